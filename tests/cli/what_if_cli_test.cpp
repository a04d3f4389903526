// `fly` and `compare` what-if options and `fly --sweep` end to end. The reference for an
// override is the same profile edited by hand (written here with the field changed): the JSON
// results must be equal, key for key and digit for digit, apart from the "overrides" list.
#include <doctest/doctest.h>

#include <nlohmann/json.hpp>

#include "support/cli.hpp"
#include "support/report_keys.hpp"
#include "support/xml_check.hpp"

using namespace sortie::test;
using nlohmann::json;

namespace {

const char* kQuad = "profiles/demo-quad-water-tank.json";

json demo(const std::string& rel) { return json::parse(read_file(source_path(rel))); }

/// The quad profile with its model paths absolute and the airframe inline (so that its
/// payload can be edited).
json quad_inline() {
  json p = demo(kQuad);
  p["airframe"] = demo("models/airframes/demo-quad-15in-inspection.json");
  p["drive"] = source_path("profiles/" + p["drive"].get<std::string>());
  p["pack"]["cell"] = source_path("profiles/" + p["pack"]["cell"].get<std::string>());
  return p;
}

json fly_json(std::vector<std::string> args) {
  const std::string out = work_path("what_if.json");
  args.insert(args.begin(), "fly");
  args.push_back("--json");
  args.push_back(out);
  const auto r = run_sortie(args);
  REQUIRE_MESSAGE((r.exit_code == 0 || r.exit_code == 3), r.err);
  json j = json::parse(read_file(out));
  return j;
}

}  // namespace

TEST_SUITE("what_if") {

TEST_CASE("fly what-if numbers equal the profile edited by hand") {
  json edited = quad_inline();
  edited["airframe"]["payload_kg"] = 0.7;
  edited["environment"]["field_elevation_m"] = 900;
  edited["environment"]["temperature_C"] = 5;
  edited["environment"]["wind"] = {{"speed_mps", 3}, {"from_deg", 200}};
  edited["pack"]["temperature_C"] = 8;
  edited["pack"]["soc0"] = 0.95;
  edited["pack"]["soh"] = {{"capacity", 0.9}, {"resistance", 1.3}};
  edited["pack"]["parallel"] = 2;
  const std::string file = write_work_file("edited.json", edited.dump(2));
  const json want = fly_json({file});
  json got = fly_json({source_path(kQuad), "--payload-kg", "0.7", "--field-elevation-m", "900", "--air-C", "5",
                       "--wind-mps", "3", "--wind-from-deg", "200", "--pack-C", "8", "--soc0", "0.95",
                       "--soh-capacity", "0.9", "--soh-resistance", "1.3", "--pack-layout", "6S2P"});
  REQUIRE(got.contains("overrides"));
  CHECK(got["overrides"].size() == 10);
  got.erase("overrides");
  CHECK(got.dump() == want.dump());
  // A changed input must show: the original profile differs (the check can fail).
  CHECK(fly_json({source_path(kQuad)}).dump() != want.dump());
}

TEST_CASE("fly field elevation alone holds the field's air temperature as a profile with temperature_C does") {
  json edited = quad_inline();
  edited["environment"]["field_elevation_m"] = 1500;
  const std::string file = write_work_file("edited_elev.json", edited.dump(2));
  const json want = fly_json({file});
  json got = fly_json({source_path(kQuad), "--field-elevation-m", "1500"});
  got.erase("overrides");
  // The held temperature passes through an ISA offset and back: equal to a few ulp, so the
  // results are compared to 1e-9 relative rather than digit for digit.
  CHECK(got["flight_time_s"].get<double>() == doctest::Approx(want["flight_time_s"].get<double>()).epsilon(1e-9));
  CHECK(got["spare_s"].get<double>() == doctest::Approx(want["spare_s"].get<double>()).epsilon(1e-9));
  CHECK(got["landing"]["soc"].get<double>() == doctest::Approx(want["landing"]["soc"].get<double>()).epsilon(1e-9));
}

TEST_CASE("fly --airframe --drive and --cell files equal the profile pointing at them") {
  json af = demo("models/airframes/demo-quad-15in-inspection.json");
  af["payload_kg"] = 0.4;
  af["cda_m2"] = af["cda_m2"].get<double>() * 1.5;
  const std::string af_file = write_work_file("af.json", af.dump(2));
  json drive = demo("models/drives/demo-quad-15in.json");
  drive["motor"]["rm_ohm"] = drive["motor"]["rm_ohm"].get<double>() * 1.4;
  const std::string drive_file = write_work_file("drive.json", drive.dump(2));
  const std::string cell_file = source_path("models/cells/demo-liion-21700-5000.json");
  json edited = quad_inline();
  edited["airframe"] = af_file;
  edited["drive"] = drive_file;
  edited["pack"]["cell"] = cell_file;
  const std::string file = write_work_file("edited_files.json", edited.dump(2));
  const json want = fly_json({file});
  json got = fly_json({source_path(kQuad), "--airframe", af_file, "--drive", drive_file, "--cell", cell_file});
  REQUIRE(got.contains("overrides"));
  got.erase("overrides");
  CHECK(got.dump() == want.dump());
}

TEST_CASE("fly overrides are stated in the text and the HTML report") {
  const std::string html = work_path("what_if.html");
  const auto r = run_sortie({"fly", source_path(kQuad), "--payload-kg", "0.6", "--soh-resistance", "1.5", "--html", html});
  CHECK(r.out.find("--payload-kg 0.6") != std::string::npos);
  CHECK(r.out.find("--soh-resistance 1.5") != std::string::npos);
  const std::string page = read_file(html);
  CHECK(page.find("What-if overrides in effect") != std::string::npos);
  CHECK(page.find("--payload-kg") != std::string::npos);
}

TEST_CASE("compare what-if numbers equal the profile edited by hand") {
  json edited = quad_inline();
  edited["airframe"]["payload_kg"] = 0.5;
  edited["pack"]["soh"] = {{"capacity", 0.85}};
  const std::string file = write_work_file("edited_cmp.json", edited.dump(2));
  const std::string a = work_path("cmp_a.json"), b = work_path("cmp_b.json");
  const auto ra = run_sortie({"compare", file, "--series", "4,6", "--capacity-Ah", "5", "--json", a});
  const auto rb = run_sortie({"compare", source_path(kQuad), "--series", "4,6", "--capacity-Ah", "5", "--payload-kg",
                              "0.5", "--soh-capacity", "0.85", "--json", b});
  REQUIRE_MESSAGE(ra.exit_code == 0, ra.err);
  REQUIRE_MESSAGE(rb.exit_code == 0, rb.err);
  json want = json::parse(read_file(a)), got = json::parse(read_file(b));
  REQUIRE(got.contains("overrides"));
  got.erase("overrides");
  CHECK(got.dump() == want.dump());
}

TEST_CASE("fly --sweep points equal single runs with the same override") {
  const std::string out = work_path("sweep.json");
  const auto r = run_sortie({"fly", source_path(kQuad), "--sweep", "payload-kg=0:1.2:0.6", "--json", out, "-q"});
  REQUIRE_MESSAGE(r.exit_code == 0, r.err);
  const json s = json::parse(read_file(out));
  REQUIRE(s["points"].size() == 3);
  for (const auto& p : s["points"]) {
    const double x = p["payload-kg"].get<double>();
    CAPTURE(x);
    char word[32];
    std::snprintf(word, sizeof word, "%.12g", x);
    const json one = fly_json({source_path(kQuad), "--payload-kg", word});
    CHECK(p["flight_time_s"].get<double>() == one["flight_time_s"].get<double>());
    CHECK(p["landing_soc"].get<double>() == one["landing"]["soc"].get<double>());
    CHECK(p["spare_s"].get<double>() == one["spare_s"].get<double>());
    CHECK(p["go"].get<bool>() == (one["verdict"].get<std::string>() == "go"));
  }
}

TEST_CASE("fly --sweep output bytes do not depend on the thread count") {
  for (const char* fmt : {"json", "csv", "text"}) {
    CAPTURE(fmt);
    const auto one = run_sortie({"fly", source_path(kQuad), "--sweep", "payload-kg=0:1:0.25", "--sweep",
                                 "wind-mps=0:6:3", "--format", fmt, "--threads", "1"});
    const auto two = run_sortie({"fly", source_path(kQuad), "--sweep", "payload-kg=0:1:0.25", "--sweep",
                                 "wind-mps=0:6:3", "--format", fmt, "--threads", "2"});
    REQUIRE_MESSAGE(one.exit_code == 0, one.err);
    CHECK(one.out.size() > 100);
    CHECK(one.out == two.out);
  }
}

TEST_CASE("fly --sweep and what-if bad input is one line with exit 2") {
  const std::string P = source_path(kQuad);
  struct Row {
    std::vector<std::string> args;
    const char* says;
  };
  const std::vector<Row> rows = {
      {{"--sweep", "payload-kg=0-1"}, "--sweep: not NAME=FROM:TO:STEP (got payload-kg=0-1"},
      {{"--sweep", "paylod-kg=0:1:0.1"}, "--sweep: unknown name (got paylod-kg, expected one of payload-kg"},
      {{"--sweep", "payload-kg=0:1:0"}, "--sweep: payload-kg: STEP not above 0 (got 0"},
      {{"--sweep", "payload-kg=1:0:0.1"}, "--sweep: payload-kg: TO below FROM"},
      {{"--sweep", "payload-kg=0:1:nan"}, "--sweep: STEP is not a finite number"},
      {{"--sweep", "payload-kg=0:600:1"}, "--sweep: payload-kg: out of range (got 600, expected a number from 0 to 500 kg)"},
      {{"--sweep", "payload-kg=0:200:0.01"}, "--sweep: payload-kg: too many points (got 20001, expected at most 10000)"},
      {{"--sweep", "payload-kg=0:1:0.01", "--sweep", "wind-mps=0:20:0.1"}, "--sweep: too many points (got 20301"},
      {{"--sweep", "payload-kg=0:1:0.5", "--payload-kg", "1"}, "--sweep: payload-kg is also set by --payload-kg"},
      {{"--sweep", "soc0=0.5:1:0.5", "--sweep", "soc0=0.5:1:0.5"}, "--sweep: soc0 swept twice"},
      {{"--payload-kg", "-1"}, "--payload-kg: out of range (got -1, expected a number from 0 to 500 kg)"},
      {{"--soh-capacity", "0"}, "--soh-capacity: out of range (got 0"},
      {{"--wind-from-deg", "inf"}, "--wind-from-deg: not a finite number"},
      {{"--pack-layout", "4x2"}, "--pack-layout: not a pack layout (got 4x2"},
      {{"--threads", "0"}, "--threads: out of range (got 0"},
  };
  for (const auto& row : rows) {
    std::vector<std::string> args{"fly", P};
    args.insert(args.end(), row.args.begin(), row.args.end());
    CAPTURE(row.says);
    const auto r = run_sortie(args);
    CHECK(r.exit_code == 2);
    CHECK(r.out.empty());
    CHECK(r.err.find(row.says) != std::string::npos);
    CHECK(std::count(r.err.begin(), r.err.end(), '\n') == 1);
  }
}

}  // TEST_SUITE

TEST_SUITE("what_if") {

TEST_CASE("fly --samples with every spread zero equals the deterministic flight") {
  const std::string spreads = write_work_file(
      "zero_spreads.json",
      R"({"cell_capacity_sd": 0, "cell_resistance_sd": 0, "wind_speed_sd_mps": 0, "wind_from_sd_deg": 0, "temperature_sd_C": 0})");
  const std::string out = work_path("samples.json");
  const auto r = run_sortie({"fly", source_path(kQuad), "--samples", "5", "--spreads", spreads, "--json", out, "-q"});
  REQUIRE_MESSAGE(r.exit_code == 0, r.err);
  const json s = json::parse(read_file(out));
  const json one = fly_json({source_path(kQuad)});
  for (const char* q : {"p5", "p50", "p95"}) {
    CHECK(s["flight_time_s"][q].get<double>() == one["flight_time_s"].get<double>());
    CHECK(s["landing_soc"][q].get<double>() == one["landing"]["soc"].get<double>());
    CHECK(s["spare_s"][q].get<double>() == one["spare_s"].get<double>());
  }
  CHECK(s["p_go"].get<double>() == (one["verdict"] == "go" ? 1.0 : 0.0));
}

TEST_CASE("fly --samples output bytes do not depend on the thread count and move with the seed") {
  std::string prev;
  for (const char* fmt : {"json", "csv"}) {
    CAPTURE(fmt);
    const auto one = run_sortie({"fly", source_path(kQuad), "--samples", "16", "--seed", "5", "--format", fmt,
                                 "--threads", "1"});
    const auto two = run_sortie({"fly", source_path(kQuad), "--samples", "16", "--seed", "5", "--format", fmt,
                                 "--threads", "2"});
    const auto other = run_sortie({"fly", source_path(kQuad), "--samples", "16", "--seed", "6", "--format", fmt});
    REQUIRE_MESSAGE(one.exit_code == 0, one.err);
    CHECK(one.out.size() > 100);
    CHECK(one.out == two.out);
    CHECK(one.out != other.out);
  }
}

TEST_CASE("fly --samples bad input is one line") {
  const std::string P = source_path(kQuad);
  const std::string bad = write_work_file("bad_spreads.json", R"({"wind_speed_sd_mps": -1})");
  const std::string unknown = write_work_file("unknown_spreads.json", R"({"wind_sd": 1})");
  struct Row {
    std::vector<std::string> args;
    int code;
    std::string says;
  };
  const std::vector<Row> rows = {
      {{"--samples", "10", "--spreads", bad}, 1, "bad_spreads.json: /wind_speed_sd_mps: out of range (got -1"},
      {{"--samples", "10", "--spreads", unknown}, 1, "unknown_spreads.json: /wind_sd"},
      {{"--samples", "0"}, 2, "--samples: out of range (got 0"},
      {{"--samples", "200000"}, 2, "--samples: out of range (got 2e+05, expected a whole number from 1 to 100000)"},
      {{"--samples", "2", "--sweep", "soc0=0.5:1:0.5"}, 2, "--samples: not with --sweep"},
      {{"--spreads", bad}, 2, "--spreads: only with --samples"},
  };
  for (const auto& row : rows) {
    std::vector<std::string> args{"fly", P};
    args.insert(args.end(), row.args.begin(), row.args.end());
    CAPTURE(row.says);
    const auto r = run_sortie(args);
    CHECK(r.exit_code == row.code);
    CHECK(r.out.empty());
    CHECK(r.err.find(row.says) != std::string::npos);
    CHECK(std::count(r.err.begin(), r.err.end(), '\n') == 1);
  }
}

}  // TEST_SUITE

TEST_SUITE("what_if") {

TEST_CASE("what-if options refuse what the profile loader refuses for the same field") {
  // For each option, a value just past each end of its range: the option must refuse it (exit
  // 2) and the profile edited by hand to it must be refused by the loader (exit 1).
  struct Edit {
    const char* option;
    std::vector<std::string> path;  // into quad_inline()
    double below, above;
  };
  const std::vector<Edit> edits = {
      {"--payload-kg", {"airframe", "payload_kg"}, -0.001, 500.001},
      {"--air-C", {"environment", "temperature_C"}, -60.001, 60.001},
      {"--pack-C", {"pack", "temperature_C"}, -60.001, 100.001},
      {"--wind-mps", {"environment", "wind", "speed_mps"}, -0.001, 60.001},
      {"--wind-from-deg", {"environment", "wind", "from_deg"}, -0.001, 360.001},
      {"--field-elevation-m", {"environment", "field_elevation_m"}, -500.001, 11000.001},
      {"--soc0", {"pack", "soc0"}, -0.001, 1.001},
      {"--soh-capacity", {"pack", "soh", "capacity"}, 0.0, 1.501},
      {"--soh-resistance", {"pack", "soh", "resistance"}, 0.0, 20.001},
  };
  for (const auto& e : edits) {
    for (const double v : {e.below, e.above}) {
      CAPTURE(e.option);
      CAPTURE(v);
      char word[32];
      std::snprintf(word, sizeof word, "%.12g", v);
      const auto opt = run_sortie({"fly", source_path(kQuad), e.option, word, "-q"});
      CHECK(opt.exit_code == 2);
      json p = quad_inline();
      json* at = &p;
      for (const auto& k : e.path) at = &(*at)[k];
      *at = v;
      const auto file = write_work_file("range_edit.json", p.dump(2));
      const auto load = run_sortie({"fly", file, "-q"});
      CHECK(load.exit_code == 1);
      CHECK(load.err.find("out of range") != std::string::npos);
    }
  }
}

}  // TEST_SUITE

TEST_SUITE("what_if") {

TEST_CASE("what-if overrides pass the loader's cross-checks again") {
  // A fixed-wing airframe on the quad's mission, and a wind no cruise leg makes headway in, are
  // refused as the same profile edited by hand is (exit 1, the phase's pointer).
  const auto fw = run_sortie({"fly", source_path(kQuad), "--airframe",
                              source_path("models/airframes/demo-fixed-wing-mapper.json")});
  CHECK(fw.exit_code == 1);
  CHECK(fw.err.find("/phases/0/airspeed_mps: a fixed-wing climb or descent needs its airspeed") != std::string::npos);
  json edited = quad_inline();
  edited["environment"]["wind"]["speed_mps"] = 9;
  const auto by_hand = run_sortie({"fly", write_work_file("windy.json", edited.dump(2))});
  const auto by_option = run_sortie({"fly", source_path(kQuad), "--wind-mps", "9"});
  CHECK(by_hand.exit_code == 1);
  CHECK(by_option.exit_code == 1);
  const auto tail = [](const std::string& e) { return e.substr(e.find("/phases/")); };
  CHECK(tail(by_option.err) == tail(by_hand.err));
}

}  // TEST_SUITE

TEST_SUITE("what_if") {

TEST_CASE("sweep and sample pages are XML-clean and print the JSON's numbers digit for digit") {
  for (const std::vector<std::string>& mode :
       {std::vector<std::string>{"--sweep", "payload-kg=0:1.2:0.3"},
        std::vector<std::string>{"--sweep", "payload-kg=0:1:0.5", "--sweep", "soh-capacity=0.8:1:0.1"},
        std::vector<std::string>{"--samples", "20", "--seed", "3"}}) {
    CAPTURE(mode[1]);
    const std::string html = work_path("plan.html"), js = work_path("plan.json");
    std::vector<std::string> args{"fly", source_path(kQuad), "--payload-kg", "0.2", "--html", html, "--json", js, "-q"};
    if (mode[0] == "--sweep" && mode[1].rfind("payload", 0) == 0) args.erase(args.begin() + 2, args.begin() + 4);
    args.insert(args.end(), mode.begin(), mode.end());
    const auto r = run_sortie(args);
    REQUIRE_MESSAGE(r.exit_code == 0, r.err);
    const auto doc = check_xml(read_file(html));
    REQUIRE_MESSAGE(doc.ok, doc.error);
    const auto keys = check_keys(doc, json::parse(read_file(js)));
    CHECK(keys.checked > 3);
    for (const auto& p : keys.problems) FAIL_CHECK(p);
    if (mode[0] == "--samples") CHECK(read_file(html).find("not a guarantee") != std::string::npos);
  }
}

}  // TEST_SUITE
