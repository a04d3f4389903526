#include "propulsion/operating_point.hpp"

#include <algorithm>
#include <cmath>
#include <limits>
#include <numbers>

#include "core/roots.hpp"

namespace sortie::propulsion {

namespace {

constexpr double kTwoPi = 2.0 * std::numbers::pi;
// Relative speed tolerance of the root finders: the thrust then matches the target to about
// 2e-12 relative (T ∝ n²), far inside every check downstream.
constexpr double kSpeedRelTol = 1e-12;
// Doublings of the speed bracket before a thrust is declared out of reach (2^80 times the
// first guess: only a prop whose CT falls to zero everywhere gets there).
constexpr int kMaxDoublings = 80;
// A point at duty_max is not saturated: allow for rounding and for the root finders' 1e-12
// speed tolerance carried through V_m/V_bus (a thousandth of a millionth of duty is nothing).
constexpr double kDutyRelTol = 1e-9;

constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();

// Prop torque Q = CP(J)·ρ·n²·D⁵/(2π), written without dividing by n so that n = 0 is defined.
double prop_torque_Nm(const Prop& p, double n_rps, double v_axial_mps, double rho) {
  const double J = advance_ratio(p, n_rps, v_axial_mps);
  const double D = p.diameter_m;
  return p.cp(J) * rho * n_rps * n_rps * D * D * D * D * D / kTwoPi;
}

// Motor current needed by the prop at speed n: I = Q·Kv + I0(ω).
double current_at_speed(const Drive& d, double n_rps, double v_axial_mps, double rho) {
  return prop_torque_Nm(d.prop, n_rps, v_axial_mps, rho) * d.motor.kv_rad_per_s_per_V() +
         d.motor.i0_at(kTwoPi * n_rps);
}

double current_limit_A(const Drive& d) { return std::min(d.motor.i_max_A, d.esc.i_max_A); }

// Fill the status fields from the current; for an over-current point, find the thrust at
// which the current reaches the lower limit (I(n) rises from I0(0) < limit at n = 0).
void flag_current(const Drive& d, MotorPoint& m, double n_rps) {
  m.motor_over_current = m.i_motor_A > d.motor.i_max_A;
  m.esc_over_current = m.i_motor_A > d.esc.i_max_A;
  if (!m.motor_over_current && !m.esc_over_current) {
    m.status = MotorStatus::ok;
    return;
  }
  m.status = MotorStatus::over_current;
  const double lim = current_limit_A(d);
  auto g = [&](double n) { return current_at_speed(d, n, m.v_axial_mps, m.rho_kg_m3) - lim; };
  if (auto n_lim = find_root(g, 0.0, n_rps, kSpeedRelTol * n_rps))
    m.thrust_at_current_limit_N = prop_thrust_N(d.prop, *n_lim, m.v_axial_mps, m.rho_kg_m3);
}

MotorPoint infeasible_point(MotorPoint m) {
  m.status = MotorStatus::infeasible;
  m.advance_ratio = m.rpm = m.omega = m.torque = m.shaft_W = kNaN;
  m.i_motor_A = m.v_motor_V = m.motor_loss_W = m.eta_motor = kNaN;
  return m;
}

double ratio_or_zero(double num, double den) { return den > 0.0 && num > 0.0 ? num / den : 0.0; }

// The motor side at duty d and bus voltage V (at_duty without the bus step).
MotorPoint motor_at_duty(const Drive& d, double duty, double v_axial_mps, double rho,
                         double v_bus_V) {
  MotorPoint m;
  m.v_axial_mps = v_axial_mps;
  m.rho_kg_m3 = rho;
  const Motor& mo = d.motor;
  const double kv = mo.kv_rad_per_s_per_V();
  const double v_m = duty * v_bus_V;
  // Torque balance g(n) = Q_motor(V_m, ω) − Q_prop(n), ω = 2π·n.
  auto g = [&](double n) {
    return motor_torque_Nm(mo, v_m, kTwoPi * n) - prop_torque_Nm(d.prop, n, v_axial_mps, rho);
  };
  const double g0 = g(0.0);
  double n = 0.0;
  if (g0 > 0.0) {
    // At the no-load speed ω = Kv·V_m the motor torque is −I0/Kv ≤ 0; a prop that absorbs power
    // (Q_prop ≥ 0) keeps g below zero there, so [0, Kv·V_m/(2π)] brackets the speed.
    const double n_hi = kv * v_m / kTwoPi;
    const double g_hi = g(n_hi);
    if (g_hi > 0.0) return infeasible_point(m);
    n = find_root(g, 0.0, n_hi, g0, g_hi, kSpeedRelTol * n_hi).value_or(kNaN);
    if (!std::isfinite(n)) return infeasible_point(m);
  }
  // g0 ≤ 0: V_m/Rm cannot even supply I0: the motor stays stalled, n = 0.
  m.omega = kTwoPi * n;
  m.rpm = 60.0 * n;
  m.advance_ratio = advance_ratio(d.prop, n, v_axial_mps);
  m.beyond_prop_table = d.prop.outside_tables(m.advance_ratio);
  m.v_motor_V = v_m;
  // Motor quantities from (V_m, ω) so that V_m·I_m − Q·ω = I²·Rm + I0·ω/Kv holds exactly.
  m.i_motor_A = (v_m - m.omega / kv) / mo.rm_ohm;
  m.torque = n > 0.0 ? (m.i_motor_A - mo.i0_at(m.omega)) / kv : 0.0;
  m.shaft_W = m.torque * m.omega;
  m.motor_loss_W = motor_loss_W(mo, m.omega, m.i_motor_A);
  m.eta_motor = ratio_or_zero(m.shaft_W, v_m * m.i_motor_A);
  m.thrust_N = n > 0.0 ? prop_thrust_N(d.prop, n, v_axial_mps, rho) : 0.0;
  flag_current(d, m, n);
  return m;
}

}  // namespace

const char* to_string(MotorStatus s) {
  switch (s) {
    case MotorStatus::ok: return "ok";
    case MotorStatus::over_current: return "over_current";
    case MotorStatus::infeasible: return "infeasible";
  }
  return "";
}

const char* to_string(BusStatus s) {
  switch (s) {
    case BusStatus::ok: return "ok";
    case BusStatus::saturated: return "saturated";
    case BusStatus::over_current: return "over_current";
    case BusStatus::infeasible: return "infeasible";
  }
  return "";
}

MotorPoint solve_motor(const Drive& d, double thrust_N, double v_axial_mps, double rho) {
  MotorPoint m;
  m.thrust_N = thrust_N;
  m.v_axial_mps = v_axial_mps;
  m.rho_kg_m3 = rho;
  if (!(thrust_N > 0.0)) return m;  // motor off: no speed, no current, no shaft power

  const Prop& p = d.prop;
  const double D2 = p.diameter_m * p.diameter_m;
  auto f = [&](double n) { return prop_thrust_N(p, n, v_axial_mps, rho) - thrust_N; };

  // Bracket: CT(J) ≤ CT_max for every J, so at n0 = √(T/(CT_max·ρ·D⁴)) the thrust is at most
  // T (f(n0) ≤ 0); then double n until the thrust reaches T.
  double lo = std::sqrt(thrust_N / (p.ct_max() * rho * D2 * D2));
  double f_lo = f(lo);
  double hi = lo, f_hi = f_lo;
  if (f_lo > 0.0) {  // only by rounding at n0: half the speed gives a quarter of the thrust
    lo = 0.5 * hi;
    f_lo = f(lo);
  } else if (f_lo < 0.0) {
    int k = 0;
    for (; k < kMaxDoublings; ++k) {
      hi = 2.0 * lo;
      f_hi = f(hi);
      if (f_hi >= 0.0) break;
      lo = hi;
      f_lo = f_hi;
    }
    if (k == kMaxDoublings) return infeasible_point(m);
  }
  const double n = find_root(f, lo, hi, f_lo, f_hi, kSpeedRelTol * hi).value_or(kNaN);
  if (!std::isfinite(n)) return infeasible_point(m);

  m.advance_ratio = advance_ratio(p, n, v_axial_mps);
  m.beyond_prop_table = p.outside_tables(m.advance_ratio);
  m.omega = kTwoPi * n;
  m.rpm = 60.0 * n;
  m.shaft_W = prop_power_W(p, n, v_axial_mps, rho);  // P = CP·ρ·n³·D⁵
  if (m.shaft_W < 0.0) return infeasible_point(m);    // windmilling: the model does not regenerate
  m.torque = m.shaft_W / m.omega;                     // Q = P/(2π·n)
  const MotorInput in = motor_input(d.motor, m.omega, m.torque);
  m.i_motor_A = in.i_A;
  m.v_motor_V = in.v_V;
  m.motor_loss_W = motor_loss_W(d.motor, m.omega, m.i_motor_A);
  m.eta_motor = ratio_or_zero(m.shaft_W, m.v_motor_V * m.i_motor_A);
  flag_current(d, m, n);
  return m;
}

BusPoint at_bus(const Drive& d, const MotorPoint& m, double v_bus_V) {
  BusPoint b;
  b.v_bus_V = v_bus_V;
  if (m.status == MotorStatus::infeasible) {
    b.status = BusStatus::infeasible;
    b.duty = b.esc_loss_W = b.bus_W = b.bus_A = kNaN;
    b.eta_motor = b.eta_esc = b.eta_system = b.g_per_W = kNaN;
    return b;
  }
  const double p_motor = m.v_motor_V * m.i_motor_A;
  b.duty = m.v_motor_V / v_bus_V;                         // V_m = d·V_bus
  b.esc_loss_W = esc_loss_W(d.esc, v_bus_V, m.i_motor_A);  // P_idle + R_on·I² + k_sw·V_bus·I
  b.bus_W = p_motor + b.esc_loss_W;                        // P_bus = V_m·I_m + loss
  b.bus_A = b.bus_W / v_bus_V;
  b.eta_motor = m.eta_motor;
  b.eta_esc = ratio_or_zero(p_motor, b.bus_W);
  b.eta_system = ratio_or_zero(m.shaft_W, b.bus_W);
  b.g_per_W = ratio_or_zero(m.thrust_N / kStandardGravity * 1000.0, b.bus_W);
  b.saturated = m.v_motor_V > d.esc.duty_max * v_bus_V * (1.0 + kDutyRelTol);
  b.over_current = m.status == MotorStatus::over_current;
  if (b.saturated) {
    b.status = BusStatus::saturated;
    b.thrust_available_N = thrust_available(d, m.v_axial_mps, m.rho_kg_m3, v_bus_V);
  } else if (b.over_current) {
    b.status = BusStatus::over_current;
  }
  return b;
}

OperatingPoint solve(const Drive& d, double thrust_N, double v_axial_mps, double rho,
                     double v_bus_V) {
  OperatingPoint op;
  op.motor = solve_motor(d, thrust_N, v_axial_mps, rho);
  op.bus = at_bus(d, op.motor, v_bus_V);
  return op;
}

OperatingPoint at_duty(const Drive& d, double duty, double v_axial_mps, double rho,
                       double v_bus_V) {
  OperatingPoint op;
  op.motor = motor_at_duty(d, duty, v_axial_mps, rho, v_bus_V);
  op.bus = at_bus(d, op.motor, v_bus_V);
  return op;
}

double thrust_available(const Drive& d, double v_axial_mps, double rho, double v_bus_V) {
  const MotorPoint m = motor_at_duty(d, d.esc.duty_max, v_axial_mps, rho, v_bus_V);
  return m.status == MotorStatus::infeasible ? 0.0 : m.thrust_N;
}

BusLoad bus_load(const Drive& d, const MotorPoint& m) {
  const double i = m.i_motor_A;
  // P_bus(V) = (V_m·I_m + P_idle + R_on·I_m²) + (k_sw·I_m)·V
  return {m.v_motor_V * i + d.esc.p_idle_W + d.esc.r_on_ohm * i * i, d.esc.k_switch * i};
}

}  // namespace sortie::propulsion
