// A mission flown phase by phase (thrust need → motor point → bus load a + b·V → battery
// segment), then the landing state, the reserve time and the rules. The steps are named in
// sim/mission_steps.hpp: one phase in mission_phase.cpp, the rules in mission_rules.cpp; the
// spare-time solve is in spare.cpp.
#include "sim/mission.hpp"

#include <algorithm>
#include <cmath>

#include "core/text.hpp"
#include "flight/atmosphere.hpp"
#include "flight/fixed_wing.hpp"
#include "flight/wind.hpp"
#include "sim/best_speeds.hpp"
#include "sim/mission_steps.hpp"

namespace sortie::sim {

using flight::Phase;

namespace steps {

/// `v` with `sig` significant digits in fixed notation ("0" for zero).
std::string format_significant(double v, int sig) {
  if (v == 0.0 || !std::isfinite(v)) return format_fixed(v, 0);
  const int mag = static_cast<int>(std::floor(std::log10(std::fabs(v))));
  return format_fixed(v, std::clamp(sig - 1 - mag, 0, 12));
}

std::vector<double> start_heights(const std::vector<Phase>& phases) {
  std::vector<double> h{0.0};
  for (const auto& p : phases) {
    const bool vertical = p.kind == Phase::Kind::climb || p.kind == Phase::Kind::descend;
    h.push_back(vertical ? p.to_height_m : h.back());
  }
  return h;
}

double phase_airspeed(const Mission& m, const Phase& p) {
  const bool holds_position = p.kind == Phase::Kind::hover ||
                              ((p.kind == Phase::Kind::climb || p.kind == Phase::Kind::descend) &&
                               p.airspeed_mps <= 0.0);
  if (is_multirotor(m.airframe) && holds_position) return m.environment.wind.speed_mps;
  return p.airspeed_mps;
}

}  // namespace steps

double stored_energy_Wh(const battery::Pack& p, double soc) {
  // ∫₀^soc OCV(s) ds for the piecewise-linear table held flat beyond its ends (trapezoids).
  const Table& ocv = p.cell.ocv_V;
  const auto& xs = ocv.x();
  double integral = 0.0, prev_x = 0.0, prev_v = ocv(0.0);
  for (double xk : xs) {
    if (xk <= 0.0) continue;
    const double x = std::min(xk, soc);
    const double v = ocv(x);
    integral += 0.5 * (prev_v + v) * (x - prev_x);
    prev_x = x;
    prev_v = v;
    if (xk >= soc) break;
  }
  if (soc > prev_x) integral += 0.5 * (prev_v + ocv(soc)) * (soc - prev_x);
  return p.capacity_Ah() * p.series * integral;
}

std::optional<double> planned_duration_s(const Mission& m, std::size_t i) {
  const Phase& p = m.phases.at(i);
  const auto h = steps::start_heights(m.phases);
  switch (p.kind) {
    case Phase::Kind::climb:
    case Phase::Kind::descend: return std::fabs(p.to_height_m - h[i]) / p.rate_mps;
    case Phase::Kind::hover:
    case Phase::Kind::loiter: return p.duration_s.value_or(0.0);
    case Phase::Kind::cruise: {
      if (p.duration_s) return *p.duration_s;
      const auto leg = flight::solve_leg(m.environment.wind, p.track_deg, phase_airspeed_mps(m, i));
      if (leg.status != flight::LegStatus::ok) return std::nullopt;
      return p.distance_m.value_or(0.0) / leg.ground_speed_mps;  // d / (V − w) into a headwind
    }
  }
  return std::nullopt;
}

namespace {

using namespace steps;

/// The pack as flown: its cells give their heat to the air at the field (a pack file may name
/// its own air).
battery::Pack pack_in_field_air(const Mission& m) {
  battery::Pack pack = m.pack;
  if (!pack.air_C)
    if (const auto air = m.environment.atmosphere.at(0.0)) pack.air_C = air->temperature_K - 273.15;
  return pack;
}

/// The flight's and the result's starting values: masses, temperatures, the covered floor,
/// the wing's speeds, the initial state.
void start_flight(Flight& f) {
  const Mission& m = f.m;
  MissionResult& out = f.out;
  out.thermal = f.pm.thermal;
  out.temperature_start_C = f.pm.t0_C;
  out.temperature_max_C = f.pm.t0_C;
  out.air_C = f.pm.air_C;
  f.S = m.pack.series;
  f.rated_Ah = m.pack.cell.capacity_Ah * m.pack.parallel;
  f.cutoff = m.pack.cell.v_cutoff_V;
  out.soc_floor_covered = m.pack.cell.soc_floor_covered();
  out.accept_extrapolation = f.opts.accept_extrapolation;
  f.stop_floor = f.opts.stop_at_coverage && out.soc_floor_covered > 0 ? out.soc_floor_covered : -1.0;
  out.pack_mass_kg = m.pack.mass_kg();
  out.all_up_mass_kg = flight::all_up_mass_kg(m.airframe, out.pack_mass_kg);
  f.heights = start_heights(m.phases);
  if (const auto* w = std::get_if<flight::FixedWing>(&m.airframe))
    if (const auto air = m.environment.atmosphere.at(0.0))
      out.wing_speeds = flight::wing_speeds(*w, out.all_up_mass_kg, air->density_kg_m3);
  f.x = f.pm.initial_state(m.pack.soc0);
  out.v_min_cell_V = kInf;
  f.multirotor = is_multirotor(m.airframe);
  f.i_cont_pack = m.pack.cell.i_cont_max_A * m.pack.parallel;
}

/// Phases after the end keep their plan so the report can show what was not flown.
void keep_unflown_phases(Flight& f) {
  for (std::size_t i = f.out.phases.size(); i < f.m.phases.size(); ++i) {
    PhaseSummary ps;
    ps.kind = f.m.phases[i].kind;
    ps.label = f.m.phases[i].label;
    ps.start_s = f.t;
    ps.planned_s = planned_duration_s(f.m, i).value_or(0.0);
    f.planned_total += ps.planned_s;
    f.out.phases.push_back(ps);
  }
}

/// The trace's exact end point, when the last sample falls before it.
void end_trace(Flight& f) {
  auto& trace = f.out.trace;
  if (!(f.opts.sample_s > 0 && !trace.empty() && trace.back().s.t < f.t)) return;
  TracePoint last = trace.back();
  last.s = Sample{f.t, f.x, battery::Thevenin{f.pm, f.last_demand}.terminal(f.x, f.t)};
  last.duty = f.last_vm > 0 ? f.last_vm / last.s.term.v_terminal_V : 0.0;
  last.height_m = f.last_h;
  trace.push_back(last);
}

/// The excursions beyond the cell model's data, each also an event.
void note_excursions(Flight& f) {
  MissionResult& out = f.out;
  out.excursions = f.watch.excursions();
  for (auto it = out.excursions.begin(); it != out.excursions.end();) {
    // Stopped at the covered floor, the flight ends a hair below it (the event's time
    // tolerance): not an excursion.
    if (out.end_kind == EndKind::coverage_floor && f.t > 0 && it->quantity == "soc" && it->at_end && it->duration_s < 1e-3) {
      it = out.excursions.erase(it);
      continue;
    }
    out.events.push_back({it->first_s, "model_range", it->phase, describe(*it)});
    ++it;
  }
}

/// The whole flight's totals: time, energy, charge, C-rate, mean duty and efficiencies.
void flight_totals(Flight& f) {
  MissionResult& out = f.out;
  const double t = f.t;
  out.completed = !f.stopped;
  out.flight_time_s = t;
  out.energy_Wh = f.x[battery::kEnergy] / 3600.0;
  out.charge_Ah = f.x[battery::kCharge] / 3600.0;
  out.c_rate_max = out.i_max_A / f.rated_Ah;
  out.duty_mean = t > 0 ? f.duty_integral / t : 0.0;
  out.eta_mean = f.drive_J > 0 ? f.shaft_J / f.drive_J : 0.0;
  out.eta_esc_mean = f.drive_J > 0 ? f.motor_in_J / f.drive_J : 0.0;
  if (!std::isfinite(out.v_min_cell_V)) out.v_min_cell_V = f.pm.ocv_pack(f.m.pack.soc0) / f.S;
}

/// The landing state: SoC, stored energy, rest and loaded cell voltage, temperature.
void landing_state(Flight& f) {
  Landing& l = f.out.landing;
  const double soc = f.x[battery::kSoc];
  l.soc = soc;
  l.energy_Wh = stored_energy_Wh(f.m.pack, std::max(0.0, soc));
  l.v_rest_cell_V = f.pm.ocv_cell_V(soc);
  l.temperature_C = f.x[battery::kTemp];
  l.v_load_cell_V = f.v_takeoff_V ? f.out.v_load_end_cell_V : f.pm.ocv_cell_V(soc);
}

}  // namespace

namespace {

/// From the last phase flown to the result: the unflown phases, the trace's end, the
/// excursions, the totals, the landing, the reserve time and the rules.
void finish_flight(Flight& f) {
  MissionResult& out = f.out;
  keep_unflown_phases(f);
  end_trace(f);
  note_excursions(f);
  f.spell.close_at(f.t);
  // Events were pushed in order of phases; keep each phase's in time order.
  std::stable_sort(out.events.begin(), out.events.end(),
                   [](const MissionEvent& a, const MissionEvent& b) { return a.t_s < b.t_s; });
  flight_totals(f);
  landing_state(f);
  reserve_time(f);
  // Rules at landing (reserves) and in flight (limits).
  reserve_rules(f);
  flight_limits(f);
  out.go = std::all_of(out.rules.begin(), out.rules.end(), [](const RuleCheck& r) { return r.pass; });
}

bool speeds_given(const Mission& m) {
  return std::all_of(m.phases.begin(), m.phases.end(),
                     [](const Phase& p) { return p.airspeed_choice == Phase::Speed::given; });
}

}  // namespace

namespace steps {

MissionResult simulate_keeping(const Mission& m, const SimOptions& opts, std::size_t phase,
                               std::optional<FlightAt>& keep) {
  if (!speeds_given(m)) return simulate_keeping(with_resolved_airspeeds(m), opts, phase, keep);
  MissionResult out;
  const battery::Pack pack = pack_in_field_air(m);
  const battery::PackModel pm(pack);
  RangeWatch watch(pack);
  Flight f(m, opts, pm, watch, out);
  start_flight(f);
  for (std::size_t i = 0; i < m.phases.size() && !f.stopped; ++i) {
    if (i == phase) keep = FlightAt{phase, pm, watch, out, f};
    fly_phase(f, i);
  }
  finish_flight(f);
  return out;
}

MissionResult simulate_from(const Mission& m, const SimOptions& opts, const FlightAt& from) {
  if (!speeds_given(m)) return simulate_from(with_resolved_airspeeds(m), opts, from);
  MissionResult out = from.out;
  RangeWatch watch = from.watch;
  Flight f(m, opts, from.pm, watch, out);
  static_cast<FlightState&>(f) = from.state;
  for (std::size_t i = from.phase; i < m.phases.size() && !f.stopped; ++i) fly_phase(f, i);
  finish_flight(f);
  return out;
}

}  // namespace steps

MissionResult simulate(const Mission& m, const SimOptions& opts) {
  std::optional<FlightAt> none;
  return simulate_keeping(m, opts, m.phases.size(), none);
}

}  // namespace sortie::sim
