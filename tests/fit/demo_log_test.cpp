// The bundled demo log is what sortie's own simulator makes from the invented demo cell with the
// documented protocol and seed: rebuilt here and compared byte for byte. With the environment
// variable SORTIE_WRITE_DEMO_LOG=1 the test writes the file instead (after changing the cell or
// the protocol on purpose).
#include <doctest/doctest.h>

#include <cstdlib>
#include <fstream>

#include "io/battery_json.hpp"
#include "io/drive_json.hpp"
#include "support/cli.hpp"
#include "support/synthetic.hpp"

using namespace sortie;

TEST_SUITE("fit") {

TEST_CASE("demo log: models/logs/demo-hppc-synthetic.csv is rebuilt exactly from the invented cell") {
  MESSAGE("seed " << test::kDemoLogSeed);
  const battery::Cell cell = io::load_cell_file(test::source_path(test::kDemoLogCell));
  const sim::SyntheticLog log = sim::synthetic_pulse_test(cell, sim::PulseTestProtocol{}, test::demo_log_noise());
  const std::string csv = test::synthetic_csv(log, test::demo_log_comments());
  const std::string path = test::source_path(test::kDemoLogFile);
  if (const char* w = std::getenv("SORTIE_WRITE_DEMO_LOG"); w && std::string(w) == "1") {
    std::ofstream(path, std::ios::binary) << csv;
    MESSAGE("wrote " << path);
  }
  CHECK(csv.size() < 1000000);  // the issue asks for under about 1 MB
  const std::string bundled = test::read_file(path);
  CHECK_MESSAGE(bundled == csv, path << " differs from the rebuilt log (" << bundled.size() << " vs "
                                     << csv.size() << " bytes)");
}

TEST_CASE("demo bench: models/logs/demo-bench-synthetic.csv is rebuilt exactly from the invented drive") {
  MESSAGE("seed " << test::kDemoBenchSeed);
  propulsion::Drive d = io::load_drive_file(test::source_path(test::kDemoBenchDrive));
  d.motor.i0_speed_exponent = 0.0;  // the fitted model's constant I0
  const std::string csv = test::synthetic_bench_csv(d, 16.0, test::kDemoBenchSeed, test::demo_bench_comments());
  const std::string path = test::source_path(test::kDemoBenchFile);
  if (const char* w = std::getenv("SORTIE_WRITE_DEMO_LOG"); w && std::string(w) == "1") {
    std::ofstream(path, std::ios::binary) << csv;
    MESSAGE("wrote " << path);
  }
  CHECK_MESSAGE(test::read_file(path) == csv, path << " differs from the rebuilt bench test");
}

}  // TEST_SUITE
