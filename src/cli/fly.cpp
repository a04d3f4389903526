// `sortie fly PROFILE.json`: one mission — phases, landing state, rules, verdict, spare time.
#include <iostream>

#include "cli/commands.hpp"
#include "cli/run.hpp"
#include "core/error.hpp"
#include "io/output.hpp"
#include "io/profile_json.hpp"
#include "report/mission_report.hpp"
#include "sim/mission.hpp"

namespace sortie::cli {

namespace {

struct FlyOptions {
  std::string profile, pack, json_file, trace_file;
  double sample_s = 1.0;
  bool quiet = false;
};

int run_fly(const FlyOptions& o) {
  const io::LoadedProfile lp = io::load_profile_file(o.profile, o.pack);
  sim::SimOptions so;
  so.sample_s = o.trace_file.empty() ? 0.0 : o.sample_s;
  const sim::MissionResult r = sim::simulate(lp.mission, so);
  if (r.refused) throw InputError(io::refusal_message(lp, r));
  const sim::SpareResult spare = sim::solve_spare(lp.mission, r);
  if (!o.json_file.empty())
    io::write_output(o.json_file, report::fly_json(lp.mission, r, spare).dump(2) + "\n");
  if (!o.trace_file.empty()) io::write_output(o.trace_file, report::fly_trace_csv(r));
  if (!o.quiet && o.json_file != "-") std::cout << report::fly_text(lp.mission, r, spare);
  return r.go ? kExitOk : kExitNoGo;
}

}  // namespace

void add_fly_command(CLI::App& app, int& exit_code) {
  auto o = std::make_shared<FlyOptions>();
  CLI::App* c = app.add_subcommand("fly", "Fly one mission profile: phases, landing state, reserve rules, verdict, spare time");
  c->add_option("PROFILE", o->profile, "mission profile (JSON)")->required()->check(CLI::ExistingFile);
  c->add_option("--pack", o->pack, "use this pack file instead of the profile's pack")->check(CLI::ExistingFile);
  c->add_option("--json", o->json_file, "write the result as JSON to FILE, or - for standard output");
  c->add_option("--trace", o->trace_file, "write a CSV trace to FILE");
  c->add_option("--sample-s", o->sample_s, "trace spacing, s (default 1)")->check(CLI::Range(1e-3, 1e6));
  c->add_flag("--quiet,-q", o->quiet, "print nothing; the exit code tells go (0) or no-go (3)");
  c->callback([o, &exit_code] { exit_code = run_fly(*o); });
}

}  // namespace sortie::cli
