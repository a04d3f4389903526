#pragma once
/// The turn-home point: for each phase of the planned mission, the latest moment at which the
/// crew can break off, fly home and land with every length-dependent rule still met.
///
/// "Home" is defined from the profile:
/// - the aircraft's ground position follows the cruise legs (ground speed from the wind triangle
///   along each leg's track); climbs, descents, hovers and loiters stay over their point;
/// - from the point reached, home is a straight cruise to the start point at the airspeed of
///   the profile's last cruise leg (its wind triangle on the track home, at the height reached),
///   then a descent to the field at the rate (and, fixed wing, the airspeed) of the profile's
///   last descent; the ground a fixed-wing glide covers is not taken off the cruise home;
/// - less than 1 m from the start point there is no cruise home, and on the ground no descent.
/// The return is flown by the same simulation as the mission (sim::simulate), so the rules are
/// judged exactly as for the plan.
#include <optional>
#include <string>
#include <vector>

#include "sim/mission.hpp"

namespace sortie::sim {

/// The mission flown as planned up to `tau_s` into phase `i` (which may run past its planned end
/// when it is a hover or loiter), then home as defined above. `with_home` false: only the part
/// up to the turn (its landing state is the state at the turn).
Mission turn_home_mission(const Mission& m, std::size_t i, double tau_s, bool with_home = true);

/// The pack's state at a moment of the flight.
struct FlightState {
  double t_s = 0.0;             ///< from take-off
  double soc = 0.0;
  double v_load_cell_V = 0.0;   ///< loaded cell voltage
  double v_rest_cell_V = 0.0;   ///< resting (open-circuit) cell voltage at that charge
};

struct TurnHomePhase {
  std::size_t phase = 0;
  /// The latest time into the phase (s from its start) to turn home; none: turning home already
  /// fails at the phase's start.
  std::optional<double> latest_in_phase_s;
  std::optional<FlightState> at;     ///< the state at that moment
  bool whole_phase = false;          ///< turning home at the planned end still holds
  bool beyond_plan = false;          ///< a hover or loiter that could last longer than planned
  bool capped = false;               ///< the search stopped at TurnHomeOptions::max_extra_s
  std::string binding_rule;          ///< the rule that fails just after it
};

struct TurnHome {
  std::vector<TurnHomePhase> phases;
  /// The first moment in the plan after which turning home fails (none: turning home holds at
  /// every moment of the plan).
  std::optional<FlightState> point;
  std::optional<std::size_t> point_phase;
  std::string binding_rule;
  double home_airspeed_mps = 0.0;    ///< 0: no cruise leg in the profile
  double home_descent_mps = 0.0;     ///< 0: no descent in the profile
  int simulations = 0;
};

struct TurnHomeOptions {
  /// Whole-mission simulations at most over all phases (LimitError beyond).
  int max_simulations = 600;
  /// Longest time a hover or loiter is searched past its planned end, s; reached with every
  /// rule held, the phase reports `capped`.
  double max_extra_s = 1e5;
  double time_tol_s = 0.05;
  SimOptions sim;
};

/// The turn-home point of each phase by TOMS 748 on the smallest rule margin of the mission
/// with the return inserted (sim::smallest_margin).
TurnHome solve_turn_home(const Mission& m, const TurnHomeOptions& opts = {});

}  // namespace sortie::sim
