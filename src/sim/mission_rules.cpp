// After the flight: the time on station left at landing, the rules at landing (reserves) and the
// limits in flight, each with where and when it was decided.
#include <algorithm>
#include <string>

#include "core/error.hpp"
#include "core/text.hpp"
#include "flight/atmosphere.hpp"
#include "flight/fixed_wing.hpp"
#include "flight/thrust_need.hpp"
#include "propulsion/operating_point.hpp"
#include "sim/mission_steps.hpp"

namespace sortie::sim::steps {

using flight::Phase;
namespace prop = propulsion;

namespace {

/// Loiter speed used for the fixed-wing reserve: the minimum-power speed, kept 20 % above stall.
double reserve_loiter_speed(const flight::FixedWing& w, double mass, double rho) {
  const auto s = flight::wing_speeds(w, mass, rho);
  return std::max(s.min_power_mps, 1.2 * s.stall_mps);
}

/// The air at the field, which the reserve hold and thrust-to-weight are reckoned in. Required:
/// the loader's ranges (field elevation −500 m to 11 km, ISA offset ±60 K) always leave the
/// field inside the ISA troposphere, and a mission built past them is refused here rather than
/// reckoned in sea-level air nobody stated.
flight::AirState field_air(const Mission& m) {
  const auto air = m.environment.atmosphere.at(0.0);
  if (!air)
    throw InputError("environment: the field's air is outside the ISA troposphere model (got field_elevation_m " +
                     format_number(m.environment.atmosphere.field_elevation_m) + " m, isa offset " +
                     format_number(m.environment.atmosphere.isa_offset_K) + " K, expected -500 to 11000 m)");
  return *air;
}

/// The hold flown for the reserve at the field: a hover, or a loiter at the minimum-power speed.
Phase reserve_hold(const Flight& f) {
  Phase hold;
  if (is_multirotor(f.m.airframe)) {
    hold.kind = Phase::Kind::hover;
  } else {
    hold.kind = Phase::Kind::loiter;
    hold.airspeed_mps = reserve_loiter_speed(std::get<flight::FixedWing>(f.m.airframe), f.out.all_up_mass_kg,
                                             field_air(f.m).density_kg_m3);
  }
  return hold;
}

/// A rule met at or above `req`.
RuleCheck& add_rule(MissionResult& out, std::string name, std::string unit, double req, double act) {
  RuleCheck r;
  r.name = std::move(name);
  r.unit = std::move(unit);
  r.required = req;
  r.actual = act;
  r.margin = act - req;
  r.pass = act >= req;
  out.rules.push_back(std::move(r));
  return out.rules.back();
}

/// A limit met at or below `lim`, reached at time `at` in phase `ph`.
RuleCheck& add_limit(MissionResult& out, std::string name, std::string unit, double lim, double act, double at,
                     int ph) {
  RuleCheck& r = add_rule(out, std::move(name), std::move(unit), lim, act);
  r.is_max = true;
  r.margin = lim - act;
  r.pass = act <= lim;
  r.t_s = at;
  r.phase = ph;
  return r;
}

/// A landing rule of a flight that ended early is not reached: it fails, and reports say so
/// instead of showing a value.
void at_landing(const Flight& f, RuleCheck& r) {
  r.t_s = f.t;
  r.reached = f.out.completed;
  if (!f.out.completed) r.pass = false;
}

/// Cell current: the continuous limit at every instant, or with a burst rating the burst
/// current at every instant and spells above the continuous limit no longer than burst_s.
void cell_current_limits(Flight& f) {
  const auto& cell = f.m.pack.cell;
  const Peak& ci = f.cell_i;
  const Peak& spell = f.spell.longest;
  if (!cell.burst) {
    add_limit(f.out, "cell_current_cont_A", "A", cell.i_cont_max_A, ci.v, ci.t, ci.phase).note =
        "per cell, at every instant; burst rule not checked: the cell gives no i_burst_max_A and burst_s";
    return;
  }
  add_limit(f.out, "cell_current_burst_A", "A", cell.burst->i_max_A, ci.v, ci.t, ci.phase).note =
      "per cell, at every instant";
  const double held = spell.phase >= 0 ? spell.v : 0.0;
  add_limit(f.out, "cell_current_cont_s", "s", cell.burst->duration_s, held, spell.phase >= 0 ? spell.t : 0.0,
            spell.phase)
      .note = "longest spell above the continuous " + format_fixed(cell.i_cont_max_A, 1) + " A per cell";
}

/// Thrust-to-weight: every rotor at full duty, static (no axial flow), in the air at the
/// field, at the loaded bus voltage at take-off: T/W = N·T_max(V) / (m·g0).
void thrust_to_weight_rule(Flight& f) {
  const Mission& m = f.m;
  const double rho = field_air(m).density_kg_m3;
  const double tmax = m.drive.rotors * prop::thrust_available(m.drive, 0.0, rho, *f.v_takeoff_V);
  const double tw = tmax / (f.out.all_up_mass_kg * flight::kStandardGravity);
  RuleCheck& r = add_rule(f.out, "thrust_to_weight", "",
                          m.reserve.thrust_to_weight_min.value_or(flight::kDefaultThrustToWeightMin), tw);
  r.t_s = 0.0;
  r.phase = 0;
  r.length_dependent = false;
  r.note = std::string("full-duty static thrust at the loaded take-off voltage ") + format_fixed(*f.v_takeoff_V, 2) +
           " V over the weight" + (m.reserve.thrust_to_weight_min ? "" : "; 2:1 minimum by default (common practice)");
}

}  // namespace

// Time on station left at landing: hover (multirotor) or loiter at the minimum-power speed
// (fixed wing) at the field, from the landing state, until the loaded cell voltage reaches
// the higher of the cutoff and the in-flight reserve voltage.
void reserve_time(Flight& f) {
  const Mission& m = f.m;
  MissionResult& out = f.out;
  if (!m.reserve.hover_s || !out.completed) return;
  std::string why, field;
  std::vector<std::string> ignored;
  const auto setup = setup_stretch(m, reserve_hold(f), 0.0, out.all_up_mass_kg, why, field, ignored);
  if (!setup) {
    out.reserve_time_end = EndKind::refused;
    out.reserve_time_refusal = why;
    return;
  }
  const double floor_v = std::max(f.cutoff, m.reserve.v_load_cell_min_V.value_or(0.0));
  // Down to the covered SoC floor only, unless extrapolation is accepted.
  auto ev = make_events(m, *setup, floor_v, f.opts.accept_extrapolation ? -1.0 : out.soc_floor_covered);
  ev.resize(kCoverage + 1);                                    // no spell watch in the hold
  ev.erase(ev.begin() + kEmpty + 1, ev.begin() + kCoverage);  // terminal events only
  SegmentOptions so;
  // No end time: the hold runs until its loaded voltage floor, saturation, power collapse
  // or an empty pack ends it (one of them always does: the charge only falls), within the
  // phase step cap.
  so.method = f.opts.method;
  so.abs_tol = f.opts.tol;
  so.rel_tol = f.opts.tol;
  so.max_steps = f.opts.max_steps_per_phase;
  so.context = "reserve time at landing";
  const auto seg = run_segment(f.pm, setup->demand, f.t, f.x, ev, so);
  out.reserve_time_s = seg.end.t - f.t;
  if (seg.stopped) out.reserve_time_end = end_kind_named(ev[*seg.stopped].kind);
}

void reserve_rules(Flight& f) {
  const Mission& m = f.m;
  MissionResult& out = f.out;
  add_rule(out, "mission_flown", "s", f.planned_total, out.flight_time_s);
  out.rules.back().pass = out.completed;
  out.rules.back().t_s = f.t;
  if (m.reserve.soc_min) at_landing(f, add_rule(out, "soc_min", "", *m.reserve.soc_min, out.landing.soc));
  // Below the covered floor the OCV is invented: a landing there fails unless accepted.
  if (out.soc_floor_covered > 0 && !f.opts.accept_extrapolation)
    at_landing(f, add_rule(out, "soc_covered", "", out.soc_floor_covered, out.landing.soc));
  if (m.reserve.hover_s) {
    RuleCheck& r = add_rule(out, "hover_s", "s", *m.reserve.hover_s, out.reserve_time_s);
    at_landing(f, r);
    if (out.reserve_time_end == EndKind::refused) {
      r.pass = false;
      r.note = "the hold at the field cannot be flown: " + out.reserve_time_refusal;
    }
  }
  if (m.reserve.v_rest_cell_min_V)
    at_landing(f, add_rule(out, "v_rest_cell_min_V", "V", *m.reserve.v_rest_cell_min_V, out.landing.v_rest_cell_V));
  if (m.reserve.v_load_cell_min_V) {
    RuleCheck& r = add_rule(out, "v_load_cell_min_V", "V", *m.reserve.v_load_cell_min_V, out.v_min_cell_V);
    r.t_s = f.v_sag.t;
    r.phase = f.v_sag.phase;
  }
}

void flight_limits(Flight& f) {
  const Mission& m = f.m;
  MissionResult& out = f.out;
  if (f.cell_i.phase >= 0) cell_current_limits(f);
  const Peak& mi = f.motor_i;
  if (mi.phase >= 0) {
    add_limit(out, "motor_current_A", "A", m.drive.motor.i_max_A, mi.v, mi.t, mi.phase).length_dependent = false;
    add_limit(out, "esc_current_A", "A", m.drive.esc.i_max_A, mi.v, mi.t, mi.phase).length_dependent = false;
  }
  if (const auto mtom = flight::mtom_kg(m.airframe)) {
    RuleCheck& r = add_limit(out, "mtom_kg", "kg", *mtom, out.all_up_mass_kg, 0.0, 0);
    r.length_dependent = false;
    r.note = "all-up mass at take-off against the airframe's mtom_kg";
  }
  if (f.multirotor && f.v_takeoff_V) thrust_to_weight_rule(f);
  const Peak& hd = f.hover_duty;
  if (hd.phase >= 0) {
    add_limit(out, "hover_duty_max", "", m.reserve.hover_duty_max.value_or(flight::kDefaultHoverDutyMax), hd.v, hd.t,
              hd.phase)
        .note = m.reserve.hover_duty_max ? "highest duty in a hover"
                                         : "highest duty in a hover; 0.80 by default, a fifth left for control (common practice)";
  }
}

}  // namespace sortie::sim::steps
