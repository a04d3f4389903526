// `fit cell` round trip: a pulse-test log made by sortie's own simulator from known parameters
// (the invented demo cell) plus measurement noise from fixed, printed seeds; the fit must give
// the parameters back. Tolerances are the issue's: R0 within 2 %, each τ within 10 %, OCV within
// 5 mV. The noise (1 mV voltage, 2 mA current, 1 mV/1 mA resolution) is that of a good cell
// cycler (common practice).
#include <doctest/doctest.h>

#include <algorithm>
#include <cmath>

#include "core/text.hpp"
#include "fit/fit_cell.hpp"
#include "io/battery_json.hpp"
#include "sim/replay.hpp"
#include "support/cli.hpp"
#include "support/synthetic.hpp"

using namespace sortie;

namespace {

/// The fit's SoC is counted from this log's own full and empty points, so it is an affine image
/// of the model's: soc_true = a + b·soc_fit, with a and b read at the two anchors.
struct SocMap {
  double a = 0.0, b = 1.0;
  double operator()(double soc_fit) const { return a + b * soc_fit; }
};

SocMap soc_map(const fit::CellFitResult& r, const sim::SyntheticLog& s) {
  std::size_t full = 0, empty = 0;
  for (const auto& an : r.soc_estimate.anchors) {
    if (an.kind == fit::SocAnchor::Kind::full) full = an.row;
    if (an.kind == fit::SocAnchor::Kind::empty) empty = an.row;
  }
  REQUIRE(full != empty);
  SocMap m;
  m.a = s.soc_true[empty];
  m.b = s.soc_true[full] - m.a;
  return m;
}

/// The demo cell is a LiPo (its file says so): the fit takes its full and cutoff voltages from
/// that (fit/chemistry).
fit::CellFitOptions lipo_options() {
  fit::CellFitOptions o;
  o.chemistry = "LiPo";
  return o;
}

}  // namespace

TEST_SUITE("fit") {

TEST_CASE("fit cell: a synthetic pulse test gives back R0 within 2 % and each tau within 10 % and the OCV within 5 mV") {
  const battery::Cell truth = io::load_cell_file(test::source_path(test::kDemoLogCell));
  for (const std::uint64_t seed : {std::uint64_t{20240611}, std::uint64_t{7}, std::uint64_t{1234567}}) {
    MESSAGE("seed " << seed);
    sim::MeasurementNoise noise;
    noise.seed = seed;
    const sim::SyntheticLog s = sim::synthetic_pulse_test(truth, sim::PulseTestProtocol{}, noise);
    const fit::CellFitResult r = fit::fit_cell(sim::to_cell_log(s, "synthetic"), lipo_options());
    const SocMap map = soc_map(r, s);
    REQUIRE(r.tables);
    REQUIRE(r.cell.rc.size() == 2);

    // R0 at every band's knot against the model's R0 at the same state.
    for (const auto& b : r.bands) {
      CHECK(b.excited);
      const double want = truth.r0_ohm(map(b.soc));
      CHECK_MESSAGE(std::fabs(b.r0_ohm - want) <= 0.02 * want,
                    "R0 at SoC " << b.soc << ": " << b.r0_ohm << " vs " << want);
    }
    // Time constants (constant in the model), at every knot.
    for (int p = 0; p < 2; ++p) {
      const double want = truth.rc[p].tau_s(0.5);
      for (const auto& b : r.bands)
        CHECK_MESSAGE(std::fabs(b.tau_s[p] - want) <= 0.10 * want,
                      "tau" << p + 1 << " at SoC " << b.soc << ": " << b.tau_s[p] << " vs " << want);
    }
    // RC resistances (constant in the model), at every knot, within 10 %: an RC pair's R and τ
    // trade against each other over a pulse of finite length, so R_k is held as loosely as τ_k.
    for (int p = 0; p < 2; ++p) {
      const double want = truth.rc[p].r_ohm(0.5);
      for (const auto& b : r.bands)
        CHECK_MESSAGE(std::fabs(b.r_ohm[p] - want) <= 0.10 * want,
                      "R" << p + 1 << " at SoC " << b.soc << ": " << b.r_ohm[p] << " vs " << want);
    }
    // OCV wherever the log has data (the fitted SoC 0..1 is where this log's discharge started
    // and ended), every 1 % SoC.
    double worst = 0.0;
    for (int i = 0; i <= 100; ++i) {
      const double sf = i / 100.0;
      worst = std::max(worst, std::fabs(r.cell.ocv_V(sf) - truth.ocv_V(map(sf))));
    }
    CHECK_MESSAGE(worst <= 0.005, "largest OCV error " << 1000 * worst << " mV");
    // Capacity: the charge between this log's full and empty points, Q·(soc_full − soc_empty).
    CHECK(r.cell.capacity_Ah == doctest::Approx(truth.capacity_Ah * map.b).epsilon(0.002));
    // The fit explains the log down to the noise: RMSE of the counted rows near σ = 1 mV
    // (plus 0.29 mV of quantisation, √(1² + 0.29²) ≈ 1.04 mV).
    CHECK(r.fit_rmse_V < 0.0012);
    // The report says how far the log reaches in current: the protocol's largest pulse.
    double i_max = 0.0;
    for (double i : s.current_A) i_max = std::max(i_max, i);
    const std::string reach = "largest discharge current in the log " + format_fixed(i_max, 2) + " A (" +
                              format_fixed(i_max / r.cell.capacity_Ah, 2) + " C)";
    CHECK_MESSAGE(std::any_of(r.notes.begin(), r.notes.end(), [&](const std::string& n) { return n.rfind(reach, 0) == 0; }),
                  "no note starting '" << reach << "'");
  }
}

TEST_CASE("fit cell: the written model re-simulated on the log's current matches it") {
  const battery::Cell truth = io::load_cell_file(test::source_path(test::kDemoLogCell));
  MESSAGE("seed " << test::kDemoLogSeed);
  const sim::SyntheticLog s = sim::synthetic_pulse_test(truth, sim::PulseTestProtocol{}, test::demo_log_noise());
  const battery::CellLog log = sim::to_cell_log(s, "synthetic");
  const fit::CellFitResult r = fit::fit_cell(log, lipo_options());
  battery::Pack pack;
  pack.cell = r.cell;
  pack.soc0 = r.soc.front();
  const sim::ReplayResult rep = sim::replay(pack, {log.time_s, log.current_A, log.section_starts});
  // Rows from the end of the first charge on (the fit leaves the charge out: a real cell's OCV
  // differs there by hysteresis; this model has none, so they would fit too, but below the
  // log's own empty point the table is held flat and the first rest sits there).
  std::size_t from = 0;
  for (const auto& an : r.soc_estimate.anchors)
    if (an.kind == fit::SocAnchor::Kind::full) from = an.row;
  double sum2 = 0.0, worst = 0.0;
  std::size_t at = 0;
  for (std::size_t k = from; k < log.size(); ++k) {
    const double d = rep.v_terminal_V[k] - s.v_true_V[k];
    sum2 += d * d;
    if (std::fabs(d) > worst) worst = std::fabs(d), at = k;
  }
  MESSAGE("largest " << 1000 * worst << " mV at t = " << log.time_s[at] << " s, fitted SoC " << r.soc[at]
                     << ", current " << log.current_A[at]);
  const double rmse_true = std::sqrt(sum2 / static_cast<double>(log.size() - from));
  MESSAGE("RMSE against the noise-free voltage: " << 1000 * rmse_true << " mV");
  CHECK(rmse_true < 0.002);
}

}  // TEST_SUITE
