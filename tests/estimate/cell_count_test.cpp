// The log's cell count against the pack's: a pack voltage per cell outside the cell's OCV table
// (by more than the tolerance) is refused. Reference values: the demo LiPo cell's OCV table
// (invented, models/cells/demo-lipo-5000.json: 3.27 V at SoC 0, 4.20 V at SoC 1) and the series
// arithmetic V_pack = S·V_cell of a series string (common practice).
#include <doctest/doctest.h>

#include "core/error.hpp"
#include "estimate/cell_count.hpp"
#include "io/battery_json.hpp"
#include "io/flight_log_csv.hpp"
#include "support/cli.hpp"

using namespace sortie;

namespace {

battery::Pack pack_of(const std::string& file) { return io::load_pack_file(test::source_path("models/packs/" + file)); }

sim::MeasuredFlight demo_log() {
  const io::FlightLog fl = io::read_flight_log_file(test::source_path("models/logs/demo-flight-quad-synthetic.csv"), {});
  return {fl.time_s, fl.voltage_V, fl.current_A, fl.lines};
}

/// A log at rest (no current) at one pack voltage.
sim::MeasuredFlight resting(double v_pack) {
  sim::MeasuredFlight f;
  for (int k = 0; k < 10; ++k) {
    f.time_s.push_back(k);
    f.voltage_V.push_back(v_pack);
    f.current_A.push_back(0.0);
    f.lines.push_back(static_cast<std::size_t>(k) + 2);
  }
  return f;
}

}  // namespace

TEST_SUITE("estimate") {

TEST_CASE("cell count: the 6S demo log fits the 6S pack it was flown on") {
  const auto c = estimate::check_cell_count(pack_of("demo-6s1p-lipo-5000.json"), demo_log(), "demo.csv");
  CHECK_MESSAGE(c.ok, c.why);
  // Its highest resting estimate lies inside the cell's OCV range (it starts near full).
  CHECK(c.rest_cell_max_V > 4.0);
  CHECK(c.rest_cell_max_V < 4.3);
}

TEST_CASE("cell count: a 4S log (the 6S demo log scaled by 4/6) against the 6S pack is refused naming file and value and expected") {
  sim::MeasuredFlight f = demo_log();
  for (double& v : f.voltage_V) v *= 4.0 / 6.0;  // the same cells at the same state, four in series
  const auto pack = pack_of("demo-6s1p-lipo-5000.json");
  const auto c = estimate::check_cell_count(pack, f, "four.csv");
  REQUIRE(!c.ok);
  // The fullest row: about 4.14 V a cell at rest on 4 cells reads about 2.76 V a cell on 6 (the
  // estimate adds the pack's own I·R_dc, about 0.1 V a cell at 12 A).
  CHECK(c.rest_cell_max_V < 3.0);
  CHECK(c.why.find("four.csv: line ") == 0);
  CHECK(c.why.find("too low for 6 cells in series") != std::string::npos);
  CHECK(c.why.find("expected at least 6 x 3.17 V = 19.02 V") != std::string::npos);
  CHECK_THROWS_AS(estimate::require_cell_count(pack, f, "four.csv"), InputError);
}

TEST_CASE("cell count: the 6S log against a 4S pack is refused as too high") {
  const auto c = estimate::check_cell_count(pack_of("demo-4s1p-lipo-5000.json"), demo_log(), "six.csv");
  REQUIRE(!c.ok);
  CHECK(c.load_cell_max_V > 6.0);  // 24.8 V over 4 cells
  CHECK(c.why.find("too high for 4 cells in series") != std::string::npos);
  CHECK(c.why.find("expected at most 4 x 4.30 V = 17.20 V") != std::string::npos);
}

TEST_CASE("cell count: the bounds are the OCV table's ends less or plus 0.10 V a cell") {
  const auto pack = pack_of("demo-6s1p-lipo-5000.json");
  // At rest the resting estimate is the voltage itself: 6 × (3.27 − 0.10) = 19.02 V is the floor.
  CHECK(estimate::check_cell_count(pack, resting(19.03), "r.csv").ok);
  CHECK(!estimate::check_cell_count(pack, resting(19.01), "r.csv").ok);
  // 6 × (4.20 + 0.10) = 25.80 V is the ceiling.
  CHECK(estimate::check_cell_count(pack, resting(25.79), "r.csv").ok);
  CHECK(!estimate::check_cell_count(pack, resting(25.81), "r.csv").ok);
}

TEST_CASE("cell count: a charging row (regeneration) is not judged") {
  const auto pack = pack_of("demo-6s1p-lipo-5000.json");
  sim::MeasuredFlight f = resting(23.0);
  f.voltage_V[3] = 27.0;  // above the ceiling, but while charging
  f.current_A[3] = -5.0;
  CHECK(estimate::check_cell_count(pack, f, "r.csv").ok);
  f.current_A[3] = 0.0;
  CHECK(!estimate::check_cell_count(pack, f, "r.csv").ok);
}

}  // TEST_SUITE
