#pragma once
/// Back-and-forth survey lines over a field polygon, in a local east/north plane (metres).
/// Geometry only: no files, no physics beyond the turn geometry of a banked circle.
#include <optional>
#include <string>
#include <vector>

#include "geo/geodesy.hpp"

namespace sortie::plan {

using geo::Xy;

/// What is wrong with a ring as a field boundary, or nothing: fewer than three distinct
/// vertices, no area, or two edges that cross or touch (other than neighbours at their shared
/// vertex). `bad_vertex` is the index of the first vertex of an offending edge.
struct RingProblem {
  std::string what;
  std::size_t bad_vertex = 0;
};
std::optional<RingProblem> ring_problem(const std::vector<Xy>& ring);

/// Signed area (shoelace formula), m²; positive when counter-clockwise.
double signed_area(const std::vector<Xy>& ring);

/// Convex hull, counter-clockwise (Andrew's monotone chain).
std::vector<Xy> convex_hull(std::vector<Xy> pts);

/// The direction of lines that gives the fewest lines: parallel to the hull edge across which
/// the hull is narrowest (the minimum width of a convex polygon is attained with one side flush
/// to an edge, so trying every hull edge is exact — rotating calipers). Degrees true in [0, 180).
double fewest_lines_direction_deg(const std::vector<Xy>& ring);

/// Width of the ring across lines flown on `direction_deg`, m.
double width_across(const std::vector<Xy>& ring, double direction_deg);

/// Line spacing from the sensor footprint: spacing = 2·h·tan(FOV/2)·(1 − overlap), with the
/// across-track field of view FOV and the side overlap as a fraction (flat ground, camera
/// pointing down: the footprint across the track is 2·h·tan(FOV/2)).
double spacing_from_sensor(double height_m, double fov_deg, double side_overlap);

/// One straight pass over the field: from `a` to `b`.
struct Pass {
  Xy a, b;
  std::size_t line = 0;  ///< index of the line it lies on
};

struct Pattern {
  double direction_deg = 0.0;  ///< line direction, degrees true in [0, 180)
  double spacing_m = 0.0;
  double width_m = 0.0;        ///< field width across the lines
  std::size_t lines = 0;       ///< line count (a line may be cut into several passes)
  std::vector<Pass> passes;    ///< in flying order, alternating direction
};

/// Fraction of a spacing a field may exceed whole spacings by without an extra line: the outer
/// lines then lie up to (1 + kSpacingSlack)·s/2 from the edges.
inline constexpr double kSpacingSlack = 1e-3;

/// Lines on `direction_deg` at `spacing_m`, n = ceil(width / spacing − kSpacingSlack), centred across the field
/// (the first and last lie within half a spacing of the edges). Each line is cut to the inside of
/// the ring (even-odd crossings). The order flies line after line, reversing each time, starting
/// at whichever of the four corners of the pattern gives the shortest time in the wind (`wind`):
/// the transit from home, the passes, the straight steps between them and the transit back, each
/// at its airspeed with its ground speed from the wind triangle; in calm air (or with no
/// airspeed given) the shortest distance. Throws nothing: the caller checks spacing ≤ width and
/// the ring first.
struct OrderWind {
  double airspeed_mps = 0.0;          ///< on the passes and the steps
  double transit_airspeed_mps = 0.0;  ///< from and back to home (0: airspeed_mps)
  double wind_mps = 0.0;
  double wind_from_deg = 0.0;
};
Pattern make_pattern(const std::vector<Xy>& ring, double direction_deg, double spacing_m, const Xy& home,
                     const OrderWind& wind = {});

/// Length of a fixed-wing turn from the end of one pass onto the next, reversed pass, at turn
/// radius r: the passes are `offset_m` apart across the track. Offset ≥ 2r: a quarter circle, the
/// straight rest (offset − 2r) and a quarter circle, π·r + offset − 2r. Offset < 2r: the bulb
/// turn (turn away by β, round by π + 2β, back by β, β = acos((r + offset/2)/(2r))), r·(π + 4β).
/// Both give π·r at offset = 2r; the bulb gives 7π·r/3 at offset 0.
double reversal_turn_length_m(double offset_m, double radius_m);

/// Turn radius of a coordinated level turn, r = V²/(g·tan φ).
double turn_radius_m(double airspeed_mps, double bank_deg);

/// Ground speed on `track_deg` at `airspeed_mps` in a wind of `wind_mps` blowing from
/// `wind_from_deg` (wind triangle: GS = √(V² − Wc²) + Wa, Wc and Wa the wind's cross and along
/// components). Not above zero when the crosswind is at least the airspeed.
double ground_speed_mps(double airspeed_mps, double track_deg, double wind_mps, double wind_from_deg);

}  // namespace sortie::plan
