// The spare-time solve flies each try from the flight as it stood at the start of the spare
// phase. Checked against the independent path, a whole simulation of the same lengthened
// mission from take-off: the results must be the same to the last bit (the same arithmetic in
// the same order), for a longer and a shorter spare phase and for every demo mission.
#include <doctest/doctest.h>

#include <optional>
#include <string>

#include "io/profile_json.hpp"
#include "sim/best_speeds.hpp"
#include "sim/mission.hpp"
#include "sim/mission_steps.hpp"
#include "support/cli.hpp"

using namespace sortie;

TEST_SUITE("mission") {

TEST_CASE("a flight resumed at its spare phase ends where a whole simulation of the same mission ends") {
  for (const char* file : {"profiles/demo-quad-water-tank.json", "profiles/demo-fixed-wing-field-survey.json",
                           "profiles/demo-hexa-highland-sensor.json"}) {
    CAPTURE(file);
    const sim::Mission m = sim::with_resolved_airspeeds(io::load_profile_file(test::source_path(file)).mission);
    const auto spare = sim::spare_phase(m);
    REQUIRE(spare);
    std::optional<sim::steps::FlightAt> at;
    const sim::MissionResult first = sim::steps::simulate_keeping(sim::lengthened(m, *spare, 30.0), {}, *spare, at);
    REQUIRE(at);
    CHECK(at->phase == *spare);
    CHECK(first.flight_time_s == sim::simulate(sim::lengthened(m, *spare, 30.0)).flight_time_s);
    for (double delta : {-60.0, 0.0, 45.0, 600.0}) {
      CAPTURE(delta);
      const sim::Mission mm = sim::lengthened(m, *spare, delta);
      const sim::MissionResult whole = sim::simulate(mm);
      const sim::MissionResult resumed = sim::steps::simulate_from(mm, {}, *at);
      CHECK(resumed.completed == whole.completed);
      CHECK(resumed.end_kind == whole.end_kind);
      CHECK(resumed.flight_time_s == whole.flight_time_s);
      CHECK(resumed.landing.soc == whole.landing.soc);
      CHECK(resumed.energy_Wh == whole.energy_Wh);
      CHECK(resumed.v_min_cell_V == whole.v_min_cell_V);
      CHECK(resumed.temperature_max_C == whole.temperature_max_C);
      CHECK(resumed.reserve_time_s == whole.reserve_time_s);
      CHECK(resumed.duty_mean == whole.duty_mean);
      REQUIRE(resumed.phases.size() == whole.phases.size());
      REQUIRE(resumed.events.size() == whole.events.size());
      for (std::size_t k = 0; k < whole.events.size(); ++k) {
        CHECK(resumed.events[k].kind == whole.events[k].kind);
        CHECK(resumed.events[k].t_s == whole.events[k].t_s);
      }
      REQUIRE(resumed.rules.size() == whole.rules.size());
      for (std::size_t k = 0; k < whole.rules.size(); ++k) {
        CAPTURE(whole.rules[k].name);
        CHECK(resumed.rules[k].pass == whole.rules[k].pass);
        CHECK(resumed.rules[k].margin == whole.rules[k].margin);
      }
      CHECK(sim::smallest_margin(mm, resumed) == sim::smallest_margin(mm, whole));
    }
  }
}

}  // TEST_SUITE
