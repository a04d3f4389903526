// The verdict's limits in flight, the honest spare time and the time left at landing, the
// turn-home point: each rule fails just over its threshold and holds exactly at it, the spare
// and time-left figures match a constant-power discharge integral, and the turn-home point is
// checked by flying the mission with the return written out by hand.
#include <doctest/doctest.h>

#include <algorithm>

#include <cmath>
#include <string>

#include "propulsion/operating_point.hpp"
#include "report/mission_report.hpp"
#include "sim/mission.hpp"
#include "sim/turn_home.hpp"
#include "support/cells.hpp"

using namespace sortie;
using flight::Phase;

namespace {

constexpr double kPi = 3.14159265358979323846;
constexpr double g0 = 9.80665;  // standard gravity (ISO 80000-3)

/// A quadcopter with a static propeller (CT, CP constant), a motor with resistance and no
/// no-load current, an ESC with only a switching loss, and a pack of the given cell.
sim::Mission quad(const battery::Cell& cell, bool with_cruise = true) {
  sim::Mission m;
  m.name = "test quad";
  m.airframe = flight::Multirotor{"test quad", 1.5, 0.3, 0.05, 0.05};
  auto& d = m.drive;
  d.rotors = 4;
  d.prop.diameter_m = 0.381;
  d.prop.ct = Table(0.10);
  d.prop.cp = Table(0.04);
  d.motor.kv_rpm_per_V = 400;
  d.motor.rm_ohm = 0.08;
  d.motor.i0_A = 0.0;
  d.motor.i_max_A = 1e4;
  d.esc.r_on_ohm = 0.0;
  d.esc.p_idle_W = 0.0;
  d.esc.k_switch = 0.02;
  d.esc.duty_max = 0.98;
  d.esc.i_max_A = 1e4;
  m.pack = test::single(cell);
  m.pack.series = 6;
  m.avionics_W = 8;
  Phase climb;
  climb.kind = Phase::Kind::climb;
  climb.to_height_m = 50;
  climb.rate_mps = 2.0;
  Phase cruise;
  cruise.kind = Phase::Kind::cruise;
  cruise.distance_m = 800;
  cruise.airspeed_mps = 10;
  cruise.track_deg = 90;
  Phase hover;
  hover.kind = Phase::Kind::hover;
  hover.duration_s = 240;
  hover.spare = true;
  Phase descend;
  descend.kind = Phase::Kind::descend;
  descend.to_height_m = 0;
  descend.rate_mps = 1.5;
  if (with_cruise) m.phases = {climb, cruise, hover, descend};
  else m.phases = {climb, hover, descend};
  return m;
}

battery::Cell sagging_cell() {
  battery::Cell c = test::analytic_cell(5.0, 3.3, 0.9, 0.004, {{Table(0.0015), Table(8.0)}});
  c.mass_kg = 0.11;
  c.v_cutoff_V = 3.3;
  return c;
}

/// A flat 3.7 V cell without resistance: a constant power draws a constant current.
battery::Cell ideal_cell() {
  battery::Cell c = test::analytic_cell(5.0, 3.7, 0.0, 0.0);
  c.mass_kg = 0.11;
  c.v_cutoff_V = 3.0;
  return c;
}

const sim::RuleCheck& rule(const sim::MissionResult& r, const std::string& name) {
  for (const auto& x : r.rules)
    if (x.name == name) return x;
  FAIL("no rule " << name);
  return r.rules.front();
}

bool has(const std::string& s, const std::string& part) { return s.find(part) != std::string::npos; }

}  // namespace

TEST_SUITE("limits") {

TEST_CASE("cell continuous current: over the limit is no-go with the reason and exactly at it holds") {
  sim::Mission m = quad(sagging_cell());
  const auto base = sim::simulate(m);
  REQUIRE(base.go);
  const double peak = rule(base, "cell_current_cont_A").actual;
  // The peak per cell is the pack's highest current over the parallel count (1 here).
  CHECK(peak == doctest::Approx(base.i_max_A).epsilon(1e-12));
  m.pack.cell.i_cont_max_A = 0.96 * peak;
  const auto over = sim::simulate(m);
  CHECK_FALSE(over.go);
  CHECK_FALSE(rule(over, "cell_current_cont_A").pass);
  const std::string why = report::verdict_line(m, over, sim::solve_spare(m, over));
  MESSAGE(why);
  CHECK(has(why, "NO-GO: cell current (continuous limit)"));
  CHECK(has(why, "limit " + report::rule_value(rule(over, "cell_current_cont_A"), 0.96 * peak)));
  m.pack.cell.i_cont_max_A = peak;
  const auto at = sim::simulate(m);
  CHECK(rule(at, "cell_current_cont_A").pass);
  CHECK(at.go);
}

TEST_CASE("cell burst current: a spell above the continuous limit longer than burst_s is no-go") {
  // The hover current rises as the pack sags; with the continuous limit inside that range the
  // spell above it is measured independently on a 0.05 s trace.
  sim::Mission m = quad(sagging_cell(), false);
  sim::SimOptions so;
  so.sample_s = 0.05;
  const auto base = sim::simulate(m, so);
  double i_hover0 = 0, i_hover1 = 0;
  for (const auto& tp : base.trace)
    if (tp.phase == 1) (i_hover0 == 0 ? i_hover0 : i_hover1) = tp.s.term.current_A, i_hover1 = tp.s.term.current_A;
  REQUIRE(i_hover1 > i_hover0);
  const double i_cont = 0.5 * (i_hover0 + i_hover1);
  // The longest run of trace points above the limit (a climb that draws more than the early
  // hover is a spell of its own, closed when the hover starts below the limit).
  double spell = 0, first = -1, last = -1;
  for (const auto& tp : base.trace) {
    if (tp.s.term.current_A > i_cont) {
      if (first < 0) first = tp.s.t;
      last = tp.s.t;
    } else {
      first = -1;
    }
    if (first >= 0) spell = std::max(spell, last - first);
  }
  MESSAGE("spell above " << i_cont << " A: " << spell << " s");
  m.pack.cell.i_cont_max_A = i_cont;
  m.pack.cell.burst = battery::Burst{2.0 * i_hover1, spell - 0.5};
  const auto fail = sim::simulate(m);
  CHECK_FALSE(rule(fail, "cell_current_cont_s").pass);
  CHECK(rule(fail, "cell_current_cont_s").actual == doctest::Approx(spell).epsilon(0.2 / spell));
  CHECK(rule(fail, "cell_current_burst_A").pass);
  CHECK_FALSE(fail.go);
  m.pack.cell.burst->duration_s = spell + 0.5;
  CHECK(sim::simulate(m).go);
  m.pack.cell.burst->i_max_A = 0.99 * rule(fail, "cell_current_burst_A").actual;
  m.pack.cell.burst->i_max_A = std::max(m.pack.cell.burst->i_max_A, i_cont);
  CHECK_FALSE(rule(sim::simulate(m), "cell_current_burst_A").pass);
}

TEST_CASE("motor and ESC current limits decide the verdict") {
  sim::Mission m = quad(sagging_cell());
  const auto base = sim::simulate(m);
  const double i_m = rule(base, "motor_current_A").actual;
  m.drive.motor.i_max_A = 0.99 * i_m;
  auto r = sim::simulate(m);
  CHECK_FALSE(r.go);
  CHECK_FALSE(rule(r, "motor_current_A").pass);
  CHECK(has(report::verdict_line(m, r, sim::solve_spare(m, r)), "no change of the mission's length mends motor current"));
  m.drive.motor.i_max_A = i_m;
  CHECK(sim::simulate(m).go);
  m.drive.esc.i_max_A = 0.99 * i_m;
  r = sim::simulate(m);
  CHECK_FALSE(rule(r, "esc_current_A").pass);
  CHECK_FALSE(r.go);
}

TEST_CASE("maximum take-off mass: all-up = empty + payload + pack against mtom_kg") {
  sim::Mission m = quad(sagging_cell());
  const double all_up = 1.5 + 0.3 + 6 * 0.11;  // docs/physics.md "Mass"
  std::get<flight::Multirotor>(m.airframe).mtom_kg = all_up - 0.01;
  auto r = sim::simulate(m);
  CHECK(rule(r, "mtom_kg").actual == doctest::Approx(all_up).epsilon(1e-12));
  CHECK_FALSE(r.go);
  std::get<flight::Multirotor>(m.airframe).mtom_kg = all_up;
  r = sim::simulate(m);
  CHECK(rule(r, "mtom_kg").pass);
}

TEST_CASE("thrust-to-weight at take-off against its closed form and at its threshold") {
  sim::Mission m = quad(sagging_cell());
  sim::SimOptions so;
  so.sample_s = 1.0;
  const auto r = sim::simulate(m, so);
  // Full duty, first-order DC motor (Drela 2007) with I0 = 0: V_m = d_max·V_bus,
  // I = (V_m − ω/Kv)/Rm, Q_motor = I/Kv; static propeller Q_prop = CP·ρ·n²·D⁵/(2π), T = CT·ρ·n²·D⁴
  // (n = ω/2π). ω where Q_motor = Q_prop by bisection; T/W = 4·T/(m·g0).
  const double v_bus = r.trace.front().s.term.v_terminal_V;
  const double rho = m.environment.atmosphere.at(0.0)->density_kg_m3;
  const double kv = 400.0 * 2 * kPi / 60.0, vm = 0.98 * v_bus, D = 0.381;
  auto excess = [&](double w) {
    const double n = w / (2 * kPi);
    return (vm - w / kv) / 0.08 / kv - 0.04 * rho * n * n * std::pow(D, 5) / (2 * kPi);
  };
  double lo = 0.0, hi = kv * vm;
  for (int k = 0; k < 200; ++k) (excess(0.5 * (lo + hi)) > 0 ? lo : hi) = 0.5 * (lo + hi);
  const double n = 0.5 * (lo + hi) / (2 * kPi);
  const double tw = 4 * 0.10 * rho * n * n * std::pow(D, 4) / (r.all_up_mass_kg * g0);
  CHECK(rule(r, "thrust_to_weight").actual == doctest::Approx(tw).epsilon(1e-6));
  CHECK(rule(r, "thrust_to_weight").required == 2.0);  // the default, common practice
  m.reserve.thrust_to_weight_min = rule(r, "thrust_to_weight").actual;
  CHECK(sim::simulate(m).go);
  m.reserve.thrust_to_weight_min = rule(r, "thrust_to_weight").actual * 1.001;
  CHECK_FALSE(sim::simulate(m).go);
}

TEST_CASE("hover duty: over the limit is no-go and exactly at it holds") {
  sim::Mission m = quad(sagging_cell());
  const auto r = sim::simulate(m);
  const auto& hd = rule(r, "hover_duty_max");
  CHECK(hd.required == 0.80);
  CHECK(hd.phase == 2);
  m.reserve.hover_duty_max = hd.actual;
  CHECK(sim::simulate(m).go);
  m.reserve.hover_duty_max = hd.actual * 0.999;
  const auto over = sim::simulate(m);
  CHECK_FALSE(over.go);
  CHECK(has(report::verdict_line(m, over, sim::solve_spare(m, over)), "hover duty"));
}

TEST_CASE("time left at landing and spare time match the constant-power discharge integral") {
  // Flat OCV and no resistance: the pack gives E = S·V·Q·3600 J at constant power P, so the
  // time from charge s0 to s1 is (s0 − s1)·E/P (a constant-power discharge integral).
  sim::Mission m = quad(ideal_cell());
  m.reserve.hover_s = 30;  // the old cap was max(10 × 30 s, 600 s) = 600 s
  const auto r = sim::simulate(m);
  REQUIRE(r.completed);
  const double E = 6 * 3.7 * 5.0 * 3600.0;
  const double p_spare = r.phases[2].energy_Wh * 3600.0 / r.phases[2].duration_s;
  // The hold at landing runs at the field's air, the hover phase at 50 m: a separate power. The
  // hold ends with an empty pack (a flat OCV never reaches the cutoff).
  sim::Mission hold = quad(ideal_cell(), false);
  hold.phases = {hold.phases[0], hold.phases[1], hold.phases[2]};
  hold.phases[0].to_height_m = 1e-3;
  hold.phases[0].rate_mps = 1e-3;
  const auto h = sim::simulate(hold);
  const double p_hold = h.phases[1].energy_Wh * 3600.0 / h.phases[1].duration_s;
  const double expected_hold = r.landing.soc * E / p_hold;
  MESSAGE("time left " << r.reserve_time_s << " s, expected " << expected_hold << " s");
  CHECK(r.reserve_time_s > 600.0);
  CHECK(r.reserve_time_s == doctest::Approx(expected_hold).epsilon(2e-3));
  CHECK(r.reserve_time_end == sim::EndKind::soc_floor);

  m.reserve = {};
  m.reserve.soc_min = 0.25;
  const auto base = sim::simulate(m);
  const auto spare = sim::solve_spare(m, base);
  const double expected_spare = (base.landing.soc - 0.25) * E / p_spare;
  MESSAGE("spare " << spare.spare_s << " s, expected " << expected_spare << " s");
  CHECK(spare.binding_rule == "soc_min");
  CHECK(spare.spare_s == doctest::Approx(expected_spare).epsilon(1e-4));
}

TEST_CASE("a spare search that reaches its cap says so and gives no figure") {
  sim::Mission m = quad(sagging_cell());
  const auto base = sim::simulate(m);
  sim::SpareOptions so;
  so.max_spare_s = 100.0;
  const auto spare = sim::solve_spare(m, base, so);
  CHECK(spare.capped);
  CHECK(spare.spare_s == 100.0);
  const auto j = report::fly_json(m, base, spare);
  CHECK(j["spare_s"].is_null());
  CHECK(j["spare"]["at_least_s"] == 100.0);
  CHECK(has(report::fly_text(m, base, spare), "more than 100 s"));
}

TEST_CASE("a mission no length of its spare phase mends says how many metres of the leg must go") {
  sim::Mission m = quad(sagging_cell());
  m.reserve.soc_min = 0.25;
  m.phases[1].distance_m = 30000;
  const auto base = sim::simulate(m);
  REQUIRE_FALSE(base.go);
  const auto spare = sim::solve_spare(m, base);
  REQUIRE_FALSE(spare.bounded);
  REQUIRE(spare.cut_leg_m.has_value());
  CHECK(*spare.cut_leg == 1);
  MESSAGE(spare.note);
  sim::Mission cut = sim::lengthened(m, 2, -240.0);
  cut.phases[1].distance_m = 30000 - *spare.cut_leg_m - 1.0;
  CHECK(sim::simulate(cut).go);
  cut.phases[1].distance_m = 30000 - *spare.cut_leg_m + 2.0;
  CHECK_FALSE(sim::simulate(cut).go);
  CHECK(report::fly_json(m, base, spare)["spare_s"].is_null());
}

TEST_CASE("a flight that fails at take-off says what failed instead of zeros") {
  sim::Mission m = quad(sagging_cell());
  m.pack.series = 2;  // a 300 rpm/V motor on 2S cannot spin the 15-inch prop fast enough
  m.drive.motor.kv_rpm_per_V = 300;
  m.reserve.soc_min = 0.25;
  const auto r = sim::simulate(m);
  REQUIRE(r.end_kind == sim::EndKind::saturation);
  CHECK(r.flight_time_s < 1e-3);
  CHECK_FALSE(rule(r, "soc_min").reached);
  const std::string v = report::verdict_line(m, r, sim::solve_spare(m, r));
  CHECK(has(v, "full duty"));
  CHECK(report::fly_json(m, r, {})["rules"][1]["actual"].is_null());
  CHECK(has(report::fly_text(m, r, {}), "not reached"));
}

TEST_CASE("a saturation message never reads short by zero") {
  // The event sits where full duty just stops giving the thrust: the shortfall there is a
  // tiny fraction of a newton.
  sim::Mission m = quad(sagging_cell());
  m.pack.series = 2;
  m.drive.motor.kv_rpm_per_V = 300;
  const auto r = sim::simulate(m);
  REQUIRE(r.end_kind == sim::EndKind::saturation);
  MESSAGE(r.end_detail);
  const auto at = r.end_detail.find("short by ");
  REQUIRE(at != std::string::npos);
  const double shortfall = std::stod(r.end_detail.substr(at + 9));
  CHECK(shortfall > 0.0);
}

TEST_CASE("turn-home point: the mission with the return flown by hand just holds at it and fails later") {
  sim::Mission m = quad(sagging_cell());
  m.reserve.soc_min = 0.30;
  m.reserve.v_load_cell_min_V = 3.4;
  m.phases[2].duration_s = 3000;  // too long: the crew must turn home during the hover
  const auto home = sim::solve_turn_home(m);
  REQUIRE(home.point.has_value());
  REQUIRE(home.point_phase == 2u);
  const double tau = *home.phases[2].latest_in_phase_s;
  MESSAGE("turn home " << tau << " s into the hover, at " << home.point->t_s << " s, binding " << home.binding_rule);
  // The return by hand: 800 m back on track 270° at the leg's 10 m/s (no wind), then down.
  auto with_return = [&](double t) {
    sim::Mission r = m;
    r.phases[2].duration_s = t;
    r.phases[2].spare = false;
    Phase back = m.phases[1];
    back.track_deg = 270;
    r.phases = {m.phases[0], m.phases[1], r.phases[2], back, m.phases[3]};
    return sim::simulate(r);
  };
  CHECK(with_return(tau - 0.5).go);
  CHECK_FALSE(with_return(tau + 1.0).go);
  // The state at the point is the plan's state at that time.
  sim::Mission to = m;
  to.phases[2].duration_s = tau;
  to.phases.resize(3);
  const auto s = sim::simulate(to);
  CHECK(home.point->t_s == doctest::Approx(s.flight_time_s));
  CHECK(home.point->soc == doctest::Approx(s.landing.soc));
  CHECK(home.point->v_rest_cell_V == doctest::Approx(s.landing.v_rest_cell_V));
  // Phases before the hover hold all the way.
  CHECK(home.phases[0].whole_phase);
  CHECK(home.phases[1].whole_phase);
}

}  // TEST_SUITE
