// Steady wind: components on a track and the wind triangle.
#include "flight/wind.hpp"

#include <doctest/doctest.h>

#include <cmath>
#include <numbers>

using namespace sortie::flight;

namespace {

constexpr double kRad = std::numbers::pi / 180.0;

struct Vec {
  double north, east;
};

/// A velocity toward `to_deg` true at `speed`.
Vec toward(double to_deg, double speed) {
  return {speed * std::cos(to_deg * kRad), speed * std::sin(to_deg * kRad)};
}

}  // namespace

TEST_SUITE("flight") {

TEST_CASE("head and cross components on a few tracks") {
  // Resolving a vector on the track (plane trigonometry): head = w·cos(from − track),
  // cross = w·sin(from − track), positive from the right.
  const Wind w{5.0, 90.0};  // from the east
  auto c = wind_components(w, 90.0);  // flying east, into it
  CHECK(c.head_mps == doctest::Approx(5.0));
  CHECK(c.cross_mps == doctest::Approx(0.0).epsilon(1e-12).scale(5.0));
  c = wind_components(w, 270.0);  // flying west: tailwind
  CHECK(c.head_mps == doctest::Approx(-5.0));
  c = wind_components(w, 0.0);  // flying north: from the right
  CHECK(c.head_mps == doctest::Approx(0.0).scale(5.0));
  CHECK(c.cross_mps == doctest::Approx(5.0));
  c = wind_components(w, 180.0);  // flying south: from the left
  CHECK(c.cross_mps == doctest::Approx(-5.0));
  // 45° off the nose: both components w/√2.
  c = wind_components(Wind{10.0, 45.0}, 360.0);
  CHECK(c.head_mps == doctest::Approx(10.0 / std::sqrt(2.0)));
  CHECK(c.cross_mps == doctest::Approx(10.0 / std::sqrt(2.0)));
}

TEST_CASE("a headwind w on the track leaves ground speed V - w and a tailwind V + w") {
  const double V = 12.0, w = 4.0;
  const Leg into = solve_leg(Wind{w, 250.0}, 250.0, V);
  REQUIRE(into.status == LegStatus::ok);
  CHECK(into.ground_speed_mps == doctest::Approx(V - w));
  CHECK(into.correction_deg == doctest::Approx(0.0).scale(1.0));
  const Leg with = solve_leg(Wind{w, 250.0}, 70.0, V);
  REQUIRE(with.status == LegStatus::ok);
  CHECK(with.ground_speed_mps == doctest::Approx(V + w));
  CHECK(solve_leg(Wind{0.0, 0.0}, 123.0, V).ground_speed_mps == doctest::Approx(V));
}

TEST_CASE("a pure crosswind: ground speed sqrt(V^2 - c^2) and crab angle asin(c/V)") {
  // Right triangle of air and wind vectors (closed form).
  const double V = 10.0, c = 6.0;
  const Leg leg = solve_leg(Wind{c, 90.0}, 0.0, V);
  REQUIRE(leg.status == LegStatus::ok);
  CHECK(leg.ground_speed_mps == doctest::Approx(8.0));
  CHECK(leg.correction_deg == doctest::Approx(std::asin(0.6) / kRad));
  CHECK(leg.heading_deg == doctest::Approx(std::asin(0.6) / kRad));  // crabbed right, into it
  // From the left on a northerly track the heading is just west of north.
  const Leg left = solve_leg(Wind{c, 270.0}, 0.0, V);
  CHECK(left.heading_deg == doctest::Approx(360.0 - std::asin(0.6) / kRad));
}

TEST_CASE("the wind triangle closes: air vector + wind vector = ground vector on the track") {
  // Vector sum in north/east components for oblique winds on several tracks.
  const double V = 15.0;
  for (double from : {0.0, 37.0, 135.0, 250.0, 301.0}) {
    for (double track : {0.0, 90.0, 200.0, 333.0}) {
      CAPTURE(from);
      CAPTURE(track);
      const Wind w{6.5, from};
      const Leg leg = solve_leg(w, track, V);
      REQUIRE(leg.status == LegStatus::ok);
      const Vec air = toward(leg.heading_deg, V);
      const Vec wind = toward(from + 180.0, w.speed_mps);  // blows toward the opposite side
      const Vec ground = toward(track, leg.ground_speed_mps);
      CHECK(air.north + wind.north == doctest::Approx(ground.north).scale(V));
      CHECK(air.east + wind.east == doctest::Approx(ground.east).scale(V));
    }
  }
}

TEST_CASE("legs the aircraft cannot fly are refused as a status") {
  const Leg cross = solve_leg(Wind{10.0, 90.0}, 0.0, 10.0);
  CHECK(cross.status == LegStatus::crosswind_too_strong);
  CHECK(cross.detail.find("crosswind 10.00 m/s") != std::string::npos);
  const Leg head = solve_leg(Wind{12.0, 0.0}, 0.0, 10.0);
  CHECK(head.status == LegStatus::no_progress);
  CHECK(head.detail.find("headwind 12.00 m/s") != std::string::npos);
  // Oblique: cross 6 < V = 8 but √(64 − 36) = 5.29 < head 8·... → no progress.
  const double w = 10.0, delta = std::atan2(6.0, 8.0);  // head 8, cross 6
  const Leg oblique = solve_leg(Wind{w, delta / kRad}, 0.0, 8.0);
  CHECK(oblique.status == LegStatus::no_progress);
}

}  // TEST_SUITE
