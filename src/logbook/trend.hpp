#pragma once
/// The state-of-health trend of a pack: an ordinary least-squares line through (x, y) points
/// (x the cycle or the day, y the capacity or resistance factor), the parameters' standard errors,
/// and where the line reaches a limit, with the delta-method σ of that crossing. The crossing is
/// an extrapolation of the fitted line: it assumes the pack keeps ageing linearly.
#include <optional>
#include <string>
#include <vector>

namespace sortie::logbook {

struct LineFit {
  std::size_t n = 0;
  double intercept = 0.0, slope = 0.0;
  double intercept_sd = 0.0, slope_sd = 0.0, covariance = 0.0;  ///< of (intercept, slope)
  double residual_sd = 0.0;  ///< √(Σr² / (n − 2))
};

/// Least squares y = a + b·x (e.g. D. C. Montgomery, G. C. Runger, "Applied Statistics and
/// Probability for Engineers", simple linear regression: b = Sxy/Sxx, a = ȳ − b·x̄,
/// Var(b) = s²/Sxx, Var(a) = s²(1/n + x̄²/Sxx), Cov(a, b) = −x̄·s²/Sxx). Needs n ≥ 3 and x not
/// all equal: std::nullopt otherwise.
std::optional<LineFit> fit_line(const std::vector<double>& x, const std::vector<double>& y);

struct Crossing {
  bool reached = false;      ///< the line meets the limit at some x (slope towards it)
  double x = 0.0, x_sd = 0.0;
  std::string why_not;       ///< when not reached
};

/// Where a + b·x = limit, x* = (limit − a)/b, and σ(x*)² = (Var a + x*² Var b + 2x* Cov)/b²
/// (first-order propagation). `falling`: the limit is below (capacity) or above (resistance).
Crossing crossing(const LineFit& f, double limit, bool falling);

/// Days since 1970-01-01 of a YYYY-MM-DD date (proleptic Gregorian); std::nullopt if malformed.
std::optional<long> days_from_date(const std::string& ymd);
/// YYYY-MM-DD of a day count since 1970-01-01.
std::string date_from_days(long days);

}  // namespace sortie::logbook

#include "logbook/logbook.hpp"

namespace sortie::logbook {

/// One factor's trend (capacity or resistance) against cycles and against days.
struct FactorTrend {
  double limit = 0.0;
  bool falling = true;                 ///< capacity falls to its limit, resistance rises
  std::optional<LineFit> by_cycle, by_day;
  Crossing cycle_at_limit, day_at_limit;  ///< day counts from 1970-01-01
};

struct PackTrend {
  std::vector<EstimateRecord> points;  ///< in cycle order
  FactorTrend capacity, resistance;
  std::string why_no_fit;              ///< when fewer than three estimates or one cycle
};

/// Lines through the estimates (unweighted: each estimate counts once; see trend.cpp) and where
/// they reach `capacity_limit` and `resistance_limit`.
PackTrend pack_trend(const std::vector<EstimateRecord>& estimates, double capacity_limit, double resistance_limit);

}  // namespace sortie::logbook
