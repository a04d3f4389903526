#include <algorithm>
#include <cmath>

#include "core/error.hpp"
#include "core/text.hpp"
#include "fit/chemistry.hpp"
#include "fit/fit_cell_steps.hpp"

namespace sortie::fit::detail {

double median(std::vector<double> v) {
  if (v.empty()) return kNaN;
  const auto mid = v.begin() + static_cast<std::ptrdiff_t>(v.size() / 2);
  std::nth_element(v.begin(), mid, v.end());
  return *mid;
}

namespace {

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
void ocv_points(const battery::CellLog& log, const std::vector<double>& soc, const std::vector<Rest>& rests,
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

/// Rows of long charges (more than 2 % of the capacity in one go) and the rests after them: they
/// sit on the charge branch of the OCV hysteresis loop while the fitted OCV is the discharge
/// branch (common practice; Plett 2015, ch. 2, "hysteresis"). Simulated, not counted.
std::vector<char> rows_to_count(const battery::CellLog& log, const SocEstimate& se) {
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

}  // namespace

/// Blocks of a log for the held-out check: the rows between two long rests (at least
/// `rest_min_s`) form one block; the long rests themselves belong to none (-1), so that every
/// fold keeps the rest ends that fix the OCV.
std::vector<int> log_blocks(const battery::CellLog& log, const std::vector<Rest>& rests, double rest_min_s, int& count) {
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


/// The log at a glance (rows, time steps, largest current); logs that cannot give a model.
void survey_log(FitWork& w) {
  const battery::CellLog& log = w.log;
  CellFitResult& out = w.out;
  const std::size_t n = w.n = log.size();
  out.rows = n;
  out.sections = log.section_starts.size();
  out.n_rc = w.nrc = w.opts.rc_pairs != 0 ? w.opts.rc_pairs : 2;
  out.notes = log.notes;
  out.warnings = log.warnings;
  if (n < 10)
    throw InputError(log.file + ": too few rows to fit a model (got " + std::to_string(n) + ", expected at least 10)");
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
  w.imax = imax;
  w.min_step = 0.05 * imax;
  if (!changes || find_current_steps(log, std::vector<double>(n, 0.5), w.min_step).empty())
    throw InputError(log.file + ": the current never changes (got " + format_fixed(ifirst, 3) + " A in every row" +
                     (changes ? " within 5 %" : "") +
                     ", expected current steps such as pulses or rests): R0 and the RC pairs cannot be "
                     "told apart from the open-circuit voltage");
}

/// The logged cell temperature's range, when there is a temperature column.
void log_temperature(FitWork& w) {
  CellFitResult& out = w.out;
  if (w.log.temperature_C.empty()) return;
  double s = 0.0, lo = 1e300, hi = -1e300;
  std::size_t m = 0;
  for (double t : w.log.temperature_C)
    if (std::isfinite(t)) s += t, lo = std::min(lo, t), hi = std::max(hi, t), ++m;
  if (m == 0) return;
  out.has_temperature = true;
  out.temperature_mean_C = s / static_cast<double>(m);
  out.temperature_min_C = lo;
  out.temperature_max_C = hi;
  if (hi - lo > 10.0)
    out.warnings.push_back("the cell temperature spans " + format_fixed(lo, 1) + " to " + format_fixed(hi, 1) +
                           " °C: one set of parameters is fitted for all of it");
}

/// Step 1: SoC by Coulomb counting from the known points (fit/soc); the rows the fit counts.
void count_soc(FitWork& w, const SocEstimate* given) {
  CellFitResult& out = w.out;
  SocOptions so = w.opts.soc;
  if (so.chemistry.empty()) so.chemistry = w.opts.chemistry;
  out.soc_estimate = given ? *given : estimate_soc(w.log, so);
  const SocEstimate& se = out.soc_estimate;
  out.soc = se.soc;
  for (const auto& m : se.warnings) out.warnings.push_back(m);
  for (const auto& m : se.notes) out.notes.push_back(m);
  if (se.chemistry) out.notes.push_back("chemistry " + se.chemistry->name + ", " + se.chemistry->how);
  w.use = rows_to_count(w.log, se);
  out.counted = w.use;
  const std::size_t counted = static_cast<std::size_t>(std::count(w.use.begin(), w.use.end(), 1));
  if (counted < 10)
    throw InputError(w.log.file + ": only " + std::to_string(counted) +
                     " rows outside long charges (got a log that is almost all charging, expected discharges, pulses "
                     "or rests: charge rows sit on the other branch of the OCV hysteresis and are not fitted)");
}

/// Step 2: the current steps and the first R0 = −ΔV/ΔI (their median).
void first_r0(FitWork& w) {
  w.steps = find_current_steps(w.log, w.soc(), w.min_step);
  w.out.steps = w.steps.size();
  std::vector<double> rs, dts;
  for (const auto& s : w.steps) {
    if (s.r_ohm > 0.0) rs.push_back(s.r_ohm);
    dts.push_back(s.dt_s);
  }
  if (rs.empty())
    throw InputError(w.log.file + ": at every current step the voltage moved the wrong way (got " +
                     std::to_string(w.steps.size()) +
                     " steps, expected the voltage to fall when the discharge current rises): check the "
                     "current sign (--discharge-positive / --discharge-negative)");
  w.r0_step = median(rs);
  w.dt_step = median(dts);
}

/// Step 3: rests, OCV points and the first OCV on the fit's grid (fit/ocv).
void first_ocv(FitWork& w) {
  const battery::CellLog& log = w.log;
  CellFitResult& out = w.out;
  const CellFitOptions& opts = w.opts;
  w.rests = find_rests(log, w.se().i_rest_A);
  out.rests = w.rests.size();
  for (const Rest& r : w.rests) w.longest_rest = std::max(w.longest_rest, r.duration_s);
  std::vector<double> drop(w.n);
  for (std::size_t k = 0; k < w.n; ++k) drop[k] = w.r0_step * log.current_A[k];
  ocv_points(log, w.soc(), w.rests, drop, opts.rest_min_s, w.se().i_rest_A, opts.low_rate_C * w.se().capacity_Ah, 60.0,
             w.rest_pts, w.loaded_pts);
  if (w.rest_pts.empty()) {
    if (w.loaded_pts.empty())
      throw InputError(log.file + ": no rest of " + format_fixed(opts.rest_min_s, 0) +
                       " s or more and no steady low-rate discharge (at most " + format_fixed(opts.low_rate_C, 2) +
                       " C), so the open-circuit voltage cannot be measured (got the longest rest " +
                       format_fixed(w.longest_rest, 0) + " s, expected rests or a slow discharge)");
    out.warnings.push_back("no rest of " + format_fixed(opts.rest_min_s, 0) + " s or more (longest " +
                           format_fixed(w.longest_rest, 0) +
                           " s): the OCV is fitted from the loaded voltage alone, which leaves hysteresis in it; log "
                           "rests for a better model");
  }
  out.ocv_rest_points = w.rest_pts.size();
  out.ocv_loaded_points = w.loaded_pts.size();
  w.s_lo = 1e300, w.s_hi = -1e300;
  for (std::size_t k = 0; k < w.n; ++k)
    if (w.use[k]) w.s_lo = std::min(w.s_lo, w.soc()[k]), w.s_hi = std::max(w.s_hi, w.soc()[k]);
  w.grid = ocv_grid(w.s_lo, w.s_hi);
  // Rest ends and low-rate rows with the step R0 only, the low-rate curve shifted through the
  // rest points.
  w.first_ocv = build_ocv(w.rest_pts, w.loaded_pts, w.grid);
  if (!w.first_ocv)
    throw InputError(log.file + ": the rests and low-rate rows lie outside the SoC range of the rows the fit counts (got SoC " +
                     format_fixed(w.s_lo, 3) + " to " + format_fixed(w.s_hi, 3) +
                     ", expected open-circuit points within it): check the known SoC points and --soc0");
}

}  // namespace sortie::fit::detail
