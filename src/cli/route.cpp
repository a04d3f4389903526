// sortie route: a profile from geometry (a GeoJSON route or field), written as ordinary profile
// JSON that `sortie fly` reads.
#include <cmath>
#include <limits>
#include <memory>
#include <nlohmann/json.hpp>
#include <optional>
#include <sstream>
#include <variant>

#include "cli/commands.hpp"
#include "cli/number_option.hpp"
#include "cli/run.hpp"
#include "core/error.hpp"
#include "core/text.hpp"
#include "geo/geodesy.hpp"
#include "io/geojson.hpp"
#include "io/output.hpp"
#include "cli/profile_load.hpp"
#include "io/profile_write.hpp"
#include "plan/legs.hpp"
#include "plan/survey.hpp"
#include "report/plan_view.hpp"
#include "report/route_geojson.hpp"
#include "sim/mission.hpp"
#include "sim/turn_home.hpp"

namespace sortie::cli {

namespace {

struct RouteOptions {
  std::string geometry, profile, out, json_file, home, turns, predict, html;
  std::optional<double> height_m, airspeed, transit_airspeed, climb_rate, climb_airspeed, descent_rate,
      descent_airspeed, spacing, fov, overlap, direction, bank, accel, yaw_rate, loiter_s, loiter_airspeed,
      loiter_radius;
  bool quiet = false;
};

/// A line direction as "a/b°", both ends in [0, 360) after rounding to 0.1°.
std::string both_ways(double dir);

std::string fmt(double v, int digits = 1) {
  std::ostringstream s;
  s.setf(std::ios::fixed);
  s.precision(digits);
  s << v;
  return s.str();
}

std::string both_ways(double dir) {
  double d = std::round(dir * 10.0) / 10.0;
  if (d >= 180.0) d -= 180.0;
  return fmt(d) + "/" + fmt(d + 180.0) + "°";
}

geo::LonLat parse_home(const std::string& s) {
  const auto comma = s.find(',');
  double lon = NAN, lat = NAN;
  try {
    if (comma == std::string::npos) throw std::invalid_argument("");
    std::size_t a = 0, b = 0;
    lon = std::stod(s.substr(0, comma), &a);
    lat = std::stod(s.substr(comma + 1), &b);
    if (a != comma || b != s.size() - comma - 1) throw std::invalid_argument("");
  } catch (const std::exception&) {
    throw UsageError("--home: not LON,LAT (got \"" + s + "\", expected two numbers in degrees, e.g. 7.25,46.5)");
  }
  if (auto why = range_problem(lon, between(-180.0, 180.0, "deg longitude"))) throw UsageError("--home: " + *why);
  if (auto why = range_problem(lat, between(-90.0, 90.0, "deg latitude"))) throw UsageError("--home: " + *why);
  return {lon, lat};
}

int run_route(const RouteOptions& o) {
  const io::GeoInput g = io::load_geojson_file(o.geometry);
  const io::LoadedProfile base = load_profile(o.profile);
  const nlohmann::json base_json = io::load_json_file(o.profile);
  const bool fixed_wing = std::holds_alternative<flight::FixedWing>(base.mission.airframe);
  const bool survey = !g.ring.empty();
  std::vector<std::string> stated;  // every default that shapes the result, in words
  auto value = [&](const std::optional<double>& v, double fallback, const std::string& what, const std::string& opt,
                   const std::string& unit) {
    if (v) return *v;
    stated.push_back(what + " " + format_number(fallback) + unit + " (default; " + opt + ")");
    return fallback;
  };

  plan::FlightPlan fp;
  if (!o.airspeed) throw UsageError("--airspeed-mps is required (the airspeed along the route or the lines)");
  fp.airspeed_mps = *o.airspeed;
  fp.transit_airspeed_mps = value(o.transit_airspeed, fp.airspeed_mps, "transit airspeed", "--transit-airspeed-mps", " m/s");
  fp.climb_rate_mps = value(o.climb_rate, 2.0, "climb rate", "--climb-rate-mps", " m/s");
  fp.descent_rate_mps = value(o.descent_rate, fixed_wing ? 1.0 : 1.5, "descent rate", "--descent-rate-mps", " m/s");
  fp.climb_airspeed_mps = value(o.climb_airspeed, fixed_wing ? fp.airspeed_mps : 0.0, "climb airspeed",
                                "--climb-airspeed-mps", " m/s");
  fp.descent_airspeed_mps = value(o.descent_airspeed, fixed_wing ? fp.airspeed_mps : 0.0, "descent airspeed",
                                  "--descent-airspeed-mps", " m/s");
  if (o.loiter_s) {
    fp.loiter_s = *o.loiter_s;
    fp.loiter_airspeed_mps = value(o.loiter_airspeed, fixed_wing ? fp.airspeed_mps : 0.0, "loiter airspeed",
                                   "--loiter-airspeed-mps", " m/s");
    fp.loiter_radius_m = o.loiter_radius;
    if (!fixed_wing && fp.loiter_airspeed_mps > 0.0)
      throw UsageError("--loiter-airspeed-mps: a multirotor waits in a hover (got " + format_number(fp.loiter_airspeed_mps) + " m/s, expected 0 or no option)");
  }
  if (fixed_wing && (fp.climb_airspeed_mps <= 0.0 || fp.descent_airspeed_mps <= 0.0))
    throw UsageError("--climb-airspeed-mps/--descent-airspeed-mps: a fixed wing climbs and descends along a path (got 0, expected an airspeed above 0 m/s)");

  std::vector<plan::PlannedPhase> planned;
  nlohmann::json summary;
  std::ostringstream text;
  const flight::Wind wind = base.mission.environment.wind;
  if (!survey) {
    std::vector<plan::RoutePoint> pts;
    bool all_heights = true;
    for (std::size_t i = 0; i < g.route.size(); ++i) {
      const auto& v = g.route[i];
      if (!v.height_m) all_heights = false;
      if (v.height_m && *v.height_m <= 0.0 && i > 0 && i + 1 < g.route.size())
        throw InputError(io::message(g.source, v.pointer, "a waypoint on the ground inside the route (no landing is planned between waypoints)",
                                     format_number(*v.height_m) + " m", "a height above 0 m"));
      pts.push_back({v.at, v.height_m});
    }
    if (!all_heights && !o.height_m)
      throw UsageError("--height-m is required: a waypoint gives no height (a LineString's third number or a Point's height_m)");
    fp.height_m = o.height_m.value_or(0.0);
    if (!pts.front().height_m && fp.height_m <= 0.0)
      throw UsageError("--height-m: the first waypoint would be on the ground (got 0 m, expected above 0 m)");
    if (pts.front().height_m && *pts.front().height_m <= 0.0)
      throw InputError(io::message(g.source, g.route.front().pointer, "the first waypoint is on the ground; the route starts with a climb to it",
                                   "0 m", "a height above 0 m"));
    planned = plan::route_phases(pts, fp);
    double dist = 0.0;
    for (const auto& p : planned)
      if (p.phase.distance_m) dist += *p.phase.distance_m;
    summary["route"] = {{"waypoints", pts.size()}, {"distance_m", dist}};
    text << "route: " << pts.size() << " waypoints, " << fmt(dist / 1000.0, 2) << " km over the ground (geodesics on WGS 84)\n";
  } else {
    if (!o.height_m) throw UsageError("--height-m is required for a survey (the height of the lines above the field)");
    fp.height_m = *o.height_m;
    geo::LonLat home;
    if (!o.home.empty()) home = parse_home(o.home);
    else if (g.home) home = g.home->at;
    else throw UsageError("--home LON,LAT is required: the field file has no Point with \"role\": \"home\"");
    const geo::LocalPlane plane(home);
    std::vector<geo::Xy> ring;
    for (const auto& v : g.ring) ring.push_back(plane.forward(v.at));
    if (auto bad = plan::ring_problem(ring))
      throw InputError(io::message(g.source, g.ring_pointer + "/" + std::to_string(bad->bad_vertex), bad->what));
    double spacing = 0.0;
    std::string spacing_from;
    if (o.spacing) {
      if (o.fov || o.overlap) throw UsageError("--spacing-m: give the spacing, or --fov-deg with --overlap, not both");
      spacing = *o.spacing;
      spacing_from = "given";
    } else {
      if (!o.fov || !o.overlap) throw UsageError("--spacing-m, or --fov-deg with --overlap, is required for a survey");
      spacing = plan::spacing_from_sensor(fp.height_m, *o.fov, *o.overlap);
      spacing_from = "2·h·tan(FOV/2)·(1 − overlap) = 2·" + format_number(fp.height_m) + "·tan(" + format_number(*o.fov) +
                     "°/2)·(1 − " + format_number(*o.overlap) + ")";
    }
    double dir = 0.0;
    std::string dir_from;
    if (o.direction) {
      dir = std::fmod(*o.direction, 180.0);
      dir_from = "given";
    } else {
      dir = plan::fewest_lines_direction_deg(ring);
      dir_from = "along the field's longest dimension: parallel to the convex-hull edge across which the field is narrowest (fewest lines)";
    }
    const double width = plan::width_across(ring, dir);
    if (spacing > width)
      throw InputError(io::message(g.source, g.ring_pointer, "the line spacing is larger than the field",
                                   format_number(spacing) + " m", "at most the field's width across lines on " + both_ways(dir) + ", " + fmt(width) + " m"));
    const std::string turns = o.turns.empty() ? (fixed_wing ? "bank" : "stop") : o.turns;
    if (o.turns.empty()) stated.push_back(std::string("turns ") + turns + " (default for a " + (fixed_wing ? "fixed wing" : "multirotor") + "; --turns)");
    fp.turns = turns == "bank" ? plan::Turns::bank : turns == "stop" ? plan::Turns::stop : plan::Turns::square;
    if (fp.turns == plan::Turns::bank && !fixed_wing) throw UsageError("--turns bank: a multirotor turns with stop (or square)");
    if (fp.turns == plan::Turns::stop && fixed_wing) throw UsageError("--turns stop: a fixed wing cannot stop; use bank (or square)");
    if (fp.turns == plan::Turns::bank) fp.bank_deg = value(o.bank, 30.0, "bank angle", "--bank-deg", "°");
    if (fp.turns == plan::Turns::stop) {
      fp.accel_mps2 = value(o.accel, 2.0, "acceleration", "--accel-mps2", " m/s²");
      fp.yaw_rate_deg_s = value(o.yaw_rate, 45.0, "hover turn rate", "--yaw-rate-dps", " °/s");
    }
    const plan::OrderWind ow{fp.airspeed_mps, fp.transit_airspeed_mps, wind.speed_mps, wind.from_deg};
    const plan::Pattern pat = plan::make_pattern(ring, dir, spacing, {0.0, 0.0}, ow);
    if (pat.passes.empty())
      throw InputError(io::message(g.source, g.ring_pointer, "no survey line falls inside the field"));
    planned = plan::survey_phases(pat, plane, home, fp);
    // Which line direction flies cheaper in the wind: passes timed at the line airspeed, turns
    // and transits not counted, for these lines and for lines at right angles.
    auto pass_time = [&](const plan::Pattern& p) {
      double t = 0.0;
      for (const auto& s : p.passes) {
        const double len = std::hypot(s.b.x - s.a.x, s.b.y - s.a.y);
        const double tr = geo::track_0_360(std::atan2(s.b.x - s.a.x, s.b.y - s.a.y) * 180.0 / 3.14159265358979323846);
        const double gs = plan::ground_speed_mps(fp.airspeed_mps, tr, wind.speed_mps, wind.from_deg);
        if (gs <= 0.0) return std::numeric_limits<double>::infinity();
        t += len / gs;
      }
      return t;
    };
    const double other_dir = std::fmod(dir + 90.0, 180.0);
    const double t_this = pass_time(pat);
    const double t_other = other_dir <= 180.0 && spacing <= plan::width_across(ring, other_dir)
                               ? pass_time(plan::make_pattern(ring, other_dir, spacing, {0.0, 0.0}, ow))
                               : std::numeric_limits<double>::infinity();
    std::string wind_note;
    if (wind.speed_mps <= 0.0) wind_note = "calm: the line direction does not change the time on the lines";
    else
      wind_note = "in the wind of " + format_number(wind.speed_mps) + " m/s from " + format_number(wind.from_deg) + "°, lines on " +
                  both_ways(dir) + " take " + fmt(t_this, 0) + " s on the lines, lines on " + both_ways(other_dir) + " would take " + (std::isfinite(t_other) ? fmt(t_other, 0) + " s" : "(not flyable)") +
                  ": the " + (t_this <= t_other ? "chosen" : "other") + " direction flies cheaper (same airspeed; turns and transits not counted)";
    double turn_r = fp.turns == plan::Turns::bank ? plan::turn_radius_m(fp.airspeed_mps, fp.bank_deg) : 0.0;
    summary["survey"] = {{"lines", pat.lines},       {"passes", pat.passes.size()},
                         {"spacing_m", spacing},     {"spacing_from", spacing_from},
                         {"direction_deg", dir},     {"direction_from", dir_from},
                         {"width_m", width},         {"turns", plan::to_string(fp.turns)},
                         {"wind_note", wind_note},   {"home", {home.lon_deg, home.lat_deg}}};
    if (fp.turns == plan::Turns::bank) {
      summary["survey"]["bank_deg"] = fp.bank_deg;
      summary["survey"]["turn_radius_m"] = turn_r;
    }
    text << "survey: " << pat.lines << " lines (" << pat.passes.size() << " passes) on " << both_ways(dir) << ", " << fmt(spacing) << " m apart (" << spacing_from << "); field " << fmt(width) << " m across the lines\n";
    text << "direction: " << dir_from << "\n";
    text << "turns: " << plan::to_string(fp.turns);
    if (fp.turns == plan::Turns::bank) text << " at " << format_number(fp.bank_deg) << "° bank, radius " << fmt(turn_r) << " m (r = V²/(g·tan φ))";
    if (fp.turns == plan::Turns::square) text << " (straight steps between lines; the turns themselves are not costed)";
    text << "\nwind: " << wind_note << "\n";
  }

  std::vector<flight::Phase> phases;
  for (const auto& p : planned) phases.push_back(p.phase);
  std::string note = std::string("Generated by sortie route from ") + o.geometry + " on the base profile " + o.profile +
                     "; legs are geodesics on WGS 84.";
  for (const auto& s : stated) note += " " + s + ".";
  const std::filesystem::path out_path(o.out);
  const std::filesystem::path out_dir = out_path.has_parent_path() ? out_path.parent_path() : std::filesystem::path(".");
  const std::filesystem::path base_dir = std::filesystem::path(o.profile).has_parent_path() ? std::filesystem::path(o.profile).parent_path()
                                                                                         : std::filesystem::path(".");
  const std::string name = base.mission.name + " (" + (survey ? "survey" : "route") + " from " +
                           std::filesystem::path(o.geometry).filename().string() + ")";
  const nlohmann::json prof = io::generated_profile(base_json, base_dir, out_dir, name, note, phases);
  const std::string content = prof.dump(2) + "\n";
  // The loader must read back what is written (checked before anything is written).
  // A phase the loader refuses (a ramp too slow for the wind, say) names the phase in the
  // profile that would have been written; it is not written.
  const io::LoadedProfile gen = parse_profile(content, io::Source{o.out + " (generated, not written)", out_dir});
  std::string predicted, page;
  if (!o.html.empty() && o.predict.empty()) throw UsageError("--html needs --predict (the plan view shows the flown predictions)");
  if (!o.predict.empty()) {
    // The generated mission flown once with a trace, and its turn-home point.
    sim::SimOptions so;
    so.sample_s = 1.0;
    const sim::MissionResult res = sim::simulate(gen.mission, so);
    if (res.refused) throw InputError(refusal_message(gen, res));
    const sim::TurnHome th = sim::solve_turn_home(gen.mission);
    const geo::LonLat start = survey ? planned.front().end : g.route.front().at;
    const nlohmann::json rg = report::route_geojson(start, planned, gen.mission, res, th);
    predicted = rg.dump(1) + "\n";
    if (!o.html.empty()) page = report::plan_view_page(rg, gen.mission, res);
    text << "flown: " << fmt(res.flight_time_s, 0) << " s, landing at " << fmt(100.0 * res.landing.soc, 1) << " % charge"
         << (th.point ? ", latest turn home at " + fmt(th.point->t_s, 0) + " s" : std::string(", turning home holds all the way")) << "\n";
  }
  summary["profile"] = o.out;
  summary["phases"] = phases.size();
  summary["defaults"] = stated;
  io::write_output(o.out, content);
  if (!o.predict.empty()) io::write_output(o.predict, predicted);
  if (!o.html.empty()) io::write_output(o.html, page);
  if (!o.json_file.empty()) io::write_output(o.json_file, summary.dump(2) + "\n");
  if (!o.quiet && o.json_file != "-") {
    text << "wrote " << o.out << ": " << phases.size() << " phases; fly it with: sortie fly " << o.out << "\n";
    for (const auto& s : stated) text << "  default: " << s << "\n";
    io::write_output("-", printable(text.str(), true));
  }
  return kExitOk;
}

}  // namespace

void add_route_command(CLI::App& app, int& exit_code) {
  auto o = std::make_shared<RouteOptions>();
  CLI::App* c = app.add_subcommand("route", "Write a profile from a GeoJSON route (LineString or Points) or a field (Polygon: survey lines)");
  c->add_option("GEOJSON", o->geometry, "route or field, GeoJSON (RFC 7946, WGS 84 lon/lat)")->required()->check(CLI::ExistingFile);
  c->add_option("--profile", o->profile, "base profile: airframe, drive, pack, environment and reserve are taken from it")
      ->required()->check(CLI::ExistingFile);
  c->add_option("--out,-o", o->out, "the profile to write (JSON)")->required()->check(output_path());
  c->add_option("--json", o->json_file, "write the plan summary as JSON to FILE, or - for standard output")->check(output_path());
  const Range speed = above_to(0.0, 150.0, "m/s");
  c->add_option("--height-m", o->height_m, "height above the field of the lines (or of waypoints without one)")
      ->check(number_in(between(0.0, 11000.0, "m")));
  c->add_option("--airspeed-mps", o->airspeed, "airspeed along the route or the lines")->check(number_in(speed));
  c->add_option("--transit-airspeed-mps", o->transit_airspeed, "airspeed from and back to home (default: --airspeed-mps)")->check(number_in(speed));
  c->add_option("--climb-rate-mps", o->climb_rate, "vertical speed in climbs (default 2)")->check(number_in(above_to(0.0, 30.0, "m/s")));
  c->add_option("--climb-airspeed-mps", o->climb_airspeed, "airspeed in climbs (default: 0 for a multirotor, --airspeed-mps for a fixed wing)")
      ->check(number_in(between(0.0, 150.0, "m/s")));
  c->add_option("--descent-rate-mps", o->descent_rate, "vertical speed in descents (default 1.5 multirotor, 1 fixed wing)")
      ->check(number_in(above_to(0.0, 30.0, "m/s")));
  c->add_option("--descent-airspeed-mps", o->descent_airspeed, "airspeed in descents (default as for climbs)")
      ->check(number_in(between(0.0, 150.0, "m/s")));
  c->add_option("--spacing-m", o->spacing, "survey line spacing")->check(number_in(above_to(0.0, 1e5, "m")));
  c->add_option("--fov-deg", o->fov, "sensor field of view across the track (spacing from height and overlap)")
      ->check(number_in(above_to(0.0, 170.0, "deg")));
  c->add_option("--overlap", o->overlap, "side overlap as a fraction, e.g. 0.7")->check(number_in(between(0.0, 0.95, "")));
  c->add_option("--direction-deg", o->direction, "survey line direction, degrees true (default: fewest lines)")
      ->check(number_in(between(0.0, 360.0, "deg")));
  c->add_option("--turns", o->turns, "square, bank (fixed wing) or stop (multirotor)")->check(CLI::IsMember({"square", "bank", "stop"}));
  c->add_option("--bank-deg", o->bank, "bank angle of fixed-wing turns (default 30)")->check(number_in(above_to(0.0, 75.0, "deg")));
  c->add_option("--accel-mps2", o->accel, "stop turns: acceleration and deceleration (default 2)")->check(number_in(above_to(0.0, 50.0, "m/s²")));
  c->add_option("--yaw-rate-dps", o->yaw_rate, "stop turns: hover turn rate (default 45)")->check(number_in(above_to(0.0, 720.0, "deg/s")));
  c->add_option("--home", o->home, "home point LON,LAT (default: the field file's Point with \"role\": \"home\")");
  c->add_option("--loiter-s", o->loiter_s, "a wait over home before the let-down, marked spare")->check(number_in(above_to(0.0, 1e6, "s")));
  c->add_option("--loiter-airspeed-mps", o->loiter_airspeed, "loiter airspeed (fixed wing; default --airspeed-mps)")->check(number_in(speed));
  c->add_option("--loiter-radius-m", o->loiter_radius, "loiter circle radius (fixed wing)")->check(number_in(above_to(0.0, 1e5, "m")));
  c->add_option("--predict", o->predict, "fly the new profile and write the route with per-waypoint predictions and the turn-home point as GeoJSON")
      ->check(output_path());
  c->add_option("--html", o->html, "with --predict: an offline plan view (SVG in HTML) of the route coloured by charge")->check(output_path());
  c->add_flag("--quiet,-q", o->quiet, "print nothing on success");
  c->callback([o, &exit_code] { exit_code = run_route(*o); });
}

}  // namespace sortie::cli
