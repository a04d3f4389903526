#include "cli/run.hpp"

#include <CLI/CLI.hpp>
#include <iostream>

#include "cli/commands.hpp"
#include "core/error.hpp"
#include "io/output.hpp"

namespace sortie::cli {

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
  io::OutputBatch outputs;  // a command's output files appear together, or none of them does
  try {
    app.parse(argc, argv);
    outputs.commit();
  } catch (const CLI::CallForHelp& e) {
    return app.exit(e);
  } catch (const CLI::CallForAllHelp& e) {
    return app.exit(e);
  } catch (const CLI::CallForVersion& e) {
    return app.exit(e);
  } catch (const CLI::ParseError& e) {
    std::cerr << "sortie: " << e.what() << " (see sortie --help)\n";
    return kExitUsage;
  } catch (const UsageError& e) {
    std::cerr << "sortie: " << e.what() << "\n";
    return kExitUsage;
  } catch (const InputError& e) {
    std::cerr << "sortie: " << e.what() << "\n";
    return kExitBadInput;
  } catch (const LimitError& e) {
    std::cerr << "sortie: " << e.what() << "\n";
    return kExitBadInput;
  } catch (const std::exception& e) {
    std::cerr << "sortie: internal error: " << e.what() << "\n";
    return kExitBadInput;
  }
  return exit_code;
}

}  // namespace sortie::cli
