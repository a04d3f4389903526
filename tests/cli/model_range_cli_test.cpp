// The model's range end to end: the cell's "coverage" block refused with one line when wrong,
// and `discharge`, `fly` and `compare` reporting, stopping at and judging the covered floor.
#include <doctest/doctest.h>

#include <algorithm>
#include <cmath>
#include <nlohmann/json.hpp>

#include "support/cli.hpp"

using namespace sortie::test;
using nlohmann::json;

namespace {

const std::string kQuad = "profiles/demo-quad-water-tank.json";

/// The demo LiPo cell with `coverage` added, and a pack of `series` of it; returns the pack path.
std::string write_pack(const std::string& tag, const json& coverage, int series = 4) {
  json cell = json::parse(read_file(source_path("models/cells/demo-lipo-5000.json")));
  cell["coverage"] = coverage;
  write_work_file(tag + "-cell.json", cell.dump(2));
  const json pack = {{"cell", tag + "-cell.json"}, {"series", series}, {"soc0", 1.0}, {"temperature_C", 20}};
  return write_work_file(tag + "-pack.json", pack.dump(2));
}

void expect_refused(const json& coverage, const std::vector<std::string>& fragments) {
  const std::string pack = write_pack("badcov", coverage);
  const std::string out = work_path("badcov.json");
  const auto r = run_sortie({"discharge", pack, "--current", "5", "--json", out});
  CHECK(r.exit_code == 1);
  CHECK(std::count(r.err.begin(), r.err.end(), '\n') == 1);
  for (const auto& f : fragments) CHECK_MESSAGE(r.err.find(f) != std::string::npos, "missing '" << f << "' in: " << r.err);
  CHECK_FALSE(file_exists(out));
}

const json* rule(const json& j, const std::string& name) {
  for (const auto& r : j["rules"])
    if (r["name"] == name) return &r;
  return nullptr;
}

}  // namespace

TEST_SUITE("cli") {

TEST_CASE("coverage block: bad values are refused with their pointer and the value and the range") {
  expect_refused({{"soc_min", 0.5}, {"soc_max", 0.4}}, {"badcov-cell.json", "/coverage/soc_max", "covered SoC range empty", "0.4"});
  expect_refused({{"soc_min", 1.5}}, {"/coverage/soc_min", "1.5"});
  expect_refused({{"soc_min", "low"}}, {"/coverage/soc_min"});
  expect_refused({{"current_max_A", 10}, {"current_min_A", 20}}, {"/coverage/current_min_A", "covered current range empty", "20"});
  expect_refused({{"current_max_A", 1e9}}, {"/coverage/current_max_A", "got 1000000000"});
  expect_refused({{"temperature_min_C", 30}, {"temperature_max_C", 10}}, {"/coverage/temperature_min_C", "30"});
  expect_refused({{"temperature_max_C", 150}}, {"/coverage/temperature_max_C", "150"});
  expect_refused({{"soc_minimum", 0.1}}, {"/coverage/soc_minimum", "soc_min"});
  expect_refused(5, {"/coverage"});
}

TEST_CASE("coverage block: every field is optional and an empty block loads") {
  const auto r = run_sortie({"discharge", write_pack("emptycov", json::object()), "--current", "5", "--json", "-"});
  REQUIRE(r.exit_code == 0);
  const json j = json::parse(r.out);
  CHECK(j["model_range"]["coverage"]["soc_min"] == 0.0);
  CHECK(j["model_range"]["coverage"]["current_max_A"].is_null());
  CHECK(j["model_range"]["excursions"].empty());
}

TEST_CASE("discharge: the excursion below the covered SoC in JSON and --stop-at-coverage ends there") {
  // 4S demo cell at 25 A from full: the charge counts down at 25 A against 5 Ah × capacity factor
  // at 20 °C; the SoC leaves 0.3 at t = 3600·Q·0.7/25 (Coulomb counting, docs/physics.md).
  const std::string pack = write_pack("cov30", {{"soc_min", 0.3}, {"current_max_A", 20.0}, {"source", "test"}});
  const auto r = run_sortie({"discharge", pack, "--current", "25", "--json", "-"});
  REQUIRE(r.exit_code == 0);
  const json j = json::parse(r.out);
  const double Q_Ah = j["pack"]["capacity_Ah"];
  const json& xs = j["model_range"]["excursions"];
  REQUIRE(xs.size() == 2);
  CHECK(xs[0]["quantity"] == "cell_current_A");
  CHECK(xs[0]["extreme"].get<double>() == doctest::Approx(25.0));
  CHECK(xs[0]["first_s"] == 0.0);
  CHECK(xs[1]["quantity"] == "soc");
  CHECK(xs[1]["side"] == "below");
  CHECK(std::fabs(xs[1]["first_s"].get<double>() - 3600.0 * Q_Ah * 0.7 / 25.0) < 1e-3);
  CHECK(std::fabs(xs[1]["duration_s"].get<double>() -
                  (j["time_to_end_s"].get<double>() - xs[1]["first_s"].get<double>())) < 1e-3);
  CHECK(j["model_range"]["soc_floor_covered"] == 0.3);

  const auto s = run_sortie({"discharge", pack, "--current", "25", "--stop-at-coverage", "--json", "-"});
  REQUIRE(s.exit_code == 0);
  const json k = json::parse(s.out);
  CHECK(k["end_reason"] == "coverage_floor");
  CHECK(k["soc_end"].get<double>() == doctest::Approx(0.3).epsilon(1e-6));
  CHECK(std::fabs(k["time_to_end_s"].get<double>() - 3600.0 * Q_Ah * 0.7 / 25.0) < 1e-3);
  const auto text = run_sortie({"discharge", pack, "--current", "25"});
  CHECK(text.out.find("outside the model's range") != std::string::npos);
  CHECK(text.out.find("state of charge below 30.0 %") != std::string::npos);
}

TEST_CASE("discharge: a power the pack cannot deliver ends as such with the power asked and the maximum") {
  const auto r = run_sortie({"discharge", source_path("models/packs/demo-4s1p-lipo-5000.json"), "--power", "100000",
                             "--json", "-"});
  REQUIRE(r.exit_code == 0);
  const json j = json::parse(r.out);
  CHECK(j["end_reason"] == "power_collapse");
  CHECK(j["power_asked_W"] == 100000.0);
  // E²/(4·R0) at full: E = 4·4.20 V, R0 = 4·3.6 mΩ·r_factor(20 °C) + 4 mΩ wiring (the demo
  // cell's tables: r_factor 1.4 at 10 °C and 1.0 at 25 °C, linear between: 1.1333 at 20 °C;
  // the pack file's wiring_ohm).
  const double r0 = 4 * 0.0036 * (1.4 + (1.0 - 1.4) * (20.0 - 10.0) / 15.0) + 0.004;
  CHECK(j["power_max_W"].get<double>() == doctest::Approx(16.8 * 16.8 / (4 * r0)).epsilon(1e-9));
}

TEST_CASE("discharge: a charging load file raises the SoC and ends at full") {
  const std::string load = write_work_file("charge.csv", "time_s,current_A\n0,-20\n3600,-20\n");
  const auto r = run_sortie({"discharge", source_path("models/packs/demo-4s1p-lipo-5000.json"), "--load", load,
                             "--soc0", "0.5", "--json", "-"});
  REQUIRE(r.exit_code == 0);
  const json j = json::parse(r.out);
  CHECK(j["end_reason"] == "pack_full");
  CHECK(j["soc_end"].get<double>() == doctest::Approx(1.0).epsilon(1e-6));
  // Coulomb counting: 0.5 of the pack's capacity at 20 A.
  CHECK(std::fabs(j["time_to_end_s"].get<double>() - 3600.0 * j["pack"]["capacity_Ah"].get<double>() * 0.5 / 20.0) < 1e-3);
}

TEST_CASE("fly: a landing below the covered SoC fails the soc_covered rule unless extrapolation is accepted") {
  // The demo quadcopter mission lands a 6S pack of the demo cell at about 53 % charge: a model
  // covered down to 60 % only has invented the OCV the landing figures rest on.
  const std::string pack = write_pack("cov60", {{"soc_min", 0.6}}, 6);
  const auto r = run_sortie({"fly", source_path(kQuad), "--pack", pack, "--json", "-"});
  CHECK(r.exit_code == 3);
  const json j = json::parse(r.out);
  const json* c = rule(j, "soc_covered");
  REQUIRE(c);
  CHECK((*c)["pass"] == false);
  CHECK((*c)["required"] == 0.6);
  CHECK(j["verdict_text"].get<std::string>().find("outside the model's data") != std::string::npos);
  const json& xs = j["model_range"]["excursions"];
  REQUIRE(xs.size() == 1);
  CHECK(xs[0]["quantity"] == "soc");
  CHECK(xs[0]["extreme"].get<double>() == doctest::Approx(j["landing"]["soc"].get<double>()).epsilon(1e-6));
  CHECK(xs[0]["phase"].get<int>() >= 0);
  // The time on station left at landing counts down to the floor only: none is left below it.
  CHECK(j["landing"]["reserve_time_s"] == 0.0);

  const auto a = run_sortie({"fly", source_path(kQuad), "--pack", pack, "--accept-extrapolation", "--json", "-"});
  CHECK(a.exit_code == 0);
  const json k = json::parse(a.out);
  CHECK_FALSE(rule(k, "soc_covered"));
  CHECK(k["model_range"]["accept_extrapolation"] == true);
  CHECK(j["model_range"]["accept_extrapolation"] == false);
  CHECK(k["verdict"] == "go");
  CHECK(k["verdict_text"].get<std::string>().find("outside the model's data") != std::string::npos);
  CHECK(k["landing"]["reserve_time_s"].get<double>() > 0.0);
  // The turn-home solve flies under the same rules as the flight: without the flag a return is
  // held to the covered floor (and the time left counted down to it), so the latest turn comes
  // earlier; with the flag it comes later or never.
  REQUIRE(j["turn_home"]["point"].is_object());
  CHECK((k["turn_home"]["point"].is_null() ||
         k["turn_home"]["point"]["t_s"].get<double>() > j["turn_home"]["point"]["t_s"].get<double>()));
}

TEST_CASE("fly --stop-at-coverage: the flight ends at the covered floor as end kind coverage_floor") {
  const std::string pack = write_pack("cov60s", {{"soc_min", 0.6}}, 6);
  const auto r = run_sortie({"fly", source_path(kQuad), "--pack", pack, "--stop-at-coverage", "--json", "-"});
  CHECK(r.exit_code == 3);
  const json j = json::parse(r.out);
  CHECK(j["completed"] == false);
  CHECK(j["end"]["kind"] == "coverage_floor");
  CHECK(j["landing"]["soc"].get<double>() == doctest::Approx(0.6).epsilon(1e-6));
  CHECK(j["model_range"]["excursions"].empty());
}

TEST_CASE("compare: each row carries the excursions of its flight") {
  const std::string pack = write_pack("cov60c", {{"soc_min", 0.6}}, 6);
  const auto r = run_sortie({"compare", source_path(kQuad), "--pack", pack, "--json", "-"});
  REQUIRE(r.exit_code == 0);
  const json j = json::parse(r.out);
  REQUIRE(j["rows"].size() == 1);
  CHECK(j["rows"][0]["verdict"] == "no-go");
  CHECK(j["rows"][0]["model_range"]["excursions"].size() == 1);
  const auto t = run_sortie({"compare", source_path(kQuad), "--pack", pack});
  CHECK(t.out.find("outside data: state of charge below 60.0 %") != std::string::npos);
}

}  // TEST_SUITE
