// The flight check against synthetic flights made by the simulator itself: the plan's own
// trace, with measurement noise from a fixed seed, written as a log. Expected values are
// independent of the check: the noise level we added, the plan's own phase energies, and a
// second simulation of the same mission on a pack with reduced capacity (the truth for the time
// on station that was really left).
#include "sim/flight_check.hpp"

#include <doctest/doctest.h>

#include <cmath>
#include <random>

#include "io/profile_json.hpp"
#include "support/cli.hpp"

using namespace sortie;

namespace {

sim::MeasuredFlight log_from(const sim::MissionResult& r, double sigma_V, double sigma_A, unsigned seed) {
  std::mt19937 gen(seed);
  std::normal_distribution<double> nv(0.0, sigma_V), ni(0.0, sigma_A);
  sim::MeasuredFlight f;
  for (const auto& p : r.trace) {
    f.time_s.push_back(p.s.t);
    f.voltage_V.push_back(p.s.term.v_terminal_V + (sigma_V > 0 ? nv(gen) : 0.0));
    f.current_A.push_back(p.s.term.current_A + (sigma_A > 0 ? ni(gen) : 0.0));
    f.lines.push_back(f.lines.size() + 2);
  }
  return f;
}

struct Flown {
  io::LoadedProfile lp;
  sim::MissionResult plan;
};

Flown fly(const std::string& profile, double soh_capacity = 1.0) {
  Flown f{io::load_profile_file(test::source_path("profiles/" + profile)), {}};
  f.lp.mission.pack.soh_capacity = soh_capacity;
  sim::SimOptions so;
  so.sample_s = 1.0;
  f.plan = sim::simulate(f.lp.mission, so);
  return f;
}

}  // namespace

TEST_SUITE("sim") {

TEST_CASE("flight check: a noisy copy of the plan gives an RMSE at the noise level and the plan's phase energies") {
  for (const char* profile : {"demo-quad-water-tank.json", "demo-fixed-wing-field-survey.json"}) {
    CAPTURE(profile);
    const Flown f = fly(profile);
    const double sigma_V = 0.02, sigma_A = 0.05;
    const sim::MeasuredFlight log = log_from(f.plan, sigma_V, sigma_A, 7);
    const sim::FlightCheck c = sim::check_flight(f.lp.mission, f.plan, log, "synthetic.csv");
    REQUIRE(c.rows_compared == log.time_s.size());
    // RMSE of n samples of N(0, σ): relative standard deviation ≈ 1/√(2n) (about 3 % here);
    // 15 % is five of those.
    CHECK(c.v_rmse_V == doctest::Approx(sigma_V).epsilon(0.15));
    // Per phase: the log's energy is a sum over 1 s rows of a piecewise-smooth power (the plan
    // steps at phase boundaries): within 2 % or 0.03 Wh of the plan's integral.
    REQUIRE(c.phases.size() == f.plan.phases.size());
    for (const auto& p : c.phases) {
      CAPTURE(p.label);
      CHECK(std::abs(p.energy_meas_Wh - p.energy_pred_Wh) <= 0.02 * p.energy_pred_Wh + 0.03);
      CHECK(std::abs(p.charge_meas_Ah - p.charge_pred_Ah) <= 0.02 * p.charge_pred_Ah + 0.002);
    }
    CHECK(c.energy_meas_Wh == doctest::Approx(f.plan.energy_Wh).epsilon(0.01));
    CHECK(c.flight_time_meas_s == doctest::Approx(f.plan.flight_time_s).epsilon(1e-6));
    CHECK(c.soc_land_counted == doctest::Approx(f.plan.landing.soc).epsilon(0.01));
    // The log is the plan: the time on station left read from it is the plan's, within 3 %.
    CHECK(c.reserve_meas_s == doctest::Approx(f.plan.reserve_time_s).epsilon(0.03));
    // The replay of the same pack on the logged current differs from the log by the noise
    // (and the current noise through R0), not more than 1.5 σ.
    CHECK(c.replay_rmse_V < 1.5 * sigma_V);
  }
}

TEST_CASE("flight check: a pack at 80 % capacity shows the shortfall in time on station") {
  const Flown plan = fly("demo-quad-water-tank.json");
  const Flown worn = fly("demo-quad-water-tank.json", 0.8);
  REQUIRE(worn.plan.completed);
  const sim::MeasuredFlight log = log_from(worn.plan, 0.01, 0.02, 11);
  const sim::FlightCheck c = sim::check_flight(plan.lp.mission, plan.plan, log, "worn.csv");
  // Truth: the same mission simulated on the worn pack (its own time on station at landing).
  const double truth = worn.plan.reserve_time_s;
  const double planned = plan.plan.reserve_time_s;
  CAPTURE(truth);
  CAPTURE(planned);
  CAPTURE(c.reserve_meas_s);
  REQUIRE(truth < planned);
  CHECK(c.reserve_meas_s < planned);
  // The shortfall, independently by Coulomb counting: the worn pack holds 0.2·Q less charge, and
  // the flight used about the same charge, so the station time lost is ≈ 0.2·Q / I_station
  // (capped by the planned time itself). The check's figure lies within 5 % of the simulated
  // truth and its shortfall within 15 % of the counted one.
  CHECK(c.reserve_meas_s == doctest::Approx(truth).epsilon(0.05));
  const double q_rated_Ah = plan.lp.mission.pack.capacity_Ah();
  const double counted_shortfall = std::min(planned, 0.2 * q_rated_Ah * 3600.0 / c.station_current_A);
  CHECK(planned - c.reserve_meas_s == doctest::Approx(counted_shortfall).epsilon(0.15));
  CHECK(c.capacity_est_Ah == doctest::Approx(0.8 * q_rated_Ah).epsilon(0.05));
}

}  // TEST_SUITE
