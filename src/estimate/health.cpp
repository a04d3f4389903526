#include "estimate/health.hpp"

#include <algorithm>
#include <cmath>
#include <cstdio>

#include <Eigen/Dense>

#include "battery/thevenin.hpp"
#include "estimate/pack_step.hpp"
#include "fit/levenberg_marquardt.hpp"

namespace sortie::estimate {

namespace {

/// The model of health.hpp on one flight (estimate/pack_step), with the pack tables built once.
void model_voltage(const battery::PackModel& m, const sim::MeasuredFlight& f, double c, double r,
                   double soc0, std::vector<double>& v) {
  const std::size_t n = f.time_s.size();
  v.resize(n);
  const PackStep ps{m, c, r};
  StepState x = ps.start(soc0);
  for (std::size_t k = 0; k < n; ++k) {
    if (k > 0) ps.advance(x, f.current_A[k], f.time_s[k] - f.time_s[k - 1]);
    v[k] = ps.voltage(x, f.current_A[k]);
  }
}

double charge_Ah(const sim::MeasuredFlight& f) {
  double q = 0.0;
  for (std::size_t k = 1; k < f.time_s.size(); ++k) q += f.current_A[k] * (f.time_s[k] - f.time_s[k - 1]);
  return q / 3600.0;
}

std::string pct(double x) {
  char b[32];
  std::snprintf(b, sizeof b, "%.1f %%", 100.0 * x);
  return b;
}

}  // namespace

std::vector<double> health_model_voltage(const battery::Pack& nominal, const sim::MeasuredFlight& f,
                                         double c, double r, double soc0) {
  const battery::PackModel m(unit_soh(nominal));
  std::vector<double> v;
  model_voltage(m, f, c, r, soc0, v);
  return v;
}

HealthEstimate estimate_health(const battery::Pack& nominal, const std::vector<HealthFlight>& flights,
                               const HealthOptions& opts) {
  HealthEstimate out;
  out.options = opts;
  const battery::PackModel m(unit_soh(nominal));
  const double rated_Ah = m.capacity_C / 3600.0;

  // Screening: each log on its own.
  std::vector<std::size_t> used;
  for (std::size_t j = 0; j < flights.size(); ++j) {
    const auto& hf = flights[j];
    FlightHealth fh;
    fh.name = hf.name;
    fh.rows = hf.log.time_s.size();
    fh.charge_Ah = charge_Ah(hf.log);
    fh.depth = fh.charge_Ah / rated_Ah;
    double mean = 0.0, sq = 0.0;
    for (double i : hf.log.current_A) mean += i;
    mean /= std::max<std::size_t>(fh.rows, 1);
    for (double i : hf.log.current_A) sq += (i - mean) * (i - mean);
    const double sd = fh.rows > 1 ? std::sqrt(sq / (fh.rows - 1)) : 0.0;
    fh.current_spread = mean > 0.0 ? sd / mean : 0.0;
    if (fh.rows < opts.min_rows)
      fh.refused = "too short: " + std::to_string(fh.rows) + " rows, at least " + std::to_string(opts.min_rows) + " needed";
    else if (mean <= 0.0)
      fh.refused = "not a discharge: the mean current is not positive";
    else if (fh.depth < opts.min_depth)
      fh.refused = "too shallow: " + pct(fh.depth) + " of the rated charge used, at least " + pct(opts.min_depth) +
                   " needed to see the capacity in the SoC drift";
    else if (fh.current_spread < opts.min_current_spread)
      fh.refused = "too little current variation: sd/mean of the current " + pct(fh.current_spread) + ", at least " +
                   pct(opts.min_current_spread) + " needed to see the resistance apart from the start SoC";
    if (hf.soc0) {
      fh.soc0 = *hf.soc0;
      fh.soc0_source = hf.soc0_source;
    }
    if (fh.refused.empty()) used.push_back(j);
    out.flights.push_back(fh);
  }
  if (used.empty()) {
    out.refused = true;
    out.why_refused = flights.empty() ? "no flight logs" : "no usable flight log: " + out.flights.front().refused;
    if (flights.size() > 1) out.why_refused = "no usable flight log (each says why)";
    return out;
  }

  // Parameters: c, r, then the start SoC of each used flight whose start is not known.
  std::vector<int> soc_index(flights.size(), -1);
  int p = 2;
  for (std::size_t j : used)
    if (!flights[j].soc0) soc_index[j] = p++;
  Eigen::VectorXd x0(p), lo(p), hi(p);
  x0(0) = 1.0;
  x0(1) = 1.0;
  lo(0) = opts.capacity_lo;
  hi(0) = opts.capacity_hi;
  lo(1) = opts.resistance_lo;
  hi(1) = opts.resistance_hi;
  for (std::size_t j : used) {
    if (soc_index[j] < 0) continue;
    const auto& f = flights[j].log;
    // Start guess: the OCV under the first row's voltage plus its R0 drop.
    const double e = f.voltage_V[0] + m.r0_pack_ohm(1.0) * f.current_A[0];
    x0(soc_index[j]) = m.ocv_cell_V.inverse(e / m.series);
    lo(soc_index[j]) = 0.0;
    hi(soc_index[j]) = 1.0;
  }

  auto soc0_of = [&](std::size_t j, const Eigen::VectorXd& x) {
    return soc_index[j] >= 0 ? x(soc_index[j]) : *flights[j].soc0;
  };
  std::vector<double> v, vp, vm;
  // Residuals r = V_meas − V_model and, when asked, J = ∂r/∂x (central differences, one-sided
  // at a bound).
  auto residuals = [&](const Eigen::VectorXd& x, bool jac, fit::NormalEquations& ne,
                       std::vector<std::vector<double>>* res_out, Eigen::MatrixXd* jtj_out) {
    ne.cost = 0.0;
    if (jac) {
      ne.jtj = Eigen::MatrixXd::Zero(p, p);
      ne.jtr = Eigen::VectorXd::Zero(p);
    }
    for (std::size_t u = 0; u < used.size(); ++u) {
      const std::size_t j = used[u];
      const auto& f = flights[j].log;
      const double s0 = soc0_of(j, x);
      model_voltage(m, f, x(0), x(1), s0, v);
      const std::size_t n = v.size();
      std::vector<double> res(n);
      for (std::size_t k = 0; k < n; ++k) {
        res[k] = f.voltage_V[k] - v[k];
        ne.cost += 0.5 * res[k] * res[k];
      }
      if (res_out) res_out->push_back(res);
      if (!jac) continue;
      // Columns touched by this flight: c, r and its own start SoC.
      std::vector<int> cols{0, 1};
      if (soc_index[j] >= 0) cols.push_back(soc_index[j]);
      std::vector<std::vector<double>> J(cols.size(), std::vector<double>(n));
      for (std::size_t a = 0; a < cols.size(); ++a) {
        const int q = cols[a];
        const double h = 1e-6;
        double up = std::min(x(q) + h, hi(q)), dn = std::max(x(q) - h, lo(q));
        Eigen::VectorXd xp = x, xm = x;
        xp(q) = up;
        xm(q) = dn;
        model_voltage(m, f, xp(0), xp(1), soc0_of(j, xp), vp);
        model_voltage(m, f, xm(0), xm(1), soc0_of(j, xm), vm);
        for (std::size_t k = 0; k < n; ++k) J[a][k] = -(vp[k] - vm[k]) / (up - dn);
      }
      for (std::size_t a = 0; a < cols.size(); ++a) {
        double g = 0.0;
        for (std::size_t k = 0; k < n; ++k) g += J[a][k] * res[k];
        ne.jtr(cols[a]) += g;
        for (std::size_t b = 0; b <= a; ++b) {
          double s = 0.0;
          for (std::size_t k = 0; k < n; ++k) s += J[a][k] * J[b][k];
          ne.jtj(cols[a], cols[b]) += s;
          if (a != b) ne.jtj(cols[b], cols[a]) += s;
        }
      }
    }
    if (jtj_out && jac) *jtj_out = ne.jtj;
  };
  const fit::LeastSquaresProblem prob = [&](const Eigen::VectorXd& x, bool jac, fit::NormalEquations& ne) {
    residuals(x, jac, ne, nullptr, nullptr);
  };
  fit::LmOptions lmo;
  lmo.cost_rel_tol = 1e-12;
  lmo.step_tol = 1e-10;
  const fit::LmResult lm = fit::levenberg_marquardt(prob, x0, lo, hi, lmo);
  out.iterations = lm.iterations;
  out.status = fit::to_string(lm.status);

  // Covariance at the optimum.
  fit::NormalEquations ne;
  std::vector<std::vector<double>> res;
  Eigen::MatrixXd jtj;
  residuals(lm.x, true, ne, &res, &jtj);
  std::size_t n_all = 0;
  double ss = 0.0, n_eff = 0.0;
  for (std::size_t u = 0; u < used.size(); ++u) {
    auto& fh = out.flights[used[u]];
    const auto& r = res[u];
    double s2 = 0.0, s1 = 0.0, mean = 0.0;
    for (double e : r) mean += e;
    mean /= r.size();
    for (std::size_t k = 0; k < r.size(); ++k) {
      s2 += (r[k] - mean) * (r[k] - mean);
      if (k > 0) s1 += (r[k] - mean) * (r[k - 1] - mean);
      ss += r[k] * r[k];
    }
    double sq = 0.0;
    for (double e : r) sq += e * e;
    fh.rmse_V = std::sqrt(sq / r.size());
    fh.lag1 = s2 > 0.0 ? s1 / s2 : 0.0;
    const double rho = std::clamp(fh.lag1, 0.0, 0.999);
    fh.n_eff = r.size() * (1.0 - rho) / (1.0 + rho);
    n_eff += fh.n_eff;
    n_all += r.size();
  }
  out.rows_used = n_all;
  out.logs_used = used.size();
  out.parameters = static_cast<std::size_t>(p);
  out.rmse_V = std::sqrt(ss / n_all);
  out.sigma_V = n_all > static_cast<std::size_t>(p) ? std::sqrt(ss / (n_all - p)) : out.rmse_V;
  out.inflation = n_eff > 0.0 ? std::max(1.0, n_all / n_eff) : 1.0;

  // Parameters held at a bound are fixed for the covariance (stated per flight).
  std::vector<int> free;
  for (int q = 0; q < p; ++q) {
    const bool at = lm.x(q) <= lo(q) + 1e-9 || lm.x(q) >= hi(q) - 1e-9;
    if (at && q >= 2) {
      for (std::size_t j : used)
        if (soc_index[j] == q) out.flights[j].soc0_at_bound = true;
      continue;
    }
    free.push_back(q);
  }
  Eigen::MatrixXd a(free.size(), free.size());
  for (std::size_t i = 0; i < free.size(); ++i)
    for (std::size_t k = 0; k < free.size(); ++k) a(i, k) = jtj(free[i], free[k]);
  const Eigen::MatrixXd cov = a.ldlt().solve(Eigen::MatrixXd::Identity(free.size(), free.size())) *
                              (out.sigma_V * out.sigma_V * out.inflation);
  out.capacity = lm.x(0);
  out.resistance = lm.x(1);
  out.capacity_sd = std::sqrt(std::max(0.0, cov(0, 0)));
  out.resistance_sd = std::sqrt(std::max(0.0, cov(1, 1)));
  out.correlation = cov(0, 1) / std::sqrt(cov(0, 0) * cov(1, 1));
  for (std::size_t j : used) {
    auto& fh = out.flights[j];
    fh.soc0 = soc0_of(j, lm.x);
    fh.soc0_fitted = soc_index[j] >= 0;
    for (std::size_t i = 0; i < free.size(); ++i)
      if (free[i] == soc_index[j]) fh.soc0_sd = std::sqrt(std::max(0.0, cov(i, i)));
  }
  if (!std::isfinite(out.correlation) || std::abs(out.correlation) > opts.max_correlation) {
    out.refused = true;
    char b[200];
    std::snprintf(b, sizeof b,
                  "the logs cannot tell capacity and resistance apart: their fitted correlation is %.3f (at most %.2f accepted)",
                  out.correlation, opts.max_correlation);
    out.why_refused = b;
  } else if (out.capacity <= lo(0) + 1e-9 || out.capacity >= hi(0) - 1e-9 || out.resistance <= lo(1) + 1e-9 ||
             out.resistance >= hi(1) - 1e-9) {
    out.refused = true;
    out.why_refused = "the fit ran to a bound of the capacity or resistance factor: the model does not explain these logs";
  }
  return out;
}

}  // namespace sortie::estimate
