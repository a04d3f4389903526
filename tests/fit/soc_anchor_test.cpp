// Known SoC points (fit/soc) and the range a fitted model records (cell JSON "coverage"):
// only a tapered constant-voltage charge, a long rest at the start near the chemistry's full
// voltage, and a low-rate discharge ending at the cutoff are known points. A synthetic pulse
// test (sortie's own simulator on the invented demo cell, fixed seeds) cut off at SoC 0.1 is
// refused without --soc0 and, with it, fitted over the range it covers only.
#include <doctest/doctest.h>

#include <algorithm>
#include <array>
#include <cmath>

#include "core/error.hpp"
#include "fit/fit_cell.hpp"
#include "fit/soc.hpp"
#include "io/battery_json.hpp"
#include "io/cell_json_write.hpp"
#include "sim/synthetic_log.hpp"
#include "support/cli.hpp"
#include "support/synthetic.hpp"

using namespace sortie;

namespace {

/// A log at 1 s: `phases` of (current A, seconds, voltage at the end), the voltage moving
/// linearly through each phase.
battery::CellLog make_log(const std::vector<std::array<double, 3>>& phases, double v0) {
  battery::CellLog log;
  log.file = "log.csv";
  double t = 0.0, v = v0;
  log.time_s.push_back(0.0), log.current_A.push_back(0.0), log.voltage_V.push_back(v0), log.line.push_back(2);
  for (const auto& [i, dur, v_end] : phases) {
    const int n = static_cast<int>(dur);
    for (int k = 1; k <= n; ++k) {
      t += 1.0;
      log.time_s.push_back(t);
      log.current_A.push_back(i);
      log.voltage_V.push_back(v + (v_end - v) * k / n);
      log.line.push_back(log.line.back() + 1);
    }
    v = v_end;
  }
  return log;
}

/// The synthetic pulse test from the rest after its full charge down to the first row below
/// SoC 0.1 (the model's own SoC): a log that never reaches empty.
battery::CellLog cut_log(const sim::SyntheticLog& s) {
  std::size_t first = 0;  // the first rest row after the charge: the CV phase ends there
  while (first < s.time_s.size() && !(s.i_true_A[first] == 0.0 && s.soc_true[first] > 0.95)) ++first;
  std::size_t last = first;
  while (last + 1 < s.time_s.size() && s.soc_true[last + 1] >= 0.1) ++last;
  sim::SyntheticLog c;
  for (std::size_t k = first; k <= last; ++k) {
    c.time_s.push_back(s.time_s[k]);
    c.current_A.push_back(s.current_A[k]);
    c.voltage_V.push_back(s.voltage_V[k]);
  }
  return sim::to_cell_log(c, "cut.csv");
}

}  // namespace

TEST_SUITE("fit") {

TEST_CASE("soc: a discharge that stops above the cutoff is no empty point and a charge pulse's peak is no full voltage") {
  // Li-ion, 2 Ah: CC-CV charge to 4.2 V, a 120 s charge pulse that peaks at 4.35 V, then a
  // 0.5 A discharge stopped at 3.45 V — well above the chemistry's usual end (2.5–3.0 V).
  const auto log = make_log({{-2.0, 3000, 4.2}, {-1.0, 300, 4.2}, {-0.2, 300, 4.2}, {0.0, 600, 4.15},
                             {-4.0, 120, 4.35}, {0.0, 600, 4.16}, {0.5, 10000, 3.45}, {0.0, 600, 3.6}},
                            3.3);
  fit::SocOptions o;
  const auto se_fail = [&] { return fit::estimate_soc(log, o); };
  // One full point (the CV end) and no empty one: the capacity cannot be measured.
  CHECK_THROWS_WITH_AS(se_fail(), doctest::Contains("expected --capacity-Ah"), InputError);
  // ... and says which end is missing and why: the 3.45 V end is above the 3.0 V cutoff.
  CHECK_THROWS_WITH_AS(se_fail(), doctest::Contains("1 full and 0 empty point(s)"), InputError);
  CHECK_THROWS_WITH_AS(se_fail(), doctest::Contains("within 20 mV of the cutoff 3.000 V"), InputError);
  CHECK_THROWS_WITH_AS(se_fail(), doctest::Contains("the lowest discharge end was 3.450 V at"), InputError);
  o.capacity_Ah = 2.0;
  const auto se = fit::estimate_soc(log, o);
  REQUIRE(se.anchors.size() == 1);
  CHECK(se.anchors[0].kind == fit::SocAnchor::Kind::full);
  CHECK(se.v_full_V == doctest::Approx(4.2));  // the CV level, not the 4.35 V peak
  CHECK(se.v_full_source.find("constant-voltage") != std::string::npos);
  REQUIRE(se.chemistry);
  CHECK(se.v_empty_V == doctest::Approx(3.0));  // the top of the Li-ion range
  // With the cutoff given at 3.45 V the end of that discharge is empty (0.25 C against 2 Ah).
  o.v_cutoff_V = 3.45;
  CHECK(fit::estimate_soc(log, o).anchors.size() == 2);
}

TEST_CASE("soc: without a chemistry or a cutoff the capacity refusal names the missing cutoff") {
  // A CC-CV charge to 4.0 V (a level no known chemistry's full charge sits at, so no chemistry is
  // taken from it) then a 0.5 A discharge: a full point, but no cutoff to find an empty one by.
  const auto log = make_log({{-2.0, 3000, 4.0}, {-1.0, 300, 4.0}, {-0.2, 300, 4.0}, {0.0, 600, 3.95},
                             {0.5, 10000, 3.2}, {0.0, 600, 3.4}},
                            3.3);
  fit::SocOptions o;
  CHECK_THROWS_WITH_AS(fit::estimate_soc(log, o),
                       doctest::Contains("the cutoff voltage is not known (give --chemistry or --v-cutoff-V)"),
                       InputError);
  o.v_cutoff_V = 3.2;  // with the cutoff the discharge's end is the empty point
  CHECK(fit::estimate_soc(log, o).capacity_from_log);
}

TEST_CASE("soc: no known point is refused naming what was looked for and found") {
  // A discharge from 3.9 V to 3.6 V: no charge, no rest at the start, no end at the cutoff.
  const auto log = make_log({{1.0, 3000, 3.6}, {0.0, 600, 3.7}}, 3.9);
  fit::SocOptions o;
  o.chemistry = "Li-ion";
  CHECK_THROWS_WITH_AS(fit::estimate_soc(log, o),
                       doctest::Contains("no known full or empty point: looked for a charge that tapered"), InputError);
  try {
    (void)fit::estimate_soc(log, o);
  } catch (const InputError& e) {
    const std::string m = e.what();
    CHECK(m.find("no charge of a minute or more") != std::string::npos);
    CHECK(m.find("the lowest discharge end 3.600 V") != std::string::npos);
    CHECK(m.find("cutoff 3.000 V") != std::string::npos);
  }
}

TEST_CASE("fit cell: a pulse test cut off at SoC 0.1 is refused without --soc0 and with it fitted over its own range") {
  const battery::Cell truth = io::load_cell_file(test::source_path(test::kDemoLogCell));
  for (const std::uint64_t seed : {std::uint64_t{20240611}, std::uint64_t{5}, std::uint64_t{77}}) {
    MESSAGE("seed " << seed);
    sim::MeasurementNoise noise;
    noise.seed = seed;
    const sim::SyntheticLog s = sim::synthetic_pulse_test(truth, sim::PulseTestProtocol{}, noise);
    const battery::CellLog log = cut_log(s);
    // No chemistry, no --soc0: nothing in the log is a known point (it starts rested at 4.2 V,
    // but without a chemistry that is no known full voltage, and it never reaches empty).
    CHECK_THROWS_WITH_AS(fit::fit_cell(log, fit::CellFitOptions{}), doctest::Contains("no known full or empty point"),
                         InputError);
    fit::CellFitOptions o;
    o.soc.soc0 = 1.0;
    o.soc.capacity_Ah = truth.capacity_Ah;
    o.chemistry = "LiPo";
    const fit::CellFitResult r = fit::fit_cell(log, o);
    REQUIRE(r.cell.coverage);
    const battery::CellCoverage& c = *r.cell.coverage;
    CHECK(c.soc_max == doctest::Approx(1.0));
    CHECK(c.soc_min == doctest::Approx(0.1).epsilon(0.1));  // within 0.01 of the cut
    REQUIRE(c.current_max_A);
    REQUIRE(c.current_min_A);
    CHECK(*c.current_max_A == doctest::Approx(4.0 * truth.capacity_Ah).epsilon(0.01));  // the 4C pulses
    CHECK(*c.current_min_A < 0.0);                                                       // the charge pulses
    // The OCV table reaches no more than the documented margin below the data.
    CHECK(r.cell.ocv_V.x().front() >= c.soc_min - fit::kOcvMarginSoc - 1e-9);
    CHECK(r.cell.ocv_V.x().front() > 0.05);
    // Over the covered range the OCV is within 5 mV of the model's (the row's own SoC, counted
    // from --soc0 1 with the given capacity, against the simulator's).
    double worst = 0.0;
    for (std::size_t k = 0; k < log.size(); k += 7) {
      const double sf = r.soc[k];
      if (sf < c.soc_min || sf > c.soc_max) continue;
      worst = std::max(worst, std::fabs(r.cell.ocv_V(sf) - truth.ocv_V(sf)));
    }
    MESSAGE("largest OCV error over the covered range " << 1000 * worst << " mV");
    CHECK(worst < 0.005);
    CHECK(std::any_of(r.warnings.begin(), r.warnings.end(),
                      [](const std::string& w) { return w.find("the OCV table stops at SoC") != std::string::npos; }));
  }
}

TEST_CASE("cell json: the coverage block is written and read back and an empty range is refused") {
  battery::Cell c = io::load_cell_file(test::source_path(test::kDemoLogCell));
  battery::CellCoverage v;
  v.soc_min = 0.1;
  v.soc_max = 1.0;
  v.current_max_A = 66.0;
  v.current_min_A = -10.0;
  v.temperature_min_C = 19.5;
  v.temperature_max_C = 23.0;
  v.source = "fit cell a.csv b.csv";
  c.coverage = v;
  nlohmann::json j = nlohmann::json::parse(io::cell_to_json(c, "").dump());
  {
    io::ObjectReader r(j, io::Source{"c.json", {}}, "");
    const battery::Cell back = io::read_cell(r);
    REQUIRE(back.coverage);
    CHECK(back.coverage->soc_min == 0.1);
    CHECK(back.coverage->current_max_A == 66.0);
    CHECK(back.coverage->current_min_A == -10.0);
    CHECK(*back.coverage->temperature_max_C == 23.0);
    CHECK(back.coverage->source == "fit cell a.csv b.csv");
  }
  j["coverage"]["soc_max"] = 0.05;
  io::ObjectReader r(j, io::Source{"c.json", {}}, "");
  CHECK_THROWS_WITH_AS(io::read_cell(r), doctest::Contains("/coverage/soc_max"), InputError);
}

}  // TEST_SUITE
