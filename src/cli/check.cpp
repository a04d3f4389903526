// `sortie check LOG.csv --profile P.json`: a flown log against the planned profile, and the
// pack model replayed on the logged current.
#include "cli/commands.hpp"
#include "cli/log_check.hpp"
#include "cli/number_option.hpp"
#include "cli/report_output.hpp"
#include "cli/run.hpp"
#include "core/error.hpp"
#include "core/text.hpp"
#include "io/flight_log_csv.hpp"
#include "io/output.hpp"
#include "cli/profile_load.hpp"
#include "report/flight_check_report.hpp"
#include "sim/flight_check.hpp"

namespace sortie::cli {

namespace {

struct CheckOptions {
  std::string log, profile, pack, columns, json_file, trace_file;
  bool quiet = false;
  ReportOutput report;
};

int run_check(const CheckOptions& o) {
  const bool print = print_format(o.report, {{"--json", &o.json_file}, {"--trace", &o.trace_file}}, o.quiet);
  const io::LoadedProfile lp = load_profile(o.profile, o.pack);
  const LogAgainstPlan r = check_log_against_plan(o.log, o.columns, lp);
  const sim::MeasuredFlight& mf = r.flight;
  const sim::FlightCheck& c = r.check;
  const std::string json = report::flight_check_json(o.log, o.profile, c).dump(2) + "\n";
  const std::string page = o.report.html_file.empty() ? "" : report::flight_check_html(o.log, o.profile, mf, c);
  const std::string trace = o.trace_file.empty() ? "" : report::flight_check_trace_csv(mf, c);
  if (!o.json_file.empty()) io::write_output(o.json_file, json);
  if (!o.trace_file.empty()) io::write_output(o.trace_file, trace);
  if (!o.report.html_file.empty()) io::write_output(o.report.html_file, page);
  if (print && o.report.format == "json") io::write_output("-", json);
  if (print && o.report.format == "text")
    io::write_output("-", printable(report::flight_check_text(o.log, o.profile, c), true));
  return kExitOk;
}

}  // namespace

void add_check_command(CLI::App& app, int& exit_code) {
  auto o = std::make_shared<CheckOptions>();
  CLI::App* c = app.add_subcommand("check", "Check a flight log against the planned profile: voltage, energy and charge per phase, landing state, time on station left; replay of the pack on the logged current");
  c->add_option("LOG", o->log, "flight log (CSV: time, pack voltage, pack current; optional height, speed, throttle, temperature)")->required()->check(CLI::ExistingFile);
  c->add_option("--profile", o->profile, "the mission profile that was planned (JSON)")->required()->check(CLI::ExistingFile);
  c->add_option("--pack", o->pack, "use this pack file instead of the profile's pack")->check(CLI::ExistingFile);
  c->add_option("--columns", o->columns, "columns by name or number with units: time=T:ms,voltage=3,current=I_bat:mA,height=..,speed=..,throttle=..,temp=..");
  c->add_option("--json", o->json_file, "write the result as JSON to FILE, or - for standard output")->check(output_path());
  c->add_option("--trace", o->trace_file, "write a CSV of every log row with the plan's and the replay's voltage, current and SoC to FILE")->check(output_path());
  add_report_options(c, o->report, {"text", "json"});
  c->add_flag("--quiet,-q", o->quiet, "print nothing");
  c->callback([o, &exit_code] { exit_code = run_check(*o); });
}

}  // namespace sortie::cli
