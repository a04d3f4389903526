// `sortie drive` end to end: the real binary on the demo drives, on bench CSVs and on broken
// input; outputs, exit codes, and that nothing is written when the input is bad.
#include <doctest/doctest.h>

#include <nlohmann/json.hpp>
#include <algorithm>
#include <cmath>
#include <string>
#include <vector>

#include "support/cli.hpp"

using sortie::test::file_exists;
using sortie::test::read_file;
using sortie::test::run_sortie;
using sortie::test::source_path;
using sortie::test::work_path;
using sortie::test::write_work_file;

namespace {

const std::string kQuad = "models/drives/demo-quad-15in.json";

bool has(const std::string& text, const std::string& part) { return text.find(part) != std::string::npos; }

// A drive file with one text replacement made in the quad demo.
std::string broken_drive(const std::string& name, const std::string& from, const std::string& to) {
  std::string text = read_file(source_path(kQuad));
  const auto p = text.find(from);
  REQUIRE(p != std::string::npos);
  text.replace(p, from.size(), to);
  return write_work_file(name, text);
}

const std::string kBench =
    "# one rotor on a thrust stand\n"
    "throttle_us,bus_V,bus_A,rpm,thrust_g\n"
    "1100,14.8,0.16,540,23\n"
    "1200,14.8,0.40,1100,93\n"
    "1300,14.8,0.93,1640,206\n"
    "1400,14.8,1.84,2160,359\n"
    "1500,14.8,3.25,2680,549\n"
    "1600,14.8,5.24,3180,774\n"
    "1700,14.8,7.90,3660,1030\n"
    "1800,14.7,11.3,4140,1316\n"
    "1900,14.7,15.5,4610,1630\n";

}  // namespace

TEST_SUITE("cli") {

TEST_CASE("drive: a sweep of each demo drive — with units in every column") {
  for (const std::string f : {"models/drives/demo-quad-15in.json", "models/drives/demo-hex-10in.json",
                              "models/drives/demo-pusher-10x6.json"}) {
    CAPTURE(f);
    const auto r = run_sortie({"drive", source_path(f), "--bus-V", "14.8"});
    CHECK(r.exit_code == 0);
    CHECK(r.err.empty());
    // The columns in the order of the physics: duty → rpm → thrust → shaft → bus, then the
    // efficiencies along that chain (no gram column: SI first).
    const std::vector<std::string> cols = {"duty %", "rpm", "thrust N", "shaft W", "bus W", "bus A",
                                           "motor η %", "ESC η %", "drive η %", "g/W", "status"};
    std::size_t at = 0;
    for (const auto& col : cols) {
      CAPTURE(col);
      const std::size_t next = r.out.find(col, at);
      REQUIRE(next != std::string::npos);
      at = next + col.size();
    }
    CHECK_FALSE(has(r.out, "thrust g"));
    CHECK(has(r.out, "(invented)"));
    CHECK(has(r.out, "not a guarantee"));
  }
}

TEST_CASE("drive: --json writes the points with their status and the schema") {
  const std::string out = work_path("drive-sweep.json");
  const auto r = run_sortie({"drive", source_path(kQuad), "--bus-V", "14.8", "--sweep", "--json", out, "--quiet"});
  REQUIRE(r.exit_code == 0);
  CHECK(r.out.empty());
  const auto j = nlohmann::json::parse(read_file(out));
  CHECK(j["schema"] == "sortie.drive/1");
  CHECK(j["mode"] == "sweep");
  CHECK(j["air"]["density_kg_m3"] == 1.225);
  const auto& pts = j["points"];
  REQUIRE(pts.size() == 10);  // 10 % to 100 % in 10 % steps
  for (const char* key : {"duty", "thrust_N", "rpm", "shaft_W", "bus_A", "bus_W", "eta_motor", "eta_esc",
                          "eta_system", "status"})
    CHECK(pts[0].contains(key));
  CHECK(pts[0]["duty"].get<double>() == doctest::Approx(0.098));
  CHECK(pts[9]["duty"].get<double>() == doctest::Approx(0.98));
  CHECK(pts[9]["status"] == "ok");
  CHECK(pts[9]["drive_thrust_N"].get<double>() == doctest::Approx(4.0 * pts[9]["thrust_N"].get<double>()));
  // Thrust rises with throttle along the sweep.
  for (std::size_t k = 1; k < pts.size(); ++k) CHECK(pts[k]["thrust_N"] > pts[k - 1]["thrust_N"]);
}

TEST_CASE("drive: the same thrust on more cells runs a lower duty and a lower ESC efficiency") {
  const auto r = run_sortie({"drive", source_path(kQuad), "--cells", "3,4,6", "--cell-V", "3.7", "--thrust-N", "6",
                             "--json", "-"});
  REQUIRE(r.exit_code == 0);
  const auto j = nlohmann::json::parse(r.out);
  REQUIRE(j["points"].size() == 3);
  CHECK(j["mode"] == "thrust");
  const auto& p = j["points"];
  CHECK(p[0]["cells"] == 3);
  CHECK(p[2]["bus_V"].get<double>() == doctest::Approx(22.2));
  CHECK(p[0]["duty"] > p[1]["duty"]);
  CHECK(p[1]["duty"] > p[2]["duty"]);
  CHECK(p[0]["eta_esc"] > p[1]["eta_esc"]);
  CHECK(p[1]["eta_esc"] > p[2]["eta_esc"]);
  CHECK(p[0]["rpm"].get<double>() == doctest::Approx(p[2]["rpm"].get<double>()));
  // And the text gives one row per pack, in the order asked.
  const auto t = run_sortie({"drive", source_path(kQuad), "--cells", "3,4,6", "--thrust-N", "6"});
  CHECK(t.exit_code == 0);
  const auto s3 = t.out.find("\n  3S "), s4 = t.out.find("\n  4S "), s6 = t.out.find("\n  6S ");
  REQUIRE(s3 != std::string::npos);
  REQUIRE(s4 != std::string::npos);
  REQUIRE(s6 != std::string::npos);
  CHECK(s3 < s4);
  CHECK(s4 < s6);
}

TEST_CASE("drive: saturation and over-current are results with the thrust available") {
  const auto r = run_sortie({"drive", source_path(kQuad), "--bus-V", "11.1", "--thrust-N", "15", "--json", "-"});
  REQUIRE(r.exit_code == 0);
  const auto j = nlohmann::json::parse(r.out);
  const auto& p = j["points"][0];
  CHECK(p["status"] == "saturated");
  CHECK(p["duty"].get<double>() > 0.98);
  CHECK(p["thrust_N"].get<double>() == 15.0);
  CHECK(p["thrust_available_N"].get<double>() < 15.0);
  const auto t = run_sortie({"drive", source_path(kQuad), "--bus-V", "11.1", "--thrust-N", "15"});
  CHECK(has(t.out, "saturated: needs duty"));
  CHECK(has(t.out, "available at 11.10 V"));
  const auto oc = run_sortie({"drive", source_path(kQuad), "--bus-V", "22.2", "--thrust-N", "30"});
  CHECK(oc.exit_code == 0);
  CHECK(has(oc.out, "over_current: motor current"));
  CHECK(has(oc.out, "the limit is reached at"));
}

TEST_CASE("drive: --altitude-m uses ISA density and --density-kg-m3 takes a value") {
  // ISA density at 2000 m: 1.0066 kg/m³ (U.S. Standard Atmosphere, 1976, table; from memory).
  const auto r = run_sortie({"drive", source_path(kQuad), "--bus-V", "14.8", "--thrust-N", "6", "--altitude-m", "2000",
                             "--json", "-"});
  REQUIRE(r.exit_code == 0);
  const auto j = nlohmann::json::parse(r.out);
  CHECK(j["air"]["density_kg_m3"].get<double>() == doctest::Approx(1.0066).epsilon(2e-4));
  const auto s = nlohmann::json::parse(
      run_sortie({"drive", source_path(kQuad), "--bus-V", "14.8", "--thrust-N", "6", "--json", "-"}).out);
  // Thinner air: the same thrust needs more speed, n ∝ ρ^(−1/2) for a static prop (T = CT·ρ·n²·D⁴).
  CHECK(j["points"][0]["rpm"].get<double>() ==
        doctest::Approx(s["points"][0]["rpm"].get<double>() * std::sqrt(1.225 / j["air"]["density_kg_m3"].get<double>()))
            .epsilon(1e-9));
  const auto d = nlohmann::json::parse(run_sortie({"drive", source_path(kQuad), "--bus-V", "14.8", "--thrust-N", "6",
                                                   "--density-kg-m3", "1.1", "--json", "-"})
                                           .out);
  CHECK(d["air"]["density_kg_m3"] == 1.1);
}

TEST_CASE("drive: bad usage exits 2 with one line") {
  const std::string q = source_path(kQuad);
  for (const auto& args : std::vector<std::vector<std::string>>{
           {"drive", q},                                                      // no bus voltage
           {"drive", q, "--bus-V", "14.8", "--cells", "4"},                  // both
           {"drive", q, "--bus-V", "14.8", "--thrust-N", "5", "--sweep"},    // both modes
           {"drive", q, "--bus-V", "14.8", "--density-kg-m3", "1", "--altitude-m", "100"},
           {"drive", q, "--bus-V", "14.8", "--columns", "thrust=F:N"},       // --columns without --bench
           {"drive", q, "--bus-V", "-3"},
           {"drive", q, "--bus-V", "14.8", "--sweep-from-pct", "80", "--sweep-to-pct", "20"},
           {"drive"}}) {
    const auto r = run_sortie(args);
    CAPTURE(args.size());
    CHECK(r.exit_code == 2);
    CHECK(r.out.empty());
    CHECK(std::count(r.err.begin(), r.err.end(), '\n') == 1);
    CHECK(has(r.err, "sortie: "));
  }
}

TEST_CASE("drive: a broken drive file exits 1 naming the file — the pointer and the value — writing nothing") {
  struct Case {
    std::string from, to, message;
  };
  const std::vector<Case> cases = {
      {"\"kv_rpm_per_V\": 400", "\"kv_rpm_per_v\": 400",
       "/motor/kv_rpm_per_v: unknown field 'kv_rpm_per_v'; did you mean 'kv_rpm_per_V'?"},
      {"\"i_max_A\": 28, ", "", "/motor/i_max_A: missing field 'i_max_A'"},
      {"\"rm_ohm\": 0.09", "\"rm_ohm\": 0.09, \"rm_ohms\": 1", "/motor/rm_ohms: unknown field 'rm_ohms'; did you mean 'rm_ohm'?"},
      {"\"duty_max\": 0.98", "\"duty_max\": 1.2", "/esc/duty_max: out of range (got 1.2, expected a number above 0, up to 1)"},
      {"0.042, 0.042, 0.041", "0.012, 0.042, 0.041",
       "/prop/cp: power coefficient below the momentum-theory minimum at J = 0"},
      {"\"value\": [0.105", "\"value\": [-0.105", "/prop/ct: static thrust coefficient not positive"},
      {"\"i0_A\": 0.8", "\"i0_A\": 30", "/motor/i0_A: no-load current at or above the current limit"},
      {"\"rotors\": 4", "\"rotors\": 2.5", "/rotors: out of range (got 2.5, expected a whole number from 1 to 64)"},
      {"\"J\": [0.0, 0.1, 0.2", "\"J\": [0.0, 0.2, 0.1", "/prop/ct/J/2: 'J' not strictly increasing"},
      {"\"rotors\": 4,", "\"rotors\": 4", "JSON syntax error"},
  };
  int k = 0;
  for (const auto& c : cases) {
    CAPTURE(c.message);
    const std::string file = broken_drive("broken-drive-" + std::to_string(++k) + ".json", c.from, c.to);
    const std::string out = work_path("broken-drive.json");
    const auto r = run_sortie({"drive", file, "--bus-V", "14.8", "--json", out});
    CHECK(r.exit_code == 1);
    CHECK(r.out.empty());
    CHECK(has(r.err, "sortie: " + file));
    CHECK(has(r.err, c.message));
    CHECK(std::count(r.err.begin(), r.err.end(), '\n') == 1);
    CHECK_FALSE(file_exists(out));
  }
}

TEST_CASE("drive: --bench shows the measured map — alone or beside the model") {
  const std::string bench = write_work_file("bench-good.csv", kBench);
  const auto alone = run_sortie({"drive", "--bench", bench});
  CHECK(alone.exit_code == 0);
  CHECK(has(alone.out, "measured map: " + bench + ", 9 rows"));
  CHECK_FALSE(has(alone.out, "model bus W"));
  const auto beside = run_sortie({"drive", source_path(kQuad), "--bus-V", "14.8", "--bench", bench, "--thrust-N", "6"});
  CHECK(beside.exit_code == 0);
  CHECK(has(beside.out, "model bus W"));
  CHECK(has(beside.out, "map at 6.00 N"));
  CHECK(has(beside.out, "against the map"));
  const auto j = nlohmann::json::parse(
      run_sortie({"drive", source_path(kQuad), "--bus-V", "14.8", "--bench", bench, "--json", "-"}).out);
  CHECK(j["schema"] == "sortie.drive/1");
  REQUIRE(j["bench"]["rows"].size() == 9);
  CHECK(j["bench"]["rows"][8]["thrust_N"].get<double>() == doctest::Approx(1.630 * 9.80665));
  CHECK(j["bench"]["rows"][0].contains("model_bus_W"));
  // Columns named by the user, with units.
  const std::string renamed = write_work_file(
      "bench-renamed.csv", "cmd,U,I,speed,F\n1100,14.8,0.16,540,0.23\n1500,14.8,3.25,2680,5.4\n1900,14.7,15.5,4610,16\n");
  const auto c = run_sortie({"drive", "--bench", renamed, "--columns",
                             "throttle=cmd:us,voltage=U:V,current=I:A,rpm=speed:rpm,thrust=F:N", "--thrust-N", "20"});
  CHECK(c.exit_code == 0);
  CHECK(has(c.out, "saturated: above the largest measured thrust"));
}

TEST_CASE("drive: a bad bench CSV exits 1 with one line naming the file and line") {
  struct Case {
    std::string text, message;
  };
  const std::vector<Case> cases = {
      {"throttle_us,bus_V,bus_A,rpm\n1100,14.8,0.5,1000\n", ": line 1: missing column for thrust"},
      {"throttle_us,bus_V,bus_A,rpm,thrust_g\n1100,14.8,0.5,1000,50\n1200,14.8,1.2,1800,160\n1300,14.7,2.5,2500,150\n",
       ": line 4: thrust not increasing with throttle (got 150 g at 1300 us, expected above 160 g)"},
      {"throttle_us,bus_V,bus_A,rpm,thrust (stone)\n1100,14.8,0.5,1000,50\n",
       ": line 1: column 'thrust (stone)': unknown unit for thrust (got 'stone'"},
      {"throttle_us,bus_V,bus_A,rpm,thrust_g\n1100,14.8,0.5,1000,50\n", ": too few rows"},
  };
  int k = 0;
  for (const auto& c : cases) {
    CAPTURE(c.message);
    const std::string file = write_work_file("bench-bad-" + std::to_string(++k) + ".csv", c.text);
    const std::string out = work_path("bench-bad.json");
    const auto r = run_sortie({"drive", source_path(kQuad), "--bus-V", "14.8", "--bench", file, "--json", out});
    CHECK(r.exit_code == 1);
    CHECK(r.out.empty());
    CHECK(has(r.err, "sortie: " + file + c.message));
    CHECK(std::count(r.err.begin(), r.err.end(), '\n') == 1);
    CHECK_FALSE(file_exists(out));
  }
  // An unknown unit given with --columns is a usage error.
  const std::string good = write_work_file("bench-good-2.csv", kBench);
  const auto u = run_sortie({"drive", "--bench", good, "--columns", "thrust=thrust_g:stone"});
  CHECK(u.exit_code == 2);
  CHECK(has(u.err, "--columns: unknown unit for thrust (got 'stone'"));
}

}  // TEST_SUITE
