// Sampled runs: the random transforms against the normal distribution's quantiles, the
// percentile definition against its published worked case, and zero spreads against the
// deterministic flight.
#include "sim/uncertainty.hpp"

#include <doctest/doctest.h>

#include <algorithm>
#include <boost/math/distributions/normal.hpp>
#include <cmath>
#include <random>

#include "io/profile_json.hpp"
#include "sim/what_if.hpp"
#include "support/cli.hpp"

using namespace sortie;

TEST_SUITE("uncertainty") {

TEST_CASE("Box-Muller normals have the normal distribution's quantiles within sampling error") {
  // Seed printed: 20261203.
  const std::uint64_t seed = 20261203;
  std::mt19937_64 g(seed);
  const std::size_t n = 40000;
  std::vector<double> z(n);
  for (auto& v : z) {
    const auto a = g();
    const auto b = g();
    v = sim::box_muller(a, b);
  }
  std::sort(z.begin(), z.end());
  const boost::math::normal normal(0.0, 1.0);
  for (const double p : {0.01, 0.05, 0.25, 0.5, 0.75, 0.95, 0.99}) {
    CAPTURE(p);
    const double q = sim::quantile_sorted(z, p);
    // The share of a true N(0,1) below the sample quantile is binomial: its standard error is
    // √(p(1−p)/n); 4.5 of them bound a false alarm over the seven checks well below 1e-4.
    const double f = boost::math::cdf(normal, q);
    CHECK(std::abs(f - p) < 4.5 * std::sqrt(p * (1 - p) / static_cast<double>(n)));
    // And the quantile itself against boost::math::quantile, to the same bound in z.
    const double dq = 4.5 * std::sqrt(p * (1 - p) / static_cast<double>(n)) /
                      boost::math::pdf(normal, boost::math::quantile(normal, p));
    CHECK(std::abs(q - boost::math::quantile(normal, p)) < dq);
  }
}

TEST_CASE("unit_uniform covers the unit interval evenly") {
  std::mt19937_64 g(99);  // seed printed: 99
  const int n = 20000;
  int below = 0;
  double lo = 1.0, hi = 0.0;
  for (int i = 0; i < n; ++i) {
    const double u = sim::unit_uniform(g());
    lo = std::min(lo, u);
    hi = std::max(hi, u);
    below += u < 0.3;
  }
  CHECK(lo >= 0.0);
  CHECK(hi < 1.0);
  CHECK(std::abs(below / double(n) - 0.3) < 4.5 * std::sqrt(0.3 * 0.7 / n));
  CHECK(sim::unit_uniform(0) == 0.0);
  CHECK(sim::unit_uniform(~0ULL) < 1.0);
}

TEST_CASE("percentiles follow Hyndman-Fan definition 7") {
  // Definition 7 (R. J. Hyndman, Y. Fan, Sample quantiles in statistical packages, 1996):
  // h = (n − 1)p + 1 (1-based); for 1..10 and p = 0.05, h = 1.45, so Q = 1.45; p = 0.5 → 5.5;
  // p = 0.95 → 9.55 (worked by hand).
  std::vector<double> v{10, 9, 8, 7, 6, 5, 4, 3, 2, 1};
  const auto p = sim::percentiles(v);
  CHECK(p.n == 10);
  CHECK(p.p5 == doctest::Approx(1.45));
  CHECK(p.p50 == doctest::Approx(5.5));
  CHECK(p.p95 == doctest::Approx(9.55));
}

TEST_CASE("sample seeds differ by index and repeat for the same seed") {
  CHECK(sim::sample_seed(1, 0) != sim::sample_seed(1, 1));
  CHECK(sim::sample_seed(1, 0) != sim::sample_seed(2, 0));
  CHECK(sim::sample_seed(5, 7) == sim::sample_seed(5, 7));
}

TEST_CASE("zero spreads fly the profile itself and drawn spreads move it") {
  const auto lp = io::load_profile_file(test::source_path("profiles/demo-quad-water-tank.json"));
  const sim::MissionResult base = sim::simulate(lp.mission);
  const sim::SampleRun zero = sim::run_samples(lp.mission, sim::zero_spreads(), 4, 3, {}, 2);
  for (const auto& p : zero.points) {
    CHECK(p.flight_time_s == base.flight_time_s);
    CHECK(p.landing_soc == base.landing.soc);
  }
  CHECK(zero.flight_time_s.p5 == base.flight_time_s);
  CHECK(zero.flight_time_s.p95 == base.flight_time_s);
  sim::Spreads s = sim::zero_spreads();
  s.payload_sd_kg = 0.2;
  sim::Draw d;
  const sim::Mission m = sim::sampled_mission(lp.mission, s, 3, 0, d);
  CHECK(sim::get_what_if(m, "payload-kg") == d.payload_kg);
  CHECK(d.payload_kg != sim::get_what_if(lp.mission, "payload-kg"));
  // Only the payload moved.
  CHECK(m.pack.soh_capacity == lp.mission.pack.soh_capacity);
  CHECK(m.environment.wind.speed_mps == lp.mission.environment.wind.speed_mps);
}

TEST_CASE("sampled runs do not depend on the thread count") {
  const auto lp = io::load_profile_file(test::source_path("profiles/demo-quad-water-tank.json"));
  sim::Spreads s;
  s.payload_sd_kg = 0.1;
  const auto a = sim::run_samples(lp.mission, s, 12, 42, {}, 1);
  const auto b = sim::run_samples(lp.mission, s, 12, 42, {}, 2);
  for (std::size_t i = 0; i < a.points.size(); ++i) {
    CHECK(a.points[i].flight_time_s == b.points[i].flight_time_s);
    CHECK(a.draws[i].payload_kg == b.draws[i].payload_kg);
  }
  CHECK(a.p_go == b.p_go);
}

TEST_CASE("the Wilson interval matches hand-worked cases") {
  // 977 of 1000: p = 0.977, z = 1.96: centre (0.977 + 0.001921)/1.003841 = 0.97517, half
  // 1.96·√(0.977·0.023/1000 + 9.6e-7)/1.003841 = 0.00946 → 0.96572 to 0.98463; 0 of 10 →
  // 0 to 0.27753 (worked by hand from E. B. Wilson 1927's formula).
  const auto [lo, hi] = sim::wilson95(977, 1000);
  CHECK(lo == doctest::Approx(0.965724).epsilon(1e-5));
  CHECK(hi == doctest::Approx(0.984626).epsilon(1e-5));
  const auto [lo0, hi0] = sim::wilson95(0, 10);
  CHECK(lo0 == 0.0);
  CHECK(hi0 == doctest::Approx(0.277533).epsilon(1e-5));
}

}  // TEST_SUITE
