#pragma once
/// Integrate the pack under one smooth demand (one load segment or one mission phase) with
/// an exponential Runge–Kutta stepper (or Boost.Odeint's Dormand–Prince) and dense output, locating events by
/// bracketing on the dense output (docs/style.md rule 8).
#include <cstddef>
#include <functional>
#include <limits>
#include <optional>
#include <string>
#include <vector>

#include "battery/thevenin.hpp"

namespace sortie::sim {

/// The pack at one instant: the state and what the terminals show.
struct Sample {
  double t = 0.0;  ///< s
  battery::State x{};
  battery::Terminal term{};
};

/// An event fires when g falls from > 0 to <= 0 (the crossing direction is always downward;
/// write g so that "still fine" is positive).
struct EventSpec {
  std::string kind;
  std::function<double(const Sample&)> g;
  bool terminal = true;  ///< ends the segment; otherwise recorded as a warning and re-armed
};

struct Crossing {
  std::size_t event = 0;  ///< index into the EventSpec list
  Sample at;
};

/// The exponential stepper's error estimate is that of its third-order companion, which
/// overstates the fourth-order solution's local error by about a factor of the step; it runs at
/// this multiple of the tolerances below. At 1e-10 × 100 the 4S2P 300 W discharge to cutoff ends
/// within 4e-4 s (2.1e-7 relative) of Dormand–Prince at 1e-10, with and without the thermal block
/// (tests/sim/exp_stepper_test.cpp holds it to 1e-6).
inline constexpr double kExpTolFactor = 100.0;

struct SegmentOptions {
  /// exponential: the RC pairs' decay integrated exactly (ExpStepper, sim/exp_stepper.hpp);
  /// dopri5: Odeint's controlled Dormand–Prince stepper with dense output, kept as the
  /// reference the tests compare against.
  enum class Method { exponential, dopri5 };
  Method method = Method::dopri5;
  double t_end = std::numeric_limits<double>::infinity();  ///< absolute end time, s
  double sample_s = 0.0;      ///< trace spacing, s (0: no trace)
  double next_sample_t = 0.0; ///< absolute time of the first trace sample
  double abs_tol = 1e-10;
  double rel_tol = 1e-10;
  double time_tol_s = 1e-4;   ///< event time tolerance (well under the 10 ms asked for)
  double max_dt_s = 0.0;      ///< largest step, s (0: no limit)
  /// Cap on the steps of a whole run (a discharge, a mission phase): steps_done + this
  /// segment's steps.
  std::size_t max_steps = 200000;
  std::size_t steps_done = 0;  ///< steps already taken by the run this segment continues
  /// Cap on the trace samples of a whole run, likewise (a long run at a fine spacing would fill
  /// the memory).
  std::size_t max_samples = 1000000;
  std::size_t samples_done = 0;
  /// What is being integrated, leading the step-cap and sample-cap messages
  /// ("phase 3 (hover)"); empty: "integration".
  std::string context;
  /// A way out, ending the step-cap message ("resample the load ..."); empty: none.
  std::string step_cap_hint;
};

/// Called once per accepted step with the samples at the step's ends (already evaluated: the
/// start is the previous step's end, the end is the step's state or its terminal event) and a
/// way to evaluate the dense output anywhere inside it (for quadrature of means and extremes).
using StepHook = std::function<void(const Sample& a, const Sample& b, const std::function<Sample(double)>& at)>;

struct SegmentResult {
  Sample end;                          ///< last point: event, t_end
  std::optional<std::size_t> stopped;  ///< the terminal event that ended it; nullopt at t_end
  std::vector<Crossing> warnings;      ///< non-terminal crossings in time order
  std::vector<Sample> samples;         ///< trace points at the requested spacing
  std::size_t steps = 0;
  double next_sample_t = 0.0;          ///< where the next segment's trace continues
};

/// Integrate from (t0, x0) under `demand` until a terminal event or opts.t_end.
/// Throws LimitError when the run's steps would exceed opts.max_steps, or its trace samples
/// opts.max_samples.
SegmentResult run_segment(const battery::PackModel& pack, const battery::Demand& demand, double t0,
                          const battery::State& x0, const std::vector<EventSpec>& events,
                          const SegmentOptions& opts, const StepHook& hook = {});

}  // namespace sortie::sim
