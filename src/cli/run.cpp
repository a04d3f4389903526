#include "cli/run.hpp"

#include <CLI/CLI.hpp>
#include <iostream>

#include "cli/commands.hpp"
#include "core/error.hpp"
#include "core/text.hpp"
#include "io/output.hpp"

namespace sortie::cli {

namespace {

/// One line on stderr: a message quotes file names, keys and values as given, so control
/// characters (a newline among them) are shown escaped.
int fail(const std::string& what, const char* suffix, int code) {
  std::cerr << "sortie: " << printable(what) << suffix << "\n";
  return code;
}

/// What CLI11 printed (help, version) must have reached standard output.
int checked_exit(int code) {
  std::cout.flush();
  if (!std::cout) return fail("standard output: cannot write", "", kExitBadInput);
  return code;
}

}  // namespace

int run(int argc, char** argv) {
  CLI::App app{"sortie: flight time, landing state and reserve checks for small electric aircraft"};
  app.set_version_flag("--version", std::string("sortie ") + SORTIE_VERSION);
  app.require_subcommand(1);
  int exit_code = kExitOk;
  add_discharge_command(app, exit_code);
  add_fit_command(app, exit_code);
  add_drive_command(app, exit_code);
  add_fly_command(app, exit_code);
  add_compare_command(app, exit_code);
  add_route_command(app, exit_code);
  add_check_command(app, exit_code);
  add_health_command(app, exit_code);
  add_remaining_command(app, exit_code);
  add_logbook_command(app, exit_code);
  io::OutputBatch outputs;  // a command's output files appear together, or none of them does
  try {
    app.parse(argc, argv);
    outputs.commit();
  } catch (const CLI::CallForHelp& e) {
    return checked_exit(app.exit(e));
  } catch (const CLI::CallForAllHelp& e) {
    return checked_exit(app.exit(e));
  } catch (const CLI::CallForVersion& e) {
    return checked_exit(app.exit(e));
  } catch (const CLI::ValidationError& e) {
    // Our validators already say what was expected, in words.
    return fail(e.what(), "", kExitUsage);
  } catch (const CLI::ParseError& e) {
    return fail(e.what(), " (see sortie --help)", kExitUsage);
  } catch (const UsageError& e) {
    return fail(e.what(), "", kExitUsage);
  } catch (const InputError& e) {
    return fail(e.what(), "", kExitBadInput);
  } catch (const LimitError& e) {
    return fail(e.what(), "", kExitBadInput);
  } catch (const std::exception& e) {
    return fail(std::string("internal error: ") + e.what(), "", kExitBadInput);
  }
  return checked_exit(exit_code);
}

}  // namespace sortie::cli
