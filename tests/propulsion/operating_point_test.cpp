// The operating-point solver: energy balance, the bus-voltage form of bus power, the inverse,
// saturation and over-current reported (not clamped), and the trade's rules of thumb.
#include <doctest/doctest.h>

#include <cmath>
#include <random>
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

// Losses written out here from the model equations, independently of the solver's own sums:
// motor I²·Rm + I0(ω)·ω/Kv (Drela 2007), ESC P_idle + R_on·I² + k_sw·V_bus·I (docs/physics.md).
double losses_W(const Drive& d, const OperatingPoint& op) {
  const auto& m = op.motor;
  const double kv = d.motor.kv_rpm_per_V * 2.0 * 3.14159265358979323846 / 60.0;
  const double motor = m.i_motor_A * m.i_motor_A * d.motor.rm_ohm + d.motor.i0_at(m.omega) * m.omega / kv;
  const double esc = d.esc.p_idle_W + d.esc.r_on_ohm * m.i_motor_A * m.i_motor_A +
                     d.esc.k_switch * op.bus.v_bus_V * m.i_motor_A;
  return motor + esc;
}

}  // namespace

TEST_SUITE("propulsion") {

TEST_CASE("operating point: bus power = shaft power + motor loss + ESC loss (property — fixed seed)") {
  // Energy conservation through the chain, to 1e-9 relative (the identities hold to rounding).
  const unsigned seed = 20240611;
  MESSAGE("seed " << seed);
  std::mt19937 rng(seed);
  std::uniform_real_distribution<double> u(0.0, 1.0);
  for (const std::string f : kDemoDrives) {
    const Drive d = load(f);
    for (int k = 0; k < 300; ++k) {
      const double v_bus = 7.0 + 18.0 * u(rng);
      const double v_ax = 15.0 * u(rng);
      const double rho = 0.8 + 0.45 * u(rng);
      CAPTURE(f);
      CAPTURE(k);
      // Forward: a thrust in; inverse: a duty in.
      const OperatingPoint a = solve(d, 0.2 + 12.0 * u(rng), v_ax, rho, v_bus);
      const OperatingPoint b = at_duty(d, 0.05 + 0.93 * u(rng), v_ax, rho, v_bus);
      for (const OperatingPoint* op : {&a, &b}) {
        if (op->motor.status == MotorStatus::infeasible) continue;
        const double rhs = op->motor.shaft_W + losses_W(d, *op);
        CHECK(op->bus.bus_W == doctest::Approx(rhs).epsilon(1e-9));
        CHECK(op->bus.bus_W == doctest::Approx(op->motor.shaft_W + op->motor.motor_loss_W + op->bus.esc_loss_W)
                                   .epsilon(1e-9));
        CHECK(op->bus.bus_A * v_bus == doctest::Approx(op->bus.bus_W).epsilon(1e-12));
        CHECK(op->bus.eta_system == doctest::Approx(op->bus.eta_motor * op->bus.eta_esc).epsilon(1e-12));
      }
    }
  }
}

TEST_CASE("operating point: bus power is exactly a + b·V_bus for a motor point") {
  // P_bus = V_m·I_m + P_idle + R_on·I_m² + k_sw·V_bus·I_m is linear in V_bus with the motor point
  // fixed (docs/physics.md "Propulsion"); bus_load gives a and b.
  const Drive d = load("models/drives/demo-hex-10in.json");
  const MotorPoint m = solve_motor(d, 4.0, 3.0, 1.2);
  const BusLoad load = bus_load(d, m);
  CHECK(load.b_W_per_V == doctest::Approx(d.esc.k_switch * m.i_motor_A).epsilon(1e-15));
  for (double v : {9.0, 11.1, 14.8, 25.0}) {
    CHECK(load.power_W(v) == doctest::Approx(at_bus(d, m, v).bus_W).epsilon(1e-13));
  }
}

TEST_CASE("operating point: at_duty is the inverse of solve") {
  // A duty in gives a thrust; that thrust solved forward at the same bus gives back the duty,
  // speed and current (to the solvers' 1e-12 speed tolerance; 1e-9 checked).
  for (const std::string f : kDemoDrives) {
    const Drive d = load(f);
    for (double duty : {0.2, 0.5, 0.9}) {
      for (double v_ax : {0.0, 6.0}) {
        CAPTURE(f);
        CAPTURE(duty);
        CAPTURE(v_ax);
        const OperatingPoint inv = at_duty(d, duty, v_ax, 1.225, 14.8);
        REQUIRE(inv.motor.thrust_N > 0.0);
        CHECK(inv.bus.duty == doctest::Approx(duty).epsilon(1e-14));
        const OperatingPoint fwd = solve(d, inv.motor.thrust_N, v_ax, 1.225, 14.8);
        CHECK(fwd.bus.duty == doctest::Approx(duty).epsilon(1e-9));
        CHECK(fwd.motor.rpm == doctest::Approx(inv.motor.rpm).epsilon(1e-9));
        CHECK(fwd.motor.i_motor_A == doctest::Approx(inv.motor.i_motor_A).epsilon(1e-9));
        CHECK(fwd.bus.bus_W == doctest::Approx(inv.bus.bus_W).epsilon(1e-9));
      }
    }
  }
}

TEST_CASE("operating point: system efficiency rises with throttle over the normal range") {
  // Common practice (no source): from low throttle up to about 80 % the fixed losses (ESC idle
  // and switching, motor no-load) shrink relative to the power delivered, so motor×ESC
  // efficiency rises. Checked on every demo drive, static, on 3S and 4S.
  for (const std::string f : kDemoDrives) {
    const Drive d = load(f);
    for (double v_bus : {11.1, 14.8}) {
      double last = 0.0;
      for (double throttle = 0.10; throttle <= 0.80 + 1e-9; throttle += 0.05) {
        CAPTURE(f);
        CAPTURE(v_bus);
        CAPTURE(throttle);
        const OperatingPoint op = at_duty(d, throttle * d.esc.duty_max, 0.0, 1.225, v_bus);
        CHECK(op.bus.eta_system > last);
        last = op.bus.eta_system;
      }
    }
  }
}

TEST_CASE("operating point: more cells give a lower duty and a lower ESC efficiency") {
  // Common practice (no source): the same thrust needs the same motor voltage and current, so a
  // higher bus voltage runs a lower duty, and its switching loss k_sw·V_bus·I_m is larger.
  for (const std::string f : kDemoDrives) {
    const Drive d = load(f);
    for (double t : {2.0, 5.0}) {
      const MotorPoint m = solve_motor(d, t, 0.0, 1.225);
      double last_duty = 2.0, last_eta = 2.0;
      for (int cells : {3, 4, 5, 6}) {
        CAPTURE(f);
        CAPTURE(cells);
        const BusPoint b = at_bus(d, m, cells * 3.7);
        CHECK(b.duty < last_duty);
        CHECK(b.eta_esc < last_eta);
        CHECK(b.duty * cells * 3.7 == doctest::Approx(m.v_motor_V).epsilon(1e-14));
        last_duty = b.duty;
        last_eta = b.eta_esc;
      }
    }
  }
}

TEST_CASE("operating point: a thrust beyond the duty limit is reported saturated — not clamped") {
  const Drive d = load("models/drives/demo-quad-15in.json");
  const double v_bus = 11.1;  // 3S
  const double available = thrust_available(d, 0.0, 1.225, v_bus);
  const OperatingPoint op = solve(d, 15.0, 0.0, 1.225, v_bus);
  CHECK(op.bus.status == BusStatus::saturated);
  CHECK(op.bus.saturated);
  // The point is the one asked for: its duty is above the limit and its thrust is the demand.
  CHECK(op.bus.duty > d.esc.duty_max);
  CHECK(op.bus.duty * v_bus == doctest::Approx(op.motor.v_motor_V).epsilon(1e-14));
  CHECK(op.motor.thrust_N == 15.0);
  // With the thrust that is available, which is what duty_max gives and less than asked.
  REQUIRE(op.bus.thrust_available_N);
  CHECK(*op.bus.thrust_available_N == doctest::Approx(available).epsilon(1e-12));
  CHECK(available < 15.0);
  const OperatingPoint at_max = at_duty(d, d.esc.duty_max, 0.0, 1.225, v_bus);
  CHECK(at_max.motor.thrust_N == doctest::Approx(available).epsilon(1e-12));
  CHECK(at_max.bus.status == BusStatus::ok);
  // Solving forward at the available thrust lands on duty_max and is not saturated.
  const OperatingPoint edge = solve(d, available, 0.0, 1.225, v_bus);
  CHECK(edge.bus.duty == doctest::Approx(d.esc.duty_max).epsilon(1e-9));
  CHECK(edge.bus.status == BusStatus::ok);
  // A duty above the limit asked of at_duty is computed, and flagged.
  const OperatingPoint over = at_duty(d, 1.0, 0.0, 1.225, v_bus);
  CHECK(over.bus.status == BusStatus::saturated);
  CHECK(over.motor.thrust_N > available);
}

TEST_CASE("operating point: current above the motor or ESC limit is flagged — not clamped") {
  const Drive d = load("models/drives/demo-quad-15in.json");  // motor 28 A, ESC 35 A
  const OperatingPoint op = solve(d, 30.0, 0.0, 1.225, 22.2);
  CHECK(op.motor.status == MotorStatus::over_current);
  CHECK(op.bus.status == BusStatus::over_current);
  CHECK(op.motor.motor_over_current);
  CHECK_FALSE(op.motor.esc_over_current);
  CHECK(op.motor.i_motor_A > 28.0);
  CHECK(op.motor.thrust_N == 30.0);
  // The thrust at which the current reaches the limit, checked by solving there.
  REQUIRE(op.motor.thrust_at_current_limit_N);
  const MotorPoint lim = solve_motor(d, *op.motor.thrust_at_current_limit_N, 0.0, 1.225);
  CHECK(lim.i_motor_A == doctest::Approx(28.0).epsilon(1e-9));
  // Over the ESC's limit too at a higher thrust.
  const OperatingPoint both = solve(d, 36.0, 0.0, 1.225, 22.2);
  CHECK(both.motor.motor_over_current);
  CHECK(both.motor.esc_over_current);
  // Saturation is reported first when both happen.
  const OperatingPoint sat = solve(d, 30.0, 0.0, 1.225, 14.8);
  CHECK(sat.bus.status == BusStatus::saturated);
  CHECK(sat.bus.over_current);
}

TEST_CASE("operating point: no thrust asked leaves the motor off and the ESC idling") {
  const Drive d = load("models/drives/demo-hex-10in.json");
  const OperatingPoint op = solve(d, 0.0, 10.0, 1.225, 14.8);
  CHECK(op.motor.status == MotorStatus::ok);
  CHECK(op.motor.rpm == 0.0);
  CHECK(op.motor.i_motor_A == 0.0);
  CHECK(op.bus.bus_W == doctest::Approx(d.esc.p_idle_W));
  CHECK(op.bus.eta_system == 0.0);
}

TEST_CASE("operating point: a duty too small to overcome the no-load torque leaves the motor stalled") {
  // V_m/Rm below I0: the motor cannot turn; the current is V_m/Rm and there is no thrust.
  const Drive d = load("models/drives/demo-quad-15in.json");
  const double duty = 0.5 * d.motor.i0_A * d.motor.rm_ohm / 14.8;
  const OperatingPoint op = at_duty(d, duty, 0.0, 1.225, 14.8);
  CHECK(op.motor.rpm == 0.0);
  CHECK(op.motor.thrust_N == 0.0);
  CHECK(op.motor.i_motor_A == doctest::Approx(duty * 14.8 / d.motor.rm_ohm).epsilon(1e-14));
  CHECK(op.bus.status == BusStatus::ok);
}

TEST_CASE("operating point: a prop that would drive the motor is infeasible — not a number") {
  // CP negative while CT is still positive (an invalid table the loader refuses; built here in
  // code): the first-order model does not regenerate, so there is no operating point.
  Drive d = load("models/drives/demo-quad-15in.json");
  d.prop.ct = Table(0.1);
  d.prop.cp = Table({0.0, 1.0}, {0.04, -0.02});
  const OperatingPoint op = solve(d, 0.05, 20.0, 1.225, 14.8);
  CHECK(op.motor.status == MotorStatus::infeasible);
  CHECK(op.bus.status == BusStatus::infeasible);
  CHECK(std::isnan(op.bus.bus_W));
  // A prop whose thrust coefficient is nowhere positive cannot reach any thrust.
  d.prop.ct = Table({0.0, 1.0}, {0.0, -0.1});
  d.prop.cp = Table(0.04);
  CHECK(solve_motor(d, 1.0, 0.0, 1.225).status == MotorStatus::infeasible);
}

TEST_CASE("operating point: a speed-dependent no-load current costs power at speed") {
  // With I0 ∝ ω^e (e > 0) the motor loses more at high speed than the constant law measured at
  // the same point, and less below it (our documented law, motor.hpp).
  Drive d = load("models/drives/demo-hex-10in.json");  // e = 0.5
  Drive c = d;
  c.motor.i0_speed_exponent = 0.0;
  const double w_ref = d.motor.omega_ref_rad_s();
  const MotorPoint fast = solve_motor(d, 9.0, 0.0, 1.225), fast_c = solve_motor(c, 9.0, 0.0, 1.225);
  const MotorPoint slow = solve_motor(d, 0.3, 0.0, 1.225), slow_c = solve_motor(c, 0.3, 0.0, 1.225);
  REQUIRE(fast.omega > w_ref);
  REQUIRE(slow.omega < w_ref);
  CHECK(fast.motor_loss_W > fast_c.motor_loss_W);
  CHECK(slow.motor_loss_W < slow_c.motor_loss_W);
  CHECK(fast.rpm == doctest::Approx(fast_c.rpm).epsilon(1e-14));  // the prop sets the speed
}

}  // TEST_SUITE
