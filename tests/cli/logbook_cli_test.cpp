#include <doctest/doctest.h>
#include <nlohmann/json.hpp>

#include <cmath>
#include <cstdlib>
#include <filesystem>

#include "logbook/logbook.hpp"
#include "support/cli.hpp"
#include "support/xml_check.hpp"

using namespace sortie;
using sortie::test::run_sortie;
using sortie::test::source_path;
using nlohmann::json;

namespace {

const std::string kLog = "models/logs/demo-flight-quad-synthetic.csv";
const std::string kProfile = "profiles/demo-quad-water-tank.json";
const std::string kPack = "models/packs/demo-6s1p-lipo-5000.json";

std::string new_logbook(const std::string& name) {
  const std::string db = test::work_path(name);
  const auto r = run_sortie({"logbook", db, "add-pack", source_path(kPack), "--name", "quad pack 1", "--serial", "Q1",
                             "--first-use", "2026-09-01"});
  REQUIRE_MESSAGE(r.exit_code == 0, r.err);
  return db;
}

}  // namespace

TEST_CASE("logbook CLI: the demo flight added to a pack stores check's own figures and recovers the log's SoH") {
  const std::string db = new_logbook("cli-demo.sqlite");
  const auto add = run_sortie({"logbook", db, "add-flight", source_path(kLog), "--pack", "1", "--profile",
                               source_path(kProfile), "--date", "2026-09-02", "--format", "json"});
  REQUIRE_MESSAGE(add.exit_code == 0, add.err);
  const json a = json::parse(add.out);
  // The same figures as `sortie check` on the same log, profile and pack (the check command is
  // the reference: add-flight must store what it reports, not a figure of its own).
  const auto chk = run_sortie({"check", source_path(kLog), "--profile", source_path(kProfile), "--pack",
                               source_path(kPack), "--format", "json"});
  REQUIRE_MESSAGE(chk.exit_code == 0, chk.err);
  const json c = json::parse(chk.out);
  CAPTURE(c.dump().substr(0, 600));
  CHECK(a["check"]["v_rmse_V"].get<double>() == doctest::Approx(c["v_rmse_V"].get<double>()));
  CHECK(a["check"]["replay_rmse_V"].get<double>() == doctest::Approx(c["replay"]["v_rmse_V"].get<double>()));
  CHECK(a["check"]["flight_time_s"].get<double>() == doctest::Approx(c["flight_time_s"]["measured"].get<double>()));
  CHECK(a["check"]["energy_Wh"].get<double>() == doctest::Approx(c["energy_Wh"]["measured"].get<double>()));
  CHECK(a["check"]["charge_Ah"].get<double>() == doctest::Approx(c["charge_Ah"]["measured"].get<double>()));
  CHECK(a["check"]["soc_land_counted"].get<double>() == doctest::Approx(c["landing_soc"]["counted"].get<double>()));
  CHECK(a["check"]["station_left_s"].get<double>() == doctest::Approx(c["time_on_station_left"]["from_log_s"].get<double>()));
  // The demo log was made on its pack at soh_capacity 0.85 (models/logs comment lines; the log's
  // generator, tests/sim/demo_flight_log_test.cpp): the estimate is within 2 % of it, and the
  // resistance factor (truth 1) within 5 %.
  REQUIRE(a["estimate"].is_object());
  CHECK(std::fabs(a["estimate"]["capacity"].get<double>() - 0.85) < 0.02 * 0.85);
  CHECK(std::fabs(a["estimate"]["resistance"].get<double>() - 1.0) < 0.05);
  CHECK(a["estimate"]["cycle"] == 1);

  // The same log again is refused in one line, and nothing is added.
  const auto again = run_sortie({"logbook", db, "add-flight", source_path(kLog), "--pack", "1", "--profile",
                                 source_path(kProfile), "--date", "2026-09-03"});
  CHECK(again.exit_code == 1);
  CHECK(again.err.find("this log is already in the logbook") != std::string::npos);
  CHECK(again.err.find('\n') == again.err.size() - 1);

  const auto hist = run_sortie({"logbook", db, "history", "--pack", "1", "--format", "json"});
  REQUIRE_MESSAGE(hist.exit_code == 0, hist.err);
  const json h = json::parse(hist.out);
  REQUIRE(h["flights"].size() == 1);
  CHECK(h["flights"][0]["date"] == "2026-09-02");
  CHECK(h["flights"][0]["flight_time_s"].get<double>() == doctest::Approx(a["check"]["flight_time_s"].get<double>()));
  REQUIRE(h["estimates"].size() == 1);
  CHECK(h["pack"]["layout"] == "6S1P");
  const auto text = run_sortie({"logbook", db, "history", "--pack", "1"});
  CHECK(text.out.find("2026-09-02") != std::string::npos);
  CHECK(text.out.find("Caution") != std::string::npos);

  // fly with the logbook pack flies the same as the pack file with the estimate's soh block
  // written in by hand, and says so as an override.
  const double cap = a["estimate"]["capacity"].get<double>(), res = a["estimate"]["resistance"].get<double>();
  const std::string pack_with_soh = test::write_work_file(
      "pack-with-soh.json", "{\"name\": \"by hand (invented)\", \"cell\": \"" + source_path("models/cells/demo-lipo-5000.json") +
                                "\", \"series\": 6, \"parallel\": 1, \"wiring_ohm\": 0.005, \"soc0\": 1.0, "
                                "\"temperature_C\": 15, \"soh\": {\"capacity\": " + json(cap).dump() +
                                ", \"resistance\": " + json(res).dump() + "}}");
  const auto fl = run_sortie({"fly", source_path(kProfile), "--logbook", db, "--pack-id", "1", "--format", "json"});
  const auto fh = run_sortie({"fly", source_path(kProfile), "--pack", pack_with_soh, "--format", "json"});
  REQUIRE_MESSAGE(fl.exit_code == 0, fl.err);
  REQUIRE_MESSAGE(fh.exit_code == 0, fh.err);
  const json jl = json::parse(fl.out), jh = json::parse(fh.out);
  CHECK(jl["landing"]["soc"].get<double>() == doctest::Approx(jh["landing"]["soc"].get<double>()).epsilon(1e-9));
  REQUIRE(jl["overrides"].is_array());
  CHECK(jl["overrides"][0]["name"] == "pack-id");
  CHECK(fl.exit_code == 0);
  const auto cmp = run_sortie({"compare", source_path(kProfile), "--logbook", db, "--pack-id", "1", "--pack",
                               pack_with_soh, "--format", "json"});
  REQUIRE_MESSAGE(cmp.exit_code == 0, cmp.err);
  CHECK(cmp.out.find("logbook pack 1") != std::string::npos);
  CHECK(run_sortie({"fly", source_path(kProfile), "--pack-id", "1"}).exit_code == 2);
}

TEST_CASE("logbook CLI: trend against the least squares done by hand and the page") {
  const std::string db = new_logbook("cli-trend.sqlite");
  {
    // Five estimates on the points of tests/logbook/trend_test.cpp, a week apart.
    logbook::Database d(db, true);
    const double cap[] = {1.00, 0.98, 0.97, 0.94, 0.93};
    const char* dates[] = {"2026-09-01", "2026-09-08", "2026-09-15", "2026-09-22", "2026-09-29"};
    for (int i = 0; i < 5; ++i) {
      logbook::EstimateRecord e;
      e.pack_id = 1;
      e.cycle = i + 1;
      e.capacity = cap[i];
      e.capacity_sd = 0.01;
      e.resistance = 1.0 + 0.05 * i;
      e.resistance_sd = 0.02;
      e.method = "test";
      e.date = dates[i];
      d.add_estimate(e);
    }
  }
  const std::string page = test::work_path("trend.html");
  const auto r = run_sortie({"logbook", db, "trend", "--pack", "1", "--capacity-limit", "0.8", "--format", "json",
                             "--html", page});
  REQUIRE_MESSAGE(r.exit_code == 0, r.err);
  const json j = json::parse(r.out);
  const json& c = j["trend"]["capacity"];
  // By hand (trend_test.cpp): b = −0.018, a = 1.018; x* = 0.218/0.018 = 12.11 cycles.
  CHECK(c["by_cycle"]["slope"].get<double>() == doctest::Approx(-0.018));
  CHECK(c["at_limit_cycle"]["cycle"].get<double>() == doctest::Approx(0.218 / 0.018));
  CHECK(c["at_limit_cycle"]["extrapolated"] == true);
  // Against dates the points are 7 days apart: the slope is −0.018/7 per day and the limit falls
  // 7·(12.111 − 1) = 77.8 days after the first date, rounded to 78: 2026-09-01 + 78 d = 2026-11-18
  // (29 days to 09-30, 31 to 10-31, 18 more).
  CHECK(c["by_day"]["slope"].get<double>() == doctest::Approx(-0.018 / 7));
  CHECK(c["at_limit_date"]["date"] == "2026-11-18");
  // Resistance rises 0.05 a cycle exactly: 2.0 at cycle 21.
  CHECK(j["trend"]["resistance"]["at_limit_cycle"]["cycle"].get<double>() == doctest::Approx(21.0));
  const std::string html = test::read_file(page);
  const auto x = test::check_xml(html);
  CHECK_MESSAGE(x.ok, x.error);
  CHECK(html.find("extrapolation") != std::string::npos);
  const auto t = run_sortie({"logbook", db, "trend", "--pack", "1"});
  CHECK(t.out.find("reaches 0.800 at cycle 12") != std::string::npos);
  CHECK(run_sortie({"logbook", db, "trend", "--pack", "1", "--capacity-limit", "nan"}).exit_code == 2);
}

TEST_CASE("logbook CLI: a foreign or broken file is refused in one line and left unchanged") {
  const std::string text = test::write_work_file("not-a-db.sqlite", "id,name\n1,x\n");
  const auto r = run_sortie({"logbook", text, "add-pack", source_path(kPack), "--name", "x"});
  CHECK(r.exit_code == 1);
  CHECK(r.err.find("not an SQLite database") != std::string::npos);
  CHECK(r.err.find('\n') == r.err.size() - 1);
  CHECK(test::read_file(text) == "id,name\n1,x\n");
  const auto h = run_sortie({"logbook", test::work_path("absent.sqlite"), "history", "--pack", "1"});
  CHECK(h.exit_code == 1);
  CHECK(h.err.find("no logbook here") != std::string::npos);
  CHECK_FALSE(test::file_exists(test::work_path("absent.sqlite")));
  const std::string db = new_logbook("cli-nopack.sqlite");
  const auto np = run_sortie({"logbook", db, "history", "--pack", "7"});
  CHECK(np.exit_code == 1);
  CHECK(np.err.find("no pack with id 7") != std::string::npos);
}

TEST_CASE("logbook CLI: two sortie processes adding packs at once keep every row") {
  const std::string db = new_logbook("cli-two.sqlite");
  // Two shells, each running add-pack 15 times, started together in the background.
  std::string one = "for i in 1 2 3 4 5 6 7 8 9 10 11 12 13 14 15; do '" + std::string(SORTIE_BIN) + "' logbook '" + db +
                    "' add-pack '" + source_path(kPack) + "' --name P$i -q || echo FAIL; done";
  const std::string out = test::work_path("two.out");
  const std::string cmd = "( " + one + " ) >" + out + " 2>&1 & ( " + one + " ) >>" + out + ".2 2>&1 & wait";
  REQUIRE(std::system(cmd.c_str()) == 0);
  CHECK(test::read_file(out) == "");
  CHECK(test::read_file(out + ".2") == "");
  const auto r = run_sortie({"logbook", db, "packs", "--format", "json"});
  REQUIRE_MESSAGE(r.exit_code == 0, r.err);
  CHECK(json::parse(r.out)["packs"].size() == 31);
}
