// Survey lines over fields in the plane: line counts of rectangles and an L-shaped field worked
// out by hand, coverage and side overlap measured on a raster, and turn lengths against circle
// geometry.
#include "plan/survey.hpp"

#include <doctest/doctest.h>

#include <cmath>
#include <numbers>
#include <vector>

#include "plan/legs.hpp"

using namespace sortie::plan;

namespace {

std::vector<Xy> rect(double w, double h, double rot_deg = 0.0) {
  // w east, h north, turned clockwise by rot_deg about the origin.
  const double a = rot_deg * std::numbers::pi / 180.0;
  std::vector<Xy> r;
  for (const Xy& p : std::vector<Xy>{{0, 0}, {w, 0}, {w, h}, {0, h}})
    r.push_back({p.x * std::cos(a) + p.y * std::sin(a), -p.x * std::sin(a) + p.y * std::cos(a)});
  return r;
}

// An L: 600 m along the bottom, 200 m deep, and a 200 m wide arm up to 800 m.
const std::vector<Xy> kL{{0, 0}, {600, 0}, {600, 200}, {200, 200}, {200, 800}, {0, 800}};

bool inside(const std::vector<Xy>& ring, const Xy& p) {  // even-odd rule, written again here
  bool in = false;
  for (std::size_t i = 0, j = ring.size() - 1; i < ring.size(); j = i++)
    if ((ring[i].y > p.y) != (ring[j].y > p.y) &&
        p.x < (ring[j].x - ring[i].x) * (p.y - ring[i].y) / (ring[j].y - ring[i].y) + ring[i].x)
      in = !in;
  return in;
}

/// In swath of `ps` with footprint width `f`: within f/2 of the pass across, inside its length.
bool in_swath(const Pass& ps, double f, const Xy& p) {
  const double len = std::hypot(ps.b.x - ps.a.x, ps.b.y - ps.a.y);
  const double ux = (ps.b.x - ps.a.x) / len, uy = (ps.b.y - ps.a.y) / len;
  const double along = (p.x - ps.a.x) * ux + (p.y - ps.a.y) * uy;
  const double across = -(p.x - ps.a.x) * uy + (p.y - ps.a.y) * ux;
  return along >= 0.0 && along <= len && std::abs(across) <= 0.5 * f;
}

struct Coverage {
  double covered = 0.0;       ///< share of the field's cells under at least one swath
  double min_overlap = 1.0;   ///< smallest share of a swath also under its neighbour's swath
};

/// Rasterise at `cell` metres: field cells, swath cells, overlaps between neighbouring lines.
Coverage raster(const std::vector<Xy>& ring, const Pattern& pat, double footprint, double cell) {
  double x0 = 1e18, x1 = -1e18, y0 = 1e18, y1 = -1e18;
  for (const Xy& p : ring) x0 = std::min(x0, p.x), x1 = std::max(x1, p.x), y0 = std::min(y0, p.y), y1 = std::max(y1, p.y);
  std::size_t field = 0, covered = 0;
  std::vector<std::size_t> own(pat.passes.size(), 0), shared(pat.passes.size(), 0);
  // The grid reaches a footprint beyond the field: a swath's overlap with its neighbour is a
  // property of the two swaths, counted also where they hang over the field's edge.
  for (double x = x0 - footprint + 0.5 * cell; x < x1 + footprint; x += cell)
    for (double y = y0 - footprint + 0.5 * cell; y < y1 + footprint; y += cell) {
      const Xy p{x, y};
      const bool in_field = inside(ring, p);
      if (in_field) ++field;
      bool any = false;
      for (std::size_t i = 0; i < pat.passes.size(); ++i) {
        if (!in_swath(pat.passes[i], footprint, p)) continue;
        any = true;
        for (std::size_t j = 0; j < pat.passes.size(); ++j) {
          if (pat.passes[j].line != pat.passes[i].line + 1) continue;
          if (!in_swath(pat.passes[j], 1e9, p)) continue;  // alongside the neighbour pass
          ++own[i];
          if (in_swath(pat.passes[j], footprint, p)) ++shared[i];
        }
      }
      if (any && in_field) ++covered;
    }
  Coverage c;
  c.covered = static_cast<double>(covered) / static_cast<double>(field);
  for (std::size_t i = 0; i < own.size(); ++i) {
    if (own[i] > 0) c.min_overlap = std::min(c.min_overlap, static_cast<double>(shared[i]) / static_cast<double>(own[i]));
  }
  return c;
}

}  // namespace

TEST_CASE("survey: line counts of rectangles are ceil(width / spacing) across the narrow side") {
  // 1000 m by 400 m, 100 m apart: lines run along the 1000 m side, 400/100 = 4 lines; 450 m deep
  // needs 5 (ceil 4.5). Turned by 30°, the same counts and the line direction turns with it.
  CHECK(fewest_lines_direction_deg(rect(1000, 400)) == doctest::Approx(90.0));
  CHECK(make_pattern(rect(1000, 400), 90.0, 100.0, {0, 0}).lines == 4);
  const Pattern five = make_pattern(rect(1000, 450), 90.0, 100.0, {0, 0});
  CHECK(five.lines == 5);
  // Centred: (450 − 4·100)/2 = 25 m inside each long edge (y = 25 … 425).
  double ymin = 1e9, ymax = -1e9;
  for (const auto& ps : five.passes) ymin = std::min(ymin, ps.a.y), ymax = std::max(ymax, ps.a.y);
  CHECK(ymin == doctest::Approx(25.0));
  CHECK(ymax == doctest::Approx(425.0));
  const auto turned = rect(1000, 400, 30.0);
  const double dir = fewest_lines_direction_deg(turned);
  CHECK(dir == doctest::Approx(120.0));
  const Pattern p = make_pattern(turned, dir, 100.0, {0, 0});
  CHECK(p.lines == 4);
  CHECK(p.passes.size() == 4);
  for (const auto& ps : p.passes) CHECK(std::hypot(ps.b.x - ps.a.x, ps.b.y - ps.a.y) == doctest::Approx(1000.0));
  // Lines centred: the first and last lie 50 m inside the long edges.
  CHECK(p.width_m == doctest::Approx(400.0));
}

TEST_CASE("survey: an L-shaped field worked out by hand") {
  // Hull of the L: widths across its edges are 800 (bottom, top), 600 (left, right) and
  // 610.2 m (the diagonal from (600, 200) to (200, 800)): the narrowest is 600 m across the
  // north-south edges, so lines run north-south: ceil(600/100) = 6 lines at x = 50 … 550,
  // two of them 800 m long (x < 200) and four 200 m long.
  const double dir = fewest_lines_direction_deg(kL);
  CHECK(dir == doctest::Approx(0.0));
  const Pattern p = make_pattern(kL, dir, 100.0, {0, 0});
  CHECK(p.lines == 6);
  REQUIRE(p.passes.size() == 6);
  int long_ones = 0;
  for (const auto& ps : p.passes) {
    const double len = std::hypot(ps.b.x - ps.a.x, ps.b.y - ps.a.y);
    const bool known = len == doctest::Approx(800.0) || len == doctest::Approx(200.0);
    CHECK(known);
    if (len > 500) ++long_ones;
  }
  CHECK(long_ones == 2);
  // East-west lines: 8 lines (800/100), two 600 m long (y < 200) and six 200 m.
  const Pattern q = make_pattern(kL, 90.0, 100.0, {0, 0});
  CHECK(q.lines == 8);
  CHECK(q.passes.size() == 8);
  // A U (two arms) cut by east-west lines: the lines across the arms fly as two passes each.
  const std::vector<Xy> u{{0, 0}, {600, 0}, {600, 600}, {400, 600}, {400, 200}, {200, 200}, {200, 600}, {0, 600}};
  const Pattern w = make_pattern(u, 90.0, 100.0, {0, 0});
  CHECK(w.lines == 6);
  CHECK(w.passes.size() == 2 + 4 * 2);
}

TEST_CASE("survey: the swaths cover the field with at least the asked side overlap (raster)") {
  // spacing = 2·h·tan(FOV/2)·(1 − overlap); footprint F = 2·h·tan(FOV/2), so neighbouring
  // swaths share F − s = overlap·F. Measured on a 1 m raster: the share can fall short of the
  // asked value by a cell at each swath edge, 2 m of a 100 m footprint.
  const double h = 80.0, fov = 64.0, ov = 0.6;
  const double footprint = 2.0 * h * std::tan(fov / 2.0 * std::numbers::pi / 180.0);
  const double s = spacing_from_sensor(h, fov, ov);
  CHECK(s == doctest::Approx(footprint * (1.0 - ov)));
  for (const auto& field : {rect(900, 430), rect(700, 380, 25.0), kL}) {
    const Pattern p = make_pattern(field, fewest_lines_direction_deg(field), s, {0, 0});
    const Coverage c = raster(field, p, footprint, 1.0);
    CHECK(c.covered >= 0.9999);
    INFO("field of " << field.size() << " vertices, " << p.lines << " lines, " << p.passes.size() << " passes");
    CHECK(c.min_overlap >= ov - 2.0 / footprint);
  }
}

TEST_CASE("survey: fixed-wing reversal turns against circle geometry") {
  // r = V²/(g·tan φ): 15 m/s at 30° bank, 225 / (9.80665 · tan 30°) = 39.74 m.
  const double r = turn_radius_m(15.0, 30.0);
  CHECK(r == doctest::Approx(225.0 / (9.80665 * std::tan(std::numbers::pi / 6.0))));
  // Lines 2r apart: a half circle, π·r. Farther apart: two quarter circles and the straight rest.
  CHECK(reversal_turn_length_m(2.0 * r, r) == doctest::Approx(std::numbers::pi * r));
  CHECK(reversal_turn_length_m(3.0 * r, r) == doctest::Approx(std::numbers::pi * r + r));
  // Closer than 2r: the bulb turn; at offset 0, three arcs of 60° + 300° + 60° = 420°: 7π·r/3.
  CHECK(reversal_turn_length_m(0.0, r) == doctest::Approx(7.0 * std::numbers::pi * r / 3.0));
  // And continuous at 2r from below (β grows as √(offset shortfall), so the step is small).
  CHECK(reversal_turn_length_m(2.0 * r - 1e-10, r) == doctest::Approx(std::numbers::pi * r).epsilon(1e-5));
}

TEST_CASE("survey: a banked pattern's phases add the circle-geometry turn distance") {
  const sortie::geo::LonLat home{8.61, 46.31};
  const sortie::geo::LocalPlane plane(home);
  const auto field = rect(1000, 500);
  const Pattern p = make_pattern(field, 0.0, 125.0, {0, 0});
  REQUIRE(p.lines == 8);
  FlightPlan fp;
  fp.height_m = 100;
  fp.climb_rate_mps = 2;
  fp.climb_airspeed_mps = 14;
  fp.descent_rate_mps = 1;
  fp.descent_airspeed_mps = 14;
  fp.airspeed_mps = 15;
  fp.transit_airspeed_mps = 15;
  fp.turns = Turns::bank;
  fp.bank_deg = 30;
  const double r = turn_radius_m(15.0, 30.0);  // 39.7 m: 125 m ≥ 2r, quarter–straight–quarter
  double turn = 0.0, lines = 0.0;
  for (const auto& ph : survey_phases(p, plane, home, fp)) {
    if (!ph.phase.distance_m) continue;
    if (ph.phase.label.rfind("turn", 0) == 0) turn += *ph.phase.distance_m;
    if (ph.phase.label.rfind("line", 0) == 0) lines += *ph.phase.distance_m;
  }
  CHECK(turn == doctest::Approx(7.0 * (std::numbers::pi * r + 125.0 - 2.0 * r)).epsilon(1e-6));
  CHECK(lines == doctest::Approx(8 * 500.0).epsilon(1e-5));  // plane vs ellipsoid: ppm
}

TEST_CASE("survey: rings that cannot bound a field") {
  CHECK(ring_problem(rect(100, 50)) == std::nullopt);
  CHECK(ring_problem(kL) == std::nullopt);
  const std::vector<Xy> bowtie{{0, 0}, {100, 100}, {100, 0}, {0, 100}};
  REQUIRE(ring_problem(bowtie));
  CHECK(ring_problem(bowtie)->what.find("crosses") != std::string::npos);
  const std::vector<Xy> flat{{0, 0}, {100, 0}, {200, 0}};
  CHECK(ring_problem(flat));
  const std::vector<Xy> two{{0, 0}, {100, 0}};
  CHECK(ring_problem(two));
}

TEST_CASE("survey: ground speed in the wind triangle") {
  // 15 m/s into a 6 m/s headwind: 9; with it: 21; across it: √(15² − 6²) = 13.75.
  CHECK(ground_speed_mps(15, 270, 6, 270) == doctest::Approx(9.0));
  CHECK(ground_speed_mps(15, 90, 6, 270) == doctest::Approx(21.0));
  CHECK(ground_speed_mps(15, 0, 6, 270) == doctest::Approx(std::sqrt(225.0 - 36.0)));
}

TEST_CASE("survey: multirotor stop turns slow down and hover-turn and speed up with kinematics of constant acceleration") {
  // Rest to rest at a = 2 m/s² and V = 10 m/s: each ramp covers V²/(2a) = 25 m at the mean speed
  // V/2 (Newton's constant-acceleration kinematics); a 90° hover turn at 45 °/s lasts 2 s.
  const sortie::geo::LonLat home{8.61, 46.31};
  const sortie::geo::LocalPlane plane(home);
  const Pattern p = make_pattern(rect(400, 300), 0.0, 100.0, {0, 0});
  REQUIRE(p.lines == 4);
  FlightPlan fp;
  fp.height_m = 60;
  fp.climb_rate_mps = 2;
  fp.descent_rate_mps = 1.5;
  fp.airspeed_mps = 10;
  fp.transit_airspeed_mps = 10;
  fp.turns = Turns::stop;
  fp.accel_mps2 = 2.0;
  fp.yaw_rate_deg_s = 45.0;
  int hovers = 0, ramps = 0;
  double on_lines = 0.0, steps = 0.0;
  for (const auto& ph : survey_phases(p, plane, home, fp)) {
    const auto& q = ph.phase;
    if (q.kind == sortie::flight::Phase::Kind::hover) {
      ++hovers;
      CHECK(*q.duration_s == doctest::Approx(2.0));
    }
    if (q.label.find("speed up") != std::string::npos || q.label.find("slow down") != std::string::npos) {
      ++ramps;
      CHECK(*q.distance_m == doctest::Approx(25.0));
      CHECK(q.airspeed_mps == doctest::Approx(5.0));
    }
    if (q.distance_m && q.label.rfind("line", 0) == 0) on_lines += *q.distance_m;
    if (q.distance_m && q.label.rfind("step", 0) == 0) steps += *q.distance_m;
  }
  CHECK(hovers == 2 * 3);            // two hover turns at each of the 3 reversals
  CHECK(ramps == 2 * (4 + 3));       // each line and each 100 m step from rest to rest
  CHECK(on_lines == doctest::Approx(4 * 300.0).epsilon(1e-5));
  CHECK(steps == doctest::Approx(3 * 100.0).epsilon(1e-5));
}
