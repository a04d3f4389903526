// An integration whose state overflows in a trial stage must not run on in NaN (Odeint accepts a
// step whose error estimate is NaN): the step is taken again shorter, or the run stops with a
// LimitError.
#include <doctest/doctest.h>

#include <cmath>
#include <limits>

#include "core/error.hpp"
#include "sim/discharge.hpp"
#include "sim/segment.hpp"
#include "support/cells.hpp"

using namespace sortie;

TEST_SUITE("sim") {

TEST_CASE("discharge: a 1000 ohm RC pair under a power ramp ends at the cutoff instead of running on in NaN") {
  // Found by the pack fuzz target (fuzz/regressions/pack/rc-pair-1000-ohm-power-load-went-nan.json):
  // the first step's trial stages drove v1 past the OCV, the terminal solve took the far root, and
  // the discharge "ended with the load" after 60 s with NaN charge and energy.
  battery::Cell c = test::analytic_cell(2.2, 3.3, 1.05, 0.006, {{Table(1000.0), Table(5.0)}});
  c.v_cutoff_V = 3.4;
  battery::Pack p = test::single(c);
  p.series = 4;
  sim::DischargeSpec spec;
  spec.load = sim::DischargeSpec::Load::series;
  spec.series.quantity = sim::LoadSeries::Quantity::power;
  spec.series.time_s = {0.0, 60.0};
  spec.series.value = {16.5, 66.0};
  spec.cutoff_cell_V = c.v_cutoff_V;
  spec.sample_s = 0.0;
  const auto r = sim::discharge(p, spec);
  CHECK(r.end_reason == sim::EndReason::cutoff_voltage);
  // v1 rises at I·R1/τ1 ≈ 1 A · 4000 Ω / 5 s = 800 V/s from 0: the 4·(4.35 − 3.4) ≈ 3.8 V
  // margin to the cutoff is used up in about 5 ms.
  CHECK(r.time_to_end_s > 0.0);
  CHECK(r.time_to_end_s < 0.01);
  CHECK(std::isfinite(r.charge_Ah));
  CHECK(std::isfinite(r.energy_Wh));
}

TEST_CASE("run_segment: a state that stops being finite is a LimitError — not a NaN result") {
  const battery::PackModel model(test::single(test::analytic_cell(5.0, 3.7, 0.0, 0.01)));
  sim::SegmentOptions opts;
  opts.t_end = 10.0;
  opts.context = "test stretch";
  const auto nan_load = battery::Demand::current(std::numeric_limits<double>::quiet_NaN());
  CHECK_THROWS_WITH_AS(sim::run_segment(model, nan_load, 0.0, model.initial_state(1.0), {}, opts),
                       doctest::Contains("test stretch: the state of the pack stopped being a finite number at t = 0 s"),
                       LimitError);
}

}  // TEST_SUITE

TEST_SUITE("sim") {

TEST_CASE("discharge: a load starting at -1e300 s is a LimitError — not a boost domain_error") {
  // Steps of a second cannot move a time of -1e300 s: the event bracket had no width and
  // TOMS 748 threw std::domain_error, reported as an internal error
  // (fuzz/regressions/load_csv/time-minus-1e300-s.csv).
  sim::DischargeSpec spec;
  spec.load = sim::DischargeSpec::Load::series;
  spec.series.quantity = sim::LoadSeries::Quantity::current;
  spec.series.time_s = {-1e300, 30.0, 60.0};
  spec.series.value = {10.0, 20.0, 5.0};
  spec.cutoff_cell_V = 3.0;
  spec.sample_s = 0.0;
  const battery::Pack p = test::single(test::analytic_cell(5.0, 3.6, 0.6, 0.01, {{Table(0.002), Table(20.0)}}));
  CHECK_THROWS_WITH_AS(sim::discharge(p, spec),
                       doctest::Contains("discharge: the integration cannot advance from t = -1e+300 s"), LimitError);
}

}  // TEST_SUITE
