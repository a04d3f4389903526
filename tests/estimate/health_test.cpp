// State of health from flights, against flights made by sortie's own simulator on a pack of
// known capacity and resistance factors with Gaussian measurement noise (independent truth: the
// simulator integrates the Thevenin ODE with Dormand–Prince under a constant-power demand; the
// estimator replays the logged current with its own discrete model).
#include <doctest/doctest.h>

#include <cmath>
#include <random>

#include "estimate/health.hpp"
#include "io/profile_json.hpp"
#include "sim/mission.hpp"
#include "support/cli.hpp"
#include "support/normal.hpp"

using namespace sortie;

namespace {

struct Truth {
  double capacity = 0.85, resistance = 1.3, soc0 = 0.95;
  double sigma_V = 0.02, sigma_A = 0.05;
};

io::LoadedProfile quad() {
  return io::load_profile_file(test::source_path("profiles/demo-quad-water-tank.json"));
}

/// The pack as the estimator sees it: the profile's, with the air at the field.
battery::Pack field_pack(const sim::Mission& m) {
  battery::Pack p = m.pack;
  if (!p.air_C)
    if (const auto air = m.environment.atmosphere.at(0.0)) p.air_C = air->temperature_K - 273.15;
  return p;
}

sim::MeasuredFlight fly(const sim::Mission& base, const Truth& t, unsigned seed) {
  sim::Mission m = base;
  m.pack.soh_capacity = t.capacity;
  m.pack.soh_resistance = t.resistance;
  m.pack.soc0 = t.soc0;
  sim::SimOptions so;
  so.sample_s = 1.0;
  const sim::MissionResult r = sim::simulate(m, so);
  REQUIRE(!r.refused);
  std::mt19937 g(seed);
  sim::MeasuredFlight f;
  for (const auto& p : r.trace) {
    f.time_s.push_back(p.s.t);
    f.voltage_V.push_back(p.s.term.v_terminal_V + t.sigma_V * test::normal(g));
    f.current_A.push_back(p.s.term.current_A + t.sigma_A * test::normal(g));
    f.lines.push_back(f.lines.size() + 2);
  }
  return f;
}

}  // namespace

TEST_SUITE("estimate") {

TEST_CASE("health: capacity 0.85 and resistance 1.3 recovered from one noisy simulated flight - several seeds") {
  const io::LoadedProfile lp = quad();
  const battery::Pack pack = field_pack(lp.mission);
  const Truth t;
  double z2_c = 0.0, z2_r = 0.0;
  const int seeds = 6;
  for (int s = 1; s <= seeds; ++s) {
    const sim::MeasuredFlight f = fly(lp.mission, t, 1000 + s);
    const estimate::HealthEstimate e = estimate::estimate_health(pack, {{"sim", f, std::nullopt, ""}});
    INFO("seed " << s << ": c " << e.capacity << " ± " << e.capacity_sd << ", r " << e.resistance << " ± "
                 << e.resistance_sd << ", corr " << e.correlation << ", rmse " << e.rmse_V << ", inflation "
                 << e.inflation << ", soc0 " << e.flights[0].soc0 << ", why " << e.why_refused);
    REQUIRE(!e.refused);
    CHECK(std::abs(e.capacity / t.capacity - 1.0) < 0.02);
    CHECK(std::abs(e.resistance / t.resistance - 1.0) < 0.05);
    CHECK(std::abs(e.flights[0].soc0 - t.soc0) < 0.02);
    REQUIRE(e.capacity_sd > 0.0);
    REQUIRE(e.resistance_sd > 0.0);
    const double zc = (e.capacity - t.capacity) / e.capacity_sd, zr = (e.resistance - t.resistance) / e.resistance_sd;
    MESSAGE("seed " << s << ": c " << e.capacity << " ± " << e.capacity_sd << " (z " << zc << "), r " << e.resistance
                    << " ± " << e.resistance_sd << " (z " << zr << ")");
    CHECK(std::abs(zc) < 4.0);
    CHECK(std::abs(zr) < 4.0);
    z2_c += zc * zc;
    z2_r += zr * zr;
  }
  // σ consistent with the actual error: the mean squared normalised error over the seeds is of
  // order 1 (χ²₆/6 lies below 3.0 with probability 0.994).
  CHECK(z2_c / seeds < 3.0);
  CHECK(z2_r / seeds < 3.0);
}

TEST_CASE("health: a shallow log and a constant-current log are refused - saying why") {
  const io::LoadedProfile lp = quad();
  const battery::Pack pack = field_pack(lp.mission);
  const sim::MeasuredFlight f = fly(lp.mission, Truth{}, 7);
  sim::MeasuredFlight shallow;  // the first 100 s: about 8 % of the charge
  for (std::size_t k = 0; k < f.time_s.size() && f.time_s[k] <= 100.0; ++k) {
    shallow.time_s.push_back(f.time_s[k]);
    shallow.voltage_V.push_back(f.voltage_V[k]);
    shallow.current_A.push_back(f.current_A[k]);
  }
  const auto e1 = estimate::estimate_health(pack, {{"shallow", shallow, std::nullopt, ""}});
  CHECK(e1.refused);
  CHECK(e1.flights[0].refused.find("too shallow") != std::string::npos);
  // A constant 20 A: the model's own voltage, so only the variation test can refuse it.
  sim::MeasuredFlight flat;
  for (int k = 0; k <= 1200; ++k) {
    flat.time_s.push_back(k);
    flat.current_A.push_back(20.0);
  }
  flat.voltage_V = estimate::health_model_voltage(pack, flat, 0.85, 1.3, 0.95);
  const auto e2 = estimate::estimate_health(pack, {{"flat", flat, std::nullopt, ""}});
  CHECK(e2.refused);
  CHECK(e2.flights[0].refused.find("too little current variation") != std::string::npos);
  // Both together: still refused; with the good flight added, the good one is used alone.
  const auto e3 = estimate::estimate_health(pack, {{"shallow", shallow, std::nullopt, ""}, {"flat", flat, std::nullopt, ""},
                                                   {"good", f, std::nullopt, ""}});
  CHECK(!e3.refused);
  CHECK(e3.logs_used == 1);
  CHECK(e3.flights[2].refused.empty());
}

TEST_CASE("health: the model of the estimator on its own voltage gives the factors back exactly") {
  const io::LoadedProfile lp = quad();
  const battery::Pack pack = field_pack(lp.mission);
  sim::MeasuredFlight f = fly(lp.mission, Truth{}, 3);
  f.voltage_V = estimate::health_model_voltage(pack, f, 0.9, 1.2, 0.9);
  const auto e = estimate::estimate_health(pack, {{"self", f, std::nullopt, ""}});
  REQUIRE(!e.refused);
  CHECK(e.capacity == doctest::Approx(0.9).epsilon(1e-5));
  CHECK(e.resistance == doctest::Approx(1.2).epsilon(1e-5));
  CHECK(e.flights[0].soc0 == doctest::Approx(0.9).epsilon(1e-5));
}

TEST_CASE("health: two flights of one pack share c and r - each with its own start SoC") {
  const io::LoadedProfile lp = quad();
  const battery::Pack pack = field_pack(lp.mission);
  Truth a, b;
  b.soc0 = 0.88;
  const auto fa = fly(lp.mission, a, 11), fb = fly(lp.mission, b, 12);
  const auto one = estimate::estimate_health(pack, {{"a", fa, std::nullopt, ""}});
  const auto two = estimate::estimate_health(pack, {{"a", fa, std::nullopt, ""}, {"b", fb, std::nullopt, ""}});
  REQUIRE(!two.refused);
  CHECK(two.logs_used == 2);
  CHECK(std::abs(two.capacity / 0.85 - 1.0) < 0.02);
  CHECK(std::abs(two.resistance / 1.3 - 1.0) < 0.05);
  CHECK(std::abs(two.flights[1].soc0 - 0.88) < 0.02);
  CHECK(two.capacity_sd < one.capacity_sd);  // more data, narrower
}

}  // TEST_SUITE
