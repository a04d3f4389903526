// The bundled demo flight log is what sortie's own simulator makes from the invented quad
// profile flown on its pack at 85 % capacity, with measurement noise from a fixed seed: rebuilt
// here and compared byte for byte. SORTIE_WRITE_DEMO_LOG=1 writes it instead
// (scripts/make-demo-flight-log.sh).
#include <doctest/doctest.h>

#include <cstdlib>
#include <fstream>

#include "io/profile_json.hpp"
#include "support/cli.hpp"
#include "support/synthetic_flight.hpp"

using namespace sortie;

namespace {

constexpr unsigned kSeed = 20261203;
constexpr double kSoh = 0.85, kSigmaV = 0.02, kSigmaA = 0.05;

/// The demo quad's mission on its pack at 85 % capacity (support/synthetic_flight.hpp).
std::string demo_flight_csv() {
  const io::LoadedProfile lp = io::load_profile_file(test::source_path("profiles/demo-quad-water-tank.json"));
  test::SyntheticFlight f;
  f.soh_capacity = kSoh;
  f.soh_resistance = lp.mission.pack.soh_resistance;
  f.soc0 = lp.mission.pack.soc0;
  f.sigma_V = kSigmaV;
  f.sigma_A = kSigmaA;
  f.seed = kSeed;
  return "# synthetic flight log, invented - not a measurement.\n"
         "# made by sortie's own simulator: profiles/demo-quad-water-tank.json (invented) flown on its pack\n"
         "# at 85 % capacity (soh_capacity 0.85), 1 s rows, 20 mV voltage and 50 mA current noise (seed 20261203),\n"
         "# current positive on discharge. tests/sim/demo_flight_log_test.cpp rebuilds it.\n" +
         test::synthetic_flight_rows(lp.mission, f);
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
