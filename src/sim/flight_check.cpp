#include "sim/flight_check.hpp"

#include <algorithm>
#include <cmath>
#include <limits>

#include "battery/thevenin.hpp"
#include "core/error.hpp"
#include "sim/replay.hpp"

namespace sortie::sim {

namespace {

const double kNaN = std::numeric_limits<double>::quiet_NaN();

/// Linear interpolation of a trace quantity at time t (t inside the trace).
template <class F>
double at(const std::vector<TracePoint>& tr, double t, F get) {
  auto it = std::lower_bound(tr.begin(), tr.end(), t, [](const TracePoint& p, double x) { return p.s.t < x; });
  if (it == tr.begin()) return get(*it);
  if (it == tr.end()) return get(tr.back());
  const TracePoint& b = *it;
  const TracePoint& a = *(it - 1);
  const double w = b.s.t > a.s.t ? (t - a.s.t) / (b.s.t - a.s.t) : 1.0;
  return get(a) + w * (get(b) - get(a));
}

/// Inverse of the pack OCV by bisection (OCV rises with SoC).
double soc_from_ocv(const battery::PackModel& pm, double v_pack) {
  double lo = 0.0, hi = 1.0;
  if (v_pack <= pm.ocv_pack(lo)) return 0.0;
  if (v_pack >= pm.ocv_pack(hi)) return 1.0;
  for (int k = 0; k < 60; ++k) {
    const double mid = 0.5 * (lo + hi);
    (pm.ocv_pack(mid) < v_pack ? lo : hi) = mid;
  }
  return 0.5 * (lo + hi);
}

}  // namespace

FlightCheck check_flight(const Mission& m, const MissionResult& plan, const MeasuredFlight& log,
                         const std::string& log_file) {
  FlightCheck c;
  const auto& tr = plan.trace;
  if (tr.size() < 2) throw InputError(log_file + ": the plan has no timeline to compare with (no trace)");
  const std::size_t n = log.time_s.size();
  const double t_plan_end = tr.back().s.t;
  const battery::PackModel pm(m.pack);

  // --- measured integrals: sample k's current flowed over (t[k-1], t[k]] (as in replay) ---
  std::vector<double> q_C(n, 0.0), e_J(n, 0.0);
  for (std::size_t k = 1; k < n; ++k) {
    const double dt = log.time_s[k] - log.time_s[k - 1];
    q_C[k] = q_C[k - 1] + log.current_A[k] * dt;
    e_J[k] = e_J[k - 1] + log.current_A[k] * log.voltage_V[k] * dt;
  }
  auto meas_at = [&](const std::vector<double>& y, double t) {
    if (t <= log.time_s.front()) return y.front();
    if (t >= log.time_s.back()) return y.back();
    const auto it = std::lower_bound(log.time_s.begin(), log.time_s.end(), t);
    const std::size_t k = static_cast<std::size_t>(it - log.time_s.begin());
    const double w = (t - log.time_s[k - 1]) / (log.time_s[k] - log.time_s[k - 1]);
    return y[k - 1] + w * (y[k] - y[k - 1]);
  };

  // --- predicted at log times ---
  double se = 0.0, sb = 0.0;
  c.pred_V.assign(n, kNaN);
  c.pred_I.assign(n, kNaN);
  c.pred_soc.assign(n, kNaN);
  c.meas_soc.resize(n);
  const double soc0 = m.pack.soc0;
  for (std::size_t k = 0; k < n; ++k) {
    const double t = log.time_s[k];
    c.meas_soc[k] = soc0 - q_C[k] / pm.capacity_C;
    if (t > t_plan_end + 1e-3) {  // 1 ms: logs written to the millisecond
      ++c.rows_after_plan;
      continue;
    }
    c.pred_V[k] = at(tr, t, [](const TracePoint& p) { return p.s.term.v_terminal_V; });
    c.pred_I[k] = at(tr, t, [](const TracePoint& p) { return p.s.term.current_A; });
    c.pred_soc[k] = at(tr, t, [](const TracePoint& p) { return p.s.x[battery::kSoc]; });
    const double d = log.voltage_V[k] - c.pred_V[k];
    se += d * d;
    sb += d;
    ++c.rows_compared;
  }
  if (c.rows_compared == 0)
    throw InputError(log_file + ": no log row lies within the plan's flight (the plan ends at " +
                     std::to_string(t_plan_end) + " s)");
  c.v_rmse_V = std::sqrt(se / static_cast<double>(c.rows_compared));
  c.v_bias_V = sb / static_cast<double>(c.rows_compared);

  // --- per phase ---
  const auto charge_pred = [&](double t) { return at(tr, t, [](const TracePoint& p) { return p.s.x[battery::kCharge]; }); };
  const auto energy_pred = [&](double t) { return at(tr, t, [](const TracePoint& p) { return p.s.x[battery::kEnergy]; }); };
  for (const PhaseSummary& ps : plan.phases) {
    PhaseCheck p;
    p.label = ps.label;
    p.start_s = ps.start_s;
    p.end_s = ps.start_s + ps.duration_s;
    p.energy_pred_Wh = (energy_pred(p.end_s) - energy_pred(p.start_s)) / 3600.0;
    p.charge_pred_Ah = (charge_pred(p.end_s) - charge_pred(p.start_s)) / 3600.0;
    p.energy_meas_Wh = (meas_at(e_J, p.end_s) - meas_at(e_J, p.start_s)) / 3600.0;
    p.charge_meas_Ah = (meas_at(q_C, p.end_s) - meas_at(q_C, p.start_s)) / 3600.0;
    p.covered = log.time_s.back() >= p.end_s - 1e-3;
    c.phases.push_back(p);
  }
  c.flight_time_pred_s = plan.flight_time_s;
  c.flight_time_meas_s = log.time_s.back() - log.time_s.front();
  c.energy_pred_Wh = plan.energy_Wh;
  c.charge_pred_Ah = plan.charge_Ah;
  c.energy_meas_Wh = e_J.back() / 3600.0;
  c.charge_meas_Ah = q_C.back() / 3600.0;
  c.soc_land_pred = plan.landing.soc;
  c.soc_land_counted = c.meas_soc.back();

  // --- replay on the logged current ---
  CurrentLog cl{log.time_s, log.current_A, {}};
  const ReplayResult rr = replay(m.pack, cl);
  c.replay_V = rr.v_terminal_V;
  c.replay_soc = rr.soc;
  double sr = 0.0;
  for (std::size_t k = 0; k < n; ++k) {
    const double d = log.voltage_V[k] - rr.v_terminal_V[k];
    sr += d * d;
    if (std::abs(d) > std::abs(c.replay_max_V)) {
      c.replay_max_V = d;
      c.replay_max_t_s = log.time_s[k];
      c.replay_max_line = k < log.lines.size() ? log.lines[k] : 0;
    }
  }
  c.replay_rmse_V = std::sqrt(sr / static_cast<double>(n));

  // --- landing state from the voltage, and the time on station left ---
  // The relaxed voltage at landing is the model's OCV at the replay's landing SoC plus the mean
  // of (measured − replayed) voltage over the last kWindow_s of the log: the model's
  // overpotential is taken as right and its open-circuit voltage is moved to the log's. The
  // window averages the measurement noise down.
  constexpr double kWindow_s = 20.0;
  double resid = 0.0;
  std::size_t cnt = 0;
  for (std::size_t k = n; k-- > 0 && log.time_s[k] >= log.time_s.back() - kWindow_s;) {
    resid += log.voltage_V[k] - rr.v_terminal_V[k];
    ++cnt;
  }
  c.soc_land_voltage = soc_from_ocv(pm, pm.ocv_pack(rr.soc.back()) + resid / static_cast<double>(cnt));
  const double used = soc0 - c.soc_land_voltage;
  c.capacity_est_Ah = used > 0.02 ? c.charge_meas_Ah / used : pm.capacity_C / 3600.0;

  // Station current: the plan's mean current over its spare phase (else the last hover/loiter).
  c.reserve_pred_s = plan.reserve_time_s;
  c.reserve_end = end_text(plan.reserve_time_end, plan.reserve_time_refusal);
  std::optional<std::size_t> sp = spare_phase(m);
  if (sp && *sp < plan.phases.size() && plan.phases[*sp].duration_s > 0.0) {
    const PhaseSummary& ps = plan.phases[*sp];
    c.station_phase = ps.label;
    c.station_current_A = (charge_pred(ps.start_s + ps.duration_s) - charge_pred(ps.start_s)) / ps.duration_s;
  } else {
    c.station_current_A = plan.flight_time_s > 0.0 ? plan.charge_Ah * 3600.0 / plan.flight_time_s : 0.0;
    c.station_phase = "whole flight";
  }
  // The plan's time on station ends at a SoC: soc_end = SoC_land,plan − I_station·t_reserve / Q.
  // The same end SoC is applied to the pack as measured: the charge left to it is
  // (SoC_land,voltage − soc_end)·Q_est, flown at the plan's station current.
  const double q_plan_Ah = pm.capacity_C / 3600.0;
  const double soc_end = c.soc_land_pred - c.station_current_A * c.reserve_pred_s / 3600.0 / q_plan_Ah;
  c.reserve_meas_s = c.station_current_A > 0.0
                         ? std::max(0.0, (c.soc_land_voltage - soc_end) * c.capacity_est_Ah * 3600.0 / c.station_current_A)
                         : 0.0;
  return c;
}

}  // namespace sortie::sim
