#include "sim/mission.hpp"
#include "core/text.hpp"

#include <algorithm>
#include <cmath>
#include <limits>
#include <tuple>
#include <cstdio>

#include "core/error.hpp"
#include "core/roots.hpp"
#include "flight/atmosphere.hpp"
#include "flight/fixed_wing.hpp"
#include "flight/thrust_need.hpp"
#include "flight/wind.hpp"
#include "propulsion/operating_point.hpp"
#include "sim/best_speeds.hpp"
#include "sim/drive_solve.hpp"
#include "sim/discharge.hpp"

namespace sortie::sim {

using flight::Phase;
namespace prop = propulsion;

namespace {

constexpr double kInf = std::numeric_limits<double>::infinity();


/// `v` with `sig` significant digits in fixed notation ("0" for zero).
std::string format_significant(double v, int sig) {
  if (v == 0.0 || !std::isfinite(v)) return format_fixed(v, 0);
  const int mag = static_cast<int>(std::floor(std::log10(std::fabs(v))));
  return format_fixed(v, std::clamp(sig - 1 - mag, 0, 12));
}

bool is_multirotor(const flight::Airframe& a) { return std::holds_alternative<flight::Multirotor>(a); }

/// Height above the field at the start of each phase, and at the end of the last.
std::vector<double> start_heights(const std::vector<Phase>& phases) {
  std::vector<double> h{0.0};
  for (const auto& p : phases) {
    const bool vertical = p.kind == Phase::Kind::climb || p.kind == Phase::Kind::descend;
    h.push_back(vertical ? p.to_height_m : h.back());
  }
  return h;
}

/// The steady condition flown through one stretch of a phase.
struct Stretch {
  double duration_s = 0.0;
  double h_mid_m = 0.0;
  double h_start_m = 0.0, h_end_m = 0.0;
};

/// Airspeed flown in a phase: a multirotor holding position (hover, vertical climb or descent)
/// flies at the wind speed; everything else at the phase's true airspeed.
double phase_airspeed(const Mission& m, const Phase& p) {
  const bool holds_position = p.kind == Phase::Kind::hover ||
                              ((p.kind == Phase::Kind::climb || p.kind == Phase::Kind::descend) &&
                               p.airspeed_mps <= 0.0);
  if (is_multirotor(m.airframe) && holds_position) return m.environment.wind.speed_mps;
  return p.airspeed_mps;
}

double vertical_rate(const Phase& p) {
  if (p.kind == Phase::Kind::climb) return p.rate_mps;
  if (p.kind == Phase::Kind::descend) return -p.rate_mps;
  return 0.0;
}

/// Loiter speed used for the fixed-wing reserve: the minimum-power speed, kept 20 % above stall.
double reserve_loiter_speed(const flight::FixedWing& w, double mass, double rho) {
  const auto s = flight::wing_speeds(w, mass, rho);
  return std::max(s.min_power_mps, 1.2 * s.stall_mps);
}

/// Event indices of one segment's event list.
enum : std::size_t { kCutoff, kSaturation, kCollapse, kEmpty, kResVLoad, kResSoc, kOverCurrent, kCellHot, kCoverage, kUnderCurrent };

struct SegmentSetup {
  battery::Demand demand;
  double v_motor_V = 0.0;
  double thrust_N = 0.0;        ///< per rotor, as the airframe needs it
  double drive_thrust_N = 0.0;  ///< per rotor, as the drive was solved (sim/drive_solve.hpp)
  double axial_mps = 0.0;       ///< the drive's axial speed
  double rho = 1.225;
  double shaft_W = 0.0;       ///< per rotor
  double motor_in_W = 0.0;    ///< per rotor, V_m·I_m
  double i_motor_A = 0.0;     ///< per rotor: the motor's and the ESC's output current
};

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
      {"cutoff_voltage", [=](const Sample& x) { return x.term.v_terminal_V / S - cutoff_cell_V; }, true},
      // Saturation: the motor needs V_m but the ESC gives at most d_max·V_bus.
      {"saturation", [=](const Sample& x) { return vm > 0 ? d_max * x.term.v_terminal_V - vm : 1.0; }, true},
      {"power_collapse", [](const Sample& x) { return x.term.discriminant; }, true},
      {"soc_floor", [](const Sample& x) { return x.x[battery::kSoc]; }, true},
      {"reserve_v_load", [=](const Sample& x) { return v_res < 0 ? 1.0 : x.term.v_terminal_V / S - v_res; }, false},
      {"reserve_soc", [=](const Sample& x) { return soc_res < 0 ? 1.0 : x.x[battery::kSoc] - soc_res; }, false},
      {"over_current", [=](const Sample& x) { return i_limit - x.term.current_A; }, false},
      // With a thermal model the cells warm; without one their temperature stays and never crosses.
      {"cell_hot", [](const Sample& x) { return battery::kCellHotC - x.x[battery::kTemp]; }, false},
      {"coverage_floor", [=](const Sample& x) { return coverage_floor < 0 ? 1.0 : x.x[battery::kSoc] - coverage_floor; }, true},
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
  // The battery sees Σ rotors P_bus + avionics (DESIGN.md): P(V) = N·a + avionics + N·b·V.
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

}  // namespace

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
  const auto h = start_heights(m.phases);
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

MissionResult simulate(const Mission& m, const SimOptions& opts) {
  for (const Phase& p : m.phases)
    if (p.airspeed_choice != Phase::Speed::given) return simulate(with_resolved_airspeeds(m), opts);
  MissionResult out;
  // The cells give their heat to the air at the field (a pack file may name its own air).
  battery::Pack pack = m.pack;
  if (!pack.air_C)
    if (const auto air = m.environment.atmosphere.at(0.0)) pack.air_C = air->temperature_K - 273.15;
  const battery::PackModel pm(pack);
  out.thermal = pm.thermal;
  out.temperature_start_C = pm.t0_C;
  out.temperature_max_C = pm.t0_C;
  out.air_C = pm.air_C;
  const double S = m.pack.series;
  const double rated_Ah = m.pack.cell.capacity_Ah * m.pack.parallel;
  const double cutoff = m.pack.cell.v_cutoff_V;
  out.soc_floor_covered = m.pack.cell.soc_floor_covered();
  out.accept_extrapolation = opts.accept_extrapolation;
  const double stop_floor = opts.stop_at_coverage && out.soc_floor_covered > 0 ? out.soc_floor_covered : -1.0;
  RangeWatch watch(pack);
  out.pack_mass_kg = m.pack.mass_kg();
  out.all_up_mass_kg = flight::all_up_mass_kg(m.airframe, out.pack_mass_kg);
  const auto heights = start_heights(m.phases);
  if (const auto* w = std::get_if<flight::FixedWing>(&m.airframe))
    if (const auto air = m.environment.atmosphere.at(0.0))
      out.wing_speeds = flight::wing_speeds(*w, out.all_up_mass_kg, air->density_kg_m3);

  battery::State x = pm.initial_state(m.pack.soc0);
  double t = 0.0;
  double next_sample = 0.0;
  bool stopped = false;
  bool reserve_v_seen = false, reserve_soc_seen = false, warned_hot = false;
  double duty_integral = 0.0;
  double planned_total = 0.0;
  out.v_min_cell_V = kInf;
  double shaft_J = 0.0, motor_in_J = 0.0, drive_J = 0.0;
  battery::Demand last_demand;  // for the trace's exact end point
  double last_vm = 0.0, last_h = 0.0;
  // Limits in flight, each the worst value over the flight and where it was reached.
  struct Peak {
    double v = -kInf, t = 0.0;
    int phase = -1;
    void see(double x, double at, int ph) {
      if (x > v) v = x, t = at, phase = ph;
    }
  };
  Peak cell_i, motor_i, hover_duty, v_sag;  // v_sag: minus the loaded cell voltage
  const bool multirotor = is_multirotor(m.airframe);
  const double i_cont_pack = m.pack.cell.i_cont_max_A * m.pack.parallel;
  // Spells above the continuous cell current, for the burst rule: the longest and where it began.
  bool spell_open = false;
  double spell_t0 = 0.0;
  int spell_phase = -1;
  Peak spell;
  auto open_spell = [&](double at, int ph) {
    if (!spell_open) spell_open = true, spell_t0 = at, spell_phase = ph;
  };
  auto close_spell = [&](double at) {
    if (spell_open) spell.see(at - spell_t0, spell_t0, spell_phase);
    spell_open = false;
  };
  std::optional<double> v_takeoff_V;  // loaded bus voltage at take-off

  for (std::size_t i = 0; i < m.phases.size() && !stopped; ++i) {
    const Phase& p = m.phases[i];
    PhaseSummary ps;
    ps.kind = p.kind;
    ps.label = p.label;
    ps.start_s = t;
    ps.height_start_m = heights[i];
    ps.height_end_m = heights[i + 1];
    ps.airspeed_mps = phase_airspeed(m, p);
    ps.v_min_cell_V = kInf;
    const auto planned = planned_duration_s(m, i);
    if (!planned) {
      const auto leg = flight::solve_leg(m.environment.wind, p.track_deg, p.airspeed_mps);
      out.refused = true;
      out.end_kind = "refused";
      out.end_detail = leg.detail;
      out.refusal_field = "airspeed_mps";
      out.end_phase = static_cast<int>(i);
      out.phases.push_back(ps);
      stopped = true;
      break;
    }
    ps.planned_s = *planned;
    planned_total += *planned;
    if (p.kind == Phase::Kind::cruise) {
      const auto leg = flight::solve_leg(m.environment.wind, p.track_deg, p.airspeed_mps);
      ps.ground_speed_mps = leg.ground_speed_mps;
      ps.heading_deg = leg.heading_deg;
    }
    const battery::State x_phase0 = x;
    double phase_duty_integral = 0.0;
    double phase_motor_in_J = 0.0;  // Σ N·V_m·I_m·dt, for the phase's ESC efficiency
    std::vector<std::string> phase_warnings;
    bool warned_over_current = false;
    const double cell_i_limit = m.pack.cell.i_cont_max_A * m.pack.parallel;
    std::size_t phase_steps = 0;  // over every stretch of the phase, against max_steps_per_phase
    const std::string phase_context = "phase " + std::to_string(i + 1) + " " + flight::to_string(p.kind) +
                                      (p.label.empty() ? "" : " (" + p.label + ")");

    for (const Stretch& st : stretches(*planned, heights[i], heights[i + 1], opts.max_height_step_m)) {
      std::string why, field;
      const auto setup = setup_stretch(m, p, st.h_mid_m, out.all_up_mass_kg, why, field, phase_warnings);
      if (!setup) {
        out.refused = true;
        out.end_kind = "refused";
        out.end_detail = why;
        out.refusal_field = field;
        out.end_phase = static_cast<int>(i);
        stopped = true;
        break;
      }
      if (ps.density_kg_m3 == 0.0 || std::fabs(st.h_mid_m - 0.5 * (heights[i] + heights[i + 1])) < 1e-9 ||
          ps.thrust_per_rotor_N == 0.0) {
        ps.density_kg_m3 = setup->rho;
        ps.thrust_per_rotor_N = setup->thrust_N;
        ps.shaft_W = setup->shaft_W;
      }
      const auto events = make_events(m, *setup, cutoff, stop_floor);
      motor_i.see(setup->i_motor_A, t, static_cast<int>(i));
      const battery::Terminal term0 = battery::Thevenin{pm, setup->demand}.terminal(x, t);
      if (i == 0 && phase_steps == 0) watch.start(Sample{t, x, term0}, 0);
      if (!v_takeoff_V) v_takeoff_V = term0.v_terminal_V;
      // A phase boundary is a jump in current: it can open or close a spell.
      if (term0.current_A > i_cont_pack) open_spell(t, static_cast<int>(i));
      else close_spell(t);
      SegmentOptions so;
      so.t_end = t + st.duration_s;
      so.sample_s = opts.sample_s;
      so.next_sample_t = next_sample;
      so.max_steps = opts.max_steps_per_phase;
      so.steps_done = phase_steps;
      so.max_samples = opts.max_trace_samples;
      so.samples_done = out.trace.size();
      so.context = phase_context;
      so.method = opts.method;
      so.abs_tol = opts.tol;
      so.rel_tol = opts.tol;
      const double vm = setup->v_motor_V;
      const bool hover = multirotor && p.kind == Phase::Kind::hover;
      auto track = [&](const Sample& s) {
        ps.v_min_cell_V = std::min(ps.v_min_cell_V, s.term.v_terminal_V / S);
        ps.i_max_A = std::max(ps.i_max_A, s.term.current_A);
        if (vm > 0) ps.duty_max = std::max(ps.duty_max, vm / s.term.v_terminal_V);
        cell_i.see(s.term.current_A / m.pack.parallel, s.t, static_cast<int>(i));
        v_sag.see(-s.term.v_terminal_V / S, s.t, static_cast<int>(i));
        if (hover && vm > 0) hover_duty.see(vm / s.term.v_terminal_V, s.t, static_cast<int>(i));
      };
      const StepHook hook = [&](double ta, double tb, const std::function<Sample(double)>& at) {
        const Sample a = at(ta), mid = at(0.5 * (ta + tb)), b = at(tb);
        track(a);
        track(mid);
        track(b);
        watch.step(a, mid, b, at, static_cast<int>(i));
        // ∫ d dt by Simpson's rule on the dense output, d = V_m/V.
        if (vm > 0)
          phase_duty_integral += (tb - ta) / 6.0 *
                                 (vm / a.term.v_terminal_V + 4 * vm / mid.term.v_terminal_V + vm / b.term.v_terminal_V);
      };
      SegmentResult seg = run_segment(pm, setup->demand, t, x, events, so, hook);
      phase_steps += seg.steps;
      next_sample = seg.next_sample_t;
      track(seg.end);
      const double dt = seg.end.t - t;
      shaft_J += m.drive.rotors * setup->shaft_W * dt;
      motor_in_J += m.drive.rotors * setup->motor_in_W * dt;
      phase_motor_in_J += m.drive.rotors * setup->motor_in_W * dt;
      drive_J += (seg.end.x[battery::kEnergy] - x[battery::kEnergy]) - m.avionics_W * dt;
      for (const auto& smp : seg.samples) {
        const double frac = st.duration_s > 0 ? (smp.t - (so.t_end - st.duration_s)) / st.duration_s : 0.0;
        out.trace.push_back({smp, static_cast<int>(i), vm > 0 ? vm / smp.term.v_terminal_V : 0.0,
                             setup->thrust_N, st.h_start_m + frac * (st.h_end_m - st.h_start_m)});
      }
      for (const auto& w : seg.warnings) {
        const int pi = static_cast<int>(i);
        if (w.event == kOverCurrent) open_spell(w.at.t, pi);
        if (w.event == kUnderCurrent) close_spell(w.at.t);
        if (w.event == kResVLoad && !reserve_v_seen) {
          reserve_v_seen = true;
          out.events.push_back({w.at.t, "reserve_v_load", pi,
                                "loaded cell voltage fell below the reserve " +
                                    format_fixed(*m.reserve.v_load_cell_min_V, 2) + " V"});
        } else if (w.event == kResSoc && !reserve_soc_seen) {
          reserve_soc_seen = true;
          out.events.push_back({w.at.t, "reserve_soc", pi,
                                "state of charge fell below the reserve " +
                                    format_fixed(*m.reserve.soc_min * 100, 0) + " %"});
        } else if (w.event == kOverCurrent && !warned_over_current) {
          warned_over_current = true;
          out.events.push_back({w.at.t, "over_current", pi,
                                "cell current " + format_fixed(w.at.term.current_A / m.pack.parallel, 1) +
                                    " A above the continuous limit " + format_fixed(m.pack.cell.i_cont_max_A, 1) + " A"});
        } else if (w.event == kCellHot && !warned_hot) {
          warned_hot = true;
          out.events.push_back({w.at.t, "cell_hot", pi,
                                "cell temperature reached " + format_fixed(battery::kCellHotC, 0) +
                                    " °C, the usual discharge limit of lithium cells (check the maker's)"});
        }
      }
      (void)cell_i_limit;
      last_demand = setup->demand;
      last_vm = vm;
      last_h = st.duration_s > 0 ? st.h_start_m + (st.h_end_m - st.h_start_m) * dt / st.duration_s : st.h_end_m;
      t = seg.end.t;
      x = seg.end.x;
      out.v_load_end_cell_V = seg.end.term.v_terminal_V / S;
      out.temperature_max_C = std::max(out.temperature_max_C, x[battery::kTemp]);
      for (const Sample& sm : seg.samples) out.temperature_max_C = std::max(out.temperature_max_C, sm.x[battery::kTemp]);
      if (seg.stopped) {
        stopped = true;
        out.end_phase = static_cast<int>(i);
        // A demand the pack cannot meet from the start of a stretch leaves the loaded voltage at
        // the vertex of the power curve, below the cutoff as well: the collapse is the reason.
        if (*seg.stopped == kCutoff && seg.end.term.collapsed) seg.stopped = kCollapse;
        out.end_kind = events[*seg.stopped].kind;
        const double v = seg.end.term.v_terminal_V;
        if (*seg.stopped == kCutoff) {
          out.end_detail = "loaded cell voltage reached the cutoff " + format_fixed(cutoff, 2) + " V";
        } else if (*seg.stopped == kSaturation) {
          const double avail = prop::thrust_available(m.drive, setup->axial_mps, setup->rho, v);
          // The drive is solved at its static-equivalent thrust (sim/drive_solve), so the
          // shortfall is in those terms too.
          const double need = setup->drive_thrust_N;
          // The event sits where d_max·V_bus = V_m, so the shortfall there is tiny: show it with
          // two significant digits, and say that it grows from here as the pack sags.
          const double short_N = need - avail;
          out.end_detail = "the drive reaches full duty at " + format_fixed(v, 2) + " V bus and cannot give the " +
                           format_fixed(need, 2) + " N per rotor the phase needs below that voltage (at " +
                           format_fixed(v, 2) + " V it gives " + format_significant(avail, 6) + " N, short by " +
                           format_significant(short_N, 2) + " N, " + format_significant(100 * short_N / need, 2) +
                           " %, growing as the pack sags)";
        } else if (*seg.stopped == kCollapse) {
          // At most E²/(4·R0) at the terminals, E = S·OCV − v1 − v2 (sim/discharge.hpp max_power_W).
          const double emf = seg.end.term.v_ocv_V - seg.end.x[battery::kV1] - seg.end.x[battery::kV2];
          const double p_max = max_power_W(emf, pm.r0_pack(seg.end.x[battery::kSoc], seg.end.x[battery::kTemp]));
          out.end_detail = "power collapse: the pack cannot deliver this power: " +
                           format_fixed(setup->demand.a + setup->demand.b * v, 0) + " W asked, at most " +
                           format_fixed(p_max, 0) + " W at this state (E²/(4·R0))";
        } else if (*seg.stopped == kCoverage) {
          out.end_detail = "state of charge reached " + format_fixed(out.soc_floor_covered * 100, 1) +
                           " %, the lowest the cell model has data for (stop at coverage)";
        } else {
          out.end_detail = "the pack is empty (state of charge 0)";
        }
        out.events.push_back({t, out.end_kind, static_cast<int>(i), out.end_detail});
        break;
      }
    }
    for (const auto& w : phase_warnings) {
      const auto colon = w.find(": ");
      const std::string kind = w.substr(0, colon);
      bool seen = false;
      for (const auto& e : out.events) seen = seen || (e.kind == kind && e.phase == static_cast<int>(i));
      if (!seen) out.events.push_back({ps.start_s, kind, static_cast<int>(i), w.substr(colon + 2)});
    }
    ps.duration_s = t - ps.start_s;
    ps.flown = !stopped;
    ps.energy_Wh = (x[battery::kEnergy] - x_phase0[battery::kEnergy]) / 3600.0;
    ps.charge_Ah = (x[battery::kCharge] - x_phase0[battery::kCharge]) / 3600.0;
    ps.c_rate_max = ps.i_max_A / rated_Ah;
    ps.duty_mean = ps.duration_s > 0 ? phase_duty_integral / ps.duration_s : ps.duty_max;
    const double phase_drive_J = ps.energy_Wh * 3600.0 - m.avionics_W * ps.duration_s;
    ps.eta_mean = phase_drive_J > 0 ? m.drive.rotors * ps.shaft_W * ps.duration_s / phase_drive_J : 0.0;
    ps.eta_esc_mean = phase_drive_J > 0 ? phase_motor_in_J / phase_drive_J : 0.0;
    ps.distance_m = p.kind == Phase::Kind::cruise ? ps.ground_speed_mps * ps.duration_s : 0.0;
    if (!std::isfinite(ps.v_min_cell_V)) ps.v_min_cell_V = 0.0;
    if (ps.duration_s > 0 || ps.flown) {
      out.v_min_cell_V = std::min(out.v_min_cell_V, ps.v_min_cell_V);
      out.i_max_A = std::max(out.i_max_A, ps.i_max_A);
    }
    duty_integral += phase_duty_integral;
    // Events were pushed in order of phases; keep each phase's in time order.
    out.phases.push_back(ps);
  }
  // Phases after the end keep their plan so the report can show what was not flown.
  for (std::size_t i = out.phases.size(); i < m.phases.size(); ++i) {
    PhaseSummary ps;
    ps.kind = m.phases[i].kind;
    ps.label = m.phases[i].label;
    ps.start_s = t;
    ps.planned_s = planned_duration_s(m, i).value_or(0.0);
    planned_total += ps.planned_s;
    out.phases.push_back(ps);
  }
  if (opts.sample_s > 0 && !out.trace.empty() && out.trace.back().s.t < t) {
    TracePoint last = out.trace.back();
    last.s = Sample{t, x, battery::Thevenin{pm, last_demand}.terminal(x, t)};
    last.duty = last_vm > 0 ? last_vm / last.s.term.v_terminal_V : 0.0;
    last.height_m = last_h;
    out.trace.push_back(last);
  }
  out.excursions = watch.excursions();
  for (auto it = out.excursions.begin(); it != out.excursions.end();) {
    // Stopped at the covered floor, the flight ends a hair below it (the event's time
    // tolerance): not an excursion.
    if (out.end_kind == "coverage_floor" && t > 0 && it->quantity == "soc" && it->at_end && it->duration_s < 1e-3) {
      it = out.excursions.erase(it);
      continue;
    }
    out.events.push_back({it->first_s, "model_range", it->phase, describe(*it)});
    ++it;
  }
  close_spell(t);
  std::stable_sort(out.events.begin(), out.events.end(),
                   [](const MissionEvent& a, const MissionEvent& b) { return a.t_s < b.t_s; });

  out.completed = !stopped;
  out.flight_time_s = t;
  out.energy_Wh = x[battery::kEnergy] / 3600.0;
  out.charge_Ah = x[battery::kCharge] / 3600.0;
  out.c_rate_max = out.i_max_A / rated_Ah;
  out.duty_mean = t > 0 ? duty_integral / t : 0.0;
  out.eta_mean = drive_J > 0 ? shaft_J / drive_J : 0.0;
  out.eta_esc_mean = drive_J > 0 ? motor_in_J / drive_J : 0.0;
  if (!std::isfinite(out.v_min_cell_V)) out.v_min_cell_V = pm.ocv_pack(m.pack.soc0) / S;

  // Landing state.
  const battery::Thevenin rest{pm, battery::Demand::current(0.0)};
  out.landing.soc = x[battery::kSoc];
  out.landing.energy_Wh = stored_energy_Wh(m.pack, std::max(0.0, x[battery::kSoc]));
  out.landing.v_rest_cell_V = pm.ocv_cell_V(x[battery::kSoc]);
  out.landing.temperature_C = x[battery::kTemp];
  out.landing.v_load_cell_V = v_takeoff_V ? out.v_load_end_cell_V : pm.ocv_cell_V(x[battery::kSoc]);
  (void)rest;

  // Time on station left at landing: hover (multirotor) or loiter at the minimum-power speed
  // (fixed wing) at the field, from the landing state, until the loaded cell voltage reaches
  // the higher of the cutoff and the in-flight reserve voltage.
  if (m.reserve.hover_s && out.completed) {
    Phase hold;
    if (is_multirotor(m.airframe)) {
      hold.kind = Phase::Kind::hover;
    } else {
      hold.kind = Phase::Kind::loiter;
      const auto air = m.environment.atmosphere.at(0.0);
      hold.airspeed_mps = reserve_loiter_speed(std::get<flight::FixedWing>(m.airframe), out.all_up_mass_kg,
                                               air ? air->density_kg_m3 : 1.225);
    }
    std::string why, field;
    std::vector<std::string> ignored;
    const auto setup = setup_stretch(m, hold, 0.0, out.all_up_mass_kg, why, field, ignored);
    if (setup) {
      const double floor_v = std::max(cutoff, m.reserve.v_load_cell_min_V.value_or(0.0));
      // Down to the covered SoC floor only, unless extrapolation is accepted.
      auto ev = make_events(m, *setup, floor_v, opts.accept_extrapolation ? -1.0 : out.soc_floor_covered);
      ev.resize(kCoverage + 1);                                    // no spell watch in the hold
      ev.erase(ev.begin() + kEmpty + 1, ev.begin() + kCoverage);  // terminal events only
      SegmentOptions so;
      // No end time: the hold runs until its loaded voltage floor, saturation, power collapse
      // or an empty pack ends it (one of them always does: the charge only falls), within the
      // phase step cap.
      so.method = opts.method;
      so.abs_tol = opts.tol;
      so.rel_tol = opts.tol;
      so.max_steps = opts.max_steps_per_phase;
      so.context = "reserve time at landing";
      const auto seg = run_segment(pm, setup->demand, t, x, ev, so);
      out.reserve_time_s = seg.end.t - t;
      out.reserve_time_end = seg.stopped ? ev[*seg.stopped].kind : "";
    } else {
      out.reserve_time_end = "refused: " + why;
    }
  }

  // Rules at landing (reserves) and in flight (limits). A landing rule of a flight that ended
  // early is not reached: it fails, and reports say so instead of showing a value.
  auto rule = [&](std::string name, std::string unit, double req, double act) -> RuleCheck& {
    RuleCheck r;
    r.name = std::move(name);
    r.unit = std::move(unit);
    r.required = req;
    r.actual = act;
    r.margin = act - req;
    r.pass = act >= req;
    out.rules.push_back(std::move(r));
    return out.rules.back();
  };
  auto limit = [&](std::string name, std::string unit, double lim, double act, double at, int ph) -> RuleCheck& {
    RuleCheck& r = rule(std::move(name), std::move(unit), lim, act);
    r.is_max = true;
    r.margin = lim - act;
    r.pass = act <= lim;
    r.t_s = at;
    r.phase = ph;
    return r;
  };
  auto at_landing = [&](RuleCheck& r) {
    r.t_s = t;
    r.reached = out.completed;
    if (!out.completed) r.pass = false;
  };
  rule("mission_flown", "s", planned_total, out.flight_time_s);
  out.rules.back().pass = out.completed;
  out.rules.back().t_s = t;
  if (m.reserve.soc_min) at_landing(rule("soc_min", "", *m.reserve.soc_min, out.landing.soc));
  // Below the covered floor the OCV is invented: a landing there fails unless accepted.
  if (out.soc_floor_covered > 0 && !opts.accept_extrapolation)
    at_landing(rule("soc_covered", "", out.soc_floor_covered, out.landing.soc));
  if (m.reserve.hover_s) {
    RuleCheck& r = rule("hover_s", "s", *m.reserve.hover_s, out.reserve_time_s);
    at_landing(r);
    if (out.reserve_time_end.rfind("refused: ", 0) == 0) {
      r.pass = false;
      r.note = "the hold at the field cannot be flown: " + out.reserve_time_end.substr(9);
    }
  }
  if (m.reserve.v_rest_cell_min_V)
    at_landing(rule("v_rest_cell_min_V", "V", *m.reserve.v_rest_cell_min_V, out.landing.v_rest_cell_V));
  if (m.reserve.v_load_cell_min_V) {
    RuleCheck& r = rule("v_load_cell_min_V", "V", *m.reserve.v_load_cell_min_V, out.v_min_cell_V);
    r.t_s = v_sag.t;
    r.phase = v_sag.phase;
  }
  // Cell current: the continuous limit at every instant, or with a burst rating the burst
  // current at every instant and spells above the continuous limit no longer than burst_s.
  if (cell_i.phase >= 0) {
    const auto& burst = m.pack.cell.burst;
    if (!burst) {
      limit("cell_current_cont_A", "A", m.pack.cell.i_cont_max_A, cell_i.v, cell_i.t, cell_i.phase).note =
          "per cell, at every instant; burst rule not checked: the cell gives no i_burst_max_A and burst_s";
    } else {
      limit("cell_current_burst_A", "A", burst->i_max_A, cell_i.v, cell_i.t, cell_i.phase).note =
          "per cell, at every instant";
      const double held = spell.phase >= 0 ? spell.v : 0.0;
      limit("cell_current_cont_s", "s", burst->duration_s, held, spell.phase >= 0 ? spell.t : 0.0, spell.phase).note =
          "longest spell above the continuous " + format_fixed(m.pack.cell.i_cont_max_A, 1) + " A per cell";
    }
  }
  if (motor_i.phase >= 0) {
    limit("motor_current_A", "A", m.drive.motor.i_max_A, motor_i.v, motor_i.t, motor_i.phase).length_dependent = false;
    limit("esc_current_A", "A", m.drive.esc.i_max_A, motor_i.v, motor_i.t, motor_i.phase).length_dependent = false;
  }
  if (const auto mtom = flight::mtom_kg(m.airframe)) {
    RuleCheck& r = limit("mtom_kg", "kg", *mtom, out.all_up_mass_kg, 0.0, 0);
    r.length_dependent = false;
    r.note = "all-up mass at take-off against the airframe's mtom_kg";
  }
  if (multirotor && v_takeoff_V) {
    // Thrust-to-weight: every rotor at full duty, static (no axial flow), in the air at the
    // field, at the loaded bus voltage at take-off: T/W = N·T_max(V) / (m·g0).
    const auto air = m.environment.atmosphere.at(0.0);
    const double rho = air ? air->density_kg_m3 : 1.225;
    const double tmax = m.drive.rotors * prop::thrust_available(m.drive, 0.0, rho, *v_takeoff_V);
    const double tw = tmax / (out.all_up_mass_kg * flight::kStandardGravity);
    RuleCheck& r = rule("thrust_to_weight", "", m.reserve.thrust_to_weight_min.value_or(flight::kDefaultThrustToWeightMin), tw);
    r.t_s = 0.0;
    r.phase = 0;
    r.length_dependent = false;
    r.note = std::string("full-duty static thrust at the loaded take-off voltage ") + format_fixed(*v_takeoff_V, 2) +
             " V over the weight" + (m.reserve.thrust_to_weight_min ? "" : "; 2:1 minimum by default (common practice)");
  }
  if (hover_duty.phase >= 0) {
    limit("hover_duty_max", "", m.reserve.hover_duty_max.value_or(flight::kDefaultHoverDutyMax), hover_duty.v,
          hover_duty.t, hover_duty.phase)
        .note = m.reserve.hover_duty_max ? "highest duty in a hover"
                                         : "highest duty in a hover; 0.80 by default, a fifth left for control (common practice)";
  }
  out.go = std::all_of(out.rules.begin(), out.rules.end(), [](const RuleCheck& r) { return r.pass; });
  return out;
}

std::optional<std::size_t> spare_phase(const Mission& m) {
  for (std::size_t i = 0; i < m.phases.size(); ++i)
    if (m.phases[i].spare) return i;
  for (std::size_t i = m.phases.size(); i-- > 0;)
    if (m.phases[i].kind == Phase::Kind::hover || m.phases[i].kind == Phase::Kind::loiter) return i;
  return std::nullopt;
}

Mission lengthened(const Mission& m, std::size_t i, double delta_s) {
  Mission out = m;
  Phase& p = out.phases.at(i);
  const double base = planned_duration_s(m, i).value_or(0.0);
  p.distance_m.reset();
  p.duration_s = std::max(0.0, base + delta_s);
  return out;
}

/// Continuous across the boundary where a flight stops completing: a completed flight's
/// completion margin is its closeness to the cutoff and to full duty, an incomplete one's is
/// minus the fraction not flown.
std::pair<double, std::string> smallest_margin(const Mission& m, const MissionResult& r) {
  double best = kInf;
  std::string name;
  for (const auto& [v, n] : rule_margins(m, r))
    if (v < best) best = v, name = n;
  return {best, name};
}

std::vector<std::pair<double, std::string>> rule_margins(const Mission& m, const MissionResult& r) {
  std::vector<std::pair<double, std::string>> out;
  auto consider = [&](double v, const std::string& n) { out.emplace_back(v, n); };
  const double planned = r.rules.front().required;
  if (!r.completed) {
    consider(-(planned - r.flight_time_s) / std::max(planned, 1.0), r.end_kind);
    return out;
  }
  const double cutoff = m.pack.cell.v_cutoff_V;
  consider((r.v_min_cell_V - cutoff) / cutoff, "cutoff_voltage");
  double duty_max = 0.0;
  for (const auto& p : r.phases) duty_max = std::max(duty_max, p.duty_max);
  consider((m.drive.esc.duty_max - duty_max) / m.drive.esc.duty_max, "saturation");
  for (const auto& rule : r.rules) {
    if (rule.name == "mission_flown" || !rule.length_dependent) continue;
    const double scale = rule.name == "soc_min" || rule.name == "soc_covered" ? 1.0 : rule.name == "hover_s" ? std::max(rule.required, 60.0)
                                                                               : rule.required;
    consider(rule.margin / scale, rule.name);
  }
  return out;
}

double predicted_root(const std::vector<std::pair<double, std::string>>& a,
                      const std::vector<std::pair<double, std::string>>& b, double xa, double xb) {
  // Each margin nearly linear in x: its zero at xa + v_a·(xb − xa)/(v_a − v_b); the first to
  // reach zero binds.
  double r = kInf;
  for (const auto& [va, na] : a)
    for (const auto& [vb, nb] : b)
      if (na == nb && va >= 0.0 && vb < va) r = std::min(r, xa + va * (xb - xa) / (va - vb));
  return std::isfinite(r) ? r : std::numeric_limits<double>::quiet_NaN();
}

void narrow_bracket(const std::function<double(double)>& f, double& lo, double& hi, double& flo, double& fhi,
                    double guess) {
  if (!(hi > lo) || flo == fhi) return;
  // Linear interpolation of the ends: r = lo + f(lo)·(hi − lo)/(f(lo) − f(hi)).
  const double r = std::isfinite(guess) ? guess : lo + flo * (hi - lo) / (flo - fhi);
  const double d = std::max(0.5, 0.002 * (hi - lo));
  for (double x : {r + d, r - d}) {
    if (!(x > lo && x < hi)) continue;
    const double fx = f(x);
    if ((fx >= 0.0) == (flo >= 0.0)) lo = x, flo = fx;
    else hi = x, fhi = fx;
  }
}

namespace {

/// The longest cruise leg given by distance, if any.
std::optional<std::size_t> longest_leg(const Mission& m) {
  std::optional<std::size_t> best;
  for (std::size_t k = 0; k < m.phases.size(); ++k) {
    const Phase& p = m.phases[k];
    if (p.kind != Phase::Kind::cruise || !p.distance_m) continue;
    if (!best || *p.distance_m > *m.phases[*best].distance_m) best = k;
  }
  return best;
}

/// With the spare phase removed and the mission still failing: how many metres of the longest
/// cruise leg must go as well (TOMS 748 to 0.5 m), or none when even 1 m of it is too much.
template <class Run>
void solve_leg_cut(const Mission& m, std::size_t spare, SpareResult& out, Run& run_mission) {
  const auto leg = longest_leg(m);
  if (!leg) {
    out.note = "the mission fails even without phase " + std::to_string(spare + 1) + ", and it has no cruise leg to shorten";
    return;
  }
  const Mission without = lengthened(m, spare, -planned_duration_s(m, spare).value_or(0.0));
  const double dist = *m.phases[*leg].distance_m;
  auto cut = [&](double c) {
    Mission mm = without;
    mm.phases[*leg].distance_m = std::max(dist - c, 1.0);
    return smallest_margin(mm, run_mission(mm, "the cut of leg " + std::to_string(*leg + 1) + " (last tried " +
                                                   format_number(c) + " m)"))
        .first;
  };
  const double lo = 0.0, hi = dist - 1.0;  // metres cut
  const double flo = smallest_margin(m, run_mission(without, "the mission without its spare phase")).first;
  const double fhi = cut(hi);
  out.cut_leg = leg;
  if (fhi < 0.0) {
    out.note = "the mission fails even without phase " + std::to_string(spare + 1) + " and with phase " +
               std::to_string(*leg + 1) + " cut to 1 m";
    return;
  }
  double a = lo, b = hi, fa = flo, fb = fhi;
  narrow_bracket(cut, a, b, fa, fb);
  const double root = find_root(cut, a, b, fa, fb, 0.5, 100).value_or(b);
  out.cut_leg_m = std::min(root + 0.5, hi);
  out.note = "remove phase " + std::to_string(spare + 1) + " and shorten phase " + std::to_string(*leg + 1) + " by " +
             format_fixed(*out.cut_leg_m, 0) + " m";
}

}  // namespace

SpareResult solve_spare(const Mission& m_in, const MissionResult& base, const SpareOptions& opts) {
  // Keyword airspeeds solved once, not in every simulation of the search.
  const Mission m = with_resolved_airspeeds(m_in);
  SpareResult out;
  out.phase = spare_phase(m);
  for (const auto& r : base.rules)
    if (!r.pass && !r.length_dependent) out.fixed_failures.push_back(r.name);
  if (!out.phase) {
    out.note = "no hover, loiter or phase marked spare to lengthen";
    return out;
  }
  if (base.refused) {
    out.note = "the mission cannot be flown as planned";
    out.bounded = false;
    return out;
  }
  const std::size_t i = *out.phase;
  const double base_len = planned_duration_s(m, i).value_or(0.0);
  SimOptions so = opts.sim;
  so.sample_s = 0.0;
  auto run_mission = [&](const Mission& mm, const std::string& what) {
    if (out.simulations >= opts.max_simulations)
      throw LimitError("spare-time solve stopped after " + std::to_string(opts.max_simulations) +
                       " whole-mission simulations without locating " + what);
    ++out.simulations;
    return simulate(mm, so);
  };
  auto run = [&](double delta) {
    return run_mission(lengthened(m, i, delta), "the spare time of phase " + std::to_string(i + 1) + " (last tried " +
                                                    format_number(delta) + " s)");
  };
  // Each evaluation is kept: the binding rule is read from the nearest failing one.
  std::vector<std::tuple<double, double, std::string>> seen;
  std::vector<std::pair<double, std::vector<std::pair<double, std::string>>>> all;  // every rule's margin
  auto f = [&](double delta) {
    const MissionResult r = run(delta);
    auto [v, name] = smallest_margin(m, r);
    seen.emplace_back(delta, v, name);
    all.emplace_back(delta, rule_margins(m, r));
    return v;
  };
  all.emplace_back(0.0, rule_margins(m, base));
  auto margins_at = [&](double x) {
    for (const auto& [d, v] : all)
      if (d == x) return v;
    return std::vector<std::pair<double, std::string>>{};
  };
  const double f0 = smallest_margin(m, base).first;
  double lo, hi, flo, fhi;
  if (f0 >= 0.0) {
    lo = 0.0;
    flo = f0;
    hi = std::min(std::max(60.0, 0.25 * base_len), opts.max_spare_s);
    fhi = f(hi);
    while (fhi >= 0.0) {
      if (hi >= opts.max_spare_s) {
        // Stated as a bound: every rule still holds with this much added, and the search stops.
        out.spare_s = hi;
        out.capped = true;
        out.note = "every rule still holds with " + format_fixed(hi, 0) + " s added; the search stops there";
        return out;
      }
      // Next try: past the root the last two points predict (margins fall nearly linearly with
      // the added time), at least 1 s further and at most eight times as far.
      const double slope = (fhi - flo) / (hi - lo);
      double next = 2.0 * hi;
      if (slope < 0.0) next = std::clamp(hi - fhi / slope + 0.02 * (hi - lo) + 1.0, hi + 1.0, 8.0 * hi);
      const double pr = predicted_root(margins_at(lo), margins_at(hi), lo, hi);
      if (std::isfinite(pr) && pr > hi) next = std::clamp(pr + 0.02 * (hi - lo) + 1.0, hi + 1.0, 8.0 * hi);
      lo = hi;
      flo = fhi;
      hi = std::min(next, opts.max_spare_s);
      fhi = f(hi);
    }
  } else {
    hi = 0.0;
    fhi = f0;
    lo = -base_len;
    const MissionResult without = run(lo);
    const auto [m_without, rule_without] = smallest_margin(m, without);
    all.emplace_back(lo, rule_margins(m, without));
    flo = m_without;
    if (flo < 0.0) {
      out.spare_s = -base_len;
      out.bounded = false;
      out.binding_rule = rule_without;
      solve_leg_cut(m, i, out, run_mission);
      return out;
    }
  }
  narrow_bracket(f, lo, hi, flo, fhi, predicted_root(margins_at(lo), margins_at(hi), lo, hi));
  const double root = find_root(f, lo, hi, flo, fhi, 0.05, 100).value_or(lo);
  // Report the side of the bracket where every rule still holds.
  out.spare_s = root;
  // The rule failing just past the root: from an evaluation within 1 s past it, else one more.
  for (const auto& [d, v, name] : seen)
    if (v < 0.0 && d > root && d - root <= 1.0 && out.binding_rule.empty()) out.binding_rule = name;
  if (out.binding_rule.empty()) out.binding_rule = smallest_margin(m, run(root + 0.05)).second;
  return out;
}

}  // namespace sortie::sim
