// sortie route end to end: the generated profile is read back by the loader and flown by fly;
// the demo fixed-wing survey regenerated from an invented field polygon flies as long as its
// hand-written legs; bad geometry is one line and nothing written.
#include <doctest/doctest.h>

#include <algorithm>
#include <cmath>
#include <nlohmann/json.hpp>
#include <string>

#include "io/profile_json.hpp"
#include "support/cli.hpp"

using namespace sortie::test;

namespace {

const std::string kBase = "profiles/demo-fixed-wing-field-survey.json";

std::vector<std::string> demo_args(const std::string& field, const std::string& out) {
  return {"route", field, "--profile", source_path(kBase), "-o", out, "--height-m", "120",
          "--airspeed-mps", "15", "--transit-airspeed-mps", "16", "--climb-rate-mps", "2", "--climb-airspeed-mps", "14",
          "--descent-rate-mps", "0.8", "--descent-airspeed-mps", "12", "--spacing-m", "250", "--turns", "square",
          "--loiter-s", "180", "--loiter-airspeed-mps", "12", "--loiter-radius-m", "60", "--quiet"};
}

double flight_time_s(const std::string& profile) {
  const CliResult r = run_sortie({"fly", profile, "--json", "-", "--quiet"});
  REQUIRE(r.exit_code == 0);
  return nlohmann::json::parse(r.out).at("flight_time_s").get<double>();
}

}  // namespace

TEST_CASE("route cli: the demo fixed-wing survey from its field polygon flies within 1 % of the hand-written legs") {
  // profiles/demo-fixed-wing-field.geojson (scripts/make-demo-field.py) lays six 1600 m lines
  // 250 m apart with the home 250 m west of line 1: the generated legs are the hand-written
  // ones plus a 250 m transit out to line 1 (the hand-written profile starts its first line
  // where it climbed), which is the whole difference.
  const std::string out = work_path("gen_fixed_wing.json");
  const CliResult r = run_sortie(demo_args(source_path("profiles/demo-fixed-wing-field.geojson"), out));
  INFO(r.err);
  REQUIRE(r.exit_code == 0);
  const double t_gen = flight_time_s(out), t_hand = flight_time_s(source_path(kBase));
  MESSAGE("generated " << t_gen << " s, hand-written " << t_hand << " s");
  CHECK(std::abs(t_gen / t_hand - 1.0) < 0.01);
  // The file is an ordinary profile: the loader reads it back with the phases it was written with.
  const auto lp = sortie::io::load_profile_file(out);
  const auto j = nlohmann::json::parse(read_file(out));
  CHECK(lp.mission.phases.size() == j.at("phases").size());
  int lines = 0;
  for (const auto& p : lp.mission.phases)
    if (p.label.rfind("line ", 0) == 0) {
      ++lines;
      CHECK(*p.distance_m == doctest::Approx(1600.0).epsilon(1e-4));
    }
  CHECK(lines == 6);
}

TEST_CASE("route cli: a LineString route becomes climbs and legs and a let-down that fly") {
  const std::string route = write_work_file("route.geojson",
      R"({"type":"LineString","coordinates":[[8.6100,46.3100,60],[8.6200,46.3100],[8.6200,46.3180,90],[8.6100,46.3100]]})");
  const std::string out = work_path("gen_route.json");
  const CliResult r = run_sortie({"route", route, "--profile", source_path(kBase), "-o", out, "--height-m", "100",
                                  "--airspeed-mps", "15", "--json", "-"});
  INFO(r.err);
  REQUIRE(r.exit_code == 0);
  const auto lp = sortie::io::load_profile_file(out);
  // climb to 60 m, leg 1, climb to 100 m (the default height of waypoint 2), leg 2, descend to
  // 90 m, leg 3, descend to the ground.
  std::vector<std::string> kinds;
  for (const auto& p : lp.mission.phases) kinds.push_back(sortie::flight::to_string(p.kind));
  CHECK(kinds == std::vector<std::string>{"climb", "cruise", "climb", "cruise", "descend", "cruise", "descend"});
  // Leg 1 runs east along 46.31°: about 0.01° · 111.3 km · cos 46.31° ≈ 769 m on a sphere
  // (a sphere of 6371 km: good to 0.5 % here), track ≈ 90°.
  CHECK(*lp.mission.phases[1].distance_m == doctest::Approx(0.01 * 111320.0 * std::cos(46.31 * M_PI / 180.0)).epsilon(0.005));
  CHECK(lp.mission.phases[1].track_deg == doctest::Approx(90.0).epsilon(1e-3));
  CHECK(run_sortie({"fly", out, "--quiet"}).exit_code != 1);
}

TEST_CASE("route cli: bad geometry is one line with the file and JSON pointer and nothing is written") {
  const std::string out = work_path("never.json");
  auto refuse = [&](const std::string& name, const std::string& text, const std::string& want,
                    std::vector<std::string> extra = {}) {
    const std::string f = write_work_file(name, text);
    std::vector<std::string> a{"route", f, "--profile", source_path(kBase), "-o", out, "--height-m", "120",
                               "--airspeed-mps", "15", "--home", "8.6,46.3"};
    a.insert(a.end(), extra.begin(), extra.end());
    if (extra.empty()) a.insert(a.end(), {"--spacing-m", "100"});
    const CliResult r = run_sortie(a);
    INFO(name << ": " << r.err);
    CHECK(r.exit_code == 1);
    CHECK(r.err.find("sortie: " + f + ": " + want) == 0);
    CHECK(std::count(r.err.begin(), r.err.end(), '\n') == 1);
    CHECK(!file_exists(out));
  };
  refuse("bad.geojson", "{\"type\": ", "");
  refuse("crs.geojson", R"({"type":"Polygon","crs":{"type":"name","properties":{"name":"EPSG:2056"}},"coordinates":[[[8.6,46.3],[8.61,46.3],[8.61,46.31],[8.6,46.3]]]})",
         "/crs: only WGS 84");
  refuse("bowtie.geojson", R"({"type":"Polygon","coordinates":[[[8.6,46.3],[8.61,46.31],[8.61,46.3],[8.6,46.31],[8.6,46.3]]]})",
         "/coordinates/0/0: the boundary crosses itself");
  refuse("flat.geojson", R"({"type":"Polygon","coordinates":[[[8.6,46.3],[8.6,46.31],[8.6,46.32],[8.6,46.3]]]})",
         "/coordinates/0/");
  refuse("repeat.geojson", R"({"type":"Polygon","coordinates":[[[8.6,46.3],[8.6,46.3],[8.61,46.31],[8.6,46.3]]]})",
         "/coordinates/0/0: two consecutive vertices are the same point");
  refuse("range.geojson", R"({"type":"Polygon","coordinates":[[[8.6,46.3],[8.61,96.3],[8.61,46.31],[8.6,46.3]]]})",
         "/coordinates/0/1/1: ");
  refuse("wide.geojson", R"({"type":"Polygon","coordinates":[[[8.6,46.3],[8.601,46.3],[8.601,46.31],[8.6,46.31],[8.6,46.3]]]})",
         "/coordinates/0: the line spacing is larger than the field", {"--spacing-m", "200"});
}

TEST_CASE("route cli: --predict writes the route with the predictions of the flight at each phase end") {
  // The same mission through `fly`: the last waypoint's time is its flight time and its state
  // the landing state; times rise and charge falls along the route; a mission long enough to
  // need it carries the turn-home point, at the time fly's own turn-home solve gives.
  const std::string out = work_path("gen_pred.json"), pred = work_path("gen_pred.geojson");
  const CliResult r = run_sortie({"route", source_path("profiles/demo-fixed-wing-field.geojson"), "--profile", source_path(kBase),
                                  "-o", out, "--height-m", "120", "--airspeed-mps", "15", "--fov-deg", "70", "--overlap", "0.4",
                                  "--loiter-s", "600", "--loiter-radius-m", "60", "--descent-rate-mps", "0.8",
                                  "--descent-airspeed-mps", "12", "--predict", pred, "--quiet"});
  INFO(r.err);
  REQUIRE(r.exit_code == 0);
  const auto g = nlohmann::json::parse(read_file(pred));
  const auto fly = nlohmann::json::parse(run_sortie({"fly", out, "--json", "-", "--quiet"}).out);
  const auto& f = g.at("features");
  CHECK(f.at(0).at("geometry").at("type") == "LineString");
  double t = 0.0, soc = 1.0;
  int waypoints = 0;
  const nlohmann::json* turn = nullptr;
  const nlohmann::json* last = nullptr;
  for (const auto& x : f) {
    const auto& p = x.at("properties");
    if (p.at("role") == "turn_home") turn = &x;
    if (p.at("role") != "waypoint") continue;
    ++waypoints;
    CHECK(p.at("time_s").get<double>() > t);
    CHECK(p.at("soc").get<double>() <= soc);
    t = p.at("time_s").get<double>();
    soc = p.at("soc").get<double>();
    last = &x;
  }
  REQUIRE(last != nullptr);
  CHECK(waypoints == static_cast<int>(fly.at("phases").size()));
  CHECK(t == doctest::Approx(fly.at("flight_time_s").get<double>()).epsilon(1e-6));
  CHECK(last->at("properties").at("soc").get<double>() == doctest::Approx(fly.at("landing").at("soc").get<double>()).epsilon(1e-6));
  REQUIRE(turn != nullptr);
  CHECK(turn->at("geometry").at("type") == "Point");
  CHECK(turn->at("properties").at("time_s").get<double>() ==
        doctest::Approx(fly.at("turn_home").at("point").at("t_s").get<double>()).epsilon(1e-9));
  MESSAGE("turn home at " << turn->at("properties").at("time_s").get<double>() << " s");
}

TEST_CASE("route cli: --html draws the plan view with the turn-home point and the wind and its colours follow the charge") {
  const std::string out = work_path("gen_html.json"), pred = work_path("gen_html.geojson"), page = work_path("gen_html.html");
  const CliResult r = run_sortie({"route", source_path("profiles/demo-fixed-wing-field.geojson"), "--profile", source_path(kBase),
                                  "-o", out, "--height-m", "120", "--airspeed-mps", "15", "--fov-deg", "70", "--overlap", "0.4",
                                  "--loiter-s", "600", "--loiter-radius-m", "60", "--descent-rate-mps", "0.8",
                                  "--descent-airspeed-mps", "12", "--predict", pred, "--html", page, "--quiet"});
  INFO(r.err);
  REQUIRE(r.exit_code == 0);
  const std::string h = read_file(page);
  CHECK(h.find("<svg") != std::string::npos);
  CHECK(h.find("<title>turn-home point</title>") != std::string::npos);
  CHECK(h.find("wind 6.0 m/s from 270.0°") != std::string::npos);
  // Hue 120·SoC: the first stretch is greener than the last.
  std::vector<double> hues;
  for (std::size_t p = h.find("stroke=\"hsl("); p != std::string::npos; p = h.find("stroke=\"hsl(", p + 1))
    hues.push_back(std::stod(h.substr(p + 12, 8)));
  REQUIRE(hues.size() > 10);
  CHECK(hues.front() > hues.back());
  CHECK(std::is_sorted(hues.rbegin(), hues.rend()));
  // Without --predict there is nothing to draw: a usage error, nothing written.
  const std::string out2 = work_path("gen_html2.json"), page2 = work_path("gen_html2.html");
  const CliResult u = run_sortie({"route", source_path("profiles/demo-fixed-wing-field.geojson"), "--profile", source_path(kBase),
                                  "-o", out2, "--height-m", "120", "--airspeed-mps", "15", "--spacing-m", "250", "--html", page2});
  CHECK(u.exit_code == 2);
  CHECK(!file_exists(out2));
  CHECK(!file_exists(page2));
}
