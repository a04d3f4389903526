#pragma once
/// Steady wind and the wind triangle of one leg flown on a track at a true airspeed.
#include <string>

namespace sortie::flight {

/// A steady, horizontal wind of the same speed and direction at every height.
struct Wind {
  double speed_mps = 0.0;  ///< m/s
  double from_deg = 0.0;   ///< direction it blows from, degrees true (0 = from the north)
};

/// The wind resolved on a track.
struct WindComponents {
  double head_mps = 0.0;   ///< along the track against the aircraft; negative is a tailwind
  double cross_mps = 0.0;  ///< across the track; positive blows from the right of the track
};

/// Head and cross components for a track (degrees true), with δ = from − track:
///   head = w·cos δ,  cross = w·sin δ
WindComponents wind_components(const Wind& wind, double track_deg);

enum class LegStatus {
  ok,
  crosswind_too_strong,  ///< |cross| ≥ airspeed: no heading holds the track
  no_progress,           ///< the ground speed along the track is not positive
};
const char* to_string(LegStatus s);

/// One leg: how the aircraft heads to hold the track, and how fast it moves along it.
struct Leg {
  LegStatus status = LegStatus::ok;
  std::string detail;               ///< why a leg is refused, with the numbers; empty when ok
  double airspeed_mps = 0.0;        ///< true airspeed, m/s
  double head_mps = 0.0;
  double cross_mps = 0.0;
  double correction_deg = 0.0;      ///< heading − track, degrees (positive: into a wind from the right)
  double heading_deg = 0.0;         ///< degrees true, 0 ≤ heading < 360
  double ground_speed_mps = 0.0;    ///< along the track, m/s (set only when ok)
};

/// The wind triangle: air vector + wind vector = ground vector along the track. The aircraft
/// crabs by the correction angle β with V·sin β = cross, so
///   ground speed = V·cos β − head = √(V² − cross²) − head
/// Refused (as a status, not an exception) when |cross| ≥ V or the ground speed is ≤ 0.
Leg solve_leg(const Wind& wind, double track_deg, double airspeed_mps);

}  // namespace sortie::flight
