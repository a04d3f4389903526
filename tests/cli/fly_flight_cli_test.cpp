// `sortie fly` end to end on the flight-model keys: airspeed keywords, banked loiter, the
// fixed-wing glide limit and its drag device, and the best speeds in text and JSON.
#include <doctest/doctest.h>

#include <nlohmann/json.hpp>

#include "support/cli.hpp"

using namespace sortie::test;
using nlohmann::json;

namespace {

json demo(const std::string& name) { return json::parse(read_file(source_path("profiles/" + name))); }

/// Write a profile into the work folder with its model paths made absolute.
std::string write_profile(const std::string& tag, json p) {
  for (const char* k : {"airframe", "drive", "pack"})
    if (p.contains(k) && p[k].is_string() && p[k].get<std::string>()[0] != '/')
      p[k] = source_path("profiles/" + p[k].get<std::string>());
  if (p["pack"].is_object() && p["pack"]["cell"].is_string())
    p["pack"]["cell"] = source_path("profiles/" + p["pack"]["cell"].get<std::string>());
  return write_work_file(tag + ".json", p.dump(2));
}

}  // namespace

TEST_SUITE("cli") {

TEST_CASE("fly: best speeds are shown in the text and the JSON") {
  const auto r = run_sortie({"fly", source_path("profiles/demo-quad-water-tank.json"), "--json", "-"});
  REQUIRE(r.exit_code == 0);
  const json j = json::parse(r.out);
  REQUIRE(j.contains("best_speeds"));
  const json& b = j["best_speeds"];
  CHECK(b["found"] == true);
  CHECK(b["endurance_mps"].get<double>() > 0.0);
  CHECK(b["range_mps"].get<double>() > b["endurance_mps"].get<double>());
  CHECK(b["endurance_W"].get<double>() > 0.0);
  // The profile's 5 m/s wind: the range speed into it as a headwind is higher.
  CHECK(b["into_headwind"]["head_mps"] == 5.0);
  CHECK(b["into_headwind"]["range_mps"].get<double>() > b["range_mps"].get<double>());
  const auto t = run_sortie({"fly", source_path("profiles/demo-quad-water-tank.json")});
  CHECK(t.out.find("best speeds  endurance ") != std::string::npos);
}

TEST_CASE("fly: airspeed_mps may be best_endurance or best_range and a misspelt keyword is refused") {
  json p = demo("demo-fixed-wing-field-survey.json");
  p["phases"][13]["airspeed_mps"] = "best_endurance";
  p["phases"][12]["airspeed_mps"] = "best_range";
  const auto r = run_sortie({"fly", write_profile("keyword", p), "--json", "-"});
  REQUIRE((r.exit_code == 0 || r.exit_code == 3));
  const json j = json::parse(r.out);
  // The loiter is the 60 m turn: its airspeed is the level best-endurance speed at its height,
  // not the number any more; the upwind leg flies faster than the calm-air range speed.
  CHECK(j["phases"][12]["airspeed_mps"].get<double>() > j["best_speeds"]["range_mps"].get<double>());
  p["phases"][13]["airspeed_mps"] = "best_endurence";
  const auto bad = run_sortie({"fly", write_profile("keyword-bad", p)});
  CHECK(bad.exit_code == 1);
  CHECK(bad.err.find("/phases/13/airspeed_mps") != std::string::npos);
  CHECK(bad.err.find("did you mean 'best_endurance'") != std::string::npos);
}

TEST_CASE("fly: a fixed-wing descent steeper than the idle glide is refused unless it has a drag device") {
  json p = demo("demo-fixed-wing-field-survey.json");
  p["phases"][14]["rate_mps"] = 2.0;  // 9.6° at 12 m/s against an idle glide near 4°
  const auto r = run_sortie({"fly", write_profile("steep", p)});
  CHECK(r.exit_code == 1);
  CHECK(r.out.empty());
  CHECK(r.err.find("/phases/14/rate_mps") != std::string::npos);
  CHECK(r.err.find("descent angle 9.6 deg") != std::string::npos);
  CHECK(r.err.find("idle glide angle") != std::string::npos);
  CHECK(std::count(r.err.begin(), r.err.end(), '\n') == 1);
  p["phases"][14]["drag_device"] = true;
  const auto ok = run_sortie({"fly", write_profile("steep-brake", p), "--json", "-"});
  CHECK((ok.exit_code == 0 || ok.exit_code == 3));
}

TEST_CASE("fly: a banked loiter costs more than a straight one and turn keys are refused on a multirotor") {
  json p = demo("demo-fixed-wing-field-survey.json");
  p["phases"][13].erase("turn_radius_m");
  const auto straight = json::parse(run_sortie({"fly", write_profile("straight", p), "--json", "-"}).out);
  p["phases"][13]["bank_deg"] = 30;
  const auto banked = json::parse(run_sortie({"fly", write_profile("banked", p), "--json", "-"}).out);
  CHECK(banked["phases"][13]["energy_Wh"].get<double>() > straight["phases"][13]["energy_Wh"].get<double>());
  p["phases"][13]["bank_deg"] = 60;  // stall speed × √2 at 12 m/s: below the 1.2 margin
  const auto steep = run_sortie({"fly", write_profile("bank-60", p)});
  CHECK(steep.exit_code == 1);
  CHECK(steep.err.find("/phases/13/airspeed_mps") != std::string::npos);
  CHECK(steep.err.find("load factor 2.00") != std::string::npos);
  json q = demo("demo-quad-water-tank.json");
  q["phases"][3]["kind"] = "hover";
  q["phases"][4]["bank_deg"] = 20;
  const auto mr = run_sortie({"fly", write_profile("quad-bank", q)});
  CHECK(mr.exit_code == 1);
  CHECK(mr.err.find("/phases/4/bank_deg") != std::string::npos);
}

TEST_CASE("fly: a turn given twice and a download fraction out of range are refused with their pointers") {
  json p = demo("demo-fixed-wing-field-survey.json");
  p["phases"][13]["bank_deg"] = 20;  // besides its turn_radius_m
  const auto both = run_sortie({"fly", write_profile("turn-twice", p)});
  CHECK(both.exit_code == 1);
  CHECK(both.err.find("/phases/13/turn_radius_m") != std::string::npos);
  CHECK(both.err.find("bank_deg or turn_radius_m, one of them") != std::string::npos);
  json q = demo("demo-quad-water-tank.json");
  json frame = json::parse(read_file(source_path("models/airframes/demo-quad-15in-inspection.json")));
  frame["download_fraction"] = 0.7;
  q["airframe"] = frame;
  const auto dl = run_sortie({"fly", write_profile("download", q)});
  CHECK(dl.exit_code == 1);
  CHECK(dl.err.find("/airframe/download_fraction") != std::string::npos);
  CHECK(dl.err.find("0.7") != std::string::npos);
}

}  // TEST_SUITE
