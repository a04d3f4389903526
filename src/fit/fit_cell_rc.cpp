#include <algorithm>
#include <cmath>
#include <functional>

#include "core/text.hpp"
#include "fit/fit_cell_steps.hpp"

namespace sortie::fit::detail {

namespace {

/// The smallest voltage change between rows: the logger's resolution (or less, for a log
/// written with more digits than the instrument has).
double voltage_resolution(const battery::CellLog& log) {
  double r = 1e300;
  for (std::size_t k = 1; k < log.size(); ++k) {
    const double d = std::fabs(log.voltage_V[k] - log.voltage_V[k - 1]);
    if (d > 1e-9) r = std::min(r, d);
  }
  return r < 1e299 ? r : 0.0;
}

/// Knots at the median SoC of clusters of current steps, each cluster at most `band` wide.
std::vector<double> step_knots(const std::vector<CurrentStep>& steps, double band) {
  std::vector<double> s;
  for (const auto& st : steps) s.push_back(std::clamp(st.soc, 0.0, 1.0));
  std::sort(s.begin(), s.end());
  std::vector<double> knots;
  for (std::size_t i = 0; i < s.size();) {
    std::size_t j = i;
    while (j + 1 < s.size() && s[j + 1] - s[i] <= band) ++j;
    const double k = s[i + (j - i) / 2];
    if (!knots.empty() && k - knots.back() < 0.5 * band) knots.back() = 0.5 * (knots.back() + k);
    else knots.push_back(k);
    i = j + 1;
  }
  if (knots.empty()) knots.push_back(0.5);
  return knots;
}

RcSolution fast_pair_first(RcSolution s, int nrc) {
  if (nrc == 2 && s.t.tau_s[0][0] > s.t.tau_s[1][0]) {
    std::swap(s.t.tau_s[0], s.t.tau_s[1]);
    std::swap(s.t.r_ohm[0], s.t.r_ohm[1]);
  }
  return s;
}

}  // namespace

double FitWork::rows_counted() const { return static_cast<double>(std::count(use.begin(), use.end(), 1)); }

RcProblem FitWork::problem(const std::vector<double>& k, bool tau_tab, bool free_ocv, const std::vector<char>* mask) {
  RcProblem p(log, soc(), first_ocv->ocv, k, nrc, mask ? *mask : use, RcProblem::RowMerge::held_current);
  out.rows_evaluated = p.rows_evaluated();
  if (!tau_tab)
    for (int q = 0; q < nrc; ++q) p.set_shared(2 + 2 * q, true);
  if (free_ocv) p.free_ocv(grid, 0.0);
  return p;
}

// Penalty weights from the data's own information: ρ² = 10⁻³ of the largest diagonal of JᵀJ
// (knots) and 10⁻³ of the largest OCV diagonal (the OCV's second difference), so they only decide
// what the data leave open.
Fit FitWork::solve(const RcSolution& start, const RcBounds& b, bool tau_tab, bool free_ocv, const std::vector<char>* mask) {
  RcProblem p = problem(start.t.knots, tau_tab, free_ocv, mask);
  const std::array<double, 2> info = p.information_scale(start);
  if (start.t.knots.size() > 1) p.set_smoothing(std::sqrt(1e-3 * std::max(1e-30, info[0])));
  if (free_ocv) p.free_ocv(grid, std::sqrt(1e-3 * std::max(1e-30, info[1])));
  const LmResult r = p.solve(start, b, lm);
  iterations += r.iterations;
  if (r.status != LmStatus::converged) out.status = r.status;
  Fit f;
  f.s = p.from_z(r.x);
  f.cost = p.data_cost(f.s);
  return f;
}

/// The bounds of the resistances and time constants: τ from half the sampling interval at the
/// steps to the longest rest (or a quarter of the log).
void rc_bounds(FitWork& w) {
  w.bounds.r_min_ohm = std::max(1e-8, w.r0_step * 1e-4);
  w.bounds.r_max_ohm = std::max(10.0, w.r0_step * 100.0);
  w.tau_min = std::max(0.05, 0.5 * w.dt_step);
  w.tau_max = std::max(20.0 * w.tau_min, std::min(1e5, std::max(w.longest_rest, 0.25 * w.out.duration_s)));
  w.bounds.tau_min_s = {w.tau_min, w.tau_min};
  w.bounds.tau_max_s = {w.tau_max, w.tau_max};
  w.lm.max_iterations = w.opts.max_iterations;
  w.block = log_blocks(w.log, w.rests, w.opts.rest_min_s, w.nblocks);
}

/// Step 4: constant R0, R_p, τ_p and the OCV, from several starting time constants.
void fit_constants(FitWork& w) {
  const std::vector<std::array<double, 2>> starts =
      w.nrc == 2 ? std::vector<std::array<double, 2>>{{2, 60}, {8, 200}, {20, 600}, {1, 20}}
                 : std::vector<std::array<double, 2>>{{5, 0}, {30, 0}, {150, 0}, {600, 0}};
  w.constants = Fit{};
  for (const auto& st : starts) {
    const std::array<double, 2> tau{std::clamp(st[0], w.tau_min, w.tau_max), std::clamp(st[1], w.tau_min, w.tau_max)};
    RcSolution s0;
    s0.t = RcTables::constant({0.5}, w.nrc, w.r0_step, {0.5 * w.r0_step, 0.5 * w.r0_step}, tau);
    const Fit f = w.solve(s0, w.bounds, false, true);
    if (f.cost < w.constants.cost) w.constants = f;
  }
  w.constants.s = fast_pair_first(w.constants.s, w.nrc);
}

/// The number of RC pairs and the time constants' upper bound, when not given: of one pair up to
/// the longest rest, and two pairs up to it, to 1800 s and to 300 s, the structure whose
/// constants predict the held-out blocks best (a simpler one is kept unless another is better by
/// more than 5 %). The cap keeps the long rests' slow relaxation out of the load pairs when that
/// predicts the loads better.
void choose_rc_structure(FitWork& w) {
  if (w.opts.rc_pairs != 0 || w.nblocks < 2) {
    w.out.n_rc = w.nrc = w.opts.rc_pairs != 0 ? w.opts.rc_pairs : 2;
    fit_constants(w);
    return;
  }
  const double full = w.tau_max;
  std::vector<RcCandidate> cands = {{1, full}, {2, std::min(full, 300.0)}, {2, std::min(full, 1800.0)}, {2, full}};
  std::vector<Fit> fits;
  std::size_t best = 0;
  for (std::size_t c = 0; c < cands.size(); ++c) {
    if (c > 0 && cands[c].tau_max_s <= cands[c - 1].tau_max_s * 1.0001 && cands[c].rc_pairs == cands[c - 1].rc_pairs) {
      cands[c].held_out_rmse_V = cands[c - 1].held_out_rmse_V, fits.push_back(fits.back());
      continue;  // the same structure
    }
    w.nrc = cands[c].rc_pairs;
    w.tau_max = std::max(20.0 * w.tau_min, cands[c].tau_max_s);
    w.bounds.tau_max_s = {w.tau_max, w.tau_max};
    fit_constants(w);
    std::size_t rows = 0;
    cands[c].held_out_rmse_V = held_out_rmse(w, w.constants.s, w.bounds, false, rows);
    fits.push_back(w.constants);
    if (cands[c].held_out_rmse_V < 0.95 * cands[best].held_out_rmse_V) best = c;
  }
  cands[best].chosen = true;
  w.out.n_rc = w.nrc = cands[best].rc_pairs;
  w.tau_max = std::max(20.0 * w.tau_min, cands[best].tau_max_s);
  w.bounds.tau_max_s = {w.tau_max, w.tau_max};
  w.constants = fits[best];
  w.out.rc_candidates = cands;
  w.out.notes.push_back(std::to_string(w.nrc) + " RC pair(s) with time constants up to " + format_fixed(w.tau_max, 0) +
                        " s: the lowest held-out error of the constants among the structures tried (" +
                        format_fixed(1000.0 * cands[best].held_out_rmse_V, 2) + " mV; give --rc to fix the count)");
}

/// Step 5: tables over SoC bands. Knots where the log excites the cell: current steps grouped
/// into clusters no wider than one band, a knot at each cluster's median SoC (a table whose knots
/// sit between the pulses could only fit their blend, not each value).
void fit_tables(FitWork& w) {
  w.knots = step_knots(w.steps, w.opts.soc_band);
  w.tb = w.bounds;
  const RcTables& c = w.constants.s.t;
  if (w.nrc == 2) {
    // Keep the pairs apart: the fast one below the geometric mean of the two constants' τ.
    const double split = std::sqrt(c.tau_s[0][0] * c.tau_s[1][0]);
    w.tb.tau_max_s[0] = std::max(w.tau_min * 1.01, split);
    w.tb.tau_min_s[1] = std::min(w.tau_max / 1.01, split);
  }
  if (w.knots.size() <= 1) return;
  // Resistances over SoC, time constants shared.
  RcSolution s0;
  s0.t = RcTables::constant(w.knots, w.nrc, c.r0_ohm[0], {c.r_ohm[0][0], w.nrc == 2 ? c.r_ohm[1][0] : 0.0},
                            {c.tau_s[0][0], w.nrc == 2 ? c.tau_s[1][0] : 1.0});
  s0.ocv_V = w.constants.s.ocv_V;
  w.tables = w.solve(s0, w.tb, false, true);
  // Time constants over SoC too, where the data support them: the fit RMSE must fall by more
  // than the log's voltage resolution and by 10 % (a gain below what the logger can show is no
  // evidence, and fewer free time constants extrapolate to other currents more safely).
  if (w.knots.size() < 3) return;
  const Fit per_band = w.solve(w.tables.s, w.tb, true, true);
  const double rmse_shared = std::sqrt(2.0 * w.tables.cost / w.rows_counted());
  const double rmse_band = std::sqrt(2.0 * per_band.cost / w.rows_counted());
  const double resolution = voltage_resolution(w.log);
  if (rmse_shared - rmse_band > std::max(resolution, 0.1 * rmse_shared)) {
    w.tau_tables = true;
    w.tables = per_band;
  } else {
    w.out.notes.push_back("time constants shared by all SoC bands: one per band lowered the fit RMSE from " +
                          format_fixed(1000.0 * rmse_shared, 2) + " to " + format_fixed(1000.0 * rmse_band, 2) +
                          " mV only (voltage resolution " + format_fixed(1000.0 * resolution, 2) + " mV)");
  }
}

namespace {

/// One band's values, its current steps and rows, and whether its estimates are tight enough.
BandFit band_at(FitWork& w, std::size_t j, const std::function<double(int, std::size_t)>& se_of) {
  const std::vector<double>& knots = w.knots;
  auto band_of = [&](double s) {
    const auto it = std::min_element(knots.begin(), knots.end(),
                                     [&](double a, double b) { return std::fabs(a - s) < std::fabs(b - s); });
    return static_cast<std::size_t>(it - knots.begin());
  };
  BandFit b;
  b.soc = knots[j];
  b.soc_lo = j == 0 ? 0.0 : 0.5 * (knots[j - 1] + knots[j]);
  b.soc_hi = j + 1 == knots.size() ? 1.0 : 0.5 * (knots[j] + knots[j + 1]);
  const RcTables& t = w.tables.s.t;
  b.r0_ohm = t.r0_ohm[j];
  b.se_r0 = se_of(0, j);
  for (int p = 0; p < w.nrc; ++p) {
    b.r_ohm[p] = t.r_ohm[p][j];
    b.tau_s[p] = t.tau_s[p][j];
    b.se_r[p] = se_of(1 + 2 * p, j);
    b.se_tau[p] = se_of(2 + 2 * p, j);
  }
  std::vector<double> r_band;
  for (const auto& st : w.steps)
    if (band_of(st.soc) == j) {
      ++b.steps;
      if (st.r_ohm > 0) r_band.push_back(st.r_ohm);
    }
  b.r0_step_ohm = median(r_band);
  for (double sv : w.soc())
    if (band_of(sv) == j) ++b.rows;
  // Too little excitation: estimates looser than 10 % (R0) or 30 % (R_p, τ_p), one standard
  // error (every knot holds current steps by construction).
  bool loose = b.se_r0 > 0.10;
  for (int p = 0; p < w.nrc; ++p) loose = loose || b.se_r[p] > 0.30 || b.se_tau[p] > 0.30;
  if (loose) {
    b.excited = false;
    b.why = "standard error R0 " + format_fixed(100 * b.se_r0, 0) + " %";
    for (int p = 0; p < w.nrc; ++p)
      b.why += ", R" + std::to_string(p + 1) + " " + format_fixed(100 * b.se_r[p], 0) + " %, tau" + std::to_string(p + 1) +
               " " + format_fixed(100 * b.se_tau[p], 0) + " %";
  }
  return b;
}

}  // namespace

/// Step 6: per band, standard errors from the Gauss–Newton covariance of the log-parameters,
/// σ²·(JᵀJ)⁻¹ with σ² = Σe²/(N − p).
void band_excitation(FitWork& w) {
  w.out.bands.clear();
  w.excited = 0;
  if (w.knots.size() <= 1) return;
  RcProblem pf = w.problem(w.knots, w.tau_tables, true);
  const std::array<double, 2> info = pf.information_scale(w.tables.s);
  pf.set_smoothing(std::sqrt(1e-3 * std::max(1e-30, info[0])));
  pf.free_ocv(w.grid, std::sqrt(1e-3 * std::max(1e-30, info[1])));
  const Eigen::VectorXd z = pf.to_z(w.tables.s);
  NormalEquations full;
  pf.evaluate(z, true, full, true);
  const double dof = std::max(1.0, static_cast<double>(pf.rows_used()) - static_cast<double>(pf.n_free()));
  const Eigen::MatrixXd cov =
      (2.0 * w.tables.cost / dof) * full.jtj.ldlt().solve(Eigen::MatrixXd::Identity(pf.n_free(), pf.n_free()));
  auto se_of = [&](int type, std::size_t j) {
    const Eigen::Index i = pf.free_index(type, j);
    return std::sqrt(std::max(0.0, cov(i, i)));
  };
  for (std::size_t j = 0; j < w.knots.size(); ++j) {
    const BandFit b = band_at(w, j, se_of);
    if (b.excited) ++w.excited;
    w.out.bands.push_back(b);
  }
}

/// Tables when at least two bands are excited, else the constants (one band for the report).
void choose_structure(FitWork& w) {
  CellFitResult& out = w.out;
  out.tables = w.excited >= 2;
  out.tau_tables = out.tables && w.tau_tables;
  out.fit_rmse_V = std::sqrt(2.0 * (out.tables ? w.tables.cost : w.constants.cost) / std::max(1.0, w.rows_counted()));
  if (out.tables) return;
  if (w.knots.size() > 1)
    out.warnings.push_back("only " + std::to_string(w.excited) +
                           " SoC band(s) have enough excitation: constant R0 and RC pairs written");
  else
    out.notes.push_back("the current steps all lie within one SoC band: constant R0 and RC pairs written");
  const RcTables& t = w.constants.s.t;
  BandFit b;
  b.soc = 0.5;
  b.soc_lo = 0.0;
  b.soc_hi = 1.0;
  b.r0_ohm = t.r0_ohm[0];
  for (int p = 0; p < w.nrc; ++p) b.r_ohm[p] = t.r_ohm[p][0], b.tau_s[p] = t.tau_s[p][0];
  b.r0_step_ohm = w.r0_step;
  b.steps = w.steps.size();
  b.rows = w.n;
  out.bands = {b};
}

double held_out_rmse(FitWork& w, const RcSolution& start, const RcBounds& b, bool tau_tab, std::size_t& rows) {
  rows = 0;
  if (w.nblocks < 2) return 0.0;
  double cost = 0.0;
  for (int f = 0; f < 2; ++f) {
    std::vector<char> train = w.use, held(w.n, 0);
    for (std::size_t k = 0; k < w.n; ++k)
      if (w.use[k] && w.block[k] >= 0 && w.block[k] % 2 == f) train[k] = 0, held[k] = 1;
    const Fit tf = w.solve(start, b, tau_tab, true, &train);
    RcProblem ph = w.problem(tf.s.t.knots, tau_tab, true, &held);
    cost += ph.data_cost(tf.s);
    rows += ph.rows_used();
  }
  return rows ? std::sqrt(2.0 * cost / static_cast<double>(rows)) : 0.0;
}

/// Held-out check: two folds over the blocks between long rests; each fold refits the final
/// structure without the other's load rows and predicts them (rests kept in both).
void held_out_check(FitWork& w) {
  CellFitResult& out = w.out;
  out.held_out_blocks = static_cast<std::size_t>(w.nblocks);
  if (w.nblocks < 2) {
    out.warnings.push_back("the log has fewer than two blocks between rests of " + format_fixed(w.opts.rest_min_s, 0) +
                           " s: no held-out check; the quality gate judges the re-simulation alone");
    return;
  }
  out.held_out_rmse_V = held_out_rmse(w, w.final_s(), w.final_bounds(), out.tau_tables, out.held_out_rows);
}

/// Warnings on the fit: SoC stretches without current steps, bands with loose estimates, the
/// solver's status, time constants at a bound.
void fit_warnings(FitWork& w) {
  CellFitResult& out = w.out;
  if (out.tables) {
    std::vector<double> edges = {0.0};
    for (double k : w.knots) edges.push_back(k);
    edges.push_back(1.0);
    for (std::size_t i = 0; i + 1 < edges.size(); ++i) {
      const bool end = i == 0 || i + 2 == edges.size();
      if (edges[i + 1] - edges[i] > (end ? 1.0 : 2.0) * w.opts.soc_band + 1e-9)
        out.warnings.push_back("no current steps between SoC " + format_fixed(edges[i], 2) + " and " +
                               format_fixed(edges[i + 1], 2) +
                               ": too little excitation there; the parameters follow the nearest band");
    }
  }
  for (const auto& b : out.bands)
    if (!b.excited)
      out.warnings.push_back("SoC band " + format_fixed(b.soc_lo, 2) + "-" + format_fixed(b.soc_hi, 2) +
                             ": too little excitation (" + b.why + "); its values follow the neighbouring bands");
  out.iterations = w.iterations;
  if (out.status != LmStatus::converged)
    out.warnings.push_back(std::string("the parameter fit ended with '") + to_string(out.status) +
                           "'; the best parameters found are written");
  const RcBounds& used = w.final_bounds();
  for (int p = 0; p < w.nrc; ++p)
    for (double t : w.final_s().t.tau_s[p])
      if (t <= used.tau_min_s[p] * 1.001 || t >= used.tau_max_s[p] / 1.001) {
        out.warnings.push_back("tau" + std::to_string(p + 1) + " reached a bound of the fit (" + format_fixed(t, 2) +
                               " s): the log may not resolve it");
        break;
      }
}

}  // namespace sortie::fit::detail
