#pragma once
// The named steps of sim::simulate, shared by mission.cpp (the procedure), mission_phase.cpp
// (one phase, its stretches and events) and mission_rules.cpp (reserve time, rules at landing,
// limits in flight). Internal to sim/: not part of the public API in sim/mission.hpp.

#include <cstddef>
#include <limits>
#include <optional>
#include <string>
#include <variant>
#include <vector>

#include "battery/thevenin.hpp"
#include "core/constants.hpp"
#include "sim/mission.hpp"
#include "sim/model_range.hpp"
#include "sim/segment.hpp"

namespace sortie::sim::steps {

constexpr double kInf = std::numeric_limits<double>::infinity();

inline bool is_multirotor(const flight::Airframe& a) { return std::holds_alternative<flight::Multirotor>(a); }

/// `v` with `sig` significant digits in fixed notation ("0" for zero).
std::string format_significant(double v, int sig);

/// Height above the field at the start of each phase, and at the end of the last.
std::vector<double> start_heights(const std::vector<flight::Phase>& phases);

/// Airspeed flown in a phase: a multirotor holding position (hover, vertical climb or descent)
/// flies at the wind speed; everything else at the phase's true airspeed.
double phase_airspeed(const Mission& m, const flight::Phase& p);

/// The steady condition flown through one stretch of a phase.
struct Stretch {
  double duration_s = 0.0;
  double h_mid_m = 0.0;
  double h_start_m = 0.0, h_end_m = 0.0;
};

/// Split a phase into stretches of at most `max_dh` of height, each flown at its middle height.
std::vector<Stretch> stretches(double duration, double h0, double h1, double max_dh);

/// Event indices of one segment's event list.
enum : std::size_t { kCutoff, kSaturation, kCollapse, kEmpty, kResVLoad, kResSoc, kOverCurrent, kCellHot, kCoverage, kUnderCurrent };

/// One stretch's drive point and the battery demand it makes.
struct SegmentSetup {
  battery::Demand demand;
  double v_motor_V = 0.0;
  double thrust_N = 0.0;        ///< per rotor, as the airframe needs it
  double drive_thrust_N = 0.0;  ///< per rotor, as the drive was solved (sim/drive_solve.hpp)
  double axial_mps = 0.0;       ///< the drive's axial speed
  double rho = core::kSeaLevelDensity;  ///< kg/m³; setup_stretch sets it from the stretch's air
  double shaft_W = 0.0;       ///< per rotor
  double motor_in_W = 0.0;    ///< per rotor, V_m·I_m
  double i_motor_A = 0.0;     ///< per rotor: the motor's and the ESC's output current
};

/// The events of one segment, indexed as above. `coverage_floor` < 0: no stop at the covered
/// SoC floor.
std::vector<EventSpec> make_events(const Mission& m, const SegmentSetup& s, double cutoff_cell_V,
                                   double coverage_floor);

/// Solve the airframe and drive for one stretch; a refusal fills `why` and `field`.
std::optional<SegmentSetup> setup_stretch(const Mission& m, const flight::Phase& p, double h_mid,
                                          double mass, std::string& why, std::string& field,
                                          std::vector<std::string>& warnings);

/// A limit in flight: the worst value over the flight and where it was reached.
struct Peak {
  double v = -kInf, t = 0.0;
  int phase = -1;
  void see(double x, double at, int ph) {
    if (x > v) v = x, t = at, phase = ph;
  }
};

/// Spells above the continuous cell current, for the burst rule: the longest and where it began.
struct Spells {
  bool open = false;
  double t0 = 0.0;
  int phase = -1;
  Peak longest;
  void open_at(double at, int ph) {
    if (!open) open = true, t0 = at, phase = ph;
  }
  void close_at(double at) {
    if (open) longest.see(at - t0, t0, phase);
    open = false;
  }
};

/// The values one simulation carries from phase to phase (Flight adds what it refers to).
struct FlightState {
  std::vector<double> heights;  ///< start_heights(m.phases)
  double S = 0.0, rated_Ah = 0.0, cutoff = 0.0;
  double stop_floor = -1.0;  ///< the covered SoC floor when the flight stops there, else −1
  double i_cont_pack = 0.0;
  bool multirotor = false;
  battery::State x{};
  double t = 0.0;
  double next_sample = 0.0;
  bool stopped = false;
  bool reserve_v_seen = false, reserve_soc_seen = false, warned_hot = false;
  double duty_integral = 0.0;
  double planned_total = 0.0;
  double shaft_J = 0.0, motor_in_J = 0.0, drive_J = 0.0;
  battery::Demand last_demand;  ///< for the trace's exact end point
  double last_vm = 0.0, last_h = 0.0;
  Peak cell_i, motor_i, hover_duty, v_sag;  ///< v_sag: minus the loaded cell voltage
  Spells spell;
  std::optional<double> v_takeoff_V;  ///< loaded bus voltage at take-off
};

/// Everything one simulation carries from phase to phase.
struct Flight : FlightState {
  Flight(const Mission& mission, const SimOptions& options, const battery::PackModel& model, RangeWatch& w,
         MissionResult& result)
      : m(mission), opts(options), pm(model), watch(w), out(result) {}
  const Mission& m;
  const SimOptions& opts;
  const battery::PackModel& pm;
  RangeWatch& watch;
  MissionResult& out;
};

/// A flight as it stood at the start of one phase: enough to fly the rest of a mission that
/// differs from the one flown only in that phase or later ones (the spare-time solve lengthens
/// one phase; everything before it flies the same in every try).
struct FlightAt {
  std::size_t phase = 0;
  battery::PackModel pm;
  RangeWatch watch;
  MissionResult out;
  FlightState state;
};

/// simulate, keeping the flight at the start of phase `phase` in `keep` when it gets there.
MissionResult simulate_keeping(const Mission& m, const SimOptions& opts, std::size_t phase,
                               std::optional<FlightAt>& keep);
/// The rest of a flight from `from`: the same result as simulate(m, opts) when m and opts differ
/// from the run that kept `from` only from its phase on (the caller's promise).
MissionResult simulate_from(const Mission& m, const SimOptions& opts, const FlightAt& from);

// mission_phase.cpp
/// Fly phase `i` from the flight's state: its stretches, events and summary.
void fly_phase(Flight& f, std::size_t i);

// mission_rules.cpp
/// Time on station left at landing (when the mission asks for it).
void reserve_time(Flight& f);
/// The reserve rules at landing and in flight.
void reserve_rules(Flight& f);
/// The limits in flight: cell, motor and ESC current, MTOM, thrust-to-weight, hover duty.
void flight_limits(Flight& f);

}  // namespace sortie::sim::steps
