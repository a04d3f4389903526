#pragma once
/// A grid of what-if missions (one or two named numbers stepped over ranges), each flown with
/// its spare solve; points run in parallel, each into its own slot.
#include <cstddef>
#include <functional>
#include <optional>
#include <string>
#include <vector>

#include "sim/mission.hpp"
#include "sim/what_if.hpp"

namespace sortie::sim {

/// Points a sweep may hold at most (all axes together); more is a one-line usage error.
inline constexpr std::size_t kMaxSweepPoints = 10000;

struct SweepAxis {
  std::string name;  ///< a what-if parameter name
  double from = 0.0, to = 0.0, step = 1.0;
  std::vector<double> values;  ///< from, from + step, …, up to to
};

/// Parse "NAME=FROM:TO:STEP" (a UsageError naming --sweep and what is wrong otherwise): the
/// name a what-if parameter, the ends inside its range, STEP > 0, TO ≥ FROM.
SweepAxis parse_sweep(const std::string& word);

/// One flown point of a sweep or of a sampled run.
struct PointResult {
  std::vector<double> x;      ///< the axes' values (a sweep) or the drawn values (samples)
  bool refused = false;       ///< the mission cannot be flown at this point (end_detail says why)
  bool go = false;
  bool completed = false;
  std::optional<EndKind> end_kind;
  std::string end_detail;
  double flight_time_s = 0.0;
  double landing_soc = 0.0;
  std::optional<double> spare_s;   ///< none: not bounded, capped, or no spare phase
  bool spare_capped = false;
  /// The rule that decides: the first failing rule of a no-go point, else the spare solve's
  /// binding rule.
  std::string limiting_rule;
  std::vector<std::string> failing;  ///< every failing rule (and "completion" when it ended early)
};

/// Fly `m` and solve its spare time, as `fly` does, into a PointResult.
PointResult fly_point(const Mission& m, const SimOptions& so);

struct SweepResult {
  std::vector<SweepAxis> axes;
  /// Row-major: the last axis varies fastest.
  std::vector<PointResult> points;
};

/// Fly every point of the grid of `axes` over `base`. `threads` 0: one per core.
SweepResult run_sweep(const Mission& base, const std::vector<SweepAxis>& axes, const SimOptions& so,
                      unsigned threads, const std::function<void(std::size_t, std::size_t)>& progress = {});

}  // namespace sortie::sim
