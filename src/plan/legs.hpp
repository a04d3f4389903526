#pragma once
/// Phases of a mission from geometry: a route through waypoints, or a survey pattern flown from
/// and back to a home point. Distances and tracks of straight legs are geodesics on WGS 84
/// (GeographicLib); turns come from circle geometry in the local plane.
#include <optional>
#include <string>
#include <vector>

#include "flight/mission.hpp"
#include "geo/geodesy.hpp"
#include "plan/survey.hpp"

namespace sortie::plan {

enum class Turns {
  square,  ///< straight step legs from one pass end to the next start, turns not costed
  bank,    ///< fixed wing: coordinated turns at bank_deg (radius r = V²/(g·tan φ))
  stop     ///< multirotor: decelerate, hover and turn, step across, hover and turn, accelerate
};
const char* to_string(Turns t);

/// How the legs are flown (SI; degrees where named).
struct FlightPlan {
  double height_m = 0.0;             ///< above the field, for vertices without their own height
  double climb_rate_mps = 0.0;
  double climb_airspeed_mps = 0.0;   ///< 0: vertical (multirotor)
  double descent_rate_mps = 0.0;
  double descent_airspeed_mps = 0.0;
  double airspeed_mps = 0.0;         ///< along the route or the survey lines
  double transit_airspeed_mps = 0.0; ///< from and back to the home point
  Turns turns = Turns::square;
  double bank_deg = 30.0;
  double accel_mps2 = 2.0;           ///< stop turns: speeding up and slowing down
  double yaw_rate_deg_s = 45.0;      ///< stop turns: hover turn rate
  std::optional<double> loiter_s;    ///< a loiter over home before the let-down, marked spare
  double loiter_airspeed_mps = 0.0;  ///< 0: a hover (multirotor)
  std::optional<double> loiter_radius_m;
};

/// A phase with where it ends (for the route out and the plan view).
struct PlannedPhase {
  flight::Phase phase;
  geo::LonLat end;
};

struct RoutePoint {
  geo::LonLat at;
  std::optional<double> height_m;
};

/// Take off at the first point, climb to its height, then for each leg climb or descend to the
/// next point's height at the leg's start and cruise the leg's geodesic distance on its initial
/// azimuth (over a few km the azimuth turns by well under 0.1°); descend to the ground at the
/// last point (the landing point: its own height is not flown). The ground covered while climbing is not taken off the leg (a longer flight).
std::vector<PlannedPhase> route_phases(const std::vector<RoutePoint>& pts, const FlightPlan& fp);

/// Climb over home, transit to the first pass, the passes with their turns, transit back,
/// the loiter if asked, and the let-down over home. `plane` is the plane the pattern lies in.
std::vector<PlannedPhase> survey_phases(const Pattern& pat, const geo::LocalPlane& plane, const geo::LonLat& home,
                                        const FlightPlan& fp);

}  // namespace sortie::plan
