#include "estimate/soc_filter.hpp"

#include <algorithm>
#include <cmath>

#include <Eigen/Dense>

#include "battery/thevenin.hpp"
#include "sim/segment.hpp"

namespace sortie::estimate {

FilterResult run_soc_filter(const battery::Pack& pack, const sim::MeasuredFlight& log, std::size_t rows,
                            const FilterOptions& o) {
  FilterResult out;
  const std::size_t n = std::min(rows, log.time_s.size());
  if (n == 0) return out;
  const battery::PackModel m(unit_soh(pack));
  const PackStep ps{m, pack.soh_capacity, pack.soh_resistance};
  // Start: the guess given, or the OCV under the first row's voltage plus its R0 drop.
  double soc0 = 0.0;
  if (o.soc0) {
    soc0 = *o.soc0;
    out.soc0_source = "given";
  } else {
    StepState probe = ps.start(1.0);
    const double e = log.voltage_V[0] + ps.r0(probe) * log.current_A[0];
    soc0 = m.ocv_cell_V.inverse(e / m.series);
    out.soc0_source = "first row's voltage";
  }
  out.soc0_guess = soc0;
  StepState x = ps.start(soc0);
  Eigen::Matrix3d P = Eigen::Matrix3d::Zero();
  P(0, 0) = o.soc0_sd * o.soc0_sd;
  P(1, 1) = P(2, 2) = o.v_rc0_sd_V * o.v_rc0_sd_V;
  const double var_i = o.current_sd_A * o.current_sd_A;
  for (std::size_t k = 0; k < n; ++k) {
    const double i = log.current_A[k];
    if (k > 0) {
      const double dt = log.time_s[k] - log.time_s[k - 1];
      double a[2], g[2];
      ps.rc_gains(x, dt, a, g);
      ps.advance(x, i, dt);
      Eigen::Matrix3d F = Eigen::Matrix3d::Zero();
      F(0, 0) = 1.0;
      F(1, 1) = a[0];
      F(2, 2) = a[1];
      Eigen::Vector3d G(-dt / ps.capacity_C(), g[0], g[1]);
      Eigen::Matrix3d Q = G * G.transpose() * var_i;
      Q(0, 0) += dt * o.soc_rate_sd * o.soc_rate_sd;
      Q(1, 1) += dt * o.v_rate_sd_V * o.v_rate_sd_V;
      if (m.n_rc > 1) Q(2, 2) += dt * o.v_rate_sd_V * o.v_rate_sd_V;
      P = F * P * F.transpose() + Q;
    }
    FilterRow fr;
    fr.t_s = log.time_s[k];
    // No update at row 0 when the start came from that row's voltage (it would count it twice).
    if (k > 0 || o.soc0) {
      // Iterated update (Gauss–Newton on the measurement; B. M. Bell and F. W. Cathey, "The
      // iterated Kalman filter update as a Gauss-Newton method", IEEE Trans. Automatic Control
      // 38, 1993): the OCV is curved, and a large start error would overshoot on one
      // linearisation. The SoC is held within [0, 1], where the OCV table is defined.
      const double r0 = ps.r0(x);
      const double R = o.voltage_sd_V * o.voltage_sd_V + r0 * r0 * var_i;
      const Eigen::Vector3d xm(x.soc, x.v1, x.v2);
      const double y = log.voltage_V[k] - ps.voltage(x, i);
      Eigen::Vector3d xi = xm;
      Eigen::RowVector3d H;
      Eigen::Vector3d K;
      double S = 0.0;
      for (int it = 0; it < 8; ++it) {
        StepState xs = x;
        xs.soc = xi(0);
        xs.v1 = xi(1);
        xs.v2 = xi(2);
        H = Eigen::RowVector3d(ps.dv_dsoc(xs, i), -1.0, m.n_rc > 1 ? -1.0 : 0.0);
        S = (H * P * H.transpose())(0, 0) + R;
        K = P * H.transpose() / S;
        Eigen::Vector3d next = xm + K * (log.voltage_V[k] - ps.voltage(xs, i) - H.dot(xm - xi));
        next(0) = std::clamp(next(0), 0.0, 1.0);
        const bool done = std::abs(next(0) - xi(0)) < 1e-9;
        xi = next;
        if (done) break;
      }
      x.soc = xi(0);
      x.v1 = xi(1);
      x.v2 = xi(2);
      const Eigen::Matrix3d IKH = Eigen::Matrix3d::Identity() - K * H;
      P = IKH * P * IKH.transpose() + K * K.transpose() * R;
      fr.innovation_V = y;
      fr.innovation_sd_V = std::sqrt(S);
    }
    fr.soc = x.soc;
    fr.soc_sd = std::sqrt(std::max(0.0, P(0, 0)));
    fr.v1 = x.v1;
    fr.v2 = x.v2;
    out.rows.push_back(fr);
  }
  out.state = x;
  for (int a = 0; a < 3; ++a)
    for (int b = 0; b < 3; ++b) out.cov[a][b] = P(a, b);
  return out;
}

std::vector<RuleTime> time_to_rules(const battery::Pack& pack, const flight::Reserve& reserve, const StepState& x0,
                                    double power_W, double horizon_s, std::string* end) {
  const battery::PackModel pm(pack);
  const double S = pack.series;
  std::vector<RuleTime> out;
  std::vector<sim::EventSpec> ev;
  // The pack's own end first (terminal), then the rules (recorded, re-armed).
  ev.push_back({"cutoff", [&](const sim::Sample& s) { return s.term.v_terminal_V / S - pack.cell.v_cutoff_V; }, true});
  ev.push_back({"power_collapse", [](const sim::Sample& s) { return s.term.discriminant; }, true});
  ev.push_back({"soc_empty", [](const sim::Sample& s) { return s.x[battery::kSoc]; }, true});
  out.push_back({"cutoff", "V", pack.cell.v_cutoff_V, std::nullopt, 0.0, false});
  if (reserve.soc_min) {
    const double lim = *reserve.soc_min;
    ev.push_back({"soc_min", [lim](const sim::Sample& s) { return s.x[battery::kSoc] - lim; }, false});
    out.push_back({"soc_min", "", lim, std::nullopt, 0.0, false});
  }
  if (reserve.v_rest_cell_min_V) {
    const double lim = *reserve.v_rest_cell_min_V;
    ev.push_back({"v_rest_cell_min_V", [&pm, lim](const sim::Sample& s) { return pm.ocv_cell_V(s.x[battery::kSoc]) - lim; }, false});
    out.push_back({"v_rest_cell_min_V", "V", lim, std::nullopt, 0.0, false});
  }
  if (reserve.v_load_cell_min_V) {
    const double lim = *reserve.v_load_cell_min_V;
    ev.push_back({"v_load_cell_min_V", [S, lim](const sim::Sample& s) { return s.term.v_terminal_V / S - lim; }, false});
    out.push_back({"v_load_cell_min_V", "V", lim, std::nullopt, 0.0, false});
  }
  battery::State x = pm.initial_state(x0.soc);
  x[battery::kV1] = x0.v1;
  x[battery::kV2] = x0.v2;
  x[battery::kTemp] = x0.temp_C;
  const battery::Demand d = battery::Demand::power(power_W);
  const battery::Thevenin rhs{pm, d};
  const sim::Sample s0{0.0, x, rhs.terminal(x, 0.0)};
  // Rules already past at the start do not cross: time 0.
  for (std::size_t e = 0; e < ev.size(); ++e)
    for (auto& r : out)
      if (r.rule == ev[e].kind && ev[e].g(s0) <= 0.0) {
        r.already = true;
        r.time_s = 0.0;
      }
  sim::SegmentOptions so;
  so.t_end = horizon_s;
  so.method = sim::SegmentOptions::Method::dopri5;
  so.max_steps = 1000000;
  so.context = "time left";
  const sim::SegmentResult seg = sim::run_segment(pm, d, 0.0, x, ev, so);
  for (const auto& w : seg.warnings)
    for (auto& r : out)
      if (r.rule == ev[w.event].kind && !r.time_s) r.time_s = w.at.t;
  std::string why = seg.stopped ? ev[*seg.stopped].kind : "horizon";
  if (seg.stopped) {
    out[0].time_s = seg.end.t;
    if (ev[*seg.stopped].kind != "cutoff") out[0].rule = "cutoff";  // the pack ended another way first
  }
  if (end) *end = why;
  if (reserve.hover_s) {
    std::optional<double> first;
    for (const auto& r : out)
      if (r.time_s) first = first ? std::min(*first, *r.time_s) : *r.time_s;
    RuleTime h{"hover_s", "s", *reserve.hover_s, std::nullopt, 0.0, false};
    if (first) {
      h.time_s = std::max(0.0, *first - *reserve.hover_s);
      h.already = *first <= *reserve.hover_s;
    }
    out.push_back(h);
  }
  return out;
}

double present_power(const sim::MeasuredFlight& log, std::size_t rows, double window_s, double* used_s) {
  const std::size_t n = std::min(rows, log.time_s.size());
  if (n == 0) return 0.0;
  const double t_end = log.time_s[n - 1];
  double sum = 0.0;
  std::size_t cnt = 0;
  double t_first = t_end;
  for (std::size_t k = n; k-- > 0 && log.time_s[k] >= t_end - window_s;) {
    sum += log.voltage_V[k] * log.current_A[k];
    ++cnt;
    t_first = log.time_s[k];
  }
  if (used_s) *used_s = t_end - t_first;
  return sum / cnt;
}

Remaining remaining_time(const battery::Pack& pack, const flight::Reserve& reserve, const sim::MeasuredFlight& log,
                         double t_cut_s, const FilterOptions& fo, const RemainingOptions& ro) {
  Remaining out;
  std::size_t rows = 0;
  while (rows < log.time_s.size() && log.time_s[rows] <= t_cut_s) ++rows;
  out.rows = rows;
  const FilterResult fr = run_soc_filter(pack, log, rows, fo);
  out.t_cut_s = rows ? log.time_s[rows - 1] : 0.0;
  out.soc = fr.state.soc;
  out.soc_sd = std::sqrt(std::max(0.0, fr.cov[0][0]));
  out.power_W = present_power(log, rows, ro.power_window_s, &out.window_s);
  out.rules = time_to_rules(pack, reserve, fr.state, out.power_W, ro.horizon_s, &out.end);
  // sd of each time from two more runs at SoC ± sd (the RC voltages moved by their regression
  // on SoC, so the pair stays consistent with the filter's covariance).
  StepState hi = fr.state, lo = fr.state;
  const double vs = fr.cov[0][0] > 0 ? 1.0 / fr.cov[0][0] : 0.0;
  hi.soc += out.soc_sd;
  lo.soc -= out.soc_sd;
  hi.v1 += fr.cov[1][0] * vs * out.soc_sd;
  lo.v1 -= fr.cov[1][0] * vs * out.soc_sd;
  hi.v2 += fr.cov[2][0] * vs * out.soc_sd;
  lo.v2 -= fr.cov[2][0] * vs * out.soc_sd;
  const auto rh = time_to_rules(pack, reserve, hi, out.power_W, ro.horizon_s);
  const auto rl = time_to_rules(pack, reserve, lo, out.power_W, ro.horizon_s);
  for (std::size_t k = 0; k < out.rules.size(); ++k)
    if (out.rules[k].time_s && rh[k].time_s && rl[k].time_s)
      out.rules[k].sd_s = 0.5 * std::abs(*rh[k].time_s - *rl[k].time_s);
  return out;
}

}  // namespace sortie::estimate
