#include "fit/thermal_fit.hpp"

#include <Eigen/Dense>
#include <algorithm>
#include <cmath>

#include "core/text.hpp"

namespace sortie::fit {

namespace {

/// Heat of each row's interval (t_{k−1}, t_k], J: I²·R0 + Σ v_p²/R_p.
std::vector<double> row_heat(const battery::CellLog& log, const std::vector<double>& soc, const battery::Cell& cell) {
  const std::size_t n = log.size();
  std::vector<double> heat(n, 0.0), v(cell.rc.size(), 0.0);
  for (std::size_t k = 0; k < n; ++k) {
    if (k == 0 || log.starts_section(k)) {
      std::fill(v.begin(), v.end(), 0.0);
      continue;
    }
    const double dt = log.time_s[k] - log.time_s[k - 1];
    const double i = log.current_A[k];
    const double s = 0.5 * (soc[k] + soc[k - 1]);
    double q = i * i * cell.r0_ohm(s);
    for (std::size_t p = 0; p < cell.rc.size(); ++p) {
      const double R = cell.rc[p].r_ohm(s);
      const double a = std::exp(-dt / cell.rc[p].tau_s(s));
      const double v_old = v[p];
      v[p] = R * i + a * (v_old - R * i);  // exact for a constant current
      q += 0.5 * (v_old * v_old + v[p] * v[p]) / R;
    }
    heat[k] = q * dt;
  }
  return heat;
}

/// One equation per row with a temperature; the integrals run from each section's first one.
struct Rows {
  struct Row {
    double dT, heat, int_T, dt;
  };
  std::vector<Row> rows;
  std::vector<std::size_t> row_index, section_of;
  double t_min = 1e300, t_max = -1e300, t_first = 0.0, heat_total = 0.0;
};

Rows thermal_rows(const battery::CellLog& log, const std::vector<double>& heat_of_row) {
  Rows out;
  std::size_t sections = 0;
  bool open = false;
  double T_s = 0.0, t_s = 0.0, heat = 0.0, int_T = 0.0, T_prev = 0.0, t_prev = 0.0;
  for (std::size_t k = 0; k < log.size(); ++k) {
    const double T = log.temperature_C[k];
    if (log.starts_section(k)) open = false;
    if (!std::isfinite(T)) continue;
    if (out.t_min > out.t_max) out.t_first = T;
    out.t_min = std::min(out.t_min, T);
    out.t_max = std::max(out.t_max, T);
    if (!open) {
      open = true;
      ++sections;
      T_s = T_prev = T;
      t_s = t_prev = log.time_s[k];
      heat = int_T = 0.0;
      continue;
    }
    // Heat of the rows since the last temperature: each row's current over its own interval.
    for (std::size_t j = k; j > 0; --j) {
      if (log.time_s[j] <= t_prev) break;
      heat += heat_of_row[j];
      out.heat_total += heat_of_row[j];
    }
    int_T += 0.5 * (T + T_prev) * (log.time_s[k] - t_prev);
    T_prev = T;
    t_prev = log.time_s[k];
    out.rows.push_back({T - T_s, heat, int_T, t_prev - t_s});
    out.row_index.push_back(k);
    out.section_of.push_back(sections);
  }
  return out;
}

/// Least squares of C·ΔT + hA·∫T − b·Δt = ∫q for the unknowns not held (b = hA·T_air unless the
/// air is given). Returns false when the columns do not tell the unknowns apart.
bool solve_heat_balance(const Rows& rs, std::optional<double> air_C, std::optional<double> C_held,
                        std::optional<double> hA_held, double& C, double& hA, double& air) {
  std::vector<int> unknown;  // 0: C, 1: hA, 2: b
  if (!C_held) unknown.push_back(0);
  if (!hA_held) unknown.push_back(1);
  if (!air_C) unknown.push_back(2);
  C = C_held.value_or(0.0), hA = hA_held.value_or(0.0), air = air_C.value_or(0.0);
  if (unknown.empty()) return true;
  const Eigen::Index m = static_cast<Eigen::Index>(rs.rows.size());
  const Eigen::Index p = static_cast<Eigen::Index>(unknown.size());
  Eigen::MatrixXd A(m, p);
  Eigen::VectorXd y(m);
  for (Eigen::Index r = 0; r < m; ++r) {
    const Rows::Row& w = rs.rows[static_cast<std::size_t>(r)];
    const double cT = air_C ? w.int_T - *air_C * w.dt : w.int_T;  // hA's column
    const double col[3] = {w.dT, cT, -w.dt};
    y[r] = w.heat - (C_held ? *C_held * w.dT : 0.0) - (hA_held ? *hA_held * cT : 0.0);
    for (Eigen::Index c = 0; c < p; ++c) A(r, c) = col[unknown[static_cast<std::size_t>(c)]];
  }
  // Columns scaled to unit norm so that J/K, W/K and W share one footing.
  const Eigen::VectorXd scale = A.colwise().norm().transpose();
  for (Eigen::Index c = 0; c < p; ++c)
    if (scale[c] > 0) A.col(c) /= scale[c];
  const Eigen::ColPivHouseholderQR<Eigen::MatrixXd> qr(A);
  if (qr.rank() < p) return false;
  const Eigen::VectorXd theta = qr.solve(y);
  for (Eigen::Index c = 0; c < p; ++c) {
    const double v = theta[c] / scale[c];
    const int u = unknown[static_cast<std::size_t>(c)];
    if (u == 0) C = v;
    if (u == 1) hA = v;
    if (u == 2) air = v;  // b for now
  }
  if (!air_C) air = hA > 0 ? air / hA : rs.t_first;
  return true;
}

/// Re-runs the block along the log, C·dT/dt = q − hA·(T − T_air), exact per interval for a
/// constant q: RMSE and largest error against the logged temperature.
void rerun(const battery::CellLog& log, const Rows& rs, ThermalFit& out) {
  double sum2 = 0.0, worst = 0.0, T_model = 0.0, heat_prev = 0.0;
  std::size_t current_section = 0;
  const double tau = out.hA_W_per_K > 0 ? out.heat_capacity_J_per_K / out.hA_W_per_K : 0.0;
  for (std::size_t r = 0; r < rs.rows.size(); ++r) {
    const std::size_t k = rs.row_index[r];
    if (rs.section_of[r] != current_section) {  // the section's first row sets the start
      current_section = rs.section_of[r];
      T_model = log.temperature_C[k] - rs.rows[r].dT;
      heat_prev = 0.0;
    }
    const bool same = r > 0 && rs.section_of[r - 1] == rs.section_of[r];
    const double dt = same ? rs.rows[r].dt - rs.rows[r - 1].dt : rs.rows[r].dt;
    const double q = dt > 0 ? (rs.rows[r].heat - heat_prev) / dt : 0.0;
    heat_prev = rs.rows[r].heat;
    if (tau > 0) {
      const double T_inf = out.air_C + q / out.hA_W_per_K;
      T_model = T_inf + (T_model - T_inf) * std::exp(-dt / tau);
    } else {
      T_model += q * dt / out.heat_capacity_J_per_K;
    }
    const double e = T_model - log.temperature_C[k];
    sum2 += e * e;
    worst = std::max(worst, std::fabs(e));
  }
  out.rmse_K = std::sqrt(sum2 / static_cast<double>(std::max<std::size_t>(1, rs.rows.size())));
  out.max_error_K = worst;
}

std::string range_text(double lo, double hi, int digits) { return format_fixed(lo, digits) + " to " + format_fixed(hi, digits); }

/// The fitted C and hA held to the prior's bounds: one out of bounds is set to its default and
/// the other refitted with it held; what is left out of bounds is set to its default too.
void bound_fit(const Rows& rs, std::optional<double> air_C, double mass_kg, const ThermalPrior& pr, ThermalFit& f,
               std::vector<std::string>& warnings) {
  const double C_lo = pr.c_lo * mass_kg, C_hi = pr.c_hi * mass_kg;
  auto c_ok = [&](double C) { return C >= C_lo && C <= C_hi; };
  auto h_ok = [&](double h) { return h >= pr.hA_lo && h <= pr.hA_hi; };
  double C = f.heat_capacity_J_per_K, hA = f.hA_W_per_K, air = f.air_C;
  f.c_fitted = c_ok(C), f.hA_fitted = h_ok(hA);
  if (!f.c_fitted)
    warnings.push_back("thermal block: the fitted heat capacity " + format_fixed(C / mass_kg, 0) + " J/(kg·K) is outside " +
                       range_text(pr.c_lo, pr.c_hi, 0) + " J/(kg·K) for a lithium cell: the default " +
                       format_fixed(pr.c_default, 0) + " is written (check --mass-kg and the sensor's contact)");
  if (!f.hA_fitted)
    warnings.push_back("thermal block: the fitted hA " + format_fixed(hA, 4) + " W/K is outside " +
                       range_text(pr.hA_lo, pr.hA_hi, 4) + " W/K for a cell of " + format_fixed(mass_kg, 3) +
                       " kg in air: the default " + format_fixed(pr.hA_default, 4) + " W/K is written");
  if (f.c_fitted && f.hA_fitted) return;
  std::optional<double> C_held, hA_held;
  if (!f.c_fitted) C_held = pr.c_default * mass_kg;
  if (!f.hA_fitted) hA_held = pr.hA_default;
  if (solve_heat_balance(rs, air_C, C_held, hA_held, C, hA, air)) {
    if (f.c_fitted && !c_ok(C)) f.c_fitted = false, C = pr.c_default * mass_kg;
    if (f.hA_fitted && !h_ok(hA)) f.hA_fitted = false, hA = pr.hA_default;
  } else {
    f.c_fitted = f.hA_fitted = false;
    C = pr.c_default * mass_kg, hA = pr.hA_default;
  }
  if (!air_C && (!std::isfinite(air) || air < rs.t_min - 10.0 || air > rs.t_max)) air = rs.t_first;
  f.heat_capacity_J_per_K = C, f.hA_W_per_K = hA, f.air_C = air;
}

}  // namespace

std::optional<ThermalFit> fit_thermal(const battery::CellLog& log, const std::vector<double>& soc, const battery::Cell& cell,
                                      std::optional<double> air_C, const ThermalPrior& prior,
                                      std::vector<std::string>& warnings, std::string& why) {
  if (log.temperature_C.size() != log.size() || log.size() < 3) {
    why = "the log has no temperature column";
    return std::nullopt;
  }
  const Rows rs = thermal_rows(log, row_heat(log, soc, cell));
  ThermalFit f;
  f.air_given = air_C.has_value();
  f.rows = rs.rows.size();
  f.heat_J = rs.heat_total;
  f.temperature_min_C = rs.t_min, f.temperature_max_C = rs.t_max;
  const double swing = std::max(0.0, rs.t_max - rs.t_min);
  double C = 0.0, hA = 0.0, air = 0.0;
  if (rs.rows.size() < 20 || swing < kThermalMinSwingK ||
      !solve_heat_balance(rs, air_C, std::nullopt, std::nullopt, C, hA, air)) {
    warnings.push_back("thermal block not fitted: the cell temperature moves " + format_fixed(swing, 2) +
                       " K over the log (fitted from a swing of " + format_fixed(kThermalMinSwingK, 0) +
                       " K or more, from discharges long or hard enough to warm the cell): the defaults c " +
                       format_fixed(prior.c_default, 0) + " J/(kg·K) and hA " + format_fixed(prior.hA_default, 4) +
                       " W/K (a cell of this mass in still air) are written");
    f.heat_capacity_J_per_K = prior.c_default * cell.mass_kg;
    f.hA_W_per_K = prior.hA_default;
    f.air_C = air_C.value_or(rs.t_first);
  } else {
    f.heat_capacity_J_per_K = C, f.hA_W_per_K = hA, f.air_C = air;
    bound_fit(rs, air_C, cell.mass_kg, prior, f, warnings);
  }
  f.how = std::string("c ") + (f.c_fitted ? "fitted" : "default") + ", hA " + (f.hA_fitted ? "fitted" : "default") +
          ", air " + (f.air_given ? "given" : (f.c_fitted || f.hA_fitted) ? "fitted" : "the log's first temperature") +
          " (bounds c " + range_text(prior.c_lo, prior.c_hi, 0) + " J/(kg·K), hA " +
          range_text(prior.hA_lo, prior.hA_hi, 4) + " W/K from the mass)";
  rerun(log, rs, f);
  return f;
}

}  // namespace sortie::fit
