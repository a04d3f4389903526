// `sortie health` and `sortie remaining` end to end on the bundled invented demo flight log
// (made by our simulator on the demo quad profile's pack at capacity 0.85, resistance 1.0).
#include <doctest/doctest.h>

#include <fstream>
#include <sstream>

#include <nlohmann/json.hpp>

#include "support/cli.hpp"

using namespace sortie::test;

namespace {
const std::string kProfile = "profiles/demo-quad-water-tank.json";
const std::string kLog = "models/logs/demo-flight-quad-synthetic.csv";

/// The demo log's header and comment lines and its first `rows` rows.
std::string head_of_log(std::size_t rows) { return csv_head(source_path(kLog), rows); }
}  // namespace

TEST_SUITE("cli") {

TEST_CASE("health: the demo log gives its pack's capacity 0.85 back - with the soh block for the pack file") {
  const auto r = run_sortie({"health", source_path(kLog), "--profile", source_path(kProfile), "--format", "json"});
  CAPTURE(r.err);
  REQUIRE(r.exit_code == 0);
  const auto j = nlohmann::json::parse(r.out);
  CHECK(j["refused"] == false);
  CHECK(std::abs(j["soh"]["capacity"].get<double>() / 0.85 - 1.0) < 0.02);
  CHECK(std::abs(j["soh"]["resistance"].get<double>() - 1.0) < 0.05);
  CHECK(j["flights"][0]["used"] == true);
  CHECK(j["thresholds"]["min_depth"].get<double>() == 0.15);
  const auto t = run_sortie({"health", source_path(kLog), "--profile", source_path(kProfile)});
  CHECK(t.out.find("\"soh\": { \"capacity\": 0.8") != std::string::npos);
  CHECK(t.out.find("Caution") != std::string::npos);
}

TEST_CASE("health: the first 100 s of the demo log is refused as too shallow - exit 4 (no estimate)") {
  const std::string path = write_work_file("health-shallow.csv", head_of_log(100));
  const auto r = run_sortie({"health", path, "--profile", source_path(kProfile), "--format", "json"});
  CHECK(r.exit_code == 4);
  const auto j = nlohmann::json::parse(r.out);
  CHECK(j["refused"] == true);
  CHECK(j["flights"][0]["refused"].get<std::string>().find("too shallow") != std::string::npos);
}

TEST_CASE("health: neither --pack nor --profile is a usage error") {
  const auto r = run_sortie({"health", source_path(kLog)});
  CHECK(r.exit_code == 2);
  CHECK(r.out.empty());
}

TEST_CASE("remaining: the demo log cut halfway gives a SoC and a time to each of the profile's rules") {
  const auto r = run_sortie({"remaining", source_path(kLog), "--profile", source_path(kProfile), "--at-s", "370",
                             "--soh-capacity", "0.85", "--format", "json"});
  CAPTURE(r.err);
  REQUIRE(r.exit_code == 0);
  const auto j = nlohmann::json::parse(r.out);
  // The log continues to its landing at 739 s; the profile's landing SoC rule (0.25) lies beyond.
  CHECK(j["soc"].get<double>() > 0.6);
  CHECK(j["soc"].get<double>() < 0.9);
  REQUIRE(j["rules"].size() == 5);  // cutoff + the profile's four rules
  for (const auto& x : j["rules"]) {
    CHECK(!x["time_left_s"].is_null());
    if (x["rule"] == "soc_min") CHECK(x["time_left_s"].get<double>() > j["log_after_cut"]["time_s"].get<double>());
  }
}

TEST_CASE("remaining: --at-s outside the log is refused with one line naming the file") {
  const auto r = run_sortie({"remaining", source_path(kLog), "--profile", source_path(kProfile), "--at-s", "5000"});
  CHECK(r.exit_code == 1);
  CHECK(r.out.empty());
  CHECK(r.err.find("demo-flight-quad-synthetic.csv") != std::string::npos);
  CHECK(r.err.find("outside the log") != std::string::npos);
}

}  // TEST_SUITE
