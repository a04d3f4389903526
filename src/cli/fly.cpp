// `sortie fly PROFILE.json`: one mission — phases, landing state, rules, verdict, spare time.
#include <iostream>

#include "cli/commands.hpp"
#include "cli/number_option.hpp"
#include "cli/coverage_options.hpp"
#include "cli/report_output.hpp"
#include "cli/progress.hpp"
#include "cli/run.hpp"
#include "cli/logbook_pack.hpp"
#include "cli/what_if.hpp"
#include "core/error.hpp"
#include "core/text.hpp"
#include "io/output.hpp"
#include "cli/profile_load.hpp"
#include "io/spreads_json.hpp"
#include "report/html_fly.hpp"
#include "report/mission_report.hpp"
#include "report/result_csv.hpp"
#include "report/what_if_report.hpp"
#include "sim/best_speeds.hpp"
#include "sim/mission.hpp"
#include "sim/sweep.hpp"
#include "sim/uncertainty.hpp"
#include "sim/turn_home.hpp"

namespace sortie::cli {

namespace {

struct FlyOptions {
  std::string profile, pack, json_file, trace_file;
  double sample_s = 1.0;
  bool quiet = false;
  bool stop_at_coverage = false, accept_extrapolation = false;
  ReportOutput report;
  WhatIfOptions what_if;
  std::vector<std::string> sweeps;  ///< NAME=FROM:TO:STEP, one or two
  unsigned threads = 0;             ///< 0: one per core
  int samples = 0;                  ///< 0: one deterministic flight
  std::int64_t seed = 1;
  std::string spreads_file;         ///< none: sim::Spreads's defaults
  std::string logbook;              ///< with pack_id: the pack from the logbook
  std::int64_t pack_id = 0;
};

int run_samples(const FlyOptions& o, const sim::Mission& m, const std::vector<sim::Override>& overrides, bool print) {
  const sim::Spreads spreads = o.spreads_file.empty() ? sim::Spreads{} : io::load_spreads_file(o.spreads_file);
  sim::SimOptions so;
  so.stop_at_coverage = o.stop_at_coverage;
  so.accept_extrapolation = o.accept_extrapolation;
  Progress progress("samples");
  const sim::SampleRun s =
      sim::run_samples(m, spreads, o.samples, static_cast<std::uint64_t>(o.seed), so, o.threads, std::ref(progress));
  const std::string html = o.report.html_file.empty() ? "" : report::samples_html(m, s, overrides);
  if (!o.json_file.empty()) io::write_output(o.json_file, report::samples_json(m, s, overrides).dump(2) + "\n");
  if (!o.report.html_file.empty()) io::write_output(o.report.html_file, html);
  if (print && o.report.format == "json") io::write_output("-", report::samples_json(m, s, overrides).dump(2) + "\n");
  if (print && o.report.format == "csv") io::write_output("-", report::samples_csv(s));
  if (print && o.report.format == "text") io::write_output("-", printable(report::samples_text(m, s, overrides), true));
  return kExitOk;
}

int run_sweep(const FlyOptions& o, const io::LoadedProfile& lp, const sim::Mission& m,
              const std::vector<sim::Override>& overrides, bool print) {
  std::vector<sim::SweepAxis> axes;
  if (o.sweeps.size() > 2)
    throw UsageError("--sweep: given " + std::to_string(o.sweeps.size()) + " times (expected once or twice)");
  for (const auto& w : o.sweeps) {
    axes.push_back(sim::parse_sweep(w));
    if (o.what_if.numbers.count(axes.back().name))
      throw UsageError("--sweep: " + axes.back().name + " is also set by --" + axes.back().name +
                       " (expected one or the other)");
    if (axes.size() == 2 && axes[0].name == axes[1].name)
      throw UsageError("--sweep: " + axes[1].name + " swept twice (expected two different names)");
  }
  if (axes.size() == 2 && axes[0].values.size() * axes[1].values.size() > sim::kMaxSweepPoints)
    throw UsageError("--sweep: too many points (got " + std::to_string(axes[0].values.size() * axes[1].values.size()) +
                     ", expected at most " + std::to_string(sim::kMaxSweepPoints) + " over both axes)");
  (void)lp;
  sim::SimOptions so;
  so.stop_at_coverage = o.stop_at_coverage;
  so.accept_extrapolation = o.accept_extrapolation;
  Progress progress("points");
  const sim::SweepResult s = sim::run_sweep(m, axes, so, o.threads, std::ref(progress));
  const std::string html = o.report.html_file.empty() ? "" : report::sweep_html(m, s, overrides);
  if (!o.json_file.empty()) io::write_output(o.json_file, report::sweep_json(m, s, overrides).dump(2) + "\n");
  if (!o.report.html_file.empty()) io::write_output(o.report.html_file, html);
  if (print && o.report.format == "json") io::write_output("-", report::sweep_json(m, s, overrides).dump(2) + "\n");
  if (print && o.report.format == "csv") io::write_output("-", report::sweep_csv(s));
  if (print && o.report.format == "text") io::write_output("-", printable(report::sweep_text(m, s, overrides), true));
  return kExitOk;
}

/// The report's text with the overrides in effect after its heading line.
std::string with_overrides(std::string text, const std::vector<sim::Override>& overrides) {
  if (overrides.empty()) return text;
  const auto at = text.find("\n\n");
  const std::string block = report::overrides_text(overrides);
  if (at == std::string::npos) return text + "\n" + block;
  return text.insert(at + 2, block + "\n");
}

int run_fly(const FlyOptions& o) {
  const bool print = print_format(o.report, {{"--json", &o.json_file}, {"--trace", &o.trace_file}}, o.quiet);
  io::LoadedProfile lp = load_profile(o.profile, o.pack);
  std::vector<sim::Override> overrides = logbook_override(lp.mission, o.logbook, o.pack_id, !o.pack.empty());
  for (auto& w : apply_what_if(lp.mission, o.what_if)) overrides.push_back(std::move(w));
  // The loader's cross-checks again on the changed mission (a fixed-wing airframe on a hover, a
  // cell whose maximum is below the reserve voltage, a wind no leg makes headway in).
  if (!overrides.empty()) cli::check_profile(lp);
  if (o.samples > 0) {
    if (!o.sweeps.empty()) throw UsageError("--samples: not with --sweep (expected one or the other)");
    if (!o.trace_file.empty()) throw UsageError("--trace: not with --samples (a sampled run keeps no trace)");
    return run_samples(o, lp.mission, overrides, print);
  }
  if (!o.spreads_file.empty()) throw UsageError("--spreads: only with --samples");
  if (!o.sweeps.empty()) {
    if (!o.trace_file.empty()) throw UsageError("--trace: not with --sweep (a sweep keeps no trace)");
    return run_sweep(o, lp, lp.mission, overrides, print);
  }
  sim::SimOptions so;
  so.sample_s = o.trace_file.empty() && o.report.html_file.empty() ? 0.0 : o.sample_s;
  so.stop_at_coverage = o.stop_at_coverage;
  so.accept_extrapolation = o.accept_extrapolation;
  sim::MissionResult r = sim::simulate(lp.mission, so);
  if (r.refused) throw InputError(refusal_message(lp, r));
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
  const std::string html = o.report.html_file.empty() ? "" : report::fly_html(lp.mission, r, spare, &home, report::overrides_html(overrides));
  auto json_text = [&] {
    nlohmann::json j = report::fly_json(lp.mission, r, spare, &home);
    if (!overrides.empty()) j["overrides"] = report::overrides_json(overrides);
    return j.dump(2) + "\n";
  };
  if (!o.json_file.empty())
    io::write_output(o.json_file, json_text());
  if (!o.trace_file.empty()) io::write_output(o.trace_file, report::fly_trace_csv(r, &home));
  if (!o.report.html_file.empty()) io::write_output(o.report.html_file, html);
  if (print && o.report.format == "json") io::write_output("-", json_text());
  if (print && o.report.format == "csv") io::write_output("-", report::fly_phases_csv(lp.mission, r));
  if (print && o.report.format == "text") io::write_output("-", printable(with_overrides(report::fly_text(lp.mission, r, spare, &home), overrides), true));
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
  add_what_if_options(c, o->what_if, true);
  add_logbook_pack_options(c, o->logbook, o->pack_id);
  c->add_option("--sweep", o->sweeps,
                "fly a grid instead of one flight: NAME=FROM:TO:STEP over a what-if number (NAME the option "
                "without its dashes, e.g. payload-kg=0:1:0.1); give it once or twice; at most 10000 points")
      ->expected(1)->multi_option_policy(CLI::MultiOptionPolicy::TakeAll);
  c->add_option("--samples", o->samples,
                "fly N samples with inputs drawn from the spreads (--spreads), report P(every rule met) and "
                "percentiles; at most 100000")
      ->check(whole_in(1, sim::kMaxSamples));
  c->add_option("--seed", o->seed, "seed of --samples (default 1): the same seed gives the same samples")
      ->check(whole_in(0, 2147483647));
  c->add_option("--spreads", o->spreads_file, "spreads of --samples (JSON; default: the documented defaults)")
      ->check(CLI::ExistingFile);
  c->add_option("--threads", o->threads, "threads for --sweep and --samples (default: one per core)")
      ->check(whole_in(1, 256));
  c->callback([o, &exit_code] { exit_code = run_fly(*o); });
}

}  // namespace sortie::cli
