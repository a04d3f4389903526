// `health` and `remaining` end to end beyond the estimate itself: the cell-count refusal shared
// with `check` and `logbook add-flight`, the HTML pages, each log's own estimate beside the joint
// one, and health's exit code when it refuses. Logs: the invented demo flight log and the
// invented pack-ageing series (examples/pack-ageing/, made by our simulator with known soh).
#include <doctest/doctest.h>

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <sstream>

#include <nlohmann/json.hpp>

#include "support/cli.hpp"
#include "support/report_keys.hpp"
#include "support/xml_check.hpp"

using namespace sortie::test;
using nlohmann::json;

namespace {

const std::string kProfile = "profiles/demo-quad-water-tank.json";
const std::string kLog = "models/logs/demo-flight-quad-synthetic.csv";
const std::string kPack6 = "models/packs/demo-6s1p-lipo-5000.json";

/// The demo 6S log as a 4S pack of the same cells would have logged it: every voltage times 4/6
/// (a series string's voltage is S times the cell's), current unchanged.
std::string four_cell_log() {
  std::istringstream in(read_file(source_path(kLog)));
  std::string line, out;
  bool header = false;
  while (std::getline(in, line)) {
    if (line.empty() || line[0] == '#' || !header) {
      if (!line.empty() && line[0] != '#') header = true;
      out += line + "\n";
      continue;
    }
    double t, v, i, h, thr;
    REQUIRE(std::sscanf(line.c_str(), "%lf,%lf,%lf,%lf,%lf", &t, &v, &i, &h, &thr) == 5);
    char b[160];
    std::snprintf(b, sizeof b, "%.3f,%.3f,%.3f,%.1f,%.1f\n", t, v * 4.0 / 6.0, i, h, thr);
    out += b;
  }
  return out;
}

/// The demo log's header and comment lines and its first `rows` rows.
std::string head_of_log(std::size_t rows) { return csv_head(source_path(kLog), rows); }

void refused_cell_count(const CliResult& r, const std::string& file) {
  CAPTURE(r.err);
  CHECK(r.exit_code == 1);
  CHECK(r.out.empty());
  CHECK(r.err.find(file) != std::string::npos);
  CHECK(r.err.find("too low for 6 cells in series") != std::string::npos);
  CHECK(r.err.find("expected at least 6 x 3.17 V") != std::string::npos);
  CHECK(std::count(r.err.begin(), r.err.end(), '\n') == 1);
}

}  // namespace

TEST_SUITE("cli") {

TEST_CASE("cell count: a 4S log against the 6S pack is refused by check and health and remaining and logbook add-flight") {
  const std::string log = write_work_file("four-cell.csv", four_cell_log());
  const std::string html = work_path("four-cell.html");
  refused_cell_count(run_sortie({"check", log, "--profile", source_path(kProfile), "--html", html}), "four-cell.csv");
  CHECK(!file_exists(html));
  refused_cell_count(run_sortie({"health", log, "--profile", source_path(kProfile)}), "four-cell.csv");
  refused_cell_count(run_sortie({"health", log, "--pack", source_path(kPack6)}), "four-cell.csv");
  refused_cell_count(run_sortie({"remaining", log, "--profile", source_path(kProfile), "--at-s", "300"}), "four-cell.csv");
  const std::string db = work_path("four-cell.sqlite");
  REQUIRE(run_sortie({"logbook", db, "add-pack", source_path(kPack6), "--name", "p", "--first-use", "2026-01-01"}).exit_code == 0);
  refused_cell_count(run_sortie({"logbook", db, "add-flight", log, "--pack", "1", "--profile", source_path(kProfile),
                                 "--date", "2026-01-02"}),
                     "four-cell.csv");
  const auto h = run_sortie({"logbook", db, "history", "--pack", "1", "--format", "json"});
  REQUIRE(h.exit_code == 0);
  CHECK(json::parse(h.out)["flights"].empty());  // nothing stored
  // The same log against a 4S pack of those cells is accepted.
  const auto ok = run_sortie({"check", log, "--profile", source_path(kProfile), "--pack",
                              source_path("models/packs/demo-4s1p-lipo-5000.json"), "-q"});
  CHECK_MESSAGE(ok.exit_code == 0, ok.err);
}

TEST_CASE("health: logs refused give exit 4 (no estimate) and not fly's no-go 3 - the report says why") {
  const std::string path = write_work_file("health-shallow-exit.csv", head_of_log(100));
  const auto r = run_sortie({"health", path, "--profile", source_path(kProfile)});
  CHECK(r.exit_code == 4);
  CHECK(r.out.find("No estimate") != std::string::npos);
  CHECK(r.out.find("too shallow") != std::string::npos);
  const auto ok = run_sortie({"health", source_path(kLog), "--profile", source_path(kProfile), "-q"});
  CHECK(ok.exit_code == 0);
}

TEST_CASE("health: two logs of an ageing pack give the joint estimate and each log's own - each near its truth") {
  // flight-1 was made at capacity 1.00, R0 factor 1.00; flight-6 at 0.80, 1.40.
  const auto r = run_sortie({"health", source_path("examples/pack-ageing/flight-1.csv"),
                             source_path("examples/pack-ageing/flight-6.csv"), "--profile", source_path(kProfile),
                             "--format", "json"});
  CAPTURE(r.err);
  REQUIRE(r.exit_code == 0);
  const json j = json::parse(r.out);
  const json& a = j["flights"][0]["own"];
  const json& b = j["flights"][1]["own"];
  REQUIRE(a["refused"] == false);
  REQUIRE(b["refused"] == false);
  CHECK(std::abs(a["capacity"].get<double>() - 1.00) < 0.02);
  CHECK(std::abs(b["capacity"].get<double>() - 0.80) < 0.02);
  CHECK(std::abs(a["resistance"].get<double>() / 1.00 - 1.0) < 0.06);
  CHECK(std::abs(b["resistance"].get<double>() / 1.40 - 1.0) < 0.06);
  CHECK(a["capacity_sd"].get<double>() > 0.0);
  // The joint factors are shared by two different packs: between the two.
  const double c = j["soh"]["capacity"].get<double>();
  CHECK(c > 0.81);
  CHECK(c < 0.99);
  CHECK(j.contains("per_log_note"));
  const auto t = run_sortie({"health", source_path("examples/pack-ageing/flight-1.csv"),
                             source_path("examples/pack-ageing/flight-6.csv"), "--profile", source_path(kProfile)});
  CHECK(t.out.find("Each log alone") != std::string::npos);
}

TEST_CASE("health: with a shallow log beside a good one the shallow one's own estimate is refused with its reason") {
  const std::string shallow = write_work_file("health-shallow-own.csv", head_of_log(100));
  const auto r = run_sortie({"health", source_path(kLog), shallow, "--profile", source_path(kProfile), "--format", "json"});
  CAPTURE(r.err);
  REQUIRE(r.exit_code == 0);  // the joint estimate stands on the good log
  const json j = json::parse(r.out);
  CHECK(j["flights"][0]["own"]["refused"] == false);
  CHECK(j["flights"][1]["own"]["refused"] == true);
  CHECK(j["flights"][1]["own"]["why_refused"].get<std::string>().find("too shallow") != std::string::npos);
  CHECK(j["flights"][0].contains("own"));
  // One log: no per-log block (the joint estimate is that log's).
  const auto one = run_sortie({"health", source_path(kLog), "--profile", source_path(kProfile), "--format", "json"});
  CHECK(!json::parse(one.out)["flights"][0].contains("own"));
}

TEST_CASE("health --html: the page plots each used log's voltage against the fitted model - its numbers the JSON's") {
  const std::string page = work_path("health.html"), js = work_path("health.json");
  const std::string shallow = write_work_file("health-html-shallow.csv", head_of_log(100));
  const auto r = run_sortie({"health", source_path("examples/pack-ageing/flight-1.csv"),
                             source_path("examples/pack-ageing/flight-6.csv"), shallow, "--profile",
                             source_path(kProfile), "--html", page, "--json", js, "-q"});
  REQUIRE_MESSAGE(r.exit_code == 0, r.err);
  REQUIRE(file_exists(page));
  const std::string text = read_file(page);
  const auto doc = check_xml(text);
  REQUIRE_MESSAGE(doc.ok, doc.error);
  CHECK(doc.count("svg") == 2);  // the two used logs; the shallow one is only in the tables
  CHECK(text.find("data-plot=\"voltage-1\"") != std::string::npos);
  CHECK(text.find("data-plot=\"voltage-2\"") != std::string::npos);
  CHECK(text.find(">log<") != std::string::npos);
  CHECK(text.find("model, c ") != std::string::npos);
  const auto keys = check_keys(doc, json::parse(read_file(js)));
  for (const auto& p : keys.problems) FAIL_CHECK(p);
  CHECK(has_key(keys, "soh.capacity"));
  CHECK(has_key(keys, "soh.resistance_sd"));
  CHECK(has_key(keys, "flights.1.own.capacity"));
  CHECK(text.find("too shallow") != std::string::npos);
  CHECK(text.find("burn") != std::string::npos);
}

TEST_CASE("remaining --html: the filtered SoC with its sd band and the voltage and the time left to each rule") {
  const std::string page = work_path("remaining.html"), js = work_path("remaining.json");
  const auto r = run_sortie({"remaining", source_path(kLog), "--profile", source_path(kProfile), "--at-s", "370",
                             "--soh-capacity", "0.85", "--html", page, "--json", js, "-q"});
  REQUIRE_MESSAGE(r.exit_code == 0, r.err);
  REQUIRE(file_exists(page));
  const std::string text = read_file(page);
  const auto doc = check_xml(text);
  REQUIRE_MESSAGE(doc.ok, doc.error);
  CHECK(doc.count("svg") == 3);
  for (const char* s : {"filtered SoC", "+1 sd", "-1 sd", "after the cut", "filter prediction", "soc_min", "hover_s"})
    CHECK_MESSAGE(text.find(s) != std::string::npos, s);
  const json j = json::parse(read_file(js));
  const auto keys = check_keys(doc, j);
  for (const auto& p : keys.problems) FAIL_CHECK(p);
  CHECK(has_key(keys, "soc"));
  CHECK(has_key(keys, "soc_sd"));
  CHECK(has_key(keys, "rules.1.time_left_s"));
}

}  // TEST_SUITE
