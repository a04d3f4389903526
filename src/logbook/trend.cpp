#include "logbook/trend.hpp"

#include <cmath>
#include <cstdio>

namespace sortie::logbook {

std::optional<LineFit> fit_line(const std::vector<double>& x, const std::vector<double>& y) {
  const std::size_t n = x.size();
  if (n < 3 || y.size() != n) return std::nullopt;
  double mx = 0.0, my = 0.0;
  for (std::size_t i = 0; i < n; ++i) { mx += x[i]; my += y[i]; }
  mx /= double(n);
  my /= double(n);
  double sxx = 0.0, sxy = 0.0;
  for (std::size_t i = 0; i < n; ++i) {
    sxx += (x[i] - mx) * (x[i] - mx);
    sxy += (x[i] - mx) * (y[i] - my);
  }
  if (!(sxx > 0.0)) return std::nullopt;
  LineFit f;
  f.n = n;
  f.slope = sxy / sxx;
  f.intercept = my - f.slope * mx;
  double ss = 0.0;
  for (std::size_t i = 0; i < n; ++i) {
    const double r = y[i] - (f.intercept + f.slope * x[i]);
    ss += r * r;
  }
  const double s2 = ss / double(n - 2);
  f.residual_sd = std::sqrt(s2);
  f.slope_sd = std::sqrt(s2 / sxx);
  f.intercept_sd = std::sqrt(s2 * (1.0 / double(n) + mx * mx / sxx));
  f.covariance = -mx * s2 / sxx;
  return f;
}

Crossing crossing(const LineFit& f, double limit, bool falling) {
  Crossing c;
  if (f.slope == 0.0 || (falling && f.slope > 0.0) || (!falling && f.slope < 0.0)) {
    c.why_not = falling ? "the fitted line does not fall (slope >= 0)" : "the fitted line does not rise (slope <= 0)";
    return c;
  }
  c.reached = true;
  c.x = (limit - f.intercept) / f.slope;
  const double var = f.intercept_sd * f.intercept_sd + c.x * c.x * f.slope_sd * f.slope_sd + 2.0 * c.x * f.covariance;
  c.x_sd = std::sqrt(std::max(var, 0.0)) / std::fabs(f.slope);
  return c;
}

// Civil-calendar day counts: H. Hinnant, "chrono-Compatible Low-Level Date Algorithms" (2013),
// days_from_civil and civil_from_days.
std::optional<long> days_from_date(const std::string& ymd) {
  int y = 0, m = 0, d = 0;
  char tail = 0;
  if (ymd.size() != 10 || std::sscanf(ymd.c_str(), "%4d-%2d-%2d%c", &y, &m, &d, &tail) != 3) return std::nullopt;
  if (ymd[4] != '-' || ymd[7] != '-' || m < 1 || m > 12 || d < 1) return std::nullopt;
  static const int mdays[] = {31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31};
  const bool leap = (y % 4 == 0 && y % 100 != 0) || y % 400 == 0;
  if (d > mdays[m - 1] + (m == 2 && leap ? 1 : 0)) return std::nullopt;
  const long yy = y - (m <= 2 ? 1 : 0);
  const long era = (yy >= 0 ? yy : yy - 399) / 400;
  const long yoe = yy - era * 400;
  const long doy = (153 * (m + (m > 2 ? -3 : 9)) + 2) / 5 + d - 1;
  const long doe = yoe * 365 + yoe / 4 - yoe / 100 + doy;
  return era * 146097 + doe - 719468;
}

std::string date_from_days(long z) {
  z += 719468;
  const long era = (z >= 0 ? z : z - 146096) / 146097;
  const long doe = z - era * 146097;
  const long yoe = (doe - doe / 1460 + doe / 36524 - doe / 146096) / 365;
  long y = yoe + era * 400;
  const long doy = doe - (365 * yoe + yoe / 4 - yoe / 100);
  const long mp = (5 * doy + 2) / 153;
  const long d = doy - (153 * mp + 2) / 5 + 1;
  const long m = mp + (mp < 10 ? 3 : -9);
  if (m <= 2) ++y;
  char buf[64];
  std::snprintf(buf, sizeof buf, "%04ld-%02ld-%02ld", y, m, d);
  return buf;
}

}  // namespace sortie::logbook

namespace sortie::logbook {

namespace {

void fit_factor(FactorTrend& t, const std::vector<double>& cycles, const std::vector<double>& days,
                const std::vector<double>& y) {
  t.by_cycle = fit_line(cycles, y);
  t.by_day = fit_line(days, y);
  if (t.by_cycle) t.cycle_at_limit = crossing(*t.by_cycle, t.limit, t.falling);
  if (t.by_day) t.day_at_limit = crossing(*t.by_day, t.limit, t.falling);
}

}  // namespace

// Unweighted on purpose: the σ of each estimate is its fit's own, from one flight's residuals; the
// scatter between flights (charge state, temperature, the log's noise) is larger, and the
// residual spread of the line measures it directly.
PackTrend pack_trend(const std::vector<EstimateRecord>& estimates, double capacity_limit, double resistance_limit) {
  PackTrend t;
  t.points = estimates;
  t.capacity.limit = capacity_limit;
  t.capacity.falling = true;
  t.resistance.limit = resistance_limit;
  t.resistance.falling = false;
  std::vector<double> cycles, days, cap, res;
  for (const auto& e : estimates) {
    const auto d = days_from_date(e.date);
    if (!d) continue;
    cycles.push_back(e.cycle);
    days.push_back(double(*d));
    cap.push_back(e.capacity);
    res.push_back(e.resistance);
  }
  if (cycles.size() < 3) {
    t.why_no_fit = "a trend needs at least 3 estimates (got " + std::to_string(cycles.size()) + ")";
    return t;
  }
  fit_factor(t.capacity, cycles, days, cap);
  fit_factor(t.resistance, cycles, days, res);
  if (!t.capacity.by_cycle) t.why_no_fit = "every estimate is at the same cycle";
  return t;
}

}  // namespace sortie::logbook
