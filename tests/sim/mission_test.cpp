// Whole missions against closed forms: fixed-wing endurance (Traub 2011), multirotor hover
// endurance (momentum theory), headwind legs, energy bookkeeping, the spare-time solve.
#include "sim/mission.hpp"

#include <doctest/doctest.h>

#include <cmath>

#include "flight/atmosphere.hpp"
#include "flight/fixed_wing.hpp"
#include "support/cells.hpp"

using namespace sortie;
using flight::Phase;

namespace {

constexpr double kPi = 3.14159265358979323846;
constexpr double g0 = 9.80665;

/// A drive whose motor and ESC lose nothing but the ESC's switching loss k·V_bus·I_m, with a
/// static propeller (constant CT, CP): with an ideal battery its efficiency is constant.
propulsion::Drive ideal_drive(int rotors, double diameter, double ct, double cp, double kv, double k_sw) {
  propulsion::Drive d;
  d.name = "test drive";
  d.rotors = rotors;
  d.prop.diameter_m = diameter;
  d.prop.ct = Table(ct);
  d.prop.cp = Table(cp);
  d.motor.kv_rpm_per_V = kv;
  d.motor.rm_ohm = 0.0;
  d.motor.i0_A = 0.0;
  d.motor.i_max_A = 1e4;
  d.esc.r_on_ohm = 0.0;
  d.esc.p_idle_W = 0.0;
  d.esc.k_switch = k_sw;
  d.esc.duty_max = 1.0;
  d.esc.i_max_A = 1e4;
  return d;
}

/// An ideal battery: flat OCV, no resistance, no RC pairs.
battery::Pack ideal_pack(double v_cell, double q_Ah, int series, double cell_mass) {
  battery::Cell c = test::analytic_cell(q_Ah, v_cell, 0.0, 0.0);
  c.mass_kg = cell_mass;
  c.v_cutoff_V = 0.5 * v_cell;
  battery::Pack p = test::single(c);
  p.series = series;
  return p;
}

Phase phase(Phase::Kind k, double duration) {
  Phase p;
  p.kind = k;
  p.duration_s = duration;
  return p;
}

sim::Mission quad_mission() {
  sim::Mission m;
  m.name = "test quad";
  m.airframe = flight::Multirotor{"test quad", 1.5, 0.3, 0.05, 0.05};
  m.drive = ideal_drive(4, 0.381, 0.10, 0.04, 400, 0.0);
  m.drive.motor.rm_ohm = 0.08;
  m.drive.motor.i0_A = 0.6;
  m.drive.esc.r_on_ohm = 0.008;
  m.drive.esc.p_idle_W = 0.3;
  m.drive.esc.k_switch = 0.02;
  m.drive.esc.duty_max = 0.98;
  m.pack = test::single(test::analytic_cell(5.0, 3.3, 0.9, 0.004, {{Table(0.0015), Table(8.0)}}));
  m.pack.cell.mass_kg = 0.11;
  m.pack.cell.v_cutoff_V = 3.3;
  m.pack.series = 6;
  m.avionics_W = 8;
  m.environment.atmosphere.field_elevation_m = 300;
  Phase climb;
  climb.kind = Phase::Kind::climb;
  climb.to_height_m = 50;
  climb.rate_mps = 2.0;
  Phase cruise;
  cruise.kind = Phase::Kind::cruise;
  cruise.distance_m = 800;
  cruise.airspeed_mps = 10;
  cruise.track_deg = 90;
  Phase hover = phase(Phase::Kind::hover, 240);
  hover.spare = true;
  Phase descend;
  descend.kind = Phase::Kind::descend;
  descend.to_height_m = 0;
  descend.rate_mps = 1.5;
  m.phases = {climb, cruise, hover, descend};
  m.reserve.soc_min = 0.25;
  m.reserve.hover_s = 60;
  m.reserve.v_rest_cell_min_V = 3.6;
  m.reserve.v_load_cell_min_V = 3.4;
  return m;
}

}  // namespace

TEST_SUITE("mission") {

TEST_CASE("fixed wing at the minimum-power speed: endurance matches Traub's closed form") {
  // L. W. Traub, "Range and Endurance Estimates for Battery-Powered Aircraft", J. Aircraft
  // 48(2), 2011, endurance with Peukert exponent n = 1:
  //   E = η·V·C / [ (2/√(ρS)) · CD0^(1/4) · (2W·√(K/3))^(3/2) ],  K = 1/(π·e·AR)
  // the bracket being the minimum power required, flown at the minimum-power speed. Here the
  // battery is ideal (flat OCV V, no resistance) and the drive's efficiency η is constant: the
  // static propeller's η_p = T·V/P_shaft = CT·J/CP and the ESC's d/(d + k_sw) (no other losses).
  sim::Mission m;
  // Wing area and CLmax chosen so that the minimum-power speed is above the stall margin
  // (1.2·V_s: CL_mp = 1.38 ≤ 2.1/1.44).
  flight::FixedWing w{"test wing", 1.6, 0.2, 0.8, 0.028, 9.0, 0.8, 2.1};
  m.airframe = w;
  const double kv = 900, k_sw = 0.03, D = 0.254, CT = 0.09, CP = 0.05;
  m.drive = ideal_drive(1, D, CT, CP, kv, k_sw);
  m.pack = ideal_pack(3.7, 5.0, 4, 0.1);
  m.phases = {phase(Phase::Kind::loiter, 1e6)};
  const double mass = 1.6 + 0.2 + 0.4;
  const double rho = m.environment.atmosphere.at(0.0)->density_kg_m3;
  const auto speeds = flight::wing_speeds(w, mass, rho);
  m.phases[0].airspeed_mps = speeds.min_power_mps;
  REQUIRE_FALSE(speeds.min_power_below_stall);

  const auto r = sim::simulate(m);
  REQUIRE(r.end_kind == sim::EndKind::soc_floor);

  const double W = mass * g0, S = w.wing_area_m2, K = 1.0 / (kPi * w.oswald_e * w.aspect_ratio);
  const double p_min = 2.0 / std::sqrt(rho * S) * std::pow(w.cd0, 0.25) * std::pow(2.0 * W * std::sqrt(K / 3.0), 1.5);
  // Drive efficiency at the one operating point: thrust T = P_min/V; n from T = CT·ρ·n²·D⁴.
  const double V = speeds.min_power_mps, T = p_min / V;
  const double n = std::sqrt(T / (CT * rho * std::pow(D, 4)));
  const double eta_p = CT * (V / (n * D)) / CP;
  const double v_bus = 4 * 3.7, omega = 2 * kPi * n;
  const double d = omega / (kv * 2 * kPi / 60.0) / v_bus;  // V_m = ω/Kv with Rm = 0
  const double eta = eta_p * d / (d + k_sw);
  const double C = 5.0 * 3600.0;  // A·s
  const double endurance = eta * v_bus * C / p_min;
  CHECK(r.flight_time_s == doctest::Approx(endurance).epsilon(1e-3));
  MESSAGE("endurance " << r.flight_time_s << " s, closed form " << endurance << " s, eta " << eta);
}

TEST_CASE("multirotor hover with an ideal battery: endurance is E·η / (N·T^1.5/(FM·√(2ρA)))") {
  // Momentum theory (J. G. Leishman, Principles of Helicopter Aerodynamics, 2nd ed., 2006,
  // ch. 2): ideal hover power per rotor T^1.5/√(2ρA); the real rotor needs P_ideal/FM. For a
  // static propeller FM = CT^1.5/(√(π/2)·CP) in the n-D coefficients (from P_ideal/P with
  // T = CT·ρn²D⁴, P = CP·ρn³D⁵, A = πD²/4). Drive efficiency η = d/(d + k_sw) as above.
  sim::Mission m;
  m.airframe = flight::Multirotor{"test quad", 1.6, 0.3, 0.05, 0.05};
  const double kv = 400, k_sw = 0.02, D = 0.381, CT = 0.10, CP = 0.042;
  m.drive = ideal_drive(4, D, CT, CP, kv, k_sw);
  m.pack = ideal_pack(3.7, 5.0, 6, 0.11);
  m.environment.atmosphere.field_elevation_m = 800;
  m.phases = {phase(Phase::Kind::hover, 1e6)};
  const auto r = sim::simulate(m);
  REQUIRE(r.end_kind == sim::EndKind::soc_floor);

  const double rho = m.environment.atmosphere.at(0.0)->density_kg_m3;
  // The rotors also carry the airframe's download f (default 0.03): T = W/(4·(1 − f)).
  const double f = flight::Multirotor{}.download_fraction;
  const double mass = 1.6 + 0.3 + 6 * 0.11, T = mass * g0 / 4 / (1 - f), A = kPi * D * D / 4;
  const double FM = std::pow(CT, 1.5) / (std::sqrt(kPi / 2) * CP);
  const double p_hover = 4 * std::pow(T, 1.5) / (FM * std::sqrt(2 * rho * A));
  const double n = std::sqrt(T / (CT * rho * std::pow(D, 4)));
  const double v_bus = 6 * 3.7;
  const double d = 2 * kPi * n / (kv * 2 * kPi / 60.0) / v_bus;
  const double eta = d / (d + k_sw);
  const double energy_J = v_bus * 5.0 * 3600.0;
  CHECK(r.flight_time_s == doctest::Approx(energy_J * eta / p_hover).epsilon(1e-3));
}

TEST_CASE("a cruise leg of distance d into a headwind w at airspeed V lasts d/(V − w)") {
  // The wind triangle with no crosswind: ground speed V − w (common practice of navigation).
  sim::Mission m = quad_mission();
  m.environment.wind = {4.0, 90.0};  // from the east, the leg flies east
  const auto r = sim::simulate(m);
  REQUIRE(r.phases.size() == 4);
  CHECK(r.phases[1].duration_s == doctest::Approx(800.0 / (10.0 - 4.0)).epsilon(1e-9));
  CHECK(r.phases[1].distance_m == doctest::Approx(800.0).epsilon(1e-9));
  // And the time with the same wind behind is d/(V + w).
  m.environment.wind.from_deg = 270.0;
  CHECK(sim::simulate(m).phases[1].duration_s == doctest::Approx(800.0 / 14.0).epsilon(1e-9));
}

TEST_CASE("energy: the pack's energy out is the sum over the phases — and SoC never rises") {
  sim::Mission m = quad_mission();
  sim::SimOptions o;
  o.sample_s = 2.0;
  const auto r = sim::simulate(m, o);
  REQUIRE(r.completed);
  double sum_Wh = 0, sum_Ah = 0, sum_t = 0;
  for (const auto& p : r.phases) {
    sum_Wh += p.energy_Wh;
    sum_Ah += p.charge_Ah;
    sum_t += p.duration_s;
  }
  CHECK(sum_Wh == doctest::Approx(r.energy_Wh).epsilon(1e-12));
  CHECK(sum_Ah == doctest::Approx(r.charge_Ah).epsilon(1e-12));
  CHECK(sum_t == doctest::Approx(r.flight_time_s).epsilon(1e-12));
  // Each phase's ESC efficiency (motor input over drive input) lies in (0, 1) and their
  // energy-weighted mean is the flight's (regression: the per-phase figure was never set).
  double drive_J = 0, motor_in_J = 0;
  for (const auto& p : r.phases) {
    CHECK(p.eta_esc_mean > 0.5);
    CHECK(p.eta_esc_mean < 1.0);
    const double pj = p.energy_Wh * 3600 - m.avionics_W * p.duration_s;
    drive_J += pj;
    motor_in_J += p.eta_esc_mean * pj;
  }
  CHECK(motor_in_J / drive_J == doctest::Approx(r.eta_esc_mean).epsilon(1e-9));
  // Charge used is the SoC drop times the capacity (Coulomb counting).
  CHECK(r.charge_Ah == doctest::Approx((1.0 - r.landing.soc) * m.pack.capacity_Ah()).epsilon(1e-9));
  REQUIRE(r.trace.size() > 10);
  for (std::size_t i = 1; i < r.trace.size(); ++i)
    CHECK(r.trace[i].s.x[battery::kSoc] <= r.trace[i - 1].s.x[battery::kSoc]);
  CHECK(r.trace.back().s.t == doctest::Approx(r.flight_time_s));
}

TEST_CASE("a heavier pack needs more thrust") {
  // All-up mass = empty + payload + pack (docs/physics.md): hover thrust per rotor = m·g/(N·(1 − f)),
  // f the airframe's download fraction.
  sim::Mission m = quad_mission();
  const auto light = sim::simulate(m);
  m.pack.parallel = 2;
  const auto heavy = sim::simulate(m);
  CHECK(heavy.all_up_mass_kg == doctest::Approx(light.all_up_mass_kg + 6 * 0.11));
  const double f = std::get<flight::Multirotor>(m.airframe).download_fraction;
  CHECK(heavy.phases[2].thrust_per_rotor_N == doctest::Approx(heavy.all_up_mass_kg * g0 / 4 / (1 - f)).epsilon(1e-9));
  CHECK(heavy.phases[2].thrust_per_rotor_N > light.phases[2].thrust_per_rotor_N);
}

TEST_CASE("the spare solve: lengthened by spare_s the mission lands on the binding rule within 1 s") {
  sim::Mission m = quad_mission();
  const auto base = sim::simulate(m);
  REQUIRE(base.go);
  const auto spare = sim::solve_spare(m, base);
  REQUIRE(spare.phase.has_value());
  CHECK(*spare.phase == 2);
  CHECK(spare.spare_s > 0);
  MESSAGE("spare " << spare.spare_s << " s, binding " << spare.binding_rule << ", " << spare.simulations << " simulations");
  CHECK(sim::simulate(sim::lengthened(m, 2, spare.spare_s - 1.0)).go);
  CHECK_FALSE(sim::simulate(sim::lengthened(m, 2, spare.spare_s + 1.0)).go);
}

TEST_CASE("the spare solve on a failing mission says how much to cut") {
  sim::Mission m = quad_mission();
  m.phases[2].duration_s = 1500;
  const auto base = sim::simulate(m);
  REQUIRE_FALSE(base.go);
  const auto spare = sim::solve_spare(m, base);
  REQUIRE(spare.phase.has_value());
  CHECK(spare.spare_s < 0);
  CHECK(sim::simulate(sim::lengthened(m, 2, spare.spare_s - 1.0)).go);
  CHECK_FALSE(sim::simulate(sim::lengthened(m, 2, spare.spare_s + 1.0)).go);
}

TEST_CASE("saturation ends the flight and says by how much the thrust falls short") {
  sim::Mission m = quad_mission();
  m.pack.series = 2;  // a 300 rpm/V motor on 2S cannot spin a 15-inch prop fast enough
  m.drive.motor.kv_rpm_per_V = 300;
  const auto r = sim::simulate(m);
  CHECK_FALSE(r.go);
  MESSAGE(sim::end_text(r.end_kind) << ": " << r.end_detail << " duty " << r.phases[0].duty_max);
  CHECK(r.end_kind == sim::EndKind::saturation);
  CHECK(r.end_detail.find("short by") != std::string::npos);
}

TEST_CASE("a fixed wing below its stall speed is refused — naming the stall speed") {
  sim::Mission m;
  m.airframe = flight::FixedWing{"test wing", 2.0, 0.2, 0.55, 0.028, 9.0, 0.8, 1.2};
  m.drive = ideal_drive(1, 0.254, 0.09, 0.05, 900, 0.02);
  m.pack = ideal_pack(3.7, 5.0, 4, 0.1);
  m.phases = {phase(Phase::Kind::loiter, 100)};
  m.phases[0].airspeed_mps = 5.0;
  const auto r = sim::simulate(m);
  CHECK(r.refused);
  CHECK(r.refusal_field == "airspeed_mps");
  CHECK(r.end_detail.find("stall") != std::string::npos);
}

TEST_CASE("stored energy integrates the OCV table exactly") {
  // ∫₀¹ (v0 + k·s) ds = v0 + k/2 for a linear OCV.
  battery::Pack p = test::single(test::analytic_cell(2.0, 3.0, 1.2, 0.01));
  p.series = 3;
  CHECK(sim::stored_energy_Wh(p, 1.0) == doctest::Approx(3 * 2.0 * (3.0 + 0.6)).epsilon(1e-12));
  CHECK(sim::stored_energy_Wh(p, 0.5) == doctest::Approx(3 * 2.0 * (3.0 * 0.5 + 1.2 * 0.125)).epsilon(1e-12));
}


TEST_CASE("mission below the covered SoC: the excursion time agrees with the trace and with a stop at the floor") {
  // The floor is put halfway between the start and the landing SoC of the plain flight, so the
  // flight crosses it. Three independent views of the crossing: the excursion's first_s lies
  // between the trace samples either side of the floor (0.25 s apart); the SoC falls all the way
  // (dSoC/dt = −I/C < 0), so the time outside is the rest of the flight; and a flight stopped at
  // the floor ends at that same time, to the 0.1 ms the events are located to.
  sim::Mission m = quad_mission();
  const auto plain = sim::simulate(m);
  REQUIRE(plain.completed);
  const double floor = 0.5 * (1.0 + plain.landing.soc);
  m.pack.cell.coverage = battery::CellCoverage{};
  m.pack.cell.coverage->soc_min = floor;
  sim::SimOptions so;
  so.sample_s = 0.25;
  const auto r = sim::simulate(m, so);
  REQUIRE(r.excursions.size() == 1);
  const auto& e = r.excursions.front();
  CHECK(e.quantity == "soc");
  CHECK(e.extreme == doctest::Approx(r.landing.soc).epsilon(1e-9));
  CHECK(std::fabs(e.duration_s - (r.flight_time_s - e.first_s)) < 1e-3);
  double before = 0.0, after = r.flight_time_s;
  for (const auto& tp : r.trace) {
    if (tp.s.x[battery::kSoc] >= floor) before = tp.s.t;
    else after = std::min(after, tp.s.t);
  }
  CHECK(e.first_s >= before);
  CHECK(e.first_s <= after);
  CHECK(after - before <= 0.25 + 1e-9);
  CHECK(e.phase >= 0);
  // The safe default: the landing below the floor fails soc_covered; accepted, the rule goes.
  bool rule_failed = false;
  for (const auto& rule : r.rules) rule_failed = rule_failed || (rule.name == "soc_covered" && !rule.pass);
  CHECK(rule_failed);
  CHECK_FALSE(r.go);
  sim::SimOptions accept;
  accept.accept_extrapolation = true;
  const auto a = sim::simulate(m, accept);
  for (const auto& rule : a.rules) CHECK(rule.name != "soc_covered");
  CHECK(a.reserve_time_s > r.reserve_time_s);

  sim::SimOptions stop;
  stop.stop_at_coverage = true;
  const auto s = sim::simulate(m, stop);
  CHECK_FALSE(s.completed);
  CHECK(s.end_kind == sim::EndKind::coverage_floor);
  CHECK(s.landing.soc == doctest::Approx(floor).epsilon(1e-6));
  CHECK(std::fabs(s.flight_time_s - e.first_s) < 1e-3);
  CHECK(s.excursions.empty());
}
}  // TEST_SUITE
