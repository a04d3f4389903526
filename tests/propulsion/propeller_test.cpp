// The propeller at the solved operating point: Durand's coefficients and momentum theory
// (J. G. Leishman, Principles of Helicopter Aerodynamics, 2nd ed., 2006, ch. 2).
#include <doctest/doctest.h>

#include <cmath>
#include <numbers>
#include <string>

#include "io/drive_json.hpp"
#include "propulsion/operating_point.hpp"
#include "support/cli.hpp"

using namespace sortie;
using namespace sortie::propulsion;

namespace {

const char* const kDemoDrives[] = {"models/drives/demo-quad-15in.json", "models/drives/demo-hex-10in.json",
                                   "models/drives/demo-pusher-10x6.json"};

Drive load(const std::string& rel) { return io::load_drive_file(test::source_path(rel)); }

}  // namespace

TEST_SUITE("propulsion") {

TEST_CASE("propeller: T = CT·ρ·n²·D⁴ and P = CP·ρ·n³·D⁵ at the solved point") {
  // The coefficient definitions in rev/s (Leishman 2006, ch. 2; every prop test report), checked
  // with n taken back from the solver's rpm and J = V/(n·D) recomputed here. The solver holds n
  // to 1e-12 relative, so T matches to ~2e-12; 1e-9 leaves room for rounding.
  for (const std::string f : kDemoDrives) {
    const Drive d = load(f);
    const double D = d.prop.diameter_m;
    for (double v : {0.0, 5.0, 12.0}) {
      for (double rho : {1.225, 1.0}) {
        for (double t : {0.5, 2.0, 5.0, 9.0}) {
          CAPTURE(f);
          CAPTURE(v);
          CAPTURE(rho);
          CAPTURE(t);
          const MotorPoint m = solve_motor(d, t, v, rho);
          REQUIRE(m.status != MotorStatus::infeasible);
          const double n = m.rpm / 60.0;
          const double J = v / (n * D);
          CHECK(m.advance_ratio == doctest::Approx(J).epsilon(1e-14));
          CHECK(d.prop.ct(J) * rho * n * n * std::pow(D, 4) == doctest::Approx(t).epsilon(1e-9));
          CHECK(m.shaft_W == doctest::Approx(d.prop.cp(J) * rho * n * n * n * std::pow(D, 5)).epsilon(1e-12));
          // Q = P/(2π·n), ω = 2π·n.
          CHECK(m.omega == doctest::Approx(2.0 * std::numbers::pi * n).epsilon(1e-14));
          CHECK(m.torque == doctest::Approx(m.shaft_W / (2.0 * std::numbers::pi * n)).epsilon(1e-12));
        }
      }
    }
  }
}

TEST_CASE("propeller: static speed in closed form for constant coefficients") {
  // With CT constant and V = 0, T = CT·ρ·n²·D⁴ inverts to n = √(T/(CT·ρ·D⁴)).
  Drive d = load("models/drives/demo-quad-15in.json");
  d.prop.ct = Table(0.11);
  d.prop.cp = Table(0.045);
  for (double t : {0.3, 3.0, 12.0}) {
    const MotorPoint m = solve_motor(d, t, 0.0, 1.225);
    const double n = std::sqrt(t / (0.11 * 1.225 * std::pow(0.381, 4)));
    CHECK(m.rpm == doctest::Approx(60.0 * n).epsilon(1e-11));
  }
}

TEST_CASE("propeller: momentum-theory ideal power never exceeds shaft power in hover") {
  // Leishman 2006, ch. 2: an ideal actuator disc of area A = π·D²/4 hovering with thrust T needs
  // P_ideal = T^1.5/√(2ρA); a real rotor needs more (figure of merit FM = P_ideal/P < 1).
  for (const std::string f : kDemoDrives) {
    const Drive d = load(f);
    const double A = std::numbers::pi * d.prop.diameter_m * d.prop.diameter_m / 4.0;
    for (double rho : {1.225, 0.9}) {
      for (double t = 0.2; t < 20.0; t *= 1.3) {
        CAPTURE(f);
        CAPTURE(t);
        const MotorPoint m = solve_motor(d, t, 0.0, rho);
        const double p_ideal = std::pow(t, 1.5) / std::sqrt(2.0 * rho * A);
        CHECK(p_ideal < m.shaft_W);
        CHECK(ideal_power_W(d.prop, t, 0.0, rho) == doctest::Approx(p_ideal).epsilon(1e-14));
      }
    }
  }
  // For constant coefficients the figure of merit is fixed: FM = CT^1.5/(√(π/2)·CP) (the same
  // relations divided by ρ·n³·D⁵).
  Drive d = load("models/drives/demo-quad-15in.json");
  d.prop.ct = Table(0.11);
  d.prop.cp = Table(0.045);
  const MotorPoint m = solve_motor(d, 7.0, 0.0, 1.225);
  const double fm = ideal_power_W(d.prop, 7.0, 0.0, 1.225) / m.shaft_W;
  CHECK(fm == doctest::Approx(std::pow(0.11, 1.5) / (std::sqrt(std::numbers::pi / 2.0) * 0.045)).epsilon(1e-10));
}

TEST_CASE("propeller: climbing-flow ideal power also stays below shaft power") {
  // Leishman 2006, ch. 2 (axial climb): P_ideal = T·(V/2 + √((V/2)² + T/(2ρA))) ≤ P_shaft, i.e.
  // propulsive efficiency T·V/P below one, for every demo drive at axial speeds inside its tables.
  for (const std::string f : kDemoDrives) {
    const Drive d = load(f);
    for (double v : {2.0, 8.0, 15.0}) {
      for (double t : {1.0, 4.0, 8.0}) {
        const MotorPoint m = solve_motor(d, t, v, 1.225);
        if (m.beyond_prop_table) continue;  // outside the data the bound was checked on
        CAPTURE(f);
        CAPTURE(v);
        CAPTURE(t);
        CHECK(ideal_power_W(d.prop, t, v, 1.225) < m.shaft_W);
        CHECK(t * v < m.shaft_W);
      }
    }
  }
}

}  // TEST_SUITE
