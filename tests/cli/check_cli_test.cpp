// `sortie check` end to end: the bundled demo flight log against its profile, and bad logs
// refused with one line naming the file and the CSV line.
#include <doctest/doctest.h>

#include <nlohmann/json.hpp>

#include "support/cli.hpp"
#include "support/report_keys.hpp"
#include "support/xml_check.hpp"

using namespace sortie::test;

namespace {

const std::string kProfile = "profiles/demo-quad-water-tank.json";

void refused(const std::string& name, const std::string& csv, const std::string& part) {
  const std::string path = write_work_file(name, csv);
  const auto r = run_sortie({"check", path, "--profile", source_path(kProfile)});
  CAPTURE(r.err);
  CHECK(r.exit_code == 1);
  CHECK(r.out.empty());
  CHECK(r.err.find(path) != std::string::npos);
  CHECK(r.err.find(part) != std::string::npos);
  CHECK(r.err.find('\n') == r.err.size() - 1);  // one line
}

}  // namespace

TEST_SUITE("cli") {

TEST_CASE("check: the demo flight log (pack at 85 % capacity) reads a shortfall in time on station") {
  const auto r = run_sortie({"check", source_path("models/logs/demo-flight-quad-synthetic.csv"), "--profile",
                             source_path(kProfile), "--format", "json"});
  REQUIRE(r.exit_code == 0);
  const auto j = nlohmann::json::parse(r.out);
  // The log's noise is 20 mV (its comment lines); the pack is worn, so the voltage sags below
  // the plan: the RMSE is above the noise, and the landing SoC and time on station are lower.
  CHECK(j["v_rmse_V"].get<double>() > 0.02);
  CHECK(j["landing_soc"]["from_voltage"].get<double>() < j["landing_soc"]["planned"].get<double>());
  CHECK(j["time_on_station_left"]["from_log_s"].get<double>() < j["time_on_station_left"]["planned_s"].get<double>());
  // The replay on the profile's (unworn) pack is further from the log than the noise too.
  CHECK(j["replay"]["v_rmse_V"].get<double>() > 0.02);
  CHECK(j["phases"].size() == 10);
  CHECK(j["caution"].get<std::string>().find("burn") != std::string::npos);
}

TEST_CASE("check: the HTML overlay is XML-clean with the three plots and the phases and its numbers are the JSON's") {
  const std::string page = work_path("check.html"), json = work_path("check.json");
  const auto r = run_sortie({"check", source_path("models/logs/demo-flight-quad-synthetic.csv"), "--profile",
                             source_path(kProfile), "--html", page, "--json", json, "-q"});
  REQUIRE(r.exit_code == 0);
  const auto doc = check_xml(read_file(page));
  REQUIRE_MESSAGE(doc.ok, doc.error);
  CHECK(doc.count("svg") == 3);
  const auto keys = check_keys(doc, nlohmann::json::parse(read_file(json)));
  for (const auto& p : keys.problems) FAIL_CHECK(p);
  CHECK(has_key(keys, "v_rmse_V"));
  CHECK(has_key(keys, "time_on_station_left.from_log_s"));
  CHECK(has_key(keys, "phases.9.energy_Wh.measured"));
  const std::string text = read_file(page);
  CHECK(text.find("station north") != std::string::npos);  // a phase band label
}

TEST_CASE("check: bad flight logs are refused with one line naming the file and the line") {
  const std::string head = "Time (s),Voltage (V),Current (A)\n";
  refused("nonnum.csv", head + "0,24.8,12\n1,abc,12\n", "line 3");
  refused("backwards.csv", head + "0,24.8,12\n1,24.7,12\n0.5,24.7,12\n", "line 4");
  refused("badunit.csv", "Time (s),Voltage (furlong),Current (A)\n0,24.8,12\n1,24.7,12\n", "unit 'furlong'");
  refused("noheader.csv", "a,b,c\n0,24.8,12\n1,24.7,12\n", "no header line");
  refused("negvolt.csv", head + "0,24.8,12\n1,-3,12\n", "line 3");
  refused("empty.csv", "# nothing\n", "no data rows");
  refused("onerow.csv", head + "0,24.8,12\n", "fewer than 2 data rows");
}

TEST_CASE("check: the trace has one row per log row and the plan's phase of each") {
  const std::string trace = work_path("check-trace.csv");
  const auto r = run_sortie({"check", source_path("models/logs/demo-flight-quad-synthetic.csv"), "--profile",
                             source_path(kProfile), "--trace", trace, "-q"});
  REQUIRE(r.exit_code == 0);
  const std::string t = read_file(trace);
  std::size_t rows = 0;
  for (char ch : t) rows += ch == '\n';
  CHECK(rows == 1 + 740);  // header and the log's 740 rows
  CHECK(t.rfind("time_s,v_log_V,v_plan_V,v_replay_V,", 0) == 0);
  CHECK(t.find("\n80.000,") != std::string::npos);
  CHECK(t.substr(t.find("\n81.000,")).substr(0, t.substr(t.find("\n81.000,")).find('\n', 1)).back() == '4');  // station north, phase 4 (numbered from 1)
}

TEST_CASE("check: columns by number with units") {
  const std::string path = write_work_file("bynumber.csv", "0,24800,12000\n1,24700,12000\n2,24650,12000\n");
  const auto r = run_sortie({"check", path, "--profile", source_path(kProfile), "--columns",
                             "time=1,voltage=2:mV,current=3:mA", "--format", "json"});
  REQUIRE(r.exit_code == 0);
  const auto j = nlohmann::json::parse(r.out);
  CHECK(j["charge_Ah"]["measured"].get<double>() == doctest::Approx(12.0 * 2.0 / 3600.0));
}

}  // TEST_SUITE
