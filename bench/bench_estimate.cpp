// Flight-log benchmarks on the invented demo flight log (740 rows, 1 s): `check` against the
// demo quad profile (the plan simulated with a 1 s trace, the comparison, the replay), the
// `health` estimate, and a whole `logbook add-flight` into a logbook in a temporary folder.
#include <cstdio>
#include <filesystem>
#include <fstream>
#include <string>
#include <vector>

#include <unistd.h>

#include "bench.hpp"
#include "cli/run.hpp"
#include "estimate/health.hpp"
#include "io/flight_log_csv.hpp"
#include "io/csv.hpp"
#include "io/profile_json.hpp"
#include "sim/flight_check.hpp"
#include "sim/mission.hpp"

namespace {

using namespace sortie;

const std::string kLog = SORTIE_SOURCE_DIR "/models/logs/demo-flight-quad-synthetic.csv";
const std::string kProfile = SORTIE_SOURCE_DIR "/profiles/demo-quad-water-tank.json";
const std::string kPack = SORTIE_SOURCE_DIR "/models/packs/demo-6s1p-lipo-5000.json";

const sim::MeasuredFlight& demo_log() {
  static const sim::MeasuredFlight f = [] {
    const io::FlightLog fl = io::read_flight_log_file(kLog, {});
    return sim::MeasuredFlight{fl.time_s, fl.voltage_V, fl.current_A, fl.lines};
  }();
  return f;
}

// What `sortie check LOG --profile P` computes after reading its files: the plan flown with a
// 1 s trace and the log checked against it (the log parse included).
const bool reg_check = bench::add_case(
    "check_demo_flight_log",
    [] {
      static const io::LoadedProfile lp = io::load_profile_file(kProfile);
      const io::FlightLog fl = io::read_flight_log_file(kLog, {});
      const sim::MeasuredFlight mf{fl.time_s, fl.voltage_V, fl.current_A, fl.lines};
      sim::SimOptions so;
      so.sample_s = 1.0;
      const sim::MissionResult plan = sim::simulate(lp.mission, so);
      bench::keep(sim::check_flight(lp.mission, plan, mf, kLog).v_rmse_V);
    },
    20);

// The estimate of `sortie health LOG --profile P`: capacity and R0 factors and the start SoC.
const bool reg_health = bench::add_case(
    "health_demo_flight_log",
    [] {
      static const battery::Pack pack = [] {
        const io::LoadedProfile lp = io::load_profile_file(kProfile);
        battery::Pack p = lp.mission.pack;  // with the air at the field, as `health --profile` takes it
        if (const auto air = lp.mission.environment.atmosphere.at(0.0)) p.air_C = air->temperature_K - 273.15;
        return p;
      }();
      bench::keep(estimate::estimate_health(pack, {{"demo", demo_log(), std::nullopt, ""}}).capacity);
    },
    10);

// `sortie logbook DB add-flight LOG --pack 1 --profile P -q` through the command line: read and
// hash the log, check it, estimate its SoH, store the flight and the estimate in one
// transaction. Each repetition adds a copy of the demo log that differs by one comment line
// (the logbook refuses a log it holds), into one logbook in a temporary folder.
const bool reg_logbook = bench::add_case(
    "logbook_add_flight_demo_log",
    [] {
      namespace fs = std::filesystem;
      static const fs::path dir = [] {
        fs::path d = fs::temp_directory_path() / ("sortie-bench-logbook-" + std::to_string(::getpid()));
        fs::remove_all(d);
        fs::create_directories(d);
        return d;
      }();
      static const std::string db = (dir / "bench.sqlite").string();
      static int rep = 0;
      auto run = [](std::vector<std::string> args) {
        std::vector<char*> argv;
        for (auto& a : args) argv.push_back(a.data());
        return cli::run(static_cast<int>(argv.size()), argv.data());
      };
      if (rep == 0 && run({"sortie", "logbook", db, "add-pack", kPack, "--name", "bench", "--first-use", "2026-01-01", "-q"}) != 0)
        std::fprintf(stderr, "logbook_add_flight_demo_log: add-pack failed\n");
      static const std::string text = io::read_text_file(kLog);
      const std::string log = (dir / ("flight-" + std::to_string(++rep) + ".csv")).string();
      std::ofstream(log, std::ios::binary) << "# bench copy " << rep << "\n" << text;
      bench::keep(run({"sortie", "logbook", db, "add-flight", log, "--pack", "1", "--profile", kProfile, "--date",
                       "2026-01-02", "-q"}));
    },
    10);

}  // namespace
