// `sortie fly` and `sortie compare` end to end on the bundled demo profiles and on broken ones.
#include <doctest/doctest.h>

#include <cstdio>
#include <map>

#include <nlohmann/json.hpp>

#include "support/cli.hpp"

using namespace sortie::test;
using nlohmann::json;

namespace {

json demo_profile(const std::string& name) {
  return json::parse(read_file(source_path("profiles/" + name)));
}

/// Write a profile into the work folder with its model paths made absolute.
std::string write_profile(const std::string& tag, json p) {
  for (const char* k : {"airframe", "drive", "pack"})
    if (p.contains(k) && p[k].is_string() && p[k].get<std::string>()[0] != '/') p[k] = source_path("profiles/" + p[k].get<std::string>());
  if (p["pack"].is_object() && p["pack"]["cell"].is_string())
    p["pack"]["cell"] = source_path("profiles/" + p["pack"]["cell"].get<std::string>());
  return write_work_file(tag + ".json", p.dump(2));
}

}  // namespace

TEST_SUITE("cli") {

TEST_CASE("fly: every demo profile runs and writes its JSON result") {
  for (const char* name : {"demo-quad-water-tank.json", "demo-fixed-wing-field-survey.json",
                           "demo-hexa-highland-sensor.json"}) {
    CAPTURE(name);
    const std::string out = work_path("fly.json");
    const auto r = run_sortie({"fly", source_path(std::string("profiles/") + name), "--json", out});
    const json j = json::parse(read_file(out));
    CHECK(r.out.find("reserve rules") != std::string::npos);
    CHECK(j["schema"] == "sortie.fly/1");
    // Exit 0 for a go, 3 for a no-go (docs/architecture.md "Commands"): the go is every rule passing.
    bool all_pass = true;
    for (const auto& rule : j["rules"]) all_pass = all_pass && rule["pass"].get<bool>();
    CHECK(r.exit_code == (all_pass ? 0 : 3));
    CHECK(j["verdict"] == (all_pass ? "go" : "no-go"));
    // The bundled demos: the quadcopter and the fixed wing are a go, the hexacopter a no-go.
    CHECK(all_pass == (std::string(name) != "demo-hexa-highland-sensor.json"));
    for (const char* k : {"flight_time_s", "spare_s"}) CHECK(j[k].is_number());
    for (const char* k : {"soc", "energy_Wh", "v_rest_cell_V"}) CHECK(j["landing"][k].is_number());
    REQUIRE(j["phases"].size() >= 3);
    for (const auto& p : j["phases"])
      for (const char* k : {"kind", "start_s", "duration_s", "energy_Wh", "charge_Ah", "v_min_cell_V", "i_max_A",
                            "duty_mean", "duty_max", "eta_mean"})
        CHECK(p.contains(k));
    for (const auto& rule : j["rules"])
      for (const char* k : {"name", "required", "actual", "margin", "pass"}) CHECK(rule.contains(k));
    CHECK(j["events"].is_array());
  }
}

TEST_CASE("fly: the quadcopter demo is a go — the hexacopter demo a no-go naming its failed rule") {
  const auto go = run_sortie({"fly", source_path("profiles/demo-quad-water-tank.json")});
  CHECK(go.exit_code == 0);
  CHECK(go.out.find(">> GO") != std::string::npos);
  const auto nogo = run_sortie({"fly", source_path("profiles/demo-hexa-highland-sensor.json"), "--json", "-"});
  CHECK(nogo.exit_code == 3);
  const json j = json::parse(nogo.out);
  CHECK(j["verdict"] == "no-go");
  // Each failed rule is named in the verdict in its README words with its value; a rule that
  // holds is not named; pass is actual >= required (<= for a limit).
  const std::map<std::string, std::string> words = {{"soc_min", "charge at landing"},
                                                    {"hover_s", "time on station left at landing"},
                                                    {"v_rest_cell_min_V", "resting cell voltage at landing"},
                                                    {"v_load_cell_min_V", "loaded cell voltage in flight"}};
  const std::string verdict = j["verdict_text"].get<std::string>();
  int failed = 0;
  for (const auto& rule : j["rules"]) {
    const std::string name = rule["name"].get<std::string>();
    CAPTURE(name);
    const double actual = rule["actual"].get<double>(), required = rule["required"].get<double>();
    // A limit in flight ("limit": "max") holds while the value stays at or under it; a reserve
    // ("min") while it is at or above it.
    const bool is_max = rule.contains("limit") && rule["limit"] == "max";
    if (name != "mission_flown") CHECK(rule["pass"].get<bool>() == (is_max ? actual <= required : actual >= required));
    if (!words.count(name)) continue;
    char value[64];
    if (name == "soc_min") std::snprintf(value, sizeof value, "%.1f %%", 100.0 * actual);
    else if (name == "hover_s") std::snprintf(value, sizeof value, "%.0f s", actual);
    else std::snprintf(value, sizeof value, "%.3f V", actual);
    const std::string named = words.at(name) + " " + value;
    CHECK_MESSAGE((verdict.find(named) != std::string::npos) == !rule["pass"].get<bool>(), verdict << " / " << named);
    failed += rule["pass"].get<bool>() ? 0 : 1;
  }
  CHECK(failed >= 1);
  CHECK(j["spare_s"].get<double>() < 0);
}

TEST_CASE("fly: the cold hexacopter pack warms in flight and gives its heat to the air at the field") {
  // The profile: pack at 0 °C, field air 0 °C; the demo LiPo cell has a thermal block.
  const auto r = run_sortie({"fly", source_path("profiles/demo-hexa-highland-sensor.json"), "--json", "-"});
  const json j = json::parse(r.out);
  REQUIRE(j.contains("cell_temperature_C"));
  const json& t = j["cell_temperature_C"];
  CHECK(t["start"] == 0.0);
  CHECK(t["air"].get<double>() == doctest::Approx(0.0).epsilon(1e-9));
  CHECK(t["landing"].get<double>() > 5.0);   // about 4C for 11 minutes
  CHECK(t["landing"].get<double>() < 60.0);  // no cell_hot warning
  CHECK(t["max"].get<double>() >= t["landing"].get<double>());
  for (const auto& e : j["events"]) CHECK(e["kind"] != "cell_hot");
  // The same pack kept at 0 °C (no thermal block) sags more and draws more charge for the same
  // 420 s hover (its resistance stays high); here it reaches the cutoff before landing.
  json cell = json::parse(read_file(source_path("models/cells/demo-lipo-5000.json")));
  cell.erase("thermal");
  write_work_file("cold-lipo.json", cell.dump());
  json pack = {{"cell", "cold-lipo.json"}, {"series", 4}, {"parallel", 2}, {"wiring_ohm", 0.004}, {"temperature_C", 0}};
  const std::string pk = write_work_file("cold-pack.json", pack.dump());
  const auto iso = run_sortie({"fly", source_path("profiles/demo-hexa-highland-sensor.json"), "--pack", pk, "--json", "-"});
  const json ji = json::parse(iso.out);
  CHECK_FALSE(ji.contains("cell_temperature_C"));
  CHECK(ji["v_min_cell_V"].get<double>() < j["v_min_cell_V"].get<double>());
  CHECK(ji["phases"][1]["charge_Ah"].get<double>() > j["phases"][1]["charge_Ah"].get<double>());
  CHECK(j["completed"] == true);
  CHECK(ji["completed"] == false);
}

TEST_CASE("fly: a lighter sensor turns the hexacopter no-go into a go") {
  json af = json::parse(read_file(source_path("models/airframes/demo-hexa-10in-lifter.json")));
  af["payload_kg"] = 0.3;
  const std::string af_path = write_work_file("light-hexa.json", af.dump());
  json p = demo_profile("demo-hexa-highland-sensor.json");
  p["airframe"] = af_path;
  const auto r = run_sortie({"fly", write_profile("light-hexa-profile", p), "--quiet"});
  CHECK(r.exit_code == 0);
  CHECK(r.out.empty());
}

TEST_CASE("fly: --pack replaces the profile's pack — --trace has the mission columns") {
  const std::string tr = work_path("fly-trace.csv");
  const auto r = run_sortie({"fly", source_path("profiles/demo-quad-water-tank.json"), "--pack",
                             source_path("models/packs/demo-4s1p-lipo-5000.json"), "--trace", tr, "--json", "-"});
  // The 4S1P 5 Ah pack flies the quadcopter demo with its reserve (a go: exit 0).
  REQUIRE_MESSAGE(r.exit_code == 0, r.err);
  CHECK(json::parse(r.out)["pack"]["layout"] == "4S1P");
  CHECK(json::parse(r.out)["verdict"] == "go");
  const std::string csv = read_file(tr);
  CHECK(csv.rfind("time_s,current_A,v_terminal_V,v_ocv_V,soc,power_W,phase,duty,thrust_N,cell_temperature_C,height_m,past_turn_home\n", 0) == 0);
}

TEST_CASE("fly: bad profiles are refused with a pointer and no output") {
  struct Case {
    std::string tag;
    std::function<void(json&)> edit;
    std::vector<std::string> fragments;
  };
  const std::vector<Case> cases = {
      {"hover-wing", [](json& p) { p["phases"][13] = {{"kind", "hover"}, {"duration_s", 60}}; },
       {"/phases/13/kind", "fixed-wing aircraft cannot hover"}},
      {"stall", [](json& p) { p["phases"][1]["airspeed_mps"] = 7; }, {"/phases/1/airspeed_mps", "stall speed"}},
      {"no-landing", [](json& p) { p["phases"].erase(p["phases"].size() - 1); }, {"/phases", "must end on the ground"}},
      {"unknown-kind", [](json& p) { p["phases"][0]["kind"] = "clmb"; }, {"/phases/0/kind", "did you mean 'climb'"}},
      {"two-spare", [](json& p) { p["phases"][1]["spare"] = true; }, {"/phases/13/spare", "more than one"}},
      {"reserve", [](json& p) { p["reserve"]["soc_min"] = 1.5; }, {"/reserve/soc_min", "got 1.5"}},
      {"headwind", [](json& p) { p["phases"][12]["airspeed_mps"] = 6.5; p["environment"]["wind"]["speed_mps"] = 8; },
       {"/phases/12/airspeed_mps"}},
  };
  for (const auto& c : cases) {
    CAPTURE(c.tag);
    json p = demo_profile("demo-fixed-wing-field-survey.json");
    c.edit(p);
    const std::string out = work_path("bad-fly.json");
    const auto r = run_sortie({"fly", write_profile("bad-" + c.tag, p), "--json", out});
    CHECK(r.exit_code == 1);
    CHECK(std::count(r.err.begin(), r.err.end(), '\n') == 1);
    for (const auto& f : c.fragments) CHECK_MESSAGE(r.err.find(f) != std::string::npos, r.err);
    CHECK_FALSE(file_exists(out));
  }
}

TEST_CASE("compare: packs ranked by spare time — heavier packs heavier aircraft") {
  const auto r = run_sortie({"compare", source_path("profiles/demo-quad-water-tank.json"), "--series", "4,6",
                             "--capacity-Ah", "3,5", "--json", "-"});
  REQUIRE(r.exit_code == 0);
  const json j = json::parse(r.out);
  CHECK(j["schema"] == "sortie.compare/1");
  REQUIRE(j["rows"].size() == 4);
  double prev = 1e300;
  bool go_seen_after_nogo = false, nogo = false;
  for (const auto& row : j["rows"]) {
    const bool go = row["verdict"] == "go";
    if (!go) nogo = true;
    if (go && nogo) go_seen_after_nogo = true;
    if (go) {
      CHECK(row["spare_s"].get<double>() <= prev);
      prev = row["spare_s"].get<double>();
    }
    for (const char* k : {"pack_mass_kg", "all_up_mass_kg", "landing_soc", "c_rate_max", "duty_mean", "eta_esc_mean"})
      CHECK(row[k].is_number());
    CHECK(row["all_up_mass_kg"].get<double>() - row["pack_mass_kg"].get<double>() == doctest::Approx(1.9));
    // What limits the pack, in the rules' own words.
    const std::string limit = row["limit"].get<std::string>();
    if (go) CHECK(limit == "then charge at landing binds");
    else CHECK((limit == "ends early at the cell cutoff" || limit.rfind("fails: ", 0) == 0));
  }
  CHECK(nogo);  // the 4S 3 Ah pack
  CHECK_FALSE(go_seen_after_nogo);
}

TEST_CASE("compare: pack files side by side") {
  const auto r = run_sortie({"compare", source_path("profiles/demo-fixed-wing-field-survey.json"), "--pack",
                             source_path("models/packs/demo-4s1p-lipo-5000.json"), "--pack",
                             source_path("models/packs/demo-4s1p-lihv-2200.json")});
  CHECK(r.exit_code == 0);
  CHECK(r.out.find("demo 4S1P 2.2 Ah LiHV pack (invented)") != std::string::npos);
  CHECK(run_sortie({"compare", source_path("profiles/demo-quad-water-tank.json")}).exit_code == 2);
}

}  // TEST_SUITE
