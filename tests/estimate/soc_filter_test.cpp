// The SoC filter and the time left, against flights made by sortie's own simulator with known
// truth: the true state at the cut is the simulator's, and the true remainder is the simulator
// continued from that state at the same power (estimate::time_to_rules on the true state).
#include <doctest/doctest.h>

#include <cmath>
#include <random>

#include "estimate/soc_filter.hpp"
#include "io/profile_json.hpp"
#include "sim/mission.hpp"
#include "support/cli.hpp"
#include "support/normal.hpp"

using namespace sortie;

namespace {

struct Flown {
  sim::MeasuredFlight log;
  std::vector<estimate::StepState> truth;  ///< the simulator's state at each row
  battery::Pack pack;                      ///< the pack that flew, with the air at the field
  flight::Reserve reserve;
};

Flown fly(unsigned seed, double soc0 = 0.95) {
  io::LoadedProfile lp = io::load_profile_file(test::source_path("profiles/demo-quad-water-tank.json"));
  sim::Mission m = lp.mission;
  m.pack.soh_capacity = 0.85;
  m.pack.soh_resistance = 1.3;
  m.pack.soc0 = soc0;
  sim::SimOptions so;
  so.sample_s = 1.0;
  const sim::MissionResult r = sim::simulate(m, so);
  REQUIRE(!r.refused);
  Flown f;
  f.pack = m.pack;
  if (const auto air = m.environment.atmosphere.at(0.0)) f.pack.air_C = air->temperature_K - 273.15;
  f.reserve = m.reserve;
  std::mt19937 g(seed);
  for (const auto& p : r.trace) {
    f.log.time_s.push_back(p.s.t);
    f.log.voltage_V.push_back(p.s.term.v_terminal_V + 0.02 * test::normal(g));
    f.log.current_A.push_back(p.s.term.current_A + 0.05 * test::normal(g));
    f.truth.push_back({p.s.x[battery::kSoc], p.s.x[battery::kV1], p.s.x[battery::kV2], p.s.x[battery::kTemp]});
  }
  return f;
}

}  // namespace

TEST_SUITE("estimate") {

TEST_CASE("soc filter: from a wrong start guess - mid-flight time left within 3 % of the simulator's true remainder") {
  double nees = 0.0;
  const int seeds = 8;
  for (int s = 1; s <= seeds; ++s) {
    const Flown f = fly(2000 + s);
    const std::size_t mid = f.log.time_s.size() / 2;
    estimate::FilterOptions fo;
    fo.soc0 = 0.80;  // truth 0.95
    fo.soc0_sd = 0.15;
    const estimate::Remaining rem = estimate::remaining_time(f.pack, f.reserve, f.log, f.log.time_s[mid], fo);
    REQUIRE(rem.rows == mid + 1);
    const auto truth = estimate::time_to_rules(f.pack, f.reserve, f.truth[mid], rem.power_W, 86400.0);
    REQUIRE(truth.size() == rem.rules.size());
    const double e = rem.soc - f.truth[mid].soc;
    nees += e * e / (rem.soc_sd * rem.soc_sd);
    for (std::size_t k = 0; k < truth.size(); ++k) {
      REQUIRE(truth[k].time_s);
      REQUIRE(rem.rules[k].time_s);
      const double t_true = *truth[k].time_s, t_est = *rem.rules[k].time_s;
      MESSAGE("seed " << s << " " << truth[k].rule << ": " << t_est << " ± " << rem.rules[k].sd_s << " s, true " << t_true
                      << " s; SoC " << rem.soc << " ± " << rem.soc_sd << " true " << f.truth[mid].soc);
      if (t_true > 0.0) CHECK(std::abs(t_est - t_true) < 0.03 * t_true);
    }
  }
  // Filter consistency: the normalised squared SoC error at the cut, averaged over the seeds,
  // lies inside the two-sided 99 % interval of χ²₈/8, [0.17, 2.51] (chi-square quantiles,
  // e.g. M. Abramowitz and I. Stegun, Handbook of Mathematical Functions, 1964, table 26.8).
  nees /= seeds;
  MESSAGE("mean NEES of SoC over " << seeds << " seeds: " << nees);
  CHECK(nees > 0.17);
  CHECK(nees < 2.51);
}

TEST_CASE("soc filter: the normalised innovations of a whole flight have mean near 0 and variance near 1") {
  const Flown f = fly(77);
  estimate::FilterOptions fo;
  fo.soc0 = 0.85;
  const estimate::FilterResult r = estimate::run_soc_filter(f.pack, f.log, f.log.time_s.size(), fo);
  double m = 0.0, v = 0.0;
  const std::size_t n = r.rows.size();
  for (const auto& row : r.rows) m += row.innovation_V / row.innovation_sd_V;
  m /= n;
  for (const auto& row : r.rows) v += std::pow(row.innovation_V / row.innovation_sd_V - m, 2);
  v /= n - 1;
  MESSAGE("normalised innovations: mean " << m << ", variance " << v << " over " << n << " rows");
  // For white unit-variance innovations, the mean of n has sd 1/√n and the variance about
  // √(2/n): bounds at 5 sd.
  CHECK(std::abs(m) < 5.0 / std::sqrt(n));
  CHECK(std::abs(v - 1.0) < 5.0 * std::sqrt(2.0 / n));
}

TEST_CASE("soc filter: the SoC tracks the truth within 2 points from a start guess 20 points low") {
  const Flown f = fly(5);
  estimate::FilterOptions fo;
  fo.soc0 = 0.75;
  fo.soc0_sd = 0.2;
  const auto good = estimate::run_soc_filter(f.pack, f.log, f.log.time_s.size(), fo);
  double worst = 0.0;
  for (std::size_t k = 60; k < good.rows.size(); ++k) worst = std::max(worst, std::abs(good.rows[k].soc - f.truth[k].soc));
  MESSAGE("largest SoC error after the first minute: " << worst);
  CHECK(worst < 0.02);
  CHECK(std::abs(good.rows.back().soc - f.truth.back().soc) < 3.0 * good.rows.back().soc_sd + 1e-3);
}

}  // TEST_SUITE
