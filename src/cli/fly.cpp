// `sortie fly PROFILE.json`: one mission — phases, landing state, rules, verdict, spare time.
#include <iostream>

#include "cli/commands.hpp"
#include "cli/number_option.hpp"
#include "cli/coverage_options.hpp"
#include "cli/report_output.hpp"
#include "cli/run.hpp"
#include "core/error.hpp"
#include "core/text.hpp"
#include "io/output.hpp"
#include "io/profile_json.hpp"
#include "report/html_fly.hpp"
#include "report/mission_report.hpp"
#include "report/result_csv.hpp"
#include "sim/best_speeds.hpp"
#include "sim/mission.hpp"
#include "sim/turn_home.hpp"

namespace sortie::cli {

namespace {

struct FlyOptions {
  std::string profile, pack, json_file, trace_file;
  double sample_s = 1.0;
  bool quiet = false;
  bool stop_at_coverage = false, accept_extrapolation = false;
  ReportOutput report;
};

int run_fly(const FlyOptions& o) {
  const bool print = print_format(o.report, {{"--json", &o.json_file}, {"--trace", &o.trace_file}}, o.quiet);
  const io::LoadedProfile lp = io::load_profile_file(o.profile, o.pack);
  sim::SimOptions so;
  so.sample_s = o.trace_file.empty() && o.report.html_file.empty() ? 0.0 : o.sample_s;
  so.stop_at_coverage = o.stop_at_coverage;
  so.accept_extrapolation = o.accept_extrapolation;
  sim::MissionResult r = sim::simulate(lp.mission, so);
  if (r.refused) throw InputError(io::refusal_message(lp, r));
  r.best_speeds = sim::best_speeds(lp.mission);
  if (lp.mission.environment.wind.speed_mps > 0.0)
    r.best_speeds_headwind = sim::best_speeds(lp.mission, 0.0, lp.mission.environment.wind.speed_mps, 0.0);
  sim::SpareOptions spare_opts;
  spare_opts.sim = so;
  const sim::SpareResult spare = sim::solve_spare(lp.mission, r, spare_opts);
  sim::TurnHomeOptions home_opts;
  home_opts.sim = so;  // the same rules as the flight: --stop-at-coverage, --accept-extrapolation
  const sim::TurnHome home = sim::solve_turn_home(lp.mission, home_opts);
  // Every output is made before the first is written.
  const std::string html = o.report.html_file.empty() ? "" : report::fly_html(lp.mission, r, spare, &home);
  if (!o.json_file.empty())
    io::write_output(o.json_file, report::fly_json(lp.mission, r, spare, &home).dump(2) + "\n");
  if (!o.trace_file.empty()) io::write_output(o.trace_file, report::fly_trace_csv(r, &home));
  if (!o.report.html_file.empty()) io::write_output(o.report.html_file, html);
  if (print && o.report.format == "json") io::write_output("-", report::fly_json(lp.mission, r, spare, &home).dump(2) + "\n");
  if (print && o.report.format == "csv") io::write_output("-", report::fly_phases_csv(lp.mission, r));
  if (print && o.report.format == "text") io::write_output("-", printable(report::fly_text(lp.mission, r, spare, &home), true));
  return r.go ? kExitOk : kExitNoGo;
}

}  // namespace

void add_fly_command(CLI::App& app, int& exit_code) {
  auto o = std::make_shared<FlyOptions>();
  CLI::App* c = app.add_subcommand("fly", "Fly one mission profile: phases, landing state, reserve rules, verdict, spare time");
  c->add_option("PROFILE", o->profile, "mission profile (JSON)")->required()->check(CLI::ExistingFile);
  c->add_option("--pack", o->pack, "use this pack file instead of the profile's pack")->check(CLI::ExistingFile);
  c->add_option("--json", o->json_file, "write the result as JSON to FILE, or - for standard output")->check(output_path());
  c->add_option("--trace", o->trace_file, "write a CSV trace to FILE")->check(output_path());
  add_report_options(c, o->report, {"text", "json", "csv"});
  c->add_option("--sample-s", o->sample_s, "trace spacing, s, for --trace and --html (default 1)")->check(number_in(between(1e-3, 1e6, "s")));
  add_coverage_options(c, o->stop_at_coverage, o->accept_extrapolation);
  c->add_flag("--quiet,-q", o->quiet, "print nothing; the exit code tells go (0) or no-go (3)");
  c->callback([o, &exit_code] { exit_code = run_fly(*o); });
}

}  // namespace sortie::cli
