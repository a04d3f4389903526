// ISA troposphere: published table values and the ideal-gas effect of a temperature offset.
#include "flight/atmosphere.hpp"

#include <doctest/doctest.h>

#include <cmath>

using namespace sortie;
using namespace sortie::flight;

namespace {

// The 1976 standard's effective Earth radius for the geometric-to-geopotential conversion
// H = r0·Z/(r0 + Z) (U.S. Standard Atmosphere, 1976, definition of geopotential height;
// r0 = 6 356 766 m — from memory).
constexpr double kR0 = 6356766.0;

double geopotential(double geometric_m) { return kR0 * geometric_m / (kR0 + geometric_m); }

}  // namespace

TEST_SUITE("flight") {

TEST_CASE("ISA density matches the U.S. Standard Atmosphere 1976 table") {
  // Published table values of density at geometric altitude (U.S. Standard Atmosphere, 1976,
  // Table I; 5 significant figures, quoted from memory of the table).
  struct Row {
    double z_m, rho;
  };
  const Row table[] = {{0, 1.2250}, {1000, 1.1117}, {2000, 1.0066}, {3000, 0.90925}, {5000, 0.73643}};
  for (const auto& row : table) {
    CAPTURE(row.z_m);
    // Taking the altitude as geopotential height (as sortie does with field elevation + height)
    // differs from the geometric table by Z²/r0, 4 m at 5 km: within 0.1 %.
    const auto air = isa_air(row.z_m);
    REQUIRE(air);
    CHECK(std::fabs(air->density_kg_m3 - row.rho) / row.rho < 1e-3);
    // Converted to geopotential height the formula meets the table to its rounding
    // (half a unit in the 5th figure is at most 0.0045 %): 0.01 %.
    const auto exact = isa_air(geopotential(row.z_m));
    REQUIRE(exact);
    CHECK(std::fabs(exact->density_kg_m3 - row.rho) / row.rho < 1e-4);
  }
}

TEST_CASE("ISA sea level: T0 and p0 give rho0 = p0/(R T0) = 1.2250 kg/m3") {
  // ICAO Standard Atmosphere (Doc 7488) sea-level values; ρ0 follows from the ideal gas law.
  const auto air = isa_air(0.0);
  REQUIRE(air);
  CHECK(air->temperature_K == doctest::Approx(288.15).epsilon(1e-15));
  CHECK(air->pressure_Pa == doctest::Approx(101325.0).epsilon(1e-15));
  CHECK(air->density_kg_m3 == doctest::Approx(1.2250).epsilon(1e-6));
}

TEST_CASE("ISA at the tropopause: 216.65 K and 22632 Pa at 11 km") {
  // U.S. Standard Atmosphere, 1976, layer base values (layer 1 starts at 11 km geopotential):
  // T = 216.65 K, p = 2.2632e4 Pa (5 figures: half a unit is 0.5 Pa).
  const auto air = isa_air(11000.0);
  REQUIRE(air);
  CHECK(air->temperature_K == doctest::Approx(216.65).epsilon(1e-12));
  CHECK(std::fabs(air->pressure_Pa - 22632.0) < 0.5);
}

TEST_CASE("heights above 11 km are refused") {
  CHECK_FALSE(isa_air(11000.5));
  CHECK_FALSE(isa_air(20000.0));
  CHECK_FALSE(isa_air(-6000.0));
  CHECK_FALSE(isa_air(std::nan("")));
  const Atmosphere high{9500.0, 0.0};
  CHECK(high.max_height_above_field_m() == doctest::Approx(1500.0));
  CHECK(high.at(1500.0));
  CHECK_FALSE(high.at(1500.1));
}

TEST_CASE("a +15 C offset lowers density by the ideal-gas ratio at unchanged pressure") {
  // The height is a pressure altitude: p is the standard one and ρ = p/(R·T), so
  // ρ(ΔT)/ρ(0) = T_ISA/(T_ISA + ΔT) (ideal gas law).
  for (double h : {0.0, 1500.0, 4000.0, 10000.0}) {
    CAPTURE(h);
    const auto std_air = isa_air(h);
    const auto warm = isa_air(h, 15.0);
    REQUIRE(std_air);
    REQUIRE(warm);
    CHECK(warm->pressure_Pa == doctest::Approx(std_air->pressure_Pa).epsilon(1e-15));
    CHECK(warm->temperature_K == doctest::Approx(std_air->temperature_K + 15.0).epsilon(1e-15));
    const double ratio = std_air->temperature_K / (std_air->temperature_K + 15.0);
    CHECK(warm->density_kg_m3 / std_air->density_kg_m3 == doctest::Approx(ratio).epsilon(1e-13));
    CHECK(warm->density_kg_m3 < std_air->density_kg_m3);
  }
}

TEST_CASE("an OAT at the field sets the offset OAT - T_ISA(field) held constant with height") {
  // Field at 400 m: T_ISA = 288.15 − 0.0065·400 = 285.55 K. OAT 12 °C = 285.15 K, so ΔT = −0.40 K.
  const Atmosphere atm = Atmosphere::from_field_temperature(400.0, 12.0 + kCelsiusZero);
  CHECK(atm.isa_offset_K == doctest::Approx(-0.40).epsilon(1e-12));
  CHECK(atm.field_temperature_K() == doctest::Approx(285.15).epsilon(1e-14));
  const auto at_field = atm.at(0.0);
  REQUIRE(at_field);
  CHECK(at_field->temperature_K == doctest::Approx(285.15).epsilon(1e-14));
  // 1000 m higher the temperature has fallen by the standard lapse, 6.5 K.
  const auto up = atm.at(1000.0);
  REQUIRE(up);
  CHECK(up->temperature_K == doctest::Approx(285.15 - 6.5).epsilon(1e-14));
  CHECK(up->height_m == doctest::Approx(1400.0));
}

}  // TEST_SUITE
