#include "fit/thermal_fit.hpp"

#include <Eigen/Dense>
#include <algorithm>
#include <cmath>

#include "core/text.hpp"

namespace sortie::fit {

std::optional<ThermalFit> fit_thermal(const CellLog& log, const std::vector<double>& soc, const battery::Cell& cell,
                                      std::optional<double> air_C, std::string& why) {
  const std::size_t n = log.size();
  if (log.temperature_C.size() != n || n < 3) {
    why = "the log has no temperature column";
    return std::nullopt;
  }
  // Heat of each row's interval (t_{k−1}, t_k], J: I²·R0 + Σ v_p²/R_p.
  std::vector<double> row_heat(n, 0.0);
  {
    std::vector<double> v(cell.rc.size(), 0.0);
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
      row_heat[k] = q * dt;
    }
  }
  // One equation per row with a temperature; the integrals run from each section's first
  // temperature.
  struct Row {
    double dT, heat, int_T, dt;
  };
  std::vector<Row> rows;
  std::vector<std::size_t> row_index, section_of;
  ThermalFit out;
  out.air_given = air_C.has_value();
  out.temperature_min_C = 1e300;
  out.temperature_max_C = -1e300;
  double heat_total = 0.0;
  std::size_t sections = 0;
  bool open = false;
  double T_s = 0.0, t_s = 0.0, heat = 0.0, int_T = 0.0, T_prev = 0.0, t_prev = 0.0;
  for (std::size_t k = 0; k < n; ++k) {
    const double T = log.temperature_C[k];
    if (log.starts_section(k)) open = false;
    if (!std::isfinite(T)) continue;
    out.temperature_min_C = std::min(out.temperature_min_C, T);
    out.temperature_max_C = std::max(out.temperature_max_C, T);
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
      heat += row_heat[j];
      heat_total += row_heat[j];
    }
    int_T += 0.5 * (T + T_prev) * (log.time_s[k] - t_prev);
    T_prev = T;
    t_prev = log.time_s[k];
    rows.push_back({T - T_s, heat, int_T, t_prev - t_s});
    row_index.push_back(k);
    section_of.push_back(sections);
  }
  out.rows = rows.size();
  out.heat_J = heat_total;
  const double swing = out.temperature_max_C - out.temperature_min_C;
  if (rows.size() < 20 || swing < 1.0) {
    why = "the cell temperature moves " + format_fixed(std::max(0.0, swing), 2) +
          " K over the log (expected a swing of at least 1 K, from discharges long or hard enough to warm the cell)";
    return std::nullopt;
  }
  // Unknowns: C, hA and (without a given air temperature) b = hA·T_air.
  //   C·ΔT + hA·∫T − b·Δt = ∫q
  const Eigen::Index m = static_cast<Eigen::Index>(rows.size());
  const Eigen::Index p = air_C ? 2 : 3;
  Eigen::MatrixXd A(m, p);
  Eigen::VectorXd y(m);
  for (Eigen::Index r = 0; r < m; ++r) {
    const Row& w = rows[static_cast<std::size_t>(r)];
    A(r, 0) = w.dT;
    if (air_C) {
      A(r, 1) = w.int_T - *air_C * w.dt;
    } else {
      A(r, 1) = w.int_T;
      A(r, 2) = -w.dt;
    }
    y[r] = w.heat;
  }
  // Columns scaled to unit norm so that J/K, W/K and W share one footing.
  Eigen::VectorXd scale = A.colwise().norm().transpose();
  for (Eigen::Index c = 0; c < p; ++c)
    if (scale[c] > 0) A.col(c) /= scale[c];
  const Eigen::ColPivHouseholderQR<Eigen::MatrixXd> qr(A);
  if (qr.rank() < p) {
    why = "the temperature and the heat in the log do not tell the heat capacity from the cooling (rank " +
          std::to_string(qr.rank()) + " of " + std::to_string(p) + ")";
    return std::nullopt;
  }
  Eigen::VectorXd theta = qr.solve(y);
  for (Eigen::Index c = 0; c < p; ++c) theta[c] /= scale[c];
  out.heat_capacity_J_per_K = theta[0];
  out.hA_W_per_K = theta[1];
  out.air_C = air_C ? *air_C : (theta[1] > 0 ? theta[2] / theta[1] : 0.0);
  if (!(out.heat_capacity_J_per_K > 0.0) || !(out.hA_W_per_K >= 0.0) || !std::isfinite(out.air_C)) {
    why = "the fit gave a heat capacity of " + format_fixed(out.heat_capacity_J_per_K, 1) + " J/K and hA " +
          format_fixed(out.hA_W_per_K, 4) + " W/K (expected both positive): the log's temperature does not follow its heat";
    return std::nullopt;
  }
  // Re-run the fitted model along the log: C·dT/dt = q − hA·(T − T_air), exact per interval
  // for a constant q.
  double sum2 = 0.0, worst = 0.0;
  std::size_t counted = 0, current_section = 0;
  double T_model = 0.0, heat_prev = 0.0;
  const double tau = out.hA_W_per_K > 0 ? out.heat_capacity_J_per_K / out.hA_W_per_K : 0.0;
  for (std::size_t r = 0; r < rows.size(); ++r) {
    const std::size_t k = row_index[r];
    if (section_of[r] != current_section) {  // the section's first row sets the start
      current_section = section_of[r];
      T_model = log.temperature_C[k] - rows[r].dT;
      heat_prev = 0.0;
    }
    const double dt = r > 0 && section_of[r - 1] == section_of[r] ? rows[r].dt - rows[r - 1].dt : rows[r].dt;
    const double q = dt > 0 ? (rows[r].heat - heat_prev) / dt : 0.0;
    heat_prev = rows[r].heat;
    if (tau > 0) {
      const double T_inf = out.air_C + q / out.hA_W_per_K;
      T_model = T_inf + (T_model - T_inf) * std::exp(-dt / tau);
    } else {
      T_model += q * dt / out.heat_capacity_J_per_K;
    }
    const double e = T_model - log.temperature_C[k];
    sum2 += e * e;
    worst = std::max(worst, std::fabs(e));
    ++counted;
  }
  out.rmse_K = std::sqrt(sum2 / static_cast<double>(std::max<std::size_t>(1, counted)));
  out.max_error_K = worst;
  return out;
}

}  // namespace sortie::fit
