// A table's x column must rise strictly: a repeated x would make the piecewise-linear table a
// step of zero width, whose slope and inverse divide by zero.
#include <doctest/doctest.h>

#include <string>

#include "core/error.hpp"
#include "io/battery_json.hpp"
#include "io/drive_json.hpp"

using namespace sortie;

namespace {

std::string cell_with_soc(const std::string& soc) {
  return "{\"name\": \"t\", \"chemistry\": \"LiPo\", \"capacity_Ah\": 5, \"mass_kg\": 0.1, \"v_max_V\": 4.2,"
         " \"v_cutoff_V\": 3.3, \"i_cont_max_A\": 50,"
         " \"ocv\": {\"soc\": [0, 0.1, 0.2, 0.3, 0.4, 0.5, 0.6, 0.7, 0.8, 0.9, 1],"
         " \"V\": [3.3, 3.6, 3.7, 3.73, 3.77, 3.81, 3.86, 3.92, 3.98, 4.07, 4.2]},"
         " \"r0_ohm\": {\"soc\": " + soc + ", \"ohm\": [0.006, 0.004, 0.0035, 0.0036]}}";
}

std::string drive_with_j(const std::string& j) {
  return "{\"rotors\": 4, \"prop\": {\"diameter_m\": 0.381, \"ct\": {\"J\": " + j +
         ", \"value\": [0.1, 0.09, 0.08]}, \"cp\": 0.045},"
         " \"motor\": {\"kv_rpm_per_V\": 400, \"rm_ohm\": 0.09, \"i0_A\": 0.8, \"i0_ref_V\": 10, \"i_max_A\": 28},"
         " \"esc\": {\"r_on_ohm\": 0.008, \"k_switch\": 0.02, \"p_idle_W\": 0.4, \"duty_max\": 0.98, \"i_max_A\": 35}}";
}

}  // namespace

TEST_SUITE("io") {

TEST_CASE("table reader: a repeated x is refused like a falling one — pointing at the repeat") {
  const io::Source src{"cell.json"};
  CHECK(io::parse_cell_json(cell_with_soc("[0.0, 0.4, 0.6, 1.0]"), src).r0_ohm.x().size() == 4);
  CHECK_THROWS_WITH_AS(io::parse_cell_json(cell_with_soc("[0.0, 0.5, 0.5, 1.0]"), src),
                       doctest::Contains("cell.json: /r0_ohm/soc/2: "), InputError);
  CHECK_THROWS_WITH_AS(io::parse_cell_json(cell_with_soc("[0.0, 0.5, 0.5, 1.0]"), src),
                       doctest::Contains("(got 0.5, expected a value above 0.5)"), InputError);
  const io::Source dsrc{"drive.json"};
  CHECK_NOTHROW(io::parse_drive_json(drive_with_j("[0.0, 0.2, 0.4]"), dsrc));
  CHECK_THROWS_WITH_AS(io::parse_drive_json(drive_with_j("[0.0, 0.2, 0.2]"), dsrc),
                       doctest::Contains("drive.json: /prop/ct/J/2: "), InputError);
}

}  // TEST_SUITE
