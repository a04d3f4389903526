// Every integration loop and whole-mission solve has a cap on its work with a specific
// one-line LimitError (docs/style.md rule 9): each test here hits one cap.
#include <doctest/doctest.h>

#include <string>

#include "battery/thevenin.hpp"
#include "core/error.hpp"
#include "io/profile_json.hpp"
#include "sim/discharge.hpp"
#include "sim/mission.hpp"
#include "sim/segment.hpp"
#include "support/cells.hpp"
#include "support/cli.hpp"

using namespace sortie;
using doctest::Contains;

namespace {

battery::Pack rc_pack() {
  return test::single(test::analytic_cell(5.0, 3.6, 0.5, 0.01, {{Table(0.004), Table(30.0)}}));
}

sim::Mission demo_mission() {
  return io::load_profile_file(test::source_path("profiles/demo-quad-water-tank.json")).mission;
}

}  // namespace

TEST_SUITE("sim") {

TEST_CASE("step cap: run_segment stops with a LimitError naming what it integrated") {
  const battery::PackModel model(rc_pack());
  sim::SegmentOptions opts;
  opts.t_end = 3600.0;
  opts.max_dt_s = 1.0;  // at least 3600 steps
  opts.max_steps = 50;
  opts.context = "test stretch";
  CHECK_THROWS_WITH_AS(sim::run_segment(model, battery::Demand::current(1.0), 0.0, model.initial_state(1.0), {}, opts),
                       Contains("test stretch: integration stopped after 50 steps at t = "), LimitError);
}

TEST_CASE("sample cap: a trace too fine for its length is a LimitError — not an exhausted memory") {
  const battery::PackModel model(rc_pack());
  sim::SegmentOptions opts;
  opts.t_end = 100.0;
  opts.sample_s = 0.01;  // 10 000 samples
  opts.max_samples = 1000;
  CHECK_THROWS_WITH_AS(sim::run_segment(model, battery::Demand::current(1.0), 0.0, model.initial_state(1.0), {}, opts),
                       Contains("integration: the trace would hold more than 1000 samples at a spacing of 0.01 s"),
                       LimitError);
}

TEST_CASE("discharge step cap over a load series names the whole cap — not the steps left") {
  // The cap was handed to each segment as the steps left, so the message read "after 0 steps".
  sim::DischargeSpec spec;
  spec.load = sim::DischargeSpec::Load::series;
  spec.series.quantity = sim::LoadSeries::Quantity::current;
  for (int k = 0; k <= 400; ++k) {  // 400 one-second stretches, each at least one step
    spec.series.time_s.push_back(k);
    spec.series.value.push_back(1.0 + (k % 2));
  }
  spec.cutoff_cell_V = 1.0;
  spec.sample_s = 0.0;
  spec.max_steps = 100;
  spec.steps_per_stretch = 0;  // the cap alone, not its share per stretch
  CHECK_THROWS_WITH_AS(sim::discharge(rc_pack(), spec), Contains("discharge: integration stopped after 100 steps at t = "),
                       LimitError);
  // The message names the run and offers a way out.
  spec.context = "discharge: flight-log.csv";
  CHECK_THROWS_WITH_AS(sim::discharge(rc_pack(), spec),
                       Contains("discharge: flight-log.csv: integration stopped after 100 steps at t = "), LimitError);
  CHECK_THROWS_WITH_AS(sim::discharge(rc_pack(), spec),
                       Contains("without reaching the end; the load has 401 rows; resample it to fewer rows, or split it into shorter files"),
                       LimitError);
  // With its share per stretch the same load runs to its end.
  spec.steps_per_stretch = 16;
  CHECK(sim::discharge(rc_pack(), spec).end_reason == sim::EndReason::load_end);
}

TEST_CASE("discharge sample cap: a fine trace over a long discharge is a LimitError") {
  sim::DischargeSpec spec;
  spec.load = sim::DischargeSpec::Load::current;
  spec.value = 0.01;  // 5 Ah at 10 mA: 500 h
  spec.cutoff_cell_V = 1.0;
  spec.sample_s = 1.0;
  spec.max_samples = 5000;
  CHECK_THROWS_WITH_AS(sim::discharge(rc_pack(), spec), Contains("discharge: the trace would hold more than 5000 samples"),
                       LimitError);
}

TEST_CASE("mission step cap counts every stretch of a phase — not each stretch alone") {
  // A climb of 1000 m in 1 m stretches: 1000 stretches of at least one step each. The cap was
  // given to each stretch afresh, so 500 steps per phase were never reached.
  sim::Mission m = demo_mission();
  m.phases.resize(2);
  m.phases[0] = flight::Phase{};
  m.phases[0].kind = flight::Phase::Kind::climb;
  m.phases[0].to_height_m = 1000.0;
  m.phases[0].rate_mps = 4.0;
  m.phases[1] = flight::Phase{};
  m.phases[1].kind = flight::Phase::Kind::descend;
  m.phases[1].to_height_m = 0.0;
  m.phases[1].rate_mps = 4.0;
  m.reserve = {};
  sim::SimOptions so;
  so.max_height_step_m = 1.0;
  so.max_steps_per_phase = 500;
  CHECK_THROWS_WITH_AS(sim::simulate(m, so), Contains("phase 1 climb: integration stopped after 500 steps at t = "),
                       LimitError);
  so.max_steps_per_phase = 100000;
  CHECK(sim::simulate(m, so).flight_time_s > 0.0);
}

TEST_CASE("mission step cap: the reserve-time run at landing has its own named cap") {
  // Short phases, then the hover reserve run flies the pack down to its cutoff: many more steps.
  sim::Mission m = demo_mission();
  m.phases.resize(2);
  m.phases[0] = flight::Phase{};
  m.phases[0].kind = flight::Phase::Kind::climb;
  m.phases[0].to_height_m = 1.0;
  m.phases[0].rate_mps = 2.0;
  m.phases[1] = flight::Phase{};
  m.phases[1].kind = flight::Phase::Kind::descend;
  m.phases[1].to_height_m = 0.0;
  m.phases[1].rate_mps = 2.0;
  m.reserve = {};
  m.reserve.hover_s = 60.0;
  sim::SimOptions so;
  so.max_steps_per_phase = 30;
  CHECK_THROWS_WITH_AS(sim::simulate(m, so), Contains("reserve time at landing: integration stopped after 30 steps"),
                       LimitError);
}

TEST_CASE("mission sample cap: the trace of a whole flight is capped") {
  sim::SimOptions so;
  so.sample_s = 0.01;
  so.max_trace_samples = 20000;  // the demo flies for over 200 s
  CHECK_THROWS_WITH_AS(sim::simulate(demo_mission(), so), Contains("the trace would hold more than 20000 samples"),
                       LimitError);
}

TEST_CASE("spare-time solve: a cap on whole-mission simulations") {
  const sim::Mission m = demo_mission();
  const sim::MissionResult base = sim::simulate(m);
  sim::SpareOptions two;
  two.max_simulations = 2;
  CHECK_THROWS_WITH_AS(sim::solve_spare(m, base, two),
                       Contains("spare-time solve stopped after 2 whole-mission simulations"), LimitError);
  const sim::SpareResult s = sim::solve_spare(m, base);
  CHECK(s.simulations > 2);
  CHECK(s.simulations <= 150);
}

}  // TEST_SUITE
