// The first-order DC motor model against its closed forms (M. Drela, "First-Order DC Electric
// Motor Model", MIT Aero & Astro, 2007).
#include <doctest/doctest.h>

#include <boost/math/tools/minima.hpp>
#include <cmath>
#include <numbers>

#include "io/drive_json.hpp"
#include "propulsion/motor.hpp"
#include "propulsion/operating_point.hpp"
#include "support/cli.hpp"

using namespace sortie;
using namespace sortie::propulsion;

namespace {

Motor demo_motor() {
  Motor m;
  m.kv_rpm_per_V = 400.0;
  m.rm_ohm = 0.09;
  m.i0_A = 0.8;
  m.i0_ref_V = 10.0;
  m.i_max_A = 60.0;
  return m;
}

}  // namespace

TEST_SUITE("propulsion") {

TEST_CASE("motor: the current of maximum efficiency at a fixed voltage is sqrt(I0·V/Rm)") {
  // Drela 2007: at fixed terminal voltage V, η(I) = (1 − I0/I)(1 − I·Rm/V) is largest at
  // I* = √(I0·V/Rm), where η* = (1 − √(I0·Rm/V))².
  const Motor m = demo_motor();
  for (double v : {6.0, 11.1, 14.8, 22.2}) {
    CAPTURE(v);
    const double i_star = std::sqrt(m.i0_A * v / m.rm_ohm);
    const double eta_star = std::pow(1.0 - std::sqrt(m.i0_A * m.rm_ohm / v), 2);
    // The model's efficiency at I* is the closed form, to rounding.
    CHECK(motor_efficiency(m, v, i_star) == doctest::Approx(eta_star).epsilon(1e-12));
    // And I* is where the model's efficiency peaks: Brent's minimiser on −η over (I0, V/Rm).
    // Near a smooth optimum the location is resolvable only to about √ε·I (ε the double's
    // epsilon, √ε ≈ 1.5e-8), hence 1e-6 relative.
    auto [i_opt, neg_eta] = boost::math::tools::brent_find_minima(
        [&](double i) { return -motor_efficiency(m, v, i); }, m.i0_A * 1.0001, v / m.rm_ohm * 0.9999, 40);
    CHECK(i_opt == doctest::Approx(i_star).epsilon(1e-6));
    CHECK(-neg_eta == doctest::Approx(eta_star).epsilon(1e-12));
  }
}

TEST_CASE("motor: efficiency at the optimum current through the operating-point solver") {
  // The same optimum found through the whole chain: fix V_m = d·V_bus with at_duty and vary the
  // load by scaling the prop's coefficients (CT, CP × k); the motor's efficiency peaks where
  // I_m = √(I0·V_m/Rm) (Drela 2007). Tolerance: the solver holds the speed to 1e-12 relative,
  // so η is smooth to ~1e-12 and Brent places the peak to ~√(1e-12) ≈ 1e-6 relative in k;
  // η is flat there, and I_m follows k to first order: 1e-4 relative on I_m is generous.
  Drive d = io::load_drive_file(test::source_path("models/drives/demo-quad-15in.json"));
  d.motor.i_max_A = d.esc.i_max_A = 1e3;  // keep the limit flags out of the way
  const double v_bus = 14.8, duty = 0.8, v_m = duty * v_bus;
  const Prop base = d.prop;
  auto eta_at = [&](double log_k) {
    d.prop.ct = base.ct.scaled(std::exp(log_k));
    d.prop.cp = base.cp.scaled(std::exp(log_k));
    return at_duty(d, duty, 0.0, 1.225, v_bus);
  };
  auto [log_k, neg_eta] = boost::math::tools::brent_find_minima(
      [&](double lk) { return -eta_at(lk).motor.eta_motor; }, std::log(0.001), std::log(2.0), 40);
  const OperatingPoint best = eta_at(log_k);
  const double i_star = std::sqrt(d.motor.i0_A * v_m / d.motor.rm_ohm);
  CHECK(best.motor.v_motor_V == doctest::Approx(v_m).epsilon(1e-12));
  CHECK(best.motor.i_motor_A == doctest::Approx(i_star).epsilon(1e-4));
  CHECK(-neg_eta == doctest::Approx(std::pow(1.0 - std::sqrt(d.motor.i0_A * d.motor.rm_ohm / v_m), 2))
                        .epsilon(1e-9));
}

TEST_CASE("motor: speed and torque to current and voltage and back") {
  // ω = (V − I·Rm)·Kv and Q = (I − I0)/Kv, Kv in rad/s/V (Drela 2007).
  const Motor m = demo_motor();
  const double kv = 400.0 * 2.0 * std::numbers::pi / 60.0;
  CHECK(m.kv_rad_per_s_per_V() == doctest::Approx(kv).epsilon(1e-15));
  const double omega = 350.0, torque = 0.25;
  const MotorInput in = motor_input(m, omega, torque);
  CHECK(in.i_A == doctest::Approx(torque * kv + 0.8).epsilon(1e-14));
  CHECK(in.v_V == doctest::Approx(omega / kv + in.i_A * 0.09).epsilon(1e-14));
  CHECK(motor_torque_Nm(m, in.v_V, omega) == doctest::Approx(torque).epsilon(1e-12));
  // Loss = V·I − Q·ω = I²·Rm + I0·ω/Kv.
  CHECK(motor_loss_W(m, omega, in.i_A) == doctest::Approx(in.v_V * in.i_A - torque * omega).epsilon(1e-12));
}

TEST_CASE("motor: the speed-dependent no-load current law") {
  // I0(ω) = i0_A·(ω/ω_ref)^e with ω_ref = Kv·(i0_ref_V − i0_A·Rm), the no-load speed of the
  // measurement (our documented law): it gives back i0_A at ω_ref for any e, and is constant at
  // e = 0.
  Motor m = demo_motor();
  const double w_ref = m.kv_rad_per_s_per_V() * (10.0 - 0.8 * 0.09);
  CHECK(m.omega_ref_rad_s() == doctest::Approx(w_ref).epsilon(1e-15));
  CHECK(m.i0_at(0.5 * w_ref) == doctest::Approx(0.8));
  m.i0_speed_exponent = 1.0;
  CHECK(m.i0_at(w_ref) == doctest::Approx(0.8).epsilon(1e-14));
  CHECK(m.i0_at(2.0 * w_ref) == doctest::Approx(1.6).epsilon(1e-14));
  m.i0_speed_exponent = 0.5;
  CHECK(m.i0_at(4.0 * w_ref) == doctest::Approx(1.6).epsilon(1e-14));
  CHECK(m.i0_at(0.0) == 0.0);
  // The no-load point itself is consistent: at V = i0_ref_V with no torque the model turns at
  // ω_ref drawing i0_A.
  const MotorInput in = motor_input(m, w_ref, 0.0);
  CHECK(in.i_A == doctest::Approx(0.8).epsilon(1e-14));
  CHECK(in.v_V == doctest::Approx(10.0).epsilon(1e-14));
}

}  // TEST_SUITE
