#include "flight/wind.hpp"

#include <cmath>
#include <cstdio>
#include <numbers>

#include "core/text.hpp"

namespace sortie::flight {

namespace {

constexpr double kDegToRad = std::numbers::pi / 180.0;

}  // namespace

WindComponents wind_components(const Wind& wind, double track_deg) {
  // δ = from − track: a wind from dead ahead (δ = 0) is all headwind, from the right (δ = 90°)
  // all crosswind from the right.
  const double delta = (wind.from_deg - track_deg) * kDegToRad;
  return WindComponents{wind.speed_mps * std::cos(delta), wind.speed_mps * std::sin(delta)};
}

const char* to_string(LegStatus s) {
  switch (s) {
    case LegStatus::ok: return "ok";
    case LegStatus::crosswind_too_strong: return "crosswind_too_strong";
    case LegStatus::no_progress: return "no_progress";
  }
  return "?";
}

Leg solve_leg(const Wind& wind, double track_deg, double airspeed_mps) {
  Leg leg;
  const WindComponents c = wind_components(wind, track_deg);
  leg.airspeed_mps = airspeed_mps;
  leg.head_mps = c.head_mps;
  leg.cross_mps = c.cross_mps;
  if (!(std::fabs(c.cross_mps) < airspeed_mps)) {
    leg.status = LegStatus::crosswind_too_strong;
    leg.detail = "crosswind " + format_fixed(std::fabs(c.cross_mps), 2) + " m/s on track " +
                 format_fixed(track_deg, 0) + " deg is not below the airspeed " + format_fixed(airspeed_mps, 2) +
                 " m/s: no heading holds the track";
    return leg;
  }
  // V·sin β = cross; ground speed = V·cos β − head.
  const double beta = std::asin(c.cross_mps / airspeed_mps);
  leg.correction_deg = beta / kDegToRad;
  double heading = std::fmod(track_deg + leg.correction_deg, 360.0);
  if (heading < 0.0) heading += 360.0;
  leg.heading_deg = heading;
  const double gs = airspeed_mps * std::cos(beta) - c.head_mps;
  if (!(gs > 0.0)) {
    leg.status = LegStatus::no_progress;
    leg.detail = "headwind " + format_fixed(c.head_mps, 2) + " m/s on track " + format_fixed(track_deg, 0) +
                 " deg leaves no ground speed at airspeed " + format_fixed(airspeed_mps, 2) + " m/s (ground speed " +
                 format_fixed(gs, 2) + " m/s)";
    return leg;
  }
  leg.ground_speed_mps = gs;
  return leg;
}

}  // namespace sortie::flight
