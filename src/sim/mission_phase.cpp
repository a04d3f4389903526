// Flying one phase of a mission: its stretches (solve the airframe and drive, then the battery
// segment), the events they raise, how the flight stops, and the phase's summary.
#include <algorithm>
#include <cmath>

#include "core/text.hpp"
#include "flight/atmosphere.hpp"
#include "flight/fixed_wing.hpp"
#include "flight/thrust_need.hpp"
#include "flight/wind.hpp"
#include "propulsion/operating_point.hpp"
#include "sim/discharge.hpp"
#include "sim/drive_solve.hpp"
#include "sim/mission_steps.hpp"

namespace sortie::sim::steps {

using flight::Phase;
namespace prop = propulsion;

namespace {

double vertical_rate(const Phase& p) {
  if (p.kind == Phase::Kind::climb) return p.rate_mps;
  if (p.kind == Phase::Kind::descend) return -p.rate_mps;
  return 0.0;
}

/// One phase in flight: its summary so far and what its stretches share.
struct PhaseRun {
  std::size_t i = 0;
  int pi = 0;  ///< i as the results number it
  const Phase* p = nullptr;
  PhaseSummary ps;
  battery::State x0{};
  double duty_integral = 0.0;
  double motor_in_J = 0.0;  ///< Σ N·V_m·I_m·dt, for the phase's ESC efficiency
  std::vector<std::string> warnings;
  bool warned_over_current = false;
  std::size_t steps = 0;  ///< over every stretch of the phase, against max_steps_per_phase
  std::string context;
};

}  // namespace

/// `coverage_floor` < 0: no stop at the covered SoC floor.
std::vector<EventSpec> make_events(const Mission& m, const SegmentSetup& s, double cutoff_cell_V,
                                   double coverage_floor) {
  const double S = m.pack.series;
  const double d_max = m.drive.esc.duty_max;
  const double vm = s.v_motor_V;
  const double i_limit = m.pack.cell.i_cont_max_A * m.pack.parallel;
  const double v_res = m.reserve.v_load_cell_min_V.value_or(-1.0);
  const double soc_res = m.reserve.soc_min.value_or(-1.0);
  return {
      {to_string(EndKind::cutoff_voltage), [=](const Sample& x) { return x.term.v_terminal_V / S - cutoff_cell_V; }, true},
      // Saturation: the motor needs V_m but the ESC gives at most d_max·V_bus.
      {to_string(EndKind::saturation), [=](const Sample& x) { return vm > 0 ? d_max * x.term.v_terminal_V - vm : 1.0; }, true},
      {to_string(EndKind::power_collapse), [](const Sample& x) { return x.term.discriminant; }, true},
      {to_string(EndKind::soc_floor), [](const Sample& x) { return x.x[battery::kSoc]; }, true},
      {"reserve_v_load", [=](const Sample& x) { return v_res < 0 ? 1.0 : x.term.v_terminal_V / S - v_res; }, false},
      {"reserve_soc", [=](const Sample& x) { return soc_res < 0 ? 1.0 : x.x[battery::kSoc] - soc_res; }, false},
      {"over_current", [=](const Sample& x) { return i_limit - x.term.current_A; }, false},
      // With a thermal model the cells warm; without one their temperature stays and never crosses.
      {"cell_hot", [](const Sample& x) { return battery::kCellHotC - x.x[battery::kTemp]; }, false},
      {to_string(EndKind::coverage_floor), [=](const Sample& x) { return coverage_floor < 0 ? 1.0 : x.x[battery::kSoc] - coverage_floor; }, true},
      // Back under the continuous limit: closes a spell above it (for the burst rule).
      {"under_current", [=](const Sample& x) { return x.term.current_A - i_limit; }, false},
  };
}

/// Solve the airframe and drive for one stretch; a refusal fills `why` and `field`.
std::optional<SegmentSetup> setup_stretch(const Mission& m, const Phase& p, double h_mid,
                                          double mass, std::string& why, std::string& field,
                                          std::vector<std::string>& warnings) {
  const auto air = m.environment.atmosphere.at(h_mid);
  if (!air) {
    why = "height " + format_fixed(h_mid, 0) + " m above the field is beyond the ISA troposphere (11 km)";
    field = "to_height_m";
    return std::nullopt;
  }
  flight::FlightCondition c;
  c.mass_kg = mass;
  c.density_kg_m3 = air->density_kg_m3;
  c.airspeed_mps = phase_airspeed(m, p);
  c.climb_rate_mps = vertical_rate(p);
  c.rotors = m.drive.rotors;
  c.disk_area_m2 = m.drive.prop.disc_area_m2();
  c.load_factor = flight::turn_load_factor(p, c.airspeed_mps);
  c.drag_device = p.drag_device;
  const auto need = flight::thrust_need(m.airframe, c);
  if (flight::refused(need.status)) {
    why = need.detail;
    field = need.status == flight::FlightStatus::below_stall || need.status == flight::FlightStatus::stall_margin
                ? "airspeed_mps"
                : "rate_mps";
    return std::nullopt;
  }
  if (need.status == flight::FlightStatus::vortex_ring) warnings.push_back("vortex_ring: " + need.detail);
  DriveSolve ds = solve_drive(m, need, air->density_kg_m3);
  if (!ds.ok) {
    why = ds.why;
    field = ds.field;
    return std::nullopt;
  }
  for (auto& w : ds.warnings) warnings.push_back(std::move(w));
  const prop::MotorPoint& mp = ds.motor;
  const auto bl = prop::bus_load(m.drive, mp);
  SegmentSetup s;
  const int N = m.drive.rotors;
  // The battery sees Σ rotors P_bus + avionics (docs/physics.md): P(V) = N·a + avionics + N·b·V.
  s.demand = battery::Demand::power(N * bl.a_W + m.avionics_W, N * bl.b_W_per_V);
  s.v_motor_V = mp.v_motor_V;
  s.thrust_N = need.thrust_per_rotor_N;
  s.drive_thrust_N = ds.drive_thrust_N;
  s.axial_mps = ds.drive_axial_mps;
  s.rho = air->density_kg_m3;
  s.shaft_W = mp.shaft_W;
  s.motor_in_W = mp.v_motor_V * mp.i_motor_A;
  s.i_motor_A = mp.i_motor_A;
  return s;
}

/// Split a phase into stretches of at most `max_dh` of height, each flown at its middle height.
std::vector<Stretch> stretches(double duration, double h0, double h1, double max_dh) {
  const int n = std::max(1, static_cast<int>(std::ceil(std::fabs(h1 - h0) / max_dh - 1e-9)));
  std::vector<Stretch> out;
  for (int k = 0; k < n; ++k) {
    Stretch s;
    s.duration_s = duration / n;
    s.h_start_m = h0 + (h1 - h0) * k / n;
    s.h_end_m = h0 + (h1 - h0) * (k + 1) / n;
    s.h_mid_m = 0.5 * (s.h_start_m + s.h_end_m);
    out.push_back(s);
  }
  return out;
}

namespace {

/// The flight ends refused in phase `r`.
void refuse(Flight& f, const PhaseRun& r, const std::string& why, const std::string& field) {
  f.out.refused = true;
  f.out.end_kind = EndKind::refused;
  f.out.end_detail = why;
  f.out.refusal_field = field;
  f.out.end_phase = r.pi;
  f.stopped = true;
}

PhaseRun open_phase(const Flight& f, std::size_t i) {
  PhaseRun r;
  r.i = i;
  r.pi = static_cast<int>(i);
  r.p = &f.m.phases[i];
  r.ps.kind = r.p->kind;
  r.ps.label = r.p->label;
  r.ps.start_s = f.t;
  r.ps.height_start_m = f.heights[i];
  r.ps.height_end_m = f.heights[i + 1];
  r.ps.airspeed_mps = phase_airspeed(f.m, *r.p);
  r.ps.v_min_cell_V = kInf;
  return r;
}

/// The phase's plan: its length, ground speed and heading, the state it starts from.
void plan_phase(Flight& f, PhaseRun& r, double planned) {
  const Phase& p = *r.p;
  r.ps.planned_s = planned;
  f.planned_total += planned;
  if (p.kind == Phase::Kind::cruise) {
    const auto leg = flight::solve_leg(f.m.environment.wind, p.track_deg, p.airspeed_mps);
    r.ps.ground_speed_mps = leg.ground_speed_mps;
    r.ps.heading_deg = leg.heading_deg;
  }
  r.x0 = f.x;
  r.context = "phase " + std::to_string(r.i + 1) + " " + flight::to_string(p.kind) +
              (p.label.empty() ? "" : " (" + p.label + ")");
}

/// The phase's density, thrust and shaft power: those of its middle stretch.
void keep_phase_condition(const Flight& f, PhaseRun& r, const Stretch& st, const SegmentSetup& s) {
  if (r.ps.density_kg_m3 == 0.0 || std::fabs(st.h_mid_m - 0.5 * (f.heights[r.i] + f.heights[r.i + 1])) < 1e-9 ||
      r.ps.thrust_per_rotor_N == 0.0) {
    r.ps.density_kg_m3 = s.rho;
    r.ps.thrust_per_rotor_N = s.thrust_N;
    r.ps.shaft_W = s.shaft_W;
  }
}

/// The state at the start of a stretch: the range watch's start, the take-off voltage, and a
/// phase boundary's jump in current, which can open or close a spell.
void start_stretch(Flight& f, const PhaseRun& r, const SegmentSetup& s) {
  const battery::Terminal term0 = battery::Thevenin{f.pm, s.demand}.terminal(f.x, f.t);
  if (r.i == 0 && r.steps == 0) f.watch.start(Sample{f.t, f.x, term0}, 0);
  if (!f.v_takeoff_V) f.v_takeoff_V = term0.v_terminal_V;
  if (term0.current_A > f.i_cont_pack) f.spell.open_at(f.t, r.pi);
  else f.spell.close_at(f.t);
}

SegmentOptions stretch_options(const Flight& f, const PhaseRun& r, double t_end) {
  SegmentOptions so;
  so.t_end = t_end;
  so.sample_s = f.opts.sample_s;
  so.next_sample_t = f.next_sample;
  so.max_steps = f.opts.max_steps_per_phase;
  so.steps_done = r.steps;
  so.max_samples = f.opts.max_trace_samples;
  so.samples_done = f.out.trace.size();
  so.context = r.context;
  so.method = f.opts.method;
  so.abs_tol = f.opts.tol;
  so.rel_tol = f.opts.tol;
  return so;
}

/// The phase's and the flight's worst values at one sample.
void track(Flight& f, PhaseRun& r, double vm, bool hover, const Sample& s) {
  PhaseSummary& ps = r.ps;
  ps.v_min_cell_V = std::min(ps.v_min_cell_V, s.term.v_terminal_V / f.S);
  ps.i_max_A = std::max(ps.i_max_A, s.term.current_A);
  if (vm > 0) ps.duty_max = std::max(ps.duty_max, vm / s.term.v_terminal_V);
  f.cell_i.see(s.term.current_A / f.m.pack.parallel, s.t, r.pi);
  f.v_sag.see(-s.term.v_terminal_V / f.S, s.t, r.pi);
  if (hover && vm > 0) f.hover_duty.see(vm / s.term.v_terminal_V, s.t, r.pi);
}

/// Run the battery segment of one stretch, watching every step.
SegmentResult run_stretch(Flight& f, PhaseRun& r, const SegmentSetup& s, const std::vector<EventSpec>& events,
                          const SegmentOptions& so) {
  const double vm = s.v_motor_V;
  const bool hover = f.multirotor && r.p->kind == Phase::Kind::hover;
  const StepHook hook = [&](const Sample& a, const Sample& b, const std::function<Sample(double)>& at) {
    const double ta = a.t, tb = b.t;
    const Sample mid = at(0.5 * (ta + tb));
    track(f, r, vm, hover, a);
    track(f, r, vm, hover, mid);
    track(f, r, vm, hover, b);
    f.watch.step(a, mid, b, at, r.pi);
    // ∫ d dt by Simpson's rule on the dense output, d = V_m/V.
    if (vm > 0)
      r.duty_integral += (tb - ta) / 6.0 *
                         (vm / a.term.v_terminal_V + 4 * vm / mid.term.v_terminal_V + vm / b.term.v_terminal_V);
  };
  SegmentResult seg = run_segment(f.pm, s.demand, f.t, f.x, events, so, hook);
  r.steps += seg.steps;
  f.next_sample = seg.next_sample_t;
  track(f, r, vm, hover, seg.end);
  return seg;
}

/// The stretch's energy flows and its trace samples, each at its height along the stretch.
void account_stretch(Flight& f, PhaseRun& r, const Stretch& st, const SegmentSetup& s, const SegmentResult& seg,
                     double t_end) {
  const int N = f.m.drive.rotors;
  const double dt = seg.end.t - f.t;
  f.shaft_J += N * s.shaft_W * dt;
  f.motor_in_J += N * s.motor_in_W * dt;
  r.motor_in_J += N * s.motor_in_W * dt;
  f.drive_J += (seg.end.x[battery::kEnergy] - f.x[battery::kEnergy]) - f.m.avionics_W * dt;
  const double vm = s.v_motor_V;
  for (const auto& smp : seg.samples) {
    const double frac = st.duration_s > 0 ? (smp.t - (t_end - st.duration_s)) / st.duration_s : 0.0;
    f.out.trace.push_back({smp, r.pi, vm > 0 ? vm / smp.term.v_terminal_V : 0.0, s.thrust_N,
                           st.h_start_m + frac * (st.h_end_m - st.h_start_m)});
  }
  f.last_demand = s.demand;
  f.last_vm = vm;
  f.last_h = st.duration_s > 0 ? st.h_start_m + (st.h_end_m - st.h_start_m) * dt / st.duration_s : st.h_end_m;
}

/// The segment's warnings: spells above the continuous current, and the first crossing of each
/// reserve, of the continuous current (per phase) and of the hot-cell temperature as events.
void note_warnings(Flight& f, PhaseRun& r, const SegmentResult& seg) {
  const Mission& m = f.m;
  auto& events = f.out.events;
  for (const auto& w : seg.warnings) {
    const int pi = r.pi;
    if (w.event == kOverCurrent) f.spell.open_at(w.at.t, pi);
    if (w.event == kUnderCurrent) f.spell.close_at(w.at.t);
    if (w.event == kResVLoad && !f.reserve_v_seen) {
      f.reserve_v_seen = true;
      events.push_back({w.at.t, "reserve_v_load", pi,
                        "loaded cell voltage fell below the reserve " + format_fixed(*m.reserve.v_load_cell_min_V, 2) +
                            " V"});
    } else if (w.event == kResSoc && !f.reserve_soc_seen) {
      f.reserve_soc_seen = true;
      events.push_back({w.at.t, "reserve_soc", pi,
                        "state of charge fell below the reserve " + format_fixed(*m.reserve.soc_min * 100, 0) + " %"});
    } else if (w.event == kOverCurrent && !r.warned_over_current) {
      r.warned_over_current = true;
      events.push_back({w.at.t, "over_current", pi,
                        "cell current " + format_fixed(w.at.term.current_A / m.pack.parallel, 1) +
                            " A above the continuous limit " + format_fixed(m.pack.cell.i_cont_max_A, 1) + " A"});
    } else if (w.event == kCellHot && !f.warned_hot) {
      f.warned_hot = true;
      events.push_back({w.at.t, "cell_hot", pi,
                        "cell temperature reached " + format_fixed(battery::kCellHotC, 0) +
                            " °C, the usual discharge limit of lithium cells (check the maker's)"});
    }
  }
}

/// The flight's state at the end of a stretch.
void advance(Flight& f, const SegmentResult& seg) {
  f.t = seg.end.t;
  f.x = seg.end.x;
  f.out.v_load_end_cell_V = seg.end.term.v_terminal_V / f.S;
  f.out.temperature_max_C = std::max(f.out.temperature_max_C, f.x[battery::kTemp]);
  for (const Sample& sm : seg.samples) f.out.temperature_max_C = std::max(f.out.temperature_max_C, sm.x[battery::kTemp]);
}

/// Why a segment stopped, in words, for the event `stopped` (after the collapse correction).
std::string stop_detail(const Flight& f, const SegmentSetup& s, const SegmentResult& seg, std::size_t stopped) {
  const double v = seg.end.term.v_terminal_V;
  if (stopped == kCutoff) return "loaded cell voltage reached the cutoff " + format_fixed(f.cutoff, 2) + " V";
  if (stopped == kSaturation) {
    const double avail = prop::thrust_available(f.m.drive, s.axial_mps, s.rho, v);
    // The drive is solved at its static-equivalent thrust (sim/drive_solve), so the
    // shortfall is in those terms too.
    const double need = s.drive_thrust_N;
    // The event sits where d_max·V_bus = V_m, so the shortfall there is tiny: show it with
    // two significant digits, and say that it grows from here as the pack sags.
    const double short_N = need - avail;
    return "the drive reaches full duty at " + format_fixed(v, 2) + " V bus and cannot give the " +
           format_fixed(need, 2) + " N per rotor the phase needs below that voltage (at " + format_fixed(v, 2) +
           " V it gives " + format_significant(avail, 6) + " N, short by " + format_significant(short_N, 2) + " N, " +
           format_significant(100 * short_N / need, 2) + " %, growing as the pack sags)";
  }
  if (stopped == kCollapse) {
    // At most E²/(4·R0) at the terminals, E = S·OCV − v1 − v2 (sim/discharge.hpp max_power_W).
    const double emf = seg.end.term.v_ocv_V - seg.end.x[battery::kV1] - seg.end.x[battery::kV2];
    const double p_max = max_power_W(emf, f.pm.r0_pack(seg.end.x[battery::kSoc], seg.end.x[battery::kTemp]));
    return "power collapse: the pack cannot deliver this power: " + format_fixed(s.demand.a + s.demand.b * v, 0) +
           " W asked, at most " + format_fixed(p_max, 0) + " W at this state (E²/(4·R0))";
  }
  if (stopped == kCoverage)
    return "state of charge reached " + format_fixed(f.out.soc_floor_covered * 100, 1) +
           " %, the lowest the cell model has data for (stop at coverage)";
  return "the pack is empty (state of charge 0)";
}

/// The flight ends where the segment stopped.
void stop_flight(Flight& f, const PhaseRun& r, const SegmentSetup& s, const std::vector<EventSpec>& events,
                 SegmentResult& seg) {
  f.stopped = true;
  f.out.end_phase = r.pi;
  // A demand the pack cannot meet from the start of a stretch leaves the loaded voltage at
  // the vertex of the power curve, below the cutoff as well: the collapse is the reason.
  if (*seg.stopped == kCutoff && seg.end.term.collapsed) seg.stopped = kCollapse;
  f.out.end_kind = end_kind_named(events[*seg.stopped].kind);
  f.out.end_detail = stop_detail(f, s, seg, *seg.stopped);
  f.out.events.push_back({f.t, events[*seg.stopped].kind, r.pi, f.out.end_detail});
}

/// Fly one stretch; false when the flight stops in it.
bool fly_stretch(Flight& f, PhaseRun& r, const Stretch& st) {
  std::string why, field;
  const auto setup = setup_stretch(f.m, *r.p, st.h_mid_m, f.out.all_up_mass_kg, why, field, r.warnings);
  if (!setup) {
    refuse(f, r, why, field);
    return false;
  }
  keep_phase_condition(f, r, st, *setup);
  const auto events = make_events(f.m, *setup, f.cutoff, f.stop_floor);
  f.motor_i.see(setup->i_motor_A, f.t, r.pi);
  start_stretch(f, r, *setup);
  const double t_end = f.t + st.duration_s;
  SegmentResult seg = run_stretch(f, r, *setup, events, stretch_options(f, r, t_end));
  account_stretch(f, r, st, *setup, seg, t_end);
  note_warnings(f, r, seg);
  advance(f, seg);
  if (!seg.stopped) return true;
  stop_flight(f, r, *setup, events, seg);
  return false;
}

/// The setup's warnings (vortex ring, drive notes) as events, once per kind and phase.
void note_phase_warnings(Flight& f, const PhaseRun& r) {
  for (const auto& w : r.warnings) {
    const auto colon = w.find(": ");
    const std::string kind = w.substr(0, colon);
    bool seen = false;
    for (const auto& e : f.out.events) seen = seen || (e.kind == kind && e.phase == r.pi);
    if (!seen) f.out.events.push_back({r.ps.start_s, kind, r.pi, w.substr(colon + 2)});
  }
}

/// The phase's summary (energy, charge, duty, efficiencies, distance) and the flight's worst values.
void close_phase(Flight& f, PhaseRun& r) {
  const Mission& m = f.m;
  PhaseSummary& ps = r.ps;
  ps.duration_s = f.t - ps.start_s;
  ps.flown = !f.stopped;
  ps.energy_Wh = (f.x[battery::kEnergy] - r.x0[battery::kEnergy]) / 3600.0;
  ps.charge_Ah = (f.x[battery::kCharge] - r.x0[battery::kCharge]) / 3600.0;
  ps.c_rate_max = ps.i_max_A / f.rated_Ah;
  ps.duty_mean = ps.duration_s > 0 ? r.duty_integral / ps.duration_s : ps.duty_max;
  const double phase_drive_J = ps.energy_Wh * 3600.0 - m.avionics_W * ps.duration_s;
  ps.eta_mean = phase_drive_J > 0 ? m.drive.rotors * ps.shaft_W * ps.duration_s / phase_drive_J : 0.0;
  ps.eta_esc_mean = phase_drive_J > 0 ? r.motor_in_J / phase_drive_J : 0.0;
  ps.distance_m = r.p->kind == Phase::Kind::cruise ? ps.ground_speed_mps * ps.duration_s : 0.0;
  if (!std::isfinite(ps.v_min_cell_V)) ps.v_min_cell_V = 0.0;
  if (ps.duration_s > 0 || ps.flown) {
    f.out.v_min_cell_V = std::min(f.out.v_min_cell_V, ps.v_min_cell_V);
    f.out.i_max_A = std::max(f.out.i_max_A, ps.i_max_A);
  }
  f.duty_integral += r.duty_integral;
  f.out.phases.push_back(ps);
}

}  // namespace

void fly_phase(Flight& f, std::size_t i) {
  PhaseRun r = open_phase(f, i);
  const auto planned = planned_duration_s(f.m, i);
  if (!planned) {
    const auto leg = flight::solve_leg(f.m.environment.wind, r.p->track_deg, r.p->airspeed_mps);
    refuse(f, r, leg.detail, "airspeed_mps");
    f.out.phases.push_back(r.ps);
    return;
  }
  plan_phase(f, r, *planned);
  for (const Stretch& st : stretches(*planned, f.heights[i], f.heights[i + 1], f.opts.max_height_step_m))
    if (!fly_stretch(f, r, st)) break;
  note_phase_warnings(f, r);
  close_phase(f, r);
}

}  // namespace sortie::sim::steps
