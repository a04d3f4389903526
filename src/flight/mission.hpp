#pragma once
/// A mission as the planner writes it: phases flown in order and the reserve rules that must
/// hold (docs/formats.md "Profile"). Plain data, SI.
#include <optional>
#include <string>
#include <vector>

namespace sortie::flight {

/// One phase. Which fields matter depends on the kind:
///   climb / descend: to_height_m at rate_mps (vertical speed, positive), optional airspeed_mps
///                    (fixed-wing climbs and glides along a path; multirotors climb vertically)
///   cruise:          distance_m over the ground (or duration_s) at airspeed_mps on track_deg
///   hover:           duration_s (multirotor only)
///   loiter:          duration_s at airspeed_mps (circling: no net wind drift)
/// Cruise and loiter may give their airspeed as a keyword (best_endurance, best_range: solved by
/// sim/best_speeds.hpp for the mission's airframe, drive and pack) and, for a fixed wing, a
/// bank angle or turn radius (a coordinated level turn). A fixed-wing descent steeper than the
/// idle glide needs drag_device.
struct Phase {
  enum class Kind { climb, cruise, hover, loiter, descend };
  Kind kind = Kind::hover;
  std::string label;                   ///< optional name shown in reports
  double to_height_m = 0.0;            ///< height above the field at the end, m
  double rate_mps = 0.0;               ///< vertical speed, m/s (> 0)
  std::optional<double> distance_m;    ///< ground distance, m
  std::optional<double> duration_s;    ///< s
  double airspeed_mps = 0.0;           ///< true airspeed, m/s
  double track_deg = 0.0;              ///< ground track, degrees true
  bool spare = false;                  ///< the phase the spare-time solve lengthens
  /// Where the airspeed comes from: the number airspeed_mps, or a best speed solved for it.
  enum class Speed { given, best_endurance, best_range };
  Speed airspeed_choice = Speed::given;
  double bank_deg = 0.0;               ///< bank angle of a coordinated turn, degrees (fixed wing)
  std::optional<double> turn_radius_m; ///< or the turn's radius, m (fixed wing)
  bool drag_device = false;            ///< a fixed-wing descent may be steeper than the idle glide
};

const char* to_string(Phase::Speed s);

/// Load factor n = 1/cos φ of a phase's coordinated turn at airspeed V: φ from bank_deg, or for
/// a turn radius r, φ = atan(V²/(g·r)) (r = V²/(g·tan φ)); 1 when it flies straight.
double turn_load_factor(const Phase& p, double airspeed_mps);

const char* to_string(Phase::Kind k);

/// Thrust-to-weight a multirotor needs at least: 2:1 is common practice for a frame that must
/// hold position in gusts and climb away (aerobatic frames use far more).
inline constexpr double kDefaultThrustToWeightMin = 2.0;
/// Highest hover duty: 0.80 leaves a fifth of the duty range for control and gusts (common
/// practice; a hover near mid-throttle is the usual design aim).
inline constexpr double kDefaultHoverDutyMax = 0.80;

/// Reserve rules; an absent rule is not checked (the two multirotor limits below take their
/// defaults instead).
struct Reserve {
  std::optional<double> soc_min;             ///< state of charge at landing, 0..1
  std::optional<double> hover_s;             ///< time on station still available at landing, s
  std::optional<double> v_rest_cell_min_V;   ///< resting cell voltage at landing, V
  std::optional<double> v_load_cell_min_V;   ///< loaded cell voltage never crossed in flight, V
  /// Multirotor: the drive's full-duty static thrust at the loaded take-off voltage over the
  /// weight (none: kDefaultThrustToWeightMin).
  std::optional<double> thrust_to_weight_min;
  /// Multirotor: highest duty in a hover, 0..1 (none: kDefaultHoverDutyMax).
  std::optional<double> hover_duty_max;
};

}  // namespace sortie::flight
