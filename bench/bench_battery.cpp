// Battery benchmarks: full discharges to cutoff.
#include "battery/pack.hpp"
#include "bench.hpp"
#include "io/battery_json.hpp"
#include "sim/discharge.hpp"

namespace {

using namespace sortie;

battery::Pack demo_pack() {
  return io::load_pack_file(SORTIE_SOURCE_DIR "/models/packs/demo-4s1p-lipo-5000.json");
}

// A 4S pack of a two-RC cell at 1C to its cutoff, no trace: the integrator's cost for a whole
// discharge (about an hour of simulated time). The demo cell has a thermal block, so this is the
// coupled six-state run; the _isothermal case is the same pack without it.
/// 1C to the cell's cutoff, no trace.
double discharge_1c(const battery::Pack& pack) {
  sim::DischargeSpec spec;
  spec.load = sim::DischargeSpec::Load::current;
  spec.value = pack.cell.capacity_Ah * pack.parallel;
  spec.cutoff_cell_V = pack.cell.v_cutoff_V;
  spec.sample_s = 0.0;
  return sim::discharge(pack, spec).time_to_end_s;
}

const bool reg_1c = bench::add_case("discharge_1C_4S2RC", [] {
  static const battery::Pack pack = demo_pack();
  bench::keep(discharge_1c(pack));
});

const bool reg_1c_iso = bench::add_case("discharge_1C_4S2RC_isothermal", [] {
  static const battery::Pack pack = [] {
    battery::Pack p = demo_pack();
    p.cell.thermal.reset();
    return p;
  }();
  bench::keep(discharge_1c(pack));
});

const bool reg_power = bench::add_case("discharge_300W_4S2RC", [] {
  static const battery::Pack pack = demo_pack();
  sim::DischargeSpec spec;
  spec.load = sim::DischargeSpec::Load::power;
  spec.value = 300.0;
  spec.cutoff_cell_V = pack.cell.v_cutoff_V;
  spec.sample_s = 0.0;
  bench::keep(sim::discharge(pack, spec).time_to_end_s);
});

}  // namespace

namespace {

using namespace sortie;

// The 4S2P pack of the demo LiPo cell (two RC pairs) at constant 300 W to its cutoff, with and
// without the thermal block: the problem bench/scipy_reference.py solves with SciPy's RK45.
battery::Pack pack_4s2p(bool thermal) {
  battery::Pack p = io::load_pack_file(SORTIE_SOURCE_DIR "/models/packs/demo-4s1p-lipo-5000.json");
  p.parallel = 2;
  if (!thermal) p.cell.thermal.reset();
  return p;
}

double discharge_300w(const battery::Pack& pack,
                      sim::SegmentOptions::Method method = sim::SegmentOptions::Method::exponential) {
  sim::DischargeSpec spec;
  spec.method = method;
  spec.load = sim::DischargeSpec::Load::power;
  spec.value = 300.0;
  spec.cutoff_cell_V = pack.cell.v_cutoff_V;
  spec.sample_s = 0.0;
  return sim::discharge(pack, spec).time_to_end_s;
}

// The default stepper: exponential (sim/exp_stepper.hpp).
const bool reg_4s2p = bench::add_case("discharge_300W_4S2P_2RC", [] {
  static const battery::Pack pack = pack_4s2p(true);
  bench::keep(discharge_300w(pack));
});

const bool reg_4s2p_iso = bench::add_case("discharge_300W_4S2P_2RC_isothermal", [] {
  static const battery::Pack pack = pack_4s2p(false);
  bench::keep(discharge_300w(pack));
});

// The same with Odeint's Dormand–Prince, the reference stepper of the tests.
const bool reg_4s2p_dp = bench::add_case("discharge_300W_4S2P_2RC_dopri5", [] {
  static const battery::Pack pack = pack_4s2p(true);
  bench::keep(discharge_300w(pack, sim::SegmentOptions::Method::dopri5));
});

const bool reg_4s2p_iso_dp = bench::add_case("discharge_300W_4S2P_2RC_isothermal_dopri5", [] {
  static const battery::Pack pack = pack_4s2p(false);
  bench::keep(discharge_300w(pack, sim::SegmentOptions::Method::dopri5));
});

}  // namespace
