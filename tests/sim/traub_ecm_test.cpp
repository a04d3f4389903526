// A level cruise on an equivalent-circuit pack against Traub's closed-form endurance.
#include <doctest/doctest.h>

#include <cmath>

#include "flight/fixed_wing.hpp"
#include "sim/mission.hpp"
#include "support/cells.hpp"

using namespace sortie;
using flight::Phase;

TEST_SUITE("mission") {

TEST_CASE("level cruise on a resistive pack: endurance within 3 % below Traub's closed form with n = 1") {
  // L. W. Traub, "Range and Endurance Estimates for Battery-Powered Aircraft", J. Aircraft
  // 48(2), 2011: E = R_t^(1−n)·(η·V·C/P)^n with P = ½ρV³S·CD0 + 2K·W²/(ρVS) the power required,
  // V the battery voltage, C its capacity and n Peukert's exponent. Traub's battery is a constant
  // voltage whose capacity shrinks with current (Peukert); the tool's is an equivalent circuit:
  // open-circuit voltage falling with SoC, and energy lost in R0 and the RC pairs. With n = 1
  // and V the mean open-circuit voltage (∫OCV dSoC, the energy the cells hold) the two differ only
  // by the I²R loss, P_loss/P = I·R/V ≈ 0.9 A × 0.022 Ω / 15.4 V ≈ 0.13 % here (a heavier load
  // loses more: Traub's n > 1 lumps that rate loss into the capacity instead). So the tool must
  // land below Traub, and within 3 %: far more than the loss, far less than any modelling error
  // in the power or the charge bookkeeping would give.
  sim::Mission m;
  const flight::FixedWing w{"test wing", 1.6, 0.2, 0.8, 0.028, 9.0, 0.8, 2.1};
  m.airframe = w;
  // A drive of constant efficiency η (CT constant, CP = CT·J/η, lossless motor and ESC).
  constexpr double kEta = 0.7;
  m.drive.rotors = 1;
  m.drive.prop.diameter_m = 0.254;
  m.drive.prop.ct = Table(0.09);
  m.drive.prop.cp = Table({0.0, 3.0}, {0.0, 0.09 * 3.0 / kEta});
  m.drive.motor.kv_rpm_per_V = 900;
  m.drive.motor.rm_ohm = 0.0;
  m.drive.motor.i0_A = 0.0;
  m.drive.motor.i_max_A = 1e4;
  m.drive.esc = {};
  m.drive.esc.r_on_ohm = 0.0;
  m.drive.esc.p_idle_W = 0.0;
  m.drive.esc.k_switch = 0.0;
  m.drive.esc.duty_max = 1.0;
  m.drive.esc.i_max_A = 1e4;
  // OCV 3.5 + 0.7·SoC V, R0 4 mΩ and one RC pair of 1.5 mΩ per cell; 4S, 5 Ah.
  battery::Cell c = test::analytic_cell(5.0, 3.5, 0.7, 0.004, {{Table(0.0015), Table(20.0)}});
  c.mass_kg = 0.1;
  c.v_cutoff_V = 3.3;
  m.pack = test::single(c);
  m.pack.series = 4;
  m.pack.wiring_ohm = 0.0;
  const double mass = 1.6 + 0.2 + 0.4;
  const double rho = m.environment.atmosphere.at(0.0)->density_kg_m3;
  const double V = flight::wing_speeds(w, mass, rho).min_power_mps;
  Phase loiter;
  loiter.kind = Phase::Kind::loiter;
  loiter.duration_s = 1e6;
  loiter.airspeed_mps = V;
  m.phases = {loiter};
  const auto r = sim::simulate(m);
  REQUIRE_FALSE(r.refused);
  REQUIRE_FALSE(r.completed);

  const double W = mass * 9.80665, S = w.wing_area_m2, K = flight::induced_drag_factor(w);
  const double p_req = 0.5 * rho * V * V * V * S * w.cd0 + 2 * K * W * W / (rho * V * S);
  const double v_mean = 4 * (3.5 + 0.7 / 2);  // ∫₀¹ OCV dSoC for a linear OCV, pack
  const double traub_s = 3600.0 * kEta * v_mean * 5.0 / p_req;  // n = 1: R_t^0 = 1, E in h → s
  MESSAGE("tool " << r.flight_time_s << " s (" << sim::end_text(r.end_kind) << "), Traub n = 1 " << traub_s << " s, ratio "
                  << r.flight_time_s / traub_s);
  CHECK(r.flight_time_s < traub_s);
  CHECK(r.flight_time_s > 0.97 * traub_s);
}

}  // TEST_SUITE
