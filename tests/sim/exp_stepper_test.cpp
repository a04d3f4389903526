// The exponential stepper against two independent references: Odeint's Dormand–Prince at
// 1e-10 on the same pack, and the closed form of a constant-current discharge (Coulomb
// counting: t = SoC drop · C / I) on a pack whose RC pairs are far faster than the steps.
#include <doctest/doctest.h>

#include <cmath>

#include "io/battery_json.hpp"
#include "sim/discharge.hpp"

using namespace sortie;

namespace {

battery::Pack demo_4s2p(bool thermal) {
  battery::Pack p = io::load_pack_file(SORTIE_SOURCE_DIR "/models/packs/demo-4s1p-lipo-5000.json");
  p.parallel = 2;
  if (!thermal) p.cell.thermal.reset();
  return p;
}

sim::DischargeSpec at_300w(const battery::Pack& p, sim::SegmentOptions::Method m, std::size_t* steps) {
  sim::DischargeSpec s;
  s.load = sim::DischargeSpec::Load::power;
  s.value = 300.0;
  s.cutoff_cell_V = p.cell.v_cutoff_V;
  s.sample_s = 0.0;
  s.method = m;
  s.steps_out = steps;
  return s;
}

}  // namespace

TEST_SUITE("sim") {
TEST_CASE("exponential stepper: the 4S2P pack at 300 W reaches its cutoff where Dormand–Prince at 1e-10 does") {
  for (bool thermal : {false, true}) {
    CAPTURE(thermal);
    const battery::Pack p = demo_4s2p(thermal);
    std::size_t steps_exp = 0, steps_dp = 0;
    const auto e = sim::discharge(p, at_300w(p, sim::SegmentOptions::Method::exponential, &steps_exp));
    const auto d = sim::discharge(p, at_300w(p, sim::SegmentOptions::Method::dopri5, &steps_dp));
    MESSAGE("thermal " << thermal << ": exponential " << e.time_to_end_s << " s in " << steps_exp
                       << " steps, Dormand-Prince " << d.time_to_end_s << " s in " << steps_dp << " steps");
    CHECK(e.end_reason == sim::EndReason::cutoff_voltage);
    CHECK(e.time_to_end_s == doctest::Approx(d.time_to_end_s).epsilon(1e-6));
    CHECK(e.energy_Wh == doctest::Approx(d.energy_Wh).epsilon(1e-6));
    CHECK(e.charge_Ah == doctest::Approx(d.charge_Ah).epsilon(1e-6));
    CHECK(e.temperature_end_C == doctest::Approx(d.temperature_end_C).epsilon(1e-6));
    CHECK(steps_exp < steps_dp);  // the fast pair no longer bounds the step
  }
}

TEST_CASE("exponential stepper: constant current with a linear OCV ends at the Coulomb-counting time") {
  // OCV linear in SoC, constant R0 and RC pairs: at constant current I the loaded voltage is
  // S·OCV(SoC) − I·(R0 + R1(1 − e^{−t/τ1}) + R2(1 − e^{−t/τ2})); the SoC floor ends the run
  // at t = (SoC0 − floor)·C/I exactly, whatever the pairs do.
  battery::Pack p = demo_4s2p(false);
  p.cell.ocv_V = Table({0.0, 1.0}, {3.3, 4.2});
  sim::DischargeSpec s;
  s.load = sim::DischargeSpec::Load::current;
  s.value = 10.0;
  s.cutoff_cell_V = 2.0;
  s.soc_floor = 0.2;
  s.sample_s = 0.0;
  s.method = sim::SegmentOptions::Method::exponential;
  const auto r = sim::discharge(p, s);
  const double t_ref = 0.8 * 3600.0 * p.capacity_Ah() / 10.0;
  CHECK(r.end_reason == sim::EndReason::soc_floor);
  CHECK(r.time_to_end_s == doctest::Approx(t_ref).epsilon(1e-7));
  CHECK(r.charge_Ah == doctest::Approx(0.8 * p.capacity_Ah()).epsilon(1e-7));
}
}
