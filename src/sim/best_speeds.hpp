#pragma once
/// Best-endurance and best-range airspeeds of a mission's aircraft, from the tool's own power
/// model: the level-flight bus power of the whole aircraft P(V) (airframe need → drive chain →
/// bus power, plus avionics) at one mass, air density and bus voltage.
///
///   best endurance: V minimising P(V) (the longest time per watt-hour);
///   best range:     V maximising V_g(V)/P(V), V_g = √(V² − c²) − h the ground speed on a track
///                   with head wind h and cross wind c (the most ground per watt-hour). In calm
///                   air, V/P(V).
///
/// For a fixed wing with an ideal drive (constant efficiency) these are the polar's V_mp and
/// V_md (J. D. Anderson Jr., Aircraft Performance and Design, 1999, ch. 5); a real drive's
/// efficiency varies with thrust and airspeed and moves them. For a multirotor the endurance
/// speed is the bottom of the bus-power bucket (translational lift against parasite and
/// profile power).
///
/// Search: P(V) on a 0.5 m/s grid from the lowest speed allowed (0 for a multirotor; the
/// stall-speed margin, flight::kStallMargin·V_s, for a fixed wing) up to the first speed the
/// drive cannot hold (saturation at the bus voltage, no operating point) or kSearchMax, then a
/// golden-section refinement to 1 mm/s around the best grid point. The result says which bound
/// ended the search and when an optimum sits on a bound (e.g. a fixed wing whose V_mp is below
/// the stall margin).
#include <optional>
#include <string>

#include "flight/mission.hpp"

namespace sortie::plan {
struct Mission;
}

namespace sortie::sim {

using plan::Mission;

inline constexpr double kSearchMax = 60.0;  ///< highest airspeed searched, m/s

struct BestSpeeds {
  double mass_kg = 0.0;
  double density_kg_m3 = 0.0;
  double v_bus_V = 0.0;          ///< bus voltage used: the pack's open-circuit voltage at 50 % SoC, V
  double search_lo_mps = 0.0, search_hi_mps = 0.0;
  std::string lower_bound;       ///< what the lowest speed is ("hover", "1.2 × stall speed")
  std::string upper_bound;       ///< what ended the search at the top
  double endurance_mps = 0.0;
  double endurance_W = 0.0;      ///< bus power there (drive and avionics), W
  bool endurance_on_bound = false;
  double range_mps = 0.0;
  double range_W = 0.0;
  double range_ground_mps = 0.0; ///< ground speed there, m/s
  double range_m_per_Wh = 0.0;   ///< ground distance per bus watt-hour, m/Wh
  bool range_on_bound = false;
  double head_mps = 0.0, cross_mps = 0.0;  ///< the wind the range speed is for
  bool found = false;            ///< false: no speed in the search range can be flown
  std::string note;              ///< why not found
};

/// Level-flight bus power of the whole aircraft at airspeed V, W: N·P_bus(V_bus) + avionics;
/// nullopt when the airframe refuses V, the drive has no point, or it saturates at v_bus.
/// `turn`: a phase whose bank or turn radius is flown (fixed wing), nullptr for straight flight.
std::optional<double> level_bus_power_W(const Mission& m, double mass_kg, double rho, double v_bus_V,
                                        double airspeed_mps, const flight::Phase* turn = nullptr);

/// Best speeds at the mission's all-up mass in the air at `height_m` above the field, for a
/// wind of head `head_mps` and cross `cross_mps` components (range only), flying the turn of
/// `turn` (nullptr: straight). Speeds below the lowest the airframe accepts (the stall margin,
/// in a turn V_s·√n) are skipped; the search starts at the first it accepts.
BestSpeeds best_speeds(const Mission& m, double height_m = 0.0, double head_mps = 0.0, double cross_mps = 0.0,
                       const flight::Phase* turn = nullptr);

/// The airspeed phase `i` flies: its number, or the best speed its keyword names, solved at the
/// phase's height for its track's wind (a loiter circles: calm-air range), m/s.
double phase_airspeed_mps(const Mission& m, std::size_t i);

/// The mission with every keyword airspeed replaced by its number.
Mission with_resolved_airspeeds(const Mission& m);

}  // namespace sortie::sim
