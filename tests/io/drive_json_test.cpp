// Drive files read from text: ranges that keep the propulsion numerics defined.
#include "io/drive_json.hpp"

#include <doctest/doctest.h>

#include <string>

#include "core/error.hpp"

using namespace sortie;

namespace {

std::string drive_with_diameter(const std::string& d) {
  return "{\"rotors\": 4, \"prop\": {\"diameter_m\": " + d +
         ", \"ct\": 0.1, \"cp\": 0.045},"
         " \"motor\": {\"kv_rpm_per_V\": 400, \"rm_ohm\": 0.09, \"i0_A\": 0.8, \"i0_ref_V\": 10, \"i_max_A\": 28},"
         " \"esc\": {\"r_on_ohm\": 0.008, \"k_switch\": 0.02, \"p_idle_W\": 0.4, \"duty_max\": 0.98, \"i_max_A\": 35}}";
}

}  // namespace

TEST_SUITE("io") {

TEST_CASE("drive reader: a prop diameter of 1e-300 m is refused — not a disc area of 0") {
  // Found by the profile fuzz target (fuzz/regressions/profile/prop-diameter-1e-300-m-disc-area-zero.json):
  // π·D²/4 underflowed to 0 and the multirotor inflow's assertion (disc area > 0) failed.
  const io::Source src{"drive.json"};
  CHECK_THROWS_WITH_AS(io::parse_drive_json(drive_with_diameter("1e-300"), src),
                       "drive.json: /prop/diameter_m: out of range (got 1e-300, expected a number from 0.01 to 10 m)",
                       InputError);
  CHECK(io::parse_drive_json(drive_with_diameter("0.01"), src).prop.disc_area_m2() > 0.0);
}

}  // TEST_SUITE
