#pragma once
/// Fly a whole mission phase by phase: the airframe's thrust need in the air of each phase, the
/// drive's operating point for it, and the pack's Thevenin ODE under the bus power that point
/// draws, P(V) = a + b·V (the ESC's switching loss grows with bus voltage). Events and reserve
/// crossings are located on the dense output; the rules are checked at landing.
#include <functional>
#include <limits>
#include <optional>
#include <string>
#include <vector>

#include "battery/pack.hpp"
#include "flight/airframe.hpp"
#include "flight/environment.hpp"
#include "flight/fixed_wing.hpp"
#include "flight/mission.hpp"
#include "plan/mission.hpp"
#include "propulsion/drive.hpp"
#include "sim/best_speeds.hpp"
#include "sim/model_range.hpp"
#include "sim/outcome.hpp"
#include "sim/segment.hpp"

namespace sortie::sim {

/// Everything one flight needs (plan/mission.hpp).
using plan::Mission;

struct SimOptions {
  double sample_s = 0.0;  ///< trace spacing, s (0: no trace)
  /// Largest height change integrated with one air density in a climb or descent, m.
  double max_height_step_m = 100.0;
  /// Integration steps of one phase over all its stretches, and of the reserve-time run at
  /// landing (LimitError naming the phase beyond).
  std::size_t max_steps_per_phase = 100000;
  std::size_t max_trace_samples = 1000000;  ///< trace points of the whole flight (LimitError beyond)
  /// End the flight where the SoC falls to the lowest SoC the cell model rests on data for
  /// (battery::Cell::soc_floor_covered), as end kind coverage_floor.
  bool stop_at_coverage = false;
  /// Let the verdict rest on the model below that floor: without it the landing SoC must stay
  /// at or above the floor (rule soc_covered) and the time on station left at landing is
  /// counted down to the floor only.
  bool accept_extrapolation = false;
  /// The pack's stepper (SegmentOptions::Method) and its tolerances: the exponential stepper at
  /// 1e-9 by default; Dormand–Prince at a tighter tolerance is the reference the tests hold it to.
  SegmentOptions::Method method = SegmentOptions::Method::exponential;
  double tol = 1e-9;
};

struct PhaseSummary {
  flight::Phase::Kind kind{};
  std::string label;
  double start_s = 0.0;
  double duration_s = 0.0;       ///< as flown (shorter than planned when the flight ended in it)
  double planned_s = 0.0;        ///< as planned
  double distance_m = 0.0;       ///< over the ground
  double height_start_m = 0.0, height_end_m = 0.0;
  double airspeed_mps = 0.0;
  double ground_speed_mps = 0.0; ///< cruise only
  double heading_deg = 0.0;      ///< cruise only
  double density_kg_m3 = 0.0;    ///< at the phase's middle height
  double thrust_per_rotor_N = 0.0;
  double shaft_W = 0.0;          ///< per rotor
  double energy_Wh = 0.0;        ///< out of the pack
  double charge_Ah = 0.0;
  double v_min_cell_V = 0.0;     ///< lowest loaded cell voltage
  double i_max_A = 0.0;          ///< highest pack current
  double c_rate_max = 0.0;       ///< i_max / rated pack capacity (1/h)
  double duty_mean = 0.0;        ///< time mean
  double duty_max = 0.0;
  double eta_mean = 0.0;         ///< shaft energy / drive energy (motor × ESC)
  double eta_esc_mean = 0.0;     ///< motor input energy / drive energy
  bool flown = false;            ///< reached its end
};

struct MissionEvent {
  double t_s = 0.0;
  std::string kind;
  int phase = -1;  ///< index into the phases, -1 after landing
  std::string detail;
};

/// One rule of the verdict: a reserve at landing or a limit in flight. Every failing rule makes
/// the verdict no-go.
struct RuleCheck {
  std::string name;
  std::string unit;
  double required = 0.0;  ///< the limit: a minimum, or a maximum when is_max
  double actual = 0.0;    ///< the value reached (the worst over the flight for a limit in flight)
  /// Room left in the rule's unit, positive when it holds: actual − required for a minimum,
  /// required − actual for a maximum.
  double margin = 0.0;
  bool pass = false;
  bool is_max = false;
  /// False when the flight ended before the value exists (a landing rule of a flight that ended
  /// early): `actual` is then meaningless and reports show "not reached".
  bool reached = true;
  /// Where the value was reached: time from take-off and phase index (-1: at landing).
  double t_s = 0.0;
  int phase = -1;
  /// Depends on the mission's length (spare and turn-home solves move it); false for limits set
  /// by the aircraft alone (take-off mass, thrust-to-weight, motor and ESC current).
  bool length_dependent = true;
  std::string note;  ///< how the limit was set, or what is not checked
};

/// One trace row: the pack sample and what the drive did.
struct TracePoint {
  Sample s;
  int phase = 0;
  double duty = 0.0;
  double thrust_N = 0.0;  ///< per rotor
  double height_m = 0.0;
};

struct Landing {
  double soc = 0.0;
  double energy_Wh = 0.0;     ///< open-circuit energy left (S·Q·∫₀^SoC OCV), Wh
  double v_rest_cell_V = 0.0; ///< relaxed: OCV(SoC) per cell
  double v_load_cell_V = 0.0; ///< loaded at touchdown
  double temperature_C = 0.0; ///< cell temperature at touchdown (the start's without a thermal model)
};

struct MissionResult {
  bool completed = false;       ///< every phase flown to its end
  std::optional<EndKind> end_kind;  ///< when not completed
  std::string end_detail;
  int end_phase = -1;
  bool refused = false;         ///< a phase asks for something the airframe or drive cannot do
  std::string refusal_field;    ///< for a refusal: the phase field at fault (e.g. airspeed_mps)
  double flight_time_s = 0.0;
  double pack_mass_kg = 0.0;
  double all_up_mass_kg = 0.0;
  double energy_Wh = 0.0, charge_Ah = 0.0;
  double v_min_cell_V = 0.0;
  double i_max_A = 0.0, c_rate_max = 0.0;
  double duty_mean = 0.0;       ///< time mean over the flight
  double eta_esc_mean = 0.0;    ///< energy-weighted over the flight
  double eta_mean = 0.0;
  bool thermal = false;         ///< the cell has a thermal model
  double temperature_start_C = 0.0, temperature_max_C = 0.0, air_C = 0.0;  ///< cell, cell, air
  Landing landing;
  double reserve_time_s = 0.0;  ///< time on station left at landing (hover or loiter), s
  /// What ended that time on station: the loaded voltage floor (cutoff_voltage), saturation,
  /// power_collapse, soc_floor or coverage_floor; refused when the hold cannot be flown
  /// (reserve_time_refusal says why); none when not computed.
  std::optional<EndKind> reserve_time_end;
  std::string reserve_time_refusal;
  double v_load_end_cell_V = 0.0;  ///< loaded cell voltage at the end of the flight, V
  /// Fixed wing only: stall, minimum-power and maximum-L/D speeds at the all-up mass in the
  /// air at the field.
  std::optional<flight::WingSpeeds> wing_speeds;
  /// Best-endurance and best-range airspeeds by the whole power model (sim/best_speeds.hpp) at
  /// the field, in calm air, and for range into the profile's wind as a headwind. Filled by the
  /// caller that shows them (best_speeds is a search of its own, not part of a simulation).
  std::optional<BestSpeeds> best_speeds, best_speeds_headwind;
  std::vector<PhaseSummary> phases;
  std::vector<MissionEvent> events;
  std::vector<RuleCheck> rules;
  double soc_floor_covered = 0.0;     ///< battery::Cell::soc_floor_covered of the pack's cell
  std::vector<Excursion> excursions;  ///< where the flight left the model's range
  bool accept_extrapolation = false;  ///< SimOptions::accept_extrapolation of this run
  bool go = false;
  std::vector<TracePoint> trace;
};

/// One simulation of the whole mission.
MissionResult simulate(const Mission& m, const SimOptions& opts = {});

/// The phase the spare solve lengthens: the one marked spare, else the last hover or loiter.
std::optional<std::size_t> spare_phase(const Mission& m);

struct SpareResult {
  std::optional<std::size_t> phase;  ///< none: nothing to lengthen
  /// + time that could be added, − time to cut; meaningful only when `bounded` and not `capped`
  double spare_s = 0.0;
  std::string binding_rule;          ///< the rule that limits it
  bool bounded = true;               ///< false: even without the phase the mission fails
  /// The search stopped at SpareOptions::max_spare_s with every rule still met: spare_s is a
  /// lower bound, not a solved figure.
  bool capped = false;
  /// When not bounded: the cruise leg shortened after the spare phase is removed, and by how
  /// much (none: no leg, or no shortening of it meets the rules).
  std::optional<std::size_t> cut_leg;
  std::optional<double> cut_leg_m;
  /// When not bounded: failing rules no change of length mends (take-off mass, thrust-to-weight,
  /// motor or ESC current).
  std::vector<std::string> fixed_failures;
  std::string note;
  int simulations = 0;
};

struct SpareOptions {
  /// Whole-mission simulations at most (LimitError beyond): the bracket search takes at most
  /// about 15, TOMS 748 rarely more than 15 more.
  int max_simulations = 150;
  /// Largest spare time searched, s: a mission that still holds every rule with this much added
  /// reports `capped` (about 11.6 days: no small electric aircraft gets there).
  double max_spare_s = 1e6;
  SimOptions sim;  ///< for each of them (its trace spacing is ignored: no trace is kept)
};

/// How much longer the spare phase could last with every rule still met: the root of the
/// smallest relative rule margin over whole-mission simulations (TOMS 748, to 0.05 s).
SpareResult solve_spare(const Mission& m, const MissionResult& base, const SpareOptions& opts = {});

/// The smallest relative margin over the length-dependent rules and the completion of the
/// flight, and the rule it belongs to (negative: a rule fails). Continuous across the point
/// where a flight stops completing.
std::pair<double, std::string> smallest_margin(const Mission& m, const MissionResult& r);

/// Narrow a sign-changing bracket [lo, hi] of f by two evaluations either side of the linear
/// interpolation of its ends (max(0.5, 0.002·(hi − lo)) away): a rule margin is nearly linear in
/// the added time, so the root usually lands inside, and TOMS 748 then starts on a bracket of a
/// second. Both ends stay a valid bracket whatever f does.
/// `guess`: a better prediction of the root than the interpolation (NaN: none).
void narrow_bracket(const std::function<double(double)>& f, double& lo, double& hi, double& flo, double& fhi,
                    double guess = std::numeric_limits<double>::quiet_NaN());

/// Every length-dependent margin smallest_margin takes the least of, with its rule's name.
std::vector<std::pair<double, std::string>> rule_margins(const Mission& m, const MissionResult& r);

/// Where the first of the margins reaches zero if each is linear between xa and xb (NaN: none
/// falls).
double predicted_root(const std::vector<std::pair<double, std::string>>& a,
                      const std::vector<std::pair<double, std::string>>& b, double xa, double xb);

/// The mission with phase `i` lengthened (or shortened) by `delta_s` seconds of flight.
Mission lengthened(const Mission& m, std::size_t i, double delta_s);

/// Planned duration of a phase in this mission (climb/descend from heights, cruise from the
/// wind triangle), s; nullopt when the leg cannot be flown.
std::optional<double> planned_duration_s(const Mission& m, std::size_t i);

/// Open-circuit energy between SoC 0 and `soc` of the pack, S·Q·∫OCV, Wh (exact for the
/// piecewise-linear table).
double stored_energy_Wh(const battery::Pack& p, double soc);

}  // namespace sortie::sim
