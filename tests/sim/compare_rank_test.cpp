// What "best pack" means (sim/compare rank_rows, equal_energy_packs, `compare --rank-by`):
// the Pareto front of spare time against pack mass checked against an independent sort-and-sweep
// (a row is on the front when every strictly lighter row has less spare, and no row of the same
// mass has more); the lightest pack meeting a requirement against a hand sort; equal-energy packs
// against the cell's energy integrated by Simpson's rule on the OCV table.
#include <doctest/doctest.h>

#include <algorithm>
#include <cmath>
#include <random>

#include <nlohmann/json.hpp>

#include "io/battery_json.hpp"
#include "sim/compare.hpp"
#include "support/cli.hpp"

using namespace sortie;

namespace {

sim::CompareRow row(double mass_kg, double spare_s, bool go, double landing_soc = 0.5) {
  sim::CompareRow r;
  r.result.go = go;
  r.result.pack_mass_kg = mass_kg;
  r.result.landing.soc = landing_soc;
  r.spare.phase = 0;
  r.spare.spare_s = spare_s;
  r.spare.bounded = true;
  r.candidate.label = std::to_string(mass_kg) + "/" + std::to_string(spare_s);
  return r;
}

}  // namespace

TEST_SUITE("sim") {

TEST_CASE("compare ranking: the Pareto front of spare against pack mass equals a sort-and-sweep") {
  std::mt19937_64 rng(7);
  std::uniform_int_distribution<int> mass(1, 12), spare(-50, 400), coin(0, 4);
  for (int trial = 0; trial < 40; ++trial) {
    std::vector<sim::CompareRow> rows;
    for (int k = 0; k < 15; ++k) rows.push_back(row(0.1 * mass(rng), 5.0 * spare(rng), coin(rng) != 0));
    sim::rank_rows(rows, {});
    // Independent: among go rows sorted by mass, a row is on the front when its spare beats the
    // best spare of every strictly lighter row and no row of its mass has more spare.
    std::vector<const sim::CompareRow*> go;
    for (const auto& r : rows)
      if (r.result.go) go.push_back(&r);
    for (const auto* r : go) {
      double best_lighter = -1e300, best_same = -1e300;
      for (const auto* q : go) {
        if (q->result.pack_mass_kg < r->result.pack_mass_kg - 1e-12) best_lighter = std::max(best_lighter, q->spare.spare_s);
        else if (std::fabs(q->result.pack_mass_kg - r->result.pack_mass_kg) < 1e-12) best_same = std::max(best_same, q->spare.spare_s);
      }
      const bool front = r->spare.spare_s > best_lighter && r->spare.spare_s >= best_same;
      CHECK_MESSAGE(r->pareto == front, r->candidate.label);
    }
    for (const auto& r : rows)
      if (!r.result.go) CHECK_FALSE(r.pareto);
  }
}

TEST_CASE("compare ranking: the lightest pack meeting a spare and a landing charge comes first") {
  std::vector<sim::CompareRow> rows = {row(0.9, 600, true, 0.6), row(0.5, 250, true, 0.5), row(0.6, 320, true, 0.2),
                                       row(0.7, 310, true, 0.45), row(0.4, 500, false, 0.5), row(0.8, 900, true, 0.7)};
  sim::RankOptions o;
  o.by = sim::RankBy::lightest;
  o.need_spare_s = 300;
  o.need_landing_soc = 0.3;
  sim::rank_rows(rows, o);
  // By hand: meeting both are 0.7 (310 s, 45 %), 0.8 (900 s, 70 %), 0.9 (600 s, 60 %).
  REQUIRE(rows.size() == 6);
  CHECK(rows[0].result.pack_mass_kg == doctest::Approx(0.7));
  CHECK(rows[1].result.pack_mass_kg == doctest::Approx(0.8));
  CHECK(rows[2].result.pack_mass_kg == doctest::Approx(0.9));
  for (int k = 0; k < 3; ++k) CHECK(rows[k].meets);
  // Then go rows short of it (by spare), then the no-go one.
  CHECK_FALSE(rows[3].meets);
  CHECK(rows[3].short_of.find("landing SoC 20.0 %") != std::string::npos);
  CHECK(rows[4].short_of.find("spare 250 s below the 300 s needed") != std::string::npos);
  CHECK_FALSE(rows[5].result.go);
  // Spare per kg: 900/0.8 = 1125 beats 600/0.9 = 667, 310/0.7 = 443, 320/0.6 = 533, 250/0.5 = 500.
  o.by = sim::RankBy::spare_per_kg;
  o.need_spare_s.reset();
  o.need_landing_soc.reset();
  sim::rank_rows(rows, o);
  CHECK(rows[0].result.pack_mass_kg == doctest::Approx(0.8));
  CHECK(rows[1].result.pack_mass_kg == doctest::Approx(0.9));
  CHECK(rows[2].result.pack_mass_kg == doctest::Approx(0.6));
}

TEST_CASE("compare ranking: equal-energy packs hold the asked energy at every cell count") {
  const battery::Cell cell = io::load_cell_file(test::source_path("models/cells/demo-lipo-5000.json"));
  battery::Pack base;
  base.cell = cell;
  const auto packs = sim::equal_energy_packs(cell, base, {2, 3, 4, 6}, 100.0, {1, 2});
  REQUIRE(packs.size() == 8);
  // Simpson's rule on 200 intervals of the resized cell's OCV (independent of the trapezoid).
  for (const auto& c : packs) {
    const auto& cl = c.pack.cell;
    double integral = 0.0;
    const int n = 200;
    for (int k = 0; k <= n; ++k) {
      const double w = (k == 0 || k == n) ? 1.0 : (k % 2 ? 4.0 : 2.0);
      integral += w * cl.ocv_V(static_cast<double>(k) / n);
    }
    integral /= 3.0 * n;
    const double wh = c.pack.series * c.pack.parallel * cl.capacity_Ah * integral;
    CHECK_MESSAGE(wh == doctest::Approx(100.0).epsilon(2e-3), c.label);
  }
}

TEST_CASE("compare --rank-by lightest: the first ranked pack is the lightest go pack with the spare asked") {
  const std::string profile = test::source_path("profiles/demo-quad-water-tank.json");
  const auto all = test::run_sortie({"compare", profile, "--series", "4,6", "--capacity-Ah", "3,5,8", "--format", "json"});
  REQUIRE(all.exit_code == 0);
  const auto j = nlohmann::json::parse(all.out);
  double lightest = 1e9;
  for (const auto& r : j["rows"])
    if (r["verdict"] == "go" && !r["spare_s"].is_null() && r["spare_s"].get<double>() >= 300.0)
      lightest = std::min(lightest, r["pack_mass_kg"].get<double>());
  REQUIRE(lightest < 1e9);
  const auto ranked = test::run_sortie({"compare", profile, "--series", "4,6", "--capacity-Ah", "3,5,8", "--format", "json",
                                        "--rank-by", "lightest", "--need-spare-s", "300"});
  REQUIRE(ranked.exit_code == 0);
  const auto k = nlohmann::json::parse(ranked.out);
  CHECK(k["rank_by"] == "lightest");
  CHECK(k["rows"][0]["rank"] == 1);
  CHECK(k["rows"][0]["pack_mass_kg"].get<double>() == doctest::Approx(lightest));
  for (const auto& r : k["rows"])
    if (r["rank"].is_null() && r["verdict"] == "go") CHECK_FALSE(r["short_of"].get<std::string>().empty());
  const auto bad = test::run_sortie({"compare", profile, "--series", "4", "--capacity-Ah", "3", "--rank-by", "heaviest"});
  CHECK(bad.exit_code == 2);
}

}  // TEST_SUITE
