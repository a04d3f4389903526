#include "fit/ocv.hpp"

#include <algorithm>
#include <cassert>
#include <cmath>
#include <optional>

#include "core/text.hpp"

namespace sortie::fit {

namespace {

/// Linear interpolation through sorted (x, y), held flat outside.
double lerp_points(const std::vector<double>& x, const std::vector<double>& y, double s) {
  if (s <= x.front()) return y.front();
  if (s >= x.back()) return y.back();
  const auto it = std::upper_bound(x.begin(), x.end(), s);
  const std::size_t i = static_cast<std::size_t>(it - x.begin()) - 1;
  const double w = (s - x[i]) / (x[i + 1] - x[i]);
  return y[i] + w * (y[i + 1] - y[i]);
}

/// Pool adjacent violators: the non-decreasing sequence nearest to y in least squares.
std::vector<double> isotonic(const std::vector<double>& y) {
  std::vector<double> blk_v, blk_n;
  for (double v : y) {
    blk_v.push_back(v);
    blk_n.push_back(1.0);
    while (blk_v.size() > 1 && blk_v[blk_v.size() - 2] >= blk_v.back()) {
      const double nv = blk_n.back() + blk_n[blk_n.size() - 2];
      const double mv = (blk_v.back() * blk_n.back() + blk_v[blk_v.size() - 2] * blk_n[blk_n.size() - 2]) / nv;
      blk_v.pop_back(), blk_n.pop_back();
      blk_v.back() = mv, blk_n.back() = nv;
    }
  }
  std::vector<double> out;
  for (std::size_t b = 0; b < blk_v.size(); ++b)
    for (int i = 0; i < static_cast<int>(blk_n[b]); ++i) out.push_back(blk_v[b]);
  return out;
}

/// Strictly rising: isotonic, then at least 0.1 mV per step; warns when a value moved > 5 mV.
std::vector<double> strictly_rising(const std::vector<double>& y, std::vector<std::string>& warnings) {
  std::vector<double> mono = isotonic(y);
  double worst = 0.0;
  for (std::size_t g = 0; g < y.size(); ++g) worst = std::max(worst, std::fabs(mono[g] - y[g]));
  if (worst > 0.005)
    warnings.push_back("the measured OCV falls with rising SoC somewhere (by up to " + format_fixed(1000 * worst, 1) +
                       " mV); the table was levelled there");
  for (std::size_t g = 1; g < mono.size(); ++g) mono[g] = std::max(mono[g], mono[g - 1] + 1e-4);
  return mono;
}

}  // namespace

Table ocv_table_from_grid(const std::vector<double>& grid, std::vector<double> values,
                          double tolerance_V, std::vector<std::string>& warnings) {
  assert(grid.size() == values.size() && grid.size() >= 2);
  const std::vector<double> y = strictly_rising(values, warnings);
  const std::size_t n = grid.size();
  std::vector<char> keep(n, 0);
  keep.front() = keep.back() = 1;
  for (std::size_t i = 0; i < n; ++i) {
    const double tenth = std::round(grid[i] * 10.0) / 10.0;
    if (std::fabs(grid[i] - tenth) < 1e-9) keep[i] = 1;
  }
  // A grid over part of 0..1 holds fewer tenths: ten equal steps over it instead.
  if (std::count(keep.begin(), keep.end(), 1) < 11)
    for (std::size_t j = 0; j <= 10; ++j) keep[std::min(n - 1, (j * (n - 1) + 5) / 10)] = 1;
  // Douglas–Peucker between kept points (D. Douglas, T. Peucker, Cartographica 10, 1973).
  std::vector<std::pair<std::size_t, std::size_t>> todo;
  std::size_t a = 0;
  for (std::size_t i = 1; i < n; ++i)
    if (keep[i]) todo.push_back({a, i}), a = i;
  while (!todo.empty()) {
    const auto [lo, hi] = todo.back();
    todo.pop_back();
    double worst = 0.0;
    std::size_t at = lo;
    for (std::size_t i = lo + 1; i < hi; ++i) {
      const double w = (grid[i] - grid[lo]) / (grid[hi] - grid[lo]);
      const double d = std::fabs(y[i] - (y[lo] + w * (y[hi] - y[lo])));
      if (d > worst) worst = d, at = i;
    }
    if (worst > tolerance_V) {
      keep[at] = 1;
      todo.push_back({lo, at});
      todo.push_back({at, hi});
    }
  }
  std::vector<double> x, v;
  for (std::size_t i = 0; i < n; ++i)
    if (keep[i]) x.push_back(grid[i]), v.push_back(y[i]);
  return Table(x, v);
}

std::vector<Rest> find_rests(const battery::CellLog& log, double i_rest_A) {
  std::vector<Rest> out;
  const std::size_t n = log.size();
  std::size_t k = 0;
  while (k < n) {
    if (std::fabs(log.current_A[k]) > i_rest_A) {
      ++k;
      continue;
    }
    std::size_t e = k;
    while (e + 1 < n && !log.starts_section(e + 1) && std::fabs(log.current_A[e + 1]) <= i_rest_A) ++e;
    Rest r;
    r.first = k;
    r.last = e;
    // Sample k's current flowed since sample k−1, so the rest began at t[k−1].
    const double t0 = k > 0 && !log.starts_section(k) ? log.time_s[k - 1] : log.time_s[k];
    r.duration_s = log.time_s[e] - t0;
    out.push_back(r);
    k = e + 1;
  }
  return out;
}

std::optional<OcvTable> build_ocv(std::vector<OcvPoint> rest, const std::vector<OcvPoint>& loaded,
                   const std::vector<double>& grid) {
  assert(!grid.empty() && (!rest.empty() || !loaded.empty()));
  OcvTable out;
  // Rest points: sorted, those closer than 0.4 % SoC averaged.
  std::sort(rest.begin(), rest.end(), [](const OcvPoint& a, const OcvPoint& b) { return a.soc < b.soc; });
  std::vector<double> rs, rv;
  for (std::size_t i = 0; i < rest.size();) {
    std::size_t j = i;
    double ss = 0.0, vs = 0.0;
    while (j < rest.size() && rest[j].soc - rest[i].soc < 0.004) ss += rest[j].soc, vs += rest[j].v, ++j;
    rs.push_back(ss / static_cast<double>(j - i));
    rv.push_back(vs / static_cast<double>(j - i));
    i = j;
  }
  out.rest_points = rs.size();

  // Loaded points: the median of each 0.5 % SoC bin.
  constexpr double kBin = 0.005;
  std::vector<double> ls, lv;
  {
    std::vector<OcvPoint> pts = loaded;
    std::sort(pts.begin(), pts.end(), [](const OcvPoint& a, const OcvPoint& b) { return a.soc < b.soc; });
    std::size_t i = 0;
    while (i < pts.size()) {
      const double b = std::floor(pts[i].soc / kBin);
      std::vector<double> vals, socs;
      while (i < pts.size() && std::floor(pts[i].soc / kBin) == b) vals.push_back(pts[i].v), socs.push_back(pts[i].soc), ++i;
      std::nth_element(vals.begin(), vals.begin() + static_cast<std::ptrdiff_t>(vals.size() / 2), vals.end());
      double sm = 0.0;
      for (double s : socs) sm += s;
      ls.push_back(sm / static_cast<double>(socs.size()));
      lv.push_back(vals[vals.size() / 2]);
    }
    out.loaded_points = loaded.size();
  }
  // Where the loaded curve is defined: between bins no more than 3 % SoC apart.
  auto loaded_covers = [&](double s) {
    if (ls.empty() || s < ls.front() - kBin || s > ls.back() + kBin) return false;
    const auto it = std::lower_bound(ls.begin(), ls.end(), s);
    if (it == ls.begin() || it == ls.end()) return true;
    return *it - *(it - 1) <= 0.03;
  };
  // Shift of the loaded curve at each rest point with loaded data within 2 % SoC.
  auto near_loaded = [&](double s) {
    const auto it = std::lower_bound(ls.begin(), ls.end(), s);
    double d = 1e300;
    if (it != ls.end()) d = std::min(d, *it - s);
    if (it != ls.begin()) d = std::min(d, s - *(it - 1));
    return d <= 0.02;
  };
  std::vector<double> ds, dv;
  for (std::size_t i = 0; i < rs.size(); ++i)
    if (near_loaded(rs[i])) {
      ds.push_back(rs[i]);
      dv.push_back(rv[i] - lerp_points(ls, lv, rs[i]));
    }
  auto shift = [&](double s) { return ds.empty() ? 0.0 : lerp_points(ds, dv, s); };

  double lo = 1e300, hi = -1e300;
  if (!rs.empty()) lo = std::min(lo, rs.front()), hi = std::max(hi, rs.back());
  if (!ls.empty()) lo = std::min(lo, ls.front()), hi = std::max(hi, ls.back());
  out.covered_lo = std::max(0.0, lo);
  out.covered_hi = std::min(1.0, hi);

  // Values on the grid where the data reach.
  std::vector<std::optional<double>> val(grid.size());
  for (std::size_t g = 0; g < grid.size(); ++g) {
    const double s = grid[g];
    if (loaded_covers(s)) val[g] = lerp_points(ls, lv, s) + shift(s);
    else if (!rs.empty() && s >= rs.front() - 1e-9 && s <= rs.back() + 1e-9) val[g] = lerp_points(rs, rv, s);
  }
  // Extend the end slopes over the grid points the data do not reach.
  std::size_t first = grid.size(), last = 0;
  for (std::size_t g = 0; g < grid.size(); ++g)
    if (val[g]) first = std::min(first, g), last = std::max(last, g);
  if (first > last) return std::nullopt;
  // Interior gaps (should not happen with rest interpolation): linear between neighbours.
  for (std::size_t g = first; g <= last; ++g)
    if (!val[g]) {
      std::size_t a = g - 1, b = g + 1;
      while (!val[b]) ++b;
      const double w = (grid[g] - grid[a]) / (grid[b] - grid[a]);
      val[g] = *val[a] + w * (*val[b] - *val[a]);
    }
  auto end_slope = [&](std::size_t a, std::size_t b) {
    const double sl = (b > a) ? (*val[b] - *val[a]) / (grid[b] - grid[a]) : 0.0;
    return std::max(sl, 0.05);  // at least 0.05 V per unit SoC so the table keeps rising
  };
  if (first > 0) {
    const std::size_t b = std::min(last, first + 2);
    const double sl = end_slope(first, b);
    for (std::size_t g = first; g-- > 0;) val[g] = *val[first] - sl * (grid[first] - grid[g]);
  }
  if (last + 1 < grid.size()) {
    const std::size_t a = last >= first + 2 ? last - 2 : first;
    const double sl = end_slope(a, last);
    for (std::size_t g = last + 1; g < grid.size(); ++g) val[g] = *val[last] + sl * (grid[g] - grid[last]);
  }
  if (out.covered_lo > 0.05)
    out.warnings.push_back("the log reaches down to SoC " + format_fixed(out.covered_lo, 3) +
                           " only: the OCV below is extrapolated");
  if (out.covered_hi < 0.95)
    out.warnings.push_back("the log reaches up to SoC " + format_fixed(out.covered_hi, 3) +
                           " only: the OCV above is extrapolated");

  std::vector<double> y(grid.size());
  for (std::size_t g = 0; g < grid.size(); ++g) y[g] = *val[g];
  const std::vector<double> mono = strictly_rising(y, out.warnings);
  out.ocv = Table(grid, mono);
  return out;
}

}  // namespace sortie::fit
