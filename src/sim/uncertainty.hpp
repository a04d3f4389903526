#pragma once
/// Sampled runs: the inputs a planner does not know exactly are drawn from stated spreads, each
/// sample is flown with its spare solve, and the results are summed up as a probability of
/// meeting every rule and percentiles. Deterministic for a seed on any thread count.
#include <cstdint>
#include <functional>
#include <map>
#include <string>
#include <vector>

#include "plan/spreads.hpp"
#include "sim/mission.hpp"
#include "sim/sweep.hpp"

namespace sortie::sim {

/// Samples a run may hold at most (a one-line usage error beyond).
inline constexpr int kMaxSamples = 100000;

/// The spreads of a sampled run (plan/spreads.hpp).
using plan::Spreads;

/// Spreads with every field 0: each sample is the profile itself.
Spreads zero_spreads();

/// The generator of sample `index` of a run seeded `seed`: std::mt19937_64 (its output is
/// fixed by the C++ standard) seeded with splitmix64(seed, index), so a sample does not depend
/// on which thread flies it.
std::uint64_t sample_seed(std::uint64_t seed, std::uint64_t index);

/// Uniform on [0, 1) from the top 53 bits of one 64-bit word.
double unit_uniform(std::uint64_t word);
/// Standard normal from two 64-bit words by Box–Muller: √(−2 ln u1)·cos(2π u2), u1 in (0, 1]
/// (G. E. P. Box, M. E. Muller, A note on the generation of random normal deviates, 1958). Only
/// the cosine branch is used, so each draw takes exactly two words. Bit-identical where the
/// maths library's log and cos are (glibc's are correctly rounded in practice).
double box_muller(std::uint64_t w1, std::uint64_t w2);

/// What one sample drew (the values set in the mission).
struct Draw {
  double capacity_factor = 1.0, resistance_factor = 1.0;
  double soh_capacity = 1.0, soh_resistance = 1.0;
  double wind_mps = 0.0, wind_from_deg = 0.0;
  double gust_mps = 0.0, gust_W = 0.0;
  double air_C = 0.0, pack_C = 0.0;
  double payload_kg = 0.0;
  /// Draws that fell outside a field's range and were held at its end (names, in draw order).
  std::vector<std::string> clamped;
};

/// Draw sample `index` and set it in a copy of `base`.
Mission sampled_mission(const Mission& base, const Spreads& s, std::uint64_t seed, std::uint64_t index, Draw& draw);

struct Percentiles {
  std::size_t n = 0;  ///< values counted
  double p5 = 0.0, p50 = 0.0, p95 = 0.0;
};
/// Sample quantiles by linear interpolation between order statistics (R. J. Hyndman, Y. Fan,
/// Sample quantiles in statistical packages, 1996, definition 7).
Percentiles percentiles(std::vector<double> v);
double quantile_sorted(const std::vector<double>& sorted, double p);

/// The Wilson score interval at 95 % (z = 1.959964) for k successes in n trials (E. B. Wilson,
/// Probable inference, the law of succession, and statistical inference, 1927):
/// (p + z²/2n ± z·√(p(1−p)/n + z²/4n²)) / (1 + z²/n).
std::pair<double, double> wilson95(std::size_t k, std::size_t n);

struct SampleRun {
  Spreads spreads;
  std::uint64_t seed = 0;
  std::vector<Draw> draws;
  std::vector<PointResult> points;
  std::size_t n_go = 0;
  double p_go = 0.0;          ///< n_go / n
  double p_go_se = 0.0;       ///< binomial standard error √(p(1 − p)/n)
  double wilson_lo = 0.0, wilson_hi = 0.0;  ///< Wilson score interval at 95 % (z = 1.959964)
  Percentiles flight_time_s, landing_soc, spare_s;
  std::map<std::string, std::size_t> failures;  ///< rule → samples in which it fails
  std::string most_failing;   ///< the rule failing in most samples (ties: the first by name); empty if none
  std::size_t clamped = 0;    ///< samples with at least one draw held at a range end
};

/// Fly `n` samples of `base` under `s`. `threads` 0: one per core.
SampleRun run_samples(const Mission& base, const Spreads& s, int n, std::uint64_t seed, const SimOptions& so,
                      unsigned threads, const std::function<void(std::size_t, std::size_t)>& progress = {});

}  // namespace sortie::sim
