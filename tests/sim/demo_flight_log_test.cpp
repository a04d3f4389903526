// The bundled demo flight log is what sortie's own simulator makes from the invented quad
// profile flown on its pack at 85 % capacity, with measurement noise from a fixed seed: rebuilt
// here and compared byte for byte. SORTIE_WRITE_DEMO_LOG=1 writes it instead
// (scripts/make-demo-flight-log.sh).
#include <doctest/doctest.h>

#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <fstream>
#include <random>

#include "io/profile_json.hpp"
#include "sim/mission.hpp"
#include "support/cli.hpp"
#include "support/normal.hpp"

using namespace sortie;

namespace {

constexpr unsigned kSeed = 20261203;
constexpr double kSoh = 0.85, kSigmaV = 0.02, kSigmaA = 0.05;

/// Standard normal from mt19937 words by Box–Muller (the engine's output is fixed by the C++
/// standard; std::normal_distribution's algorithm is not, so it is not used for a bundled file).
std::string demo_flight_csv() {
  io::LoadedProfile lp = io::load_profile_file(test::source_path("profiles/demo-quad-water-tank.json"));
  lp.mission.pack.soh_capacity = kSoh;
  sim::SimOptions so;
  so.sample_s = 1.0;
  const sim::MissionResult r = sim::simulate(lp.mission, so);
  std::mt19937 g(kSeed);
  std::string out =
      "# synthetic flight log, invented - not a measurement.\n"
      "# made by sortie's own simulator: profiles/demo-quad-water-tank.json (invented) flown on its pack\n"
      "# at 85 % capacity (soh_capacity 0.85), 1 s rows, 20 mV voltage and 50 mA current noise (seed 20261203),\n"
      "# current positive on discharge. tests/sim/demo_flight_log_test.cpp rebuilds it.\n"
      "Time (s),Voltage (V),Current (A),Altitude (m),Throttle (%)\n";
  char buf[160];
  for (const auto& p : r.trace) {
    const double v = p.s.term.v_terminal_V + kSigmaV * test::normal(g);
    const double i = p.s.term.current_A + kSigmaA * test::normal(g);
    std::snprintf(buf, sizeof buf, "%.3f,%.3f,%.3f,%.1f,%.1f\n", p.s.t, v, i, p.height_m, 100.0 * p.duty);
    out += buf;
  }
  return out;
}

}  // namespace

TEST_SUITE("sim") {

TEST_CASE("demo flight log: models/logs/demo-flight-quad-synthetic.csv is rebuilt exactly from the invented profile") {
  const std::string csv = demo_flight_csv();
  const std::string path = test::source_path("models/logs/demo-flight-quad-synthetic.csv");
  if (const char* w = std::getenv("SORTIE_WRITE_DEMO_LOG"); w && std::string(w) == "1") {
    std::ofstream(path, std::ios::binary) << csv;
    MESSAGE("wrote " << path);
  }
  const std::string bundled = test::read_file(path);
  CHECK_MESSAGE(bundled == csv, path << " differs from the rebuilt log (" << bundled.size() << " vs " << csv.size() << " bytes)");
}

}  // TEST_SUITE
