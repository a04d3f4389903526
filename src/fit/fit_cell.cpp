#include "fit/fit_cell.hpp"

#include <algorithm>
#include <cmath>
#include <filesystem>
#include <limits>
#include <numeric>

#include "core/error.hpp"
#include "core/text.hpp"
#include "fit/chemistry.hpp"
#include "fit/ocv.hpp"
#include "fit/rc_fit.hpp"

namespace sortie::fit {

namespace {

const double kNaN = std::numeric_limits<double>::quiet_NaN();

double median(std::vector<double> v) {
  if (v.empty()) return kNaN;
  const auto mid = v.begin() + static_cast<std::ptrdiff_t>(v.size() / 2);
  std::nth_element(v.begin(), mid, v.end());
  return *mid;
}

/// The fitted OCV grid: every 1 % SoC over 0..1 and whatever the log covers beyond (a log may
/// start below its own "empty" point); thinned to 0..1 when written (ocv_table_from_grid).
std::vector<double> ocv_grid(double s_lo, double s_hi) {
  const int lo = static_cast<int>(std::floor(std::min(0.0, s_lo) * 100.0 - 1e-9));
  const int hi = static_cast<int>(std::ceil(std::max(1.0, s_hi) * 100.0 + 1e-9));
  std::vector<double> g;
  for (int i = std::max(lo, -50); i <= std::min(hi, 150); ++i) g.push_back(i / 100.0);
  return g;
}

/// Rest-end and low-rate loaded OCV estimates with a drop added back: OCV ≈ V + drop. They start
/// the joint fit and give the first OCV (fit/ocv).
void ocv_points(const CellLog& log, const std::vector<double>& soc, const std::vector<Rest>& rests,
                const std::vector<double>& drop, double rest_min_s, double i_rest, double i_low,
                double settle_s, std::vector<OcvPoint>& rest_pts, std::vector<OcvPoint>& loaded_pts) {
  rest_pts.clear();
  loaded_pts.clear();
  for (const Rest& r : rests)
    if (r.duration_s >= rest_min_s) rest_pts.push_back({soc[r.last], log.voltage_V[r.last] + drop[r.last]});
  // Loaded rows: discharge at a low rate, steady for settle_s (charge rows only when the log
  // has no low-rate discharge: charge and discharge OCV differ by hysteresis).
  for (int pass = 0; pass < 2 && loaded_pts.empty(); ++pass) {
    const double sign = pass == 0 ? 1.0 : -1.0;
    double since = 0.0;
    for (std::size_t k = 0; k < log.size(); ++k) {
      const double i = sign * log.current_A[k];
      if (k == 0 || log.starts_section(k) ||
          std::fabs(log.current_A[k] - log.current_A[k - 1]) > 0.02 * std::fabs(log.current_A[k]) + 1e-9) {
        since = 0.0;
        continue;
      }
      since += log.time_s[k] - log.time_s[k - 1];
      if (i > i_rest && i <= i_low && since >= settle_s) loaded_pts.push_back({soc[k], log.voltage_V[k] + drop[k]});
    }
  }
}

/// The smallest voltage change between rows: the logger's resolution (or less, for a log
/// written with more digits than the instrument has).
double voltage_resolution(const CellLog& log) {
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

/// Rows of long charges (more than 2 % of the capacity in one go) and the rests after them: they
/// sit on the charge branch of the OCV hysteresis loop while the fitted OCV is the discharge
/// branch (common practice; Plett 2015, ch. 2, "hysteresis"). Simulated, not counted.
std::vector<char> rows_to_count(const CellLog& log, const SocEstimate& se) {
  const std::size_t n = log.size();
  std::vector<char> use(n, 1);
  std::size_t k = 0;
  while (k < n) {
    if (log.current_A[k] >= -se.i_rest_A) {
      ++k;
      continue;
    }
    std::size_t e = k;
    while (e + 1 < n && !log.starts_section(e + 1) && log.current_A[e + 1] < -se.i_rest_A) ++e;
    if (std::fabs(se.charge_Ah[e] - (k > 0 ? se.charge_Ah[k - 1] : 0.0)) > 0.02 * se.capacity_Ah) {
      while (e + 1 < n && !log.starts_section(e + 1) && std::fabs(log.current_A[e + 1]) <= se.i_rest_A) ++e;
      for (std::size_t r = k; r <= e; ++r) use[r] = 0;
    }
    k = e + 1;
  }
  // Long-rest tails: rows of a rest later than kRestTailS after its load, except the last
  // kRestEndS of it (the OCV there), are not counted — a cell relaxing for an hour shows slow
  // diffusion and hysteresis that two RC pairs fitted to it would carry into every load.
  for (std::size_t r = 0; r < n;) {
    if (std::fabs(log.current_A[r]) > se.i_rest_A) {
      ++r;
      continue;
    }
    std::size_t e = r;
    while (e + 1 < n && !log.starts_section(e + 1) && std::fabs(log.current_A[e + 1]) <= se.i_rest_A) ++e;
    const double t0 = r > 0 && !log.starts_section(r) ? log.time_s[r - 1] : log.time_s[r];
    for (std::size_t q = r; q <= e; ++q)
      if (log.time_s[q] - t0 > kRestTailS && log.time_s[e] - log.time_s[q] > kRestEndS) use[q] = 0;
    r = e + 1;
  }
  return use;
}

/// Blocks of a log for the held-out check: the rows between two long rests (at least
/// `rest_min_s`) form one block; the long rests themselves belong to none (-1), so that every
/// fold keeps the rest ends that fix the OCV.
std::vector<int> log_blocks(const CellLog& log, const std::vector<Rest>& rests, double rest_min_s, int& count) {
  std::vector<int> b(log.size(), 0);
  int block = 0;
  std::size_t k = 0;
  bool in_block = false;
  for (const Rest& r : rests) {
    if (r.duration_s < rest_min_s) continue;
    for (; k < r.first; ++k) b[k] = block, in_block = true;
    for (; k <= r.last; ++k) b[k] = -1;
    if (in_block) ++block, in_block = false;
  }
  for (; k < log.size(); ++k) b[k] = block, in_block = true;
  count = block + (in_block ? 1 : 0);
  return b;
}

}  // namespace

namespace {

CellFitResult fit_impl(const CellLog& log, const CellFitOptions& opts, const SocEstimate* given) {
  CellFitResult out;
  out.files = {log.file};
  const std::size_t n = log.size();
  out.rows = n;
  out.sections = log.section_starts.size();
  out.n_rc = opts.rc_pairs;
  out.notes = log.notes;
  out.warnings = log.warnings;
  if (n < 10)
    throw InputError(log.file + ": too few rows to fit a model (got " + std::to_string(n) + ", expected at least 10)");

  // --- the log at a glance; logs that cannot give a model ---
  double imax = 0.0;
  const double ifirst = log.current_A[0];
  bool changes = false;
  for (double i : log.current_A) {
    imax = std::max(imax, std::fabs(i));
    if (std::fabs(i - ifirst) > 1e-9) changes = true;
  }
  if (imax == 0.0)
    throw InputError(log.file + ": the current is zero in every row (got " + std::to_string(n) +
                     " rows at 0 A, expected a test that charges or discharges the cell): nothing to fit");
  out.duration_s = log.time_s.back() - log.time_s.front();
  out.dt_min_s = 1e300;
  out.dt_max_s = 0.0;
  for (std::size_t k = 1; k < n; ++k) {
    if (log.starts_section(k)) continue;
    const double dt = log.time_s[k] - log.time_s[k - 1];
    out.dt_min_s = std::min(out.dt_min_s, dt);
    out.dt_max_s = std::max(out.dt_max_s, dt);
  }
  const double min_step = 0.05 * imax;
  if (!changes || find_current_steps(log, std::vector<double>(n, 0.5), min_step).empty())
    throw InputError(log.file + ": the current never changes (got " + format_fixed(ifirst, 3) + " A in every row" +
                     (changes ? " within 5 %" : "") +
                     ", expected current steps such as pulses or rests): R0 and the RC pairs cannot be "
                     "told apart from the open-circuit voltage");
  if (!log.temperature_C.empty()) {
    double s = 0.0, lo = 1e300, hi = -1e300;
    std::size_t m = 0;
    for (double t : log.temperature_C)
      if (std::isfinite(t)) s += t, lo = std::min(lo, t), hi = std::max(hi, t), ++m;
    if (m > 0) {
      out.has_temperature = true;
      out.temperature_mean_C = s / static_cast<double>(m);
      out.temperature_min_C = lo;
      out.temperature_max_C = hi;
      if (hi - lo > 10.0)
        out.warnings.push_back("the cell temperature spans " + format_fixed(lo, 1) + " to " + format_fixed(hi, 1) +
                               " °C: one set of parameters is fitted for all of it");
    }
  }

  // --- 1. SoC ---
  SocOptions so = opts.soc;
  if (so.chemistry.empty()) so.chemistry = opts.chemistry;
  out.soc_estimate = given ? *given : estimate_soc(log, so);
  const SocEstimate& se = out.soc_estimate;
  out.soc = se.soc;
  for (const auto& w : se.warnings) out.warnings.push_back(w);
  for (const auto& w : se.notes) out.notes.push_back(w);
  if (se.chemistry) out.notes.push_back("chemistry " + se.chemistry->name + ", " + se.chemistry->how);
  const std::vector<double>& soc = out.soc;
  const double Q = se.capacity_Ah;
  const std::vector<char> use = rows_to_count(log, se);
  out.counted = use;
  const std::size_t counted = static_cast<std::size_t>(std::count(use.begin(), use.end(), 1));
  if (counted < 10)
    throw InputError(log.file + ": only " + std::to_string(counted) +
                     " rows outside long charges (got a log that is almost all charging, expected discharges, pulses "
                     "or rests: charge rows sit on the other branch of the OCV hysteresis and are not fitted)");

  // --- 2. steps and the first R0 ---
  const std::vector<CurrentStep> steps = find_current_steps(log, soc, min_step);
  out.steps = steps.size();
  std::vector<double> rs, dts;
  for (const auto& s : steps) {
    if (s.r_ohm > 0.0) rs.push_back(s.r_ohm);
    dts.push_back(s.dt_s);
  }
  if (rs.empty())
    throw InputError(log.file + ": at every current step the voltage moved the wrong way (got " +
                     std::to_string(steps.size()) +
                     " steps, expected the voltage to fall when the discharge current rises): check the "
                     "current sign (--discharge-positive / --discharge-negative)");
  const double r0_step = median(rs);
  const double dt_step = median(dts);

  // --- 3. rests and the first OCV ---
  const std::vector<Rest> rests = find_rests(log, se.i_rest_A);
  out.rests = rests.size();
  double longest_rest = 0.0;
  for (const Rest& r : rests) longest_rest = std::max(longest_rest, r.duration_s);
  const double i_low = opts.low_rate_C * Q;
  std::vector<OcvPoint> rest_pts, loaded_pts;
  {
    std::vector<double> drop(n);
    for (std::size_t k = 0; k < n; ++k) drop[k] = r0_step * log.current_A[k];
    ocv_points(log, soc, rests, drop, opts.rest_min_s, se.i_rest_A, i_low, 60.0, rest_pts, loaded_pts);
  }
  if (rest_pts.empty()) {
    if (loaded_pts.empty())
      throw InputError(log.file + ": no rest of " + format_fixed(opts.rest_min_s, 0) +
                       " s or more and no steady low-rate discharge (at most " + format_fixed(opts.low_rate_C, 2) +
                       " C), so the open-circuit voltage cannot be measured (got the longest rest " +
                       format_fixed(longest_rest, 0) + " s, expected rests or a slow discharge)");
    out.warnings.push_back("no rest of " + format_fixed(opts.rest_min_s, 0) + " s or more (longest " + format_fixed(longest_rest, 0) +
                           " s): the OCV is fitted from the loaded voltage alone, which leaves hysteresis in it; log "
                           "rests for a better model");
  }
  out.ocv_rest_points = rest_pts.size();
  out.ocv_loaded_points = loaded_pts.size();
  double s_lo = 1e300, s_hi = -1e300;  // SoC range of the rows counted
  for (std::size_t k = 0; k < n; ++k)
    if (use[k]) s_lo = std::min(s_lo, soc[k]), s_hi = std::max(s_hi, soc[k]);
  const std::vector<double> grid = ocv_grid(s_lo, s_hi);
  // The first OCV: rest ends and low-rate rows with the step R0 only, the low-rate curve shifted
  // through the rest points (fit/ocv).
  const std::optional<OcvTable> built = build_ocv(rest_pts, loaded_pts, grid);
  if (!built)
    throw InputError(log.file + ": the rests and low-rate rows lie outside the SoC range of the rows the fit counts (got SoC " +
                     format_fixed(s_lo, 3) + " to " + format_fixed(s_hi, 3) +
                     ", expected open-circuit points within it): check the known SoC points and --soc0");
  const OcvTable& first_ocv = *built;

  // --- 4. constants and the OCV, from several starting time constants ---
  const int nrc = opts.rc_pairs;
  RcBounds bounds;
  bounds.r_min_ohm = std::max(1e-8, r0_step * 1e-4);
  bounds.r_max_ohm = std::max(10.0, r0_step * 100.0);
  const double tau_min = std::max(0.05, 0.5 * dt_step);
  const double tau_max = std::max(20.0 * tau_min, std::min(1e5, std::max(longest_rest, 0.25 * out.duration_s)));
  bounds.tau_min_s = {tau_min, tau_min};
  bounds.tau_max_s = {tau_max, tau_max};
  LmOptions lm;
  lm.max_iterations = opts.max_iterations;
  int iterations = 0;
  auto note_status = [&](const LmResult& r) {
    iterations += r.iterations;
    if (r.status != LmStatus::converged) out.status = r.status;
  };
  auto order = [&](RcSolution s) {  // fast pair first
    if (nrc == 2 && s.t.tau_s[0][0] > s.t.tau_s[1][0]) {
      std::swap(s.t.tau_s[0], s.t.tau_s[1]);
      std::swap(s.t.r_ohm[0], s.t.r_ohm[1]);
    }
    return s;
  };
  struct Fit {
    RcSolution s;
    double cost = std::numeric_limits<double>::infinity();  ///< data only, ½Σe²
  };
  // A problem with the OCV free on the grid (or held at first_ocv), time constants shared across
  // knots unless `tau_tables`.
  auto problem = [&](const std::vector<double>& k, bool tau_tables, bool free_ocv, const std::vector<char>* mask = nullptr) {
    RcProblem p(log, soc, first_ocv.ocv, k, nrc, mask ? *mask : use, RcProblem::RowMerge::held_current);
    out.rows_evaluated = p.rows_evaluated();
    if (!tau_tables)
      for (int q = 0; q < nrc; ++q) p.set_shared(2 + 2 * q, true);
    if (free_ocv) p.free_ocv(grid, 0.0);
    return p;
  };
  // One Levenberg–Marquardt run. Penalty weights from the data's own information: ρ² = 10⁻³ of
  // the largest diagonal of JᵀJ (knots) and 10⁻³ of the largest OCV diagonal (the OCV's second
  // difference), so they only decide what the data leave open.
  auto solve = [&](const RcSolution& start, const RcBounds& b, bool tau_tables, bool free_ocv,
                   const std::vector<char>* mask = nullptr) {
    RcProblem p = problem(start.t.knots, tau_tables, free_ocv, mask);
    const std::array<double, 2> info = p.information_scale(start);
    if (start.t.knots.size() > 1) p.set_smoothing(std::sqrt(1e-3 * std::max(1e-30, info[0])));
    if (free_ocv) p.free_ocv(grid, std::sqrt(1e-3 * std::max(1e-30, info[1])));
    const LmResult r = p.solve(start, b, lm);
    note_status(r);
    Fit f;
    f.s = p.from_z(r.x);
    f.cost = p.data_cost(f.s);
    return f;
  };

  Fit constants;
  {
    const std::vector<std::array<double, 2>> starts =
        nrc == 2 ? std::vector<std::array<double, 2>>{{2, 60}, {8, 200}, {20, 600}, {1, 20}}
                 : std::vector<std::array<double, 2>>{{5, 0}, {30, 0}, {150, 0}, {600, 0}};
    for (const auto& st : starts) {
      const std::array<double, 2> tau{std::clamp(st[0], tau_min, tau_max), std::clamp(st[1], tau_min, tau_max)};
      RcSolution s0;
      s0.t = RcTables::constant({0.5}, nrc, r0_step, {0.5 * r0_step, 0.5 * r0_step}, tau);
      const Fit f = solve(s0, bounds, false, true);
      if (f.cost < constants.cost) constants = f;
    }
  }
  constants.s = order(constants.s);

  // --- 5. tables over SoC bands ---
  // Knots where the log excites the cell: current steps grouped into clusters no wider than one
  // band, a knot at each cluster's median SoC (a table whose knots sit between the pulses could
  // only fit their blend, not each value).
  const std::vector<double> knots = step_knots(steps, opts.soc_band);
  RcBounds tb = bounds;
  if (nrc == 2) {
    // Keep the pairs apart: the fast one below the geometric mean of the two constants' τ.
    const double split = std::sqrt(constants.s.t.tau_s[0][0] * constants.s.t.tau_s[1][0]);
    tb.tau_max_s[0] = std::max(tau_min * 1.01, split);
    tb.tau_min_s[1] = std::min(tau_max / 1.01, split);
  }
  Fit tables;
  bool tau_tables = false;
  if (knots.size() > 1) {
    // Resistances over SoC, time constants shared.
    RcSolution s0;
    const RcTables& c = constants.s.t;
    s0.t = RcTables::constant(knots, nrc, c.r0_ohm[0], {c.r_ohm[0][0], nrc == 2 ? c.r_ohm[1][0] : 0.0},
                              {c.tau_s[0][0], nrc == 2 ? c.tau_s[1][0] : 1.0});
    s0.ocv_V = constants.s.ocv_V;
    tables = solve(s0, tb, false, true);
    // Time constants over SoC too, where the data support them: the fit RMSE must fall by more
    // than the log's voltage resolution and by 10 % (a gain below what the logger can show is no
    // evidence, and fewer free time constants extrapolate to other currents more safely).
    if (knots.size() >= 3) {
      const Fit per_band = solve(tables.s, tb, true, true);
      const double rows_used = static_cast<double>(std::count(use.begin(), use.end(), 1));
      const double rmse_shared = std::sqrt(2.0 * tables.cost / rows_used);
      const double rmse_band = std::sqrt(2.0 * per_band.cost / rows_used);
      const double resolution = voltage_resolution(log);
      if (rmse_shared - rmse_band > std::max(resolution, 0.1 * rmse_shared)) {
        tau_tables = true;
        tables = per_band;
      } else {
        out.notes.push_back("time constants shared by all SoC bands: one per band lowered the fit RMSE from " +
                            format_fixed(1000.0 * rmse_shared, 2) + " to " + format_fixed(1000.0 * rmse_band, 2) +
                            " mV only (voltage resolution " + format_fixed(1000.0 * resolution, 2) + " mV)");
      }
    }
  }

  // --- 6. excitation per band ---
  std::vector<BandFit> bands;
  std::size_t excited = 0;
  if (knots.size() > 1) {
    RcProblem pf = problem(knots, tau_tables, true);
    const std::array<double, 2> info = pf.information_scale(tables.s);
    pf.set_smoothing(std::sqrt(1e-3 * std::max(1e-30, info[0])));
    pf.free_ocv(grid, std::sqrt(1e-3 * std::max(1e-30, info[1])));
    const Eigen::VectorXd z = pf.to_z(tables.s);
    NormalEquations full;
    pf.evaluate(z, true, full, true);
    const double dof = std::max(1.0, static_cast<double>(pf.rows_used()) - static_cast<double>(pf.n_free()));
    // Gauss–Newton covariance of the log-parameters: σ²·(JᵀJ)⁻¹ with σ² = Σe²/(N − p).
    const Eigen::MatrixXd cov =
        (2.0 * tables.cost / dof) * full.jtj.ldlt().solve(Eigen::MatrixXd::Identity(pf.n_free(), pf.n_free()));
    auto band_of = [&](double s) {
      const auto it = std::min_element(knots.begin(), knots.end(),
                                       [&](double a, double b) { return std::fabs(a - s) < std::fabs(b - s); });
      return static_cast<std::size_t>(it - knots.begin());
    };
    for (std::size_t j = 0; j < knots.size(); ++j) {
      BandFit b;
      b.soc = knots[j];
      b.soc_lo = j == 0 ? 0.0 : 0.5 * (knots[j - 1] + knots[j]);
      b.soc_hi = j + 1 == knots.size() ? 1.0 : 0.5 * (knots[j] + knots[j + 1]);
      const RcTables& t = tables.s.t;
      b.r0_ohm = t.r0_ohm[j];
      auto se_of = [&](int type) {
        const Eigen::Index i = pf.free_index(type, j);
        return std::sqrt(std::max(0.0, cov(i, i)));
      };
      b.se_r0 = se_of(0);
      for (int p = 0; p < nrc; ++p) {
        b.r_ohm[p] = t.r_ohm[p][j];
        b.tau_s[p] = t.tau_s[p][j];
        b.se_r[p] = se_of(1 + 2 * p);
        b.se_tau[p] = se_of(2 + 2 * p);
      }
      std::vector<double> r_band;
      for (const auto& st : steps)
        if (band_of(st.soc) == j) {
          ++b.steps;
          if (st.r_ohm > 0) r_band.push_back(st.r_ohm);
        }
      b.r0_step_ohm = median(r_band);
      for (double sv : soc)
        if (band_of(sv) == j) ++b.rows;
      // Too little excitation: estimates looser than 10 % (R0) or 30 % (R_p, τ_p), one standard
      // error (every knot holds current steps by construction).
      bool loose = b.se_r0 > 0.10;
      for (int p = 0; p < nrc; ++p) loose = loose || b.se_r[p] > 0.30 || b.se_tau[p] > 0.30;
      if (loose) {
        b.excited = false;
        b.why = "standard error R0 " + format_fixed(100 * b.se_r0, 0) + " %";
        for (int p = 0; p < nrc; ++p)
          b.why += ", R" + std::to_string(p + 1) + " " + format_fixed(100 * b.se_r[p], 0) + " %, tau" +
                   std::to_string(p + 1) + " " + format_fixed(100 * b.se_tau[p], 0) + " %";
      }
      if (b.excited) ++excited;
      bands.push_back(b);
    }
  }
  out.tables = excited >= 2;
  const RcSolution& final_s = out.tables ? tables.s : constants.s;
  const RcTables& final_t = final_s.t;
  if (!out.tables) {
    if (knots.size() > 1)
      out.warnings.push_back("only " + std::to_string(excited) +
                             " SoC band(s) have enough excitation: constant R0 and RC pairs written");
    else
      out.notes.push_back("the current steps all lie within one SoC band: constant R0 and RC pairs written");
    BandFit b;  // one band for the report: the whole range
    b.soc = 0.5;
    b.soc_lo = 0.0;
    b.soc_hi = 1.0;
    b.r0_ohm = final_t.r0_ohm[0];
    for (int p = 0; p < nrc; ++p) b.r_ohm[p] = final_t.r_ohm[p][0], b.tau_s[p] = final_t.tau_s[p][0];
    b.r0_step_ohm = r0_step;
    b.steps = steps.size();
    b.rows = n;
    bands = {b};
  }
  out.bands = bands;
  out.tau_tables = out.tables && tau_tables;
  out.fit_rmse_V = std::sqrt(2.0 * (out.tables ? tables.cost : constants.cost) /
                             std::max<double>(1.0, static_cast<double>(std::count(use.begin(), use.end(), 1))));
  // --- held-out check: two folds over the blocks between long rests; each fold refits the
  // final structure without the other's load rows and predicts them (rests kept in both) ---
  {
    int nblocks = 0;
    const std::vector<int> block = log_blocks(log, rests, opts.rest_min_s, nblocks);
    out.held_out_blocks = static_cast<std::size_t>(nblocks);
    if (nblocks >= 2) {
      double cost = 0.0;
      std::size_t rows_h = 0;
      for (int f = 0; f < 2; ++f) {
        std::vector<char> train = use, held(n, 0);
        for (std::size_t k = 0; k < n; ++k)
          if (use[k] && block[k] >= 0 && block[k] % 2 == f) train[k] = 0, held[k] = 1;
        const Fit tf = solve(out.tables ? tables.s : constants.s, out.tables ? tb : bounds, out.tables && tau_tables, true, &train);
        RcProblem ph = problem(tf.s.t.knots, out.tables && tau_tables, true, &held);
        cost += ph.data_cost(tf.s);
        rows_h += ph.rows_used();
      }
      out.held_out_rows = rows_h;
      out.held_out_rmse_V = rows_h ? std::sqrt(2.0 * cost / static_cast<double>(rows_h)) : 0.0;
    } else {
      out.warnings.push_back("the log has fewer than two blocks between rests of " + format_fixed(opts.rest_min_s, 0) +
                             " s: no held-out check; the quality gate judges the re-simulation alone");
    }
  }

  // SoC ranges without current steps: the tables hold the nearest band's values there.
  if (out.tables) {
    std::vector<double> edges = {0.0};
    for (double k : knots) edges.push_back(k);
    edges.push_back(1.0);
    for (std::size_t i = 0; i + 1 < edges.size(); ++i) {
      const bool end = i == 0 || i + 2 == edges.size();
      if (edges[i + 1] - edges[i] > (end ? 1.0 : 2.0) * opts.soc_band + 1e-9)
        out.warnings.push_back("no current steps between SoC " + format_fixed(edges[i], 2) + " and " + format_fixed(edges[i + 1], 2) +
                               ": too little excitation there; the parameters follow the nearest band");
    }
  }
  for (const auto& b : out.bands)
    if (!b.excited)
      out.warnings.push_back("SoC band " + format_fixed(b.soc_lo, 2) + "-" + format_fixed(b.soc_hi, 2) +
                             ": too little excitation (" + b.why + "); its values follow the neighbouring bands");
  out.iterations = iterations;
  if (out.status != LmStatus::converged)
    out.warnings.push_back(std::string("the parameter fit ended with '") + to_string(out.status) +
                           "'; the best parameters found are written");
  const RcBounds& used_bounds = out.tables ? tb : bounds;
  for (int p = 0; p < nrc; ++p)
    for (double t : final_t.tau_s[p])
      if (t <= used_bounds.tau_min_s[p] * 1.001 || t >= used_bounds.tau_max_s[p] / 1.001) {
        out.warnings.push_back("tau" + std::to_string(p + 1) + " reached a bound of the fit (" + format_fixed(t, 2) +
                               " s): the log may not resolve it");
        break;
      }

  // --- OCV: the fitted grid over the SoC the counted rows cover, and at most kOcvMarginSoc
  // beyond (the second-difference penalty extends the fitted curve linearly there) ---
  const double cov_lo = std::max(0.0, s_lo), cov_hi = std::min(1.0, s_hi);
  const double ocv_lo = std::max(0.0, cov_lo - kOcvMarginSoc), ocv_hi = std::min(1.0, cov_hi + kOcvMarginSoc);
  if (ocv_lo > 1e-9)
    out.warnings.push_back("the log reaches down to SoC " + format_fixed(s_lo, 3) + " only: the OCV table stops at SoC " +
                           format_fixed(ocv_lo, 3) + " (" + format_fixed(100 * kOcvMarginSoc, 0) +
                           " % below the data); a run below it is outside the model's coverage");
  if (ocv_hi < 1.0 - 1e-9)
    out.warnings.push_back("the log reaches up to SoC " + format_fixed(s_hi, 3) + " only: the OCV table stops at SoC " +
                           format_fixed(ocv_hi, 3) + "; a run above it is outside the model's coverage");
  std::vector<double> g01, v01;
  for (std::size_t o = 0; o < grid.size(); ++o)
    if (grid[o] >= ocv_lo - 1e-9 && grid[o] <= ocv_hi + 1e-9)
      g01.push_back(std::clamp(grid[o], ocv_lo, ocv_hi)), v01.push_back(final_s.ocv_V[o]);
  const Table ocv = ocv_table_from_grid(g01, v01, 0.0005, out.warnings);
  if (se.chemistry) {
    const Chemistry& ch = *se.chemistry;
    if (ocv.y().front() < ch.ocv_min_V - 1e-9 || ocv.y().back() > ch.ocv_max_V + 1e-9) {
      out.ocv_physical = false;
      out.warnings.push_back("the fitted OCV runs from " + format_fixed(ocv.y().front(), 3) + " to " +
                             format_fixed(ocv.y().back(), 3) + " V, outside what a " + ch.name + " cell can show (" +
                             format_fixed(ch.ocv_min_V, 2) + " to " + format_fixed(ch.ocv_max_V, 2) +
                             " V): the SoC scale or the chemistry is wrong; the fit fails its quality gate");
    }
  }

  // --- the model ---
  battery::Cell& c = out.cell;
  c.name = opts.name.empty() ? "cell fitted from " + std::filesystem::path(log.file).filename().string() : opts.name;
  c.chemistry = opts.chemistry;
  c.capacity_Ah = Q;
  c.ocv_V = ocv;
  c.r0_ohm = out.tables ? final_t.r0_table() : Table(final_t.r0_ohm[0]);
  c.rc.clear();
  for (int p = 0; p < nrc; ++p) {
    battery::RcPair rc;
    rc.r_ohm = out.tables ? final_t.r_table(p) : Table(final_t.r_ohm[p][0]);
    const bool tau_table = out.tables && tau_tables;
    rc.tau_s = tau_table ? final_t.tau_table(p) : Table(final_t.tau_s[p][0]);
    c.rc.push_back(rc);
  }
  double idis_max = 0.0, ichg_max = 0.0;
  for (std::size_t k = 0; k < n; ++k) {
    idis_max = std::max(idis_max, log.current_A[k]);
    ichg_max = std::min(ichg_max, log.current_A[k]);
  }
  // Full-charge and cutoff voltages: given, the CV level or the chemistry's (fit/soc); never a
  // pulse's peak or the lowest voltage seen.
  if (!(se.v_full_V > 0.0))
    throw InputError(log.file + ": the full-charge voltage is not known (got no charge that tapered at a constant voltage and "
                                "no chemistry, expected --v-max-V or --chemistry)");
  if (!(se.v_empty_V > 0.0))
    throw InputError(log.file + ": the cutoff voltage is not known (got no chemistry, expected --v-cutoff-V or --chemistry)");
  c.v_max_V = std::round(se.v_full_V * 1000.0) / 1000.0;
  c.v_cutoff_V = std::round(se.v_empty_V * 1000.0) / 1000.0;
  out.notes.push_back("v_max_V " + format_fixed(c.v_max_V, 3) + " V: " + se.v_full_source + "; v_cutoff_V " +
                      format_fixed(c.v_cutoff_V, 3) + " V: " + se.v_empty_source);
  if (!(c.v_cutoff_V < c.v_max_V))
    throw InputError(log.file + ": the cutoff voltage is not below the maximum voltage (got " + format_fixed(c.v_cutoff_V, 3) +
                     " V and " + format_fixed(c.v_max_V, 3) +
                     " V, expected a log that spans a discharge; give --v-max-V and --v-cutoff-V)");
  // What the data covered (cell JSON "coverage").
  battery::CellCoverage cov;
  cov.soc_min = cov_lo;
  cov.soc_max = cov_hi;
  cov.current_max_A = idis_max;
  cov.current_min_A = ichg_max;
  if (out.has_temperature) cov.temperature_min_C = out.temperature_min_C, cov.temperature_max_C = out.temperature_max_C;
  cov.source = "fit cell " + std::filesystem::path(log.file).filename().string();
  c.coverage = cov;
  // How far the model may be trusted in current: a linear circuit fitted up to one rate held
  // twice that rate to 10 mV on an open dataset of a pouch cell, and missed three times it by
  // 30–38 mV as the cell's polarisation grew faster than the current near empty (README, "Fit
  // figures").
  out.notes.push_back("largest discharge current in the log " + format_fixed(idis_max, 2) + " A (" +
                      format_fixed(idis_max / Q, 2) + " C): above about twice that the model extrapolates; near empty "
                      "at such rates it can hold the voltage up too long. Log pulses at the highest current you will fly");
  if (opts.i_cont_max_A) {
    c.i_cont_max_A = *opts.i_cont_max_A;
  } else {
    c.i_cont_max_A = std::ceil(std::max(idis_max, 1e-3) * 10.0) / 10.0;
    out.notes.push_back("i_cont_max_A set to the largest discharge current in the log, " + format_fixed(c.i_cont_max_A, 1) +
                        " A (give --i-cont-max-A for the maker's limit)");
  }
  if (opts.mass_kg) {
    c.mass_kg = *opts.mass_kg;
  } else {
    // A placeholder at 200 Wh/kg, typical of Li-ion cells (common practice); flagged.
    double mean_ocv = 0.0;
    for (double v : final_s.ocv_V) mean_ocv += v;
    mean_ocv /= static_cast<double>(final_s.ocv_V.size());
    c.mass_kg = std::max(0.001, std::round(Q * mean_ocv / 200.0 * 1000.0) / 1000.0);
    out.warnings.push_back("mass_kg not given: " + format_fixed(c.mass_kg, 3) +
                           " kg written as a placeholder (200 Wh/kg); weigh the cell and give --mass-kg");
  }
  // --- thermal block, from a temperature column ---
  if (out.has_temperature) {
    std::string why;
    out.thermal = fit_thermal(log, soc, c, opts.air_C, why);
    if (out.thermal) {
      const double cp = out.thermal->heat_capacity_J_per_K / c.mass_kg;
      if (cp < 100.0 || cp > 5000.0) {
        out.warnings.push_back("thermal block not written: the fitted heat capacity " +
                               format_fixed(out.thermal->heat_capacity_J_per_K, 1) + " J/K is " + format_fixed(cp, 0) +
                               " J/(kg·K) for " + format_fixed(c.mass_kg, 3) +
                               " kg (expected 100 to 5000; give --mass-kg, or check the temperature sensor's contact)");
        out.thermal.reset();
      } else {
        c.thermal = battery::Thermal{cp, out.thermal->hA_W_per_K};
      }
    } else {
      out.warnings.push_back("no thermal block: " + why);
    }
  }
  out.note = "Fitted by sortie fit cell from " + std::filesystem::path(log.file).filename().string() + " (" +
             std::to_string(n) + " rows): capacity " + se.capacity_source + "; OCV fitted with the RC pairs, started from " +
             std::to_string(out.ocv_rest_points) + " rest ends and " + std::to_string(out.ocv_loaded_points) +
             " low-rate rows; " + std::to_string(nrc) + " RC pair(s)" +
             (out.tables ? " as tables over SoC" : " as constants") +
             (out.has_temperature ? "; at a mean cell temperature of " + format_fixed(out.temperature_mean_C, 1) + " °C" : "") +
             (out.thermal ? "; thermal block from the logged temperature" : "") +
             (opts.mass_kg ? "" : "; mass_kg is a placeholder") + ". An estimate from measurements, not a rating.";
  return out;
}

}  // namespace

CellFitResult fit_cell(const CellLog& log, const CellFitOptions& opts) { return fit_impl(log, opts, nullptr); }

CellFitResult fit_cell(const std::vector<CellLog>& logs, const CellFitOptions& opts) {
  if (logs.empty()) throw InputError("fit cell: no log given (expected at least one)");
  if (logs.size() == 1) return fit_impl(logs.front(), opts, nullptr);
  SocOptions so = opts.soc;
  if (so.chemistry.empty()) so.chemistry = opts.chemistry;
  // The capacity: measured by the logs that hold a full-to-empty pair (their mean), else given.
  std::vector<double> caps;
  for (std::size_t i = 0; i < logs.size(); ++i) {
    SocOptions o = so;
    if (i > 0) o.soc0.reset();  // --soc0 is the first log's
    o.capacity_Ah.reset();
    try {
      const SocEstimate e = estimate_soc(logs[i], o);
      if (e.capacity_from_log) caps.push_back(e.capacity_Ah);
    } catch (const InputError&) {
      // This log cannot measure the capacity alone; the second pass says why if it cannot be fitted at all.
    }
  }
  double q = 0.0;
  if (!caps.empty()) {
    for (double c : caps) q += c;
    q /= static_cast<double>(caps.size());
  } else if (so.capacity_Ah) {
    q = *so.capacity_Ah;
  } else {
    throw InputError(logs.front().file + ": none of the " + std::to_string(logs.size()) +
                     " logs covers a full discharge or charge, so the capacity cannot be measured (expected --capacity-Ah)");
  }
  // One log of sections: each input log starts a section (an unknown gap, cell relaxed), its SoC
  // counted from its own known points with the common capacity.
  CellLog m;
  SocEstimate se;
  m.section_starts.clear();
  std::vector<std::size_t> starts;
  std::string names;
  const bool any_temp = std::any_of(logs.begin(), logs.end(), [](const CellLog& l) { return !l.temperature_C.empty(); });
  const bool any_mode = std::any_of(logs.begin(), logs.end(), [](const CellLog& l) { return !l.mode.empty(); });
  double t_end = 0.0;
  for (std::size_t i = 0; i < logs.size(); ++i) {
    const CellLog& l = logs[i];
    SocOptions o = so;
    if (i > 0) o.soc0.reset();
    o.capacity_Ah = q;
    SocEstimate e = estimate_soc(l, o);
    const std::size_t base = m.size();
    starts.push_back(base);
    const double shift = i == 0 ? 0.0 : t_end + 3600.0 - l.time_s.front();
    for (std::size_t k = 0; k < l.size(); ++k) {
      m.time_s.push_back(l.time_s[k] + shift);
      m.current_A.push_back(l.current_A[k]);
      m.voltage_V.push_back(l.voltage_V[k]);
      if (any_temp) m.temperature_C.push_back(l.temperature_C.empty() ? std::numeric_limits<double>::quiet_NaN() : l.temperature_C[k]);
      if (any_mode) m.mode.push_back(l.mode.empty() ? std::string() : l.mode[k]);
      m.line.push_back(l.line.empty() ? k + 2 : l.line[k]);
    }
    t_end = m.time_s.back();
    for (std::size_t st : l.section_starts) m.section_starts.push_back(base + st);
    for (const auto& nline : l.notes) m.notes.push_back(std::filesystem::path(l.file).filename().string() + ": " + nline);
    for (const auto& w : l.warnings) m.warnings.push_back(std::filesystem::path(l.file).filename().string() + ": " + w);
    names += (i ? " " : "") + std::filesystem::path(l.file).filename().string();
    // Merge the SoC estimates.
    const double q0 = se.charge_Ah.empty() ? 0.0 : se.charge_Ah.back();
    for (double c : e.charge_Ah) se.charge_Ah.push_back(q0 + c);
    se.soc.insert(se.soc.end(), e.soc.begin(), e.soc.end());
    for (SocAnchor a : e.anchors) {
      a.row += base;
      a.how = std::filesystem::path(l.file).filename().string() + ": " + a.how;
      se.anchors.push_back(a);
    }
    for (const auto& w : e.warnings) se.warnings.push_back(std::filesystem::path(l.file).filename().string() + ": " + w);
    if (i == 0) {
      se.v_full_V = e.v_full_V, se.v_full_source = e.v_full_source;
      se.v_empty_V = e.v_empty_V, se.v_empty_source = e.v_empty_source;
      se.chemistry = e.chemistry, se.notes = e.notes;
      se.i_rest_A = e.i_rest_A;
    } else {
      if (!(se.v_full_V > 0.0) && e.v_full_V > 0.0) se.v_full_V = e.v_full_V, se.v_full_source = e.v_full_source;
      if (!se.chemistry && e.chemistry) se.chemistry = e.chemistry;
      se.i_rest_A = std::max(se.i_rest_A, e.i_rest_A);
    }
  }
  m.file = names;
  se.capacity_Ah = q;
  se.capacity_from_log = !caps.empty();
  se.capacity_source = caps.empty() ? std::string("given (--capacity-Ah)")
                                    : "from the logs: the mean of " + std::to_string(caps.size()) + " measured";
  CellFitResult r = fit_impl(m, opts, &se);
  r.log_starts = starts;
  r.files.clear();
  for (const CellLog& l : logs) r.files.push_back(l.file);
  if (r.cell.coverage) r.cell.coverage->source = "fit cell " + names;
  return r;
}

}  // namespace sortie::fit
