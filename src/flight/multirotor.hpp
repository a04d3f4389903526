#pragma once
/// Thrust a multirotor needs in steady flight, and the flow through its rotors by momentum
/// theory (J. G. Leishman, Principles of Helicopter Aerodynamics, 2nd ed., 2006, ch. 2 for
/// hover and axial flight, ch. 2 and 5 for Glauert's forward-flight inflow).
///
/// Frame: the rotors share one disk plane, tilted forward by α from horizontal, and share the
/// thrust equally (a symmetric, trimmed frame; rotor-to-rotor interference is not modelled).
///
/// The free stream in disc axes: `axial_mps`, the component along the rotor axis, positive when
/// the air enters the disc from above (as in a climb), and `edgewise_mps`, along the disc:
///   V_n = V·sin α + V_z·cos α,   V_e = V·cos α − V_z·sin α   (V horizontal airspeed, V_z climb rate)
/// The propeller tables CT(J), CP(J) are axial-flow data and do not see V_e, so a multirotor's
/// power is not read from them at V_n: V_n, V_e and Glauert's v_i below feed the momentum-theory
/// power of flight/rotor_power.hpp, calibrated to the drive's own hover power at the same
/// thrust, and the drive is solved at its static-equivalent thrust (sim/drive_solve.hpp).
///
/// Where this stops being valid:
/// - Glauert's inflow is for steady flight at moderate speed with uniform inflow; the ideal
///   (momentum) power T·(V_n + v_i) is a lower bound; real rotors need more.
/// - In descent with −2·v_h < V_n < 0 momentum theory has no valid solution (vortex-ring and
///   turbulent wake states); the inflow there continues the normal-working root from hover. The
///   vortex-ring warning is not this axial band but the region of descent rate and horizontal
///   speed in `in_vortex_ring_region`, where forward speed sweeps the wake away.
/// - Below V_n = −2·v_h (windmill-brake state) the windmill branch is used.
/// - A descent rate's vertical drag is taken off the thrust; a multirotor cannot descend faster
///   than it would fall (refused, FlightStatus::descent_too_fast).
/// - Download: the rotors give T_z = (W + D_z)/(1 − f), f = download_fraction (airframe.hpp).
#include <string>

#include "flight/airframe.hpp"
#include "flight/flight_status.hpp"

namespace sortie::flight {

/// Which momentum-theory branch the rotor flow is on.
enum class RotorFlow {
  normal_working,  ///< V_n ≥ 0: hover, climb, forward flight (and the root continued from hover below 0)
  vortex_ring,     ///< −2·v_h < V_n < 0: no valid momentum solution; estimate
  windmill_brake,  ///< V_n ≤ −2·v_h: the air goes up through the disk
};
const char* to_string(RotorFlow f);

/// Disk area π·D²/4 of a rotor of diameter D, m².
double disk_area_m2(double diameter_m);

/// Hover induced velocity v_h = √(T/(2·ρ·A)), m/s (Leishman 2006, ch. 2, simple momentum theory).
double hover_induced_velocity(double thrust_N, double density_kg_m3, double disk_area_m2);

struct Inflow {
  double induced_mps = 0.0;  ///< v_i, m/s (positive down through the disk, along −thrust)
  RotorFlow flow = RotorFlow::normal_working;
};

/// Glauert's momentum inflow for one rotor of thrust T:
///   v_i = T / (2·ρ·A·√(V_e² + (V_n + v_i)²))
/// solved for v_i with a bracketed root finder (sortie::find_root). With V_e = 0 it reduces to
/// the axial climb result v_i = −V_n/2 + √((V_n/2)² + v_h²), and in the windmill-brake state to
/// v_i = −V_n/2 − √((V_n/2)² − v_h²) (Leishman 2006, ch. 2).
Inflow glauert_inflow(double thrust_N, double density_kg_m3, double disk_area_m2,
                      double axial_mps, double edgewise_mps);

/// The vortex-ring region used for the warning, in units of the hover induced velocity v_h:
/// descent rate 0.28·v_h ≤ −V_z ≤ 2·v_h with horizontal airspeed V < v_h. A box around the
/// region bounded by J. Wolkovitch, "Analytical prediction of vortex-ring boundaries for
/// helicopters in steep descents", J. American Helicopter Society 17(3), 1972 (the onset near
/// 0.28·v_h in vertical descent, the far side at the windmill-brake limit 2·v_h, the region
/// closing as the horizontal speed reaches about v_h; the boundary values from memory). The
/// box errs toward warning at its corners.
bool in_vortex_ring_region(double horizontal_mps, double climb_rate_mps, double hover_induced_mps);

/// What a multirotor needs in one steady flight condition.
struct RotorDemand {
  FlightStatus status = FlightStatus::ok;
  std::string detail;                 ///< the warning or refusal, with numbers; empty when ok
  double weight_N = 0.0;              ///< m·g0
  double drag_N = 0.0;                ///< horizontal body drag ½·ρ·V²·CdA, N
  double drag_vertical_N = 0.0;       ///< ½·ρ·V_z·|V_z|·CdA_v, N (negative in descent: it holds the frame up)
  double download_N = 0.0;            ///< rotor download on the frame, f·T_z, N
  double thrust_total_N = 0.0;        ///< all rotors, N
  double thrust_per_rotor_N = 0.0;    ///< N
  double tilt_rad = 0.0;              ///< disk tilt forward from horizontal, α
  double axial_mps = 0.0;             ///< V_n, the free stream through the disc, m/s
  double edgewise_mps = 0.0;          ///< V_e, m/s
  double hover_induced_mps = 0.0;     ///< v_h at this rotor thrust, m/s
  double induced_mps = 0.0;           ///< Glauert v_i, m/s
  RotorFlow flow = RotorFlow::normal_working;
  double ideal_power_per_rotor_W = 0.0;  ///< momentum-theory T·(V_n + v_i), W (a lower bound)
};

/// Steady flight at horizontal airspeed V ≥ 0 and vertical rate V_z (climb positive), for
/// all-up mass m, air density ρ and `rotors` rotors of disk area A each. The rotors balance
/// weight and body drag (docs/physics.md "Flight"):
///   T_x = D = ½·ρ·V²·CdA,   T_z = W + ½·ρ·V_z·|V_z|·CdA_v,   T = √(T_x² + T_z²),
///   α = atan(T_x / T_z)
/// with T_z raised by the download, T_z = (W + D_z)/(1 − f).
/// Level forward flight is T = √(W'² + D²), α = atan(D/W'), W' = W/(1 − f); vertical climb
/// T = (W + ½·ρ·V_c²·CdA_v)/(1 − f).
RotorDemand multirotor_steady(const Multirotor& frame, double mass_kg, double density_kg_m3,
                              int rotors, double disk_area_m2, double airspeed_mps,
                              double climb_rate_mps);

/// Hover in still air: T = W, v_i = v_h.
RotorDemand multirotor_hover(const Multirotor& frame, double mass_kg, double density_kg_m3,
                             int rotors, double disk_area_m2);
/// Vertical climb at `rate_mps` > 0.
RotorDemand multirotor_climb(const Multirotor& frame, double mass_kg, double density_kg_m3,
                             int rotors, double disk_area_m2, double rate_mps);
/// Vertical descent at `rate_mps` > 0 (downward).
RotorDemand multirotor_descent(const Multirotor& frame, double mass_kg, double density_kg_m3,
                               int rotors, double disk_area_m2, double rate_mps);
/// Level forward flight at airspeed `airspeed_mps`.
RotorDemand multirotor_forward(const Multirotor& frame, double mass_kg, double density_kg_m3,
                               int rotors, double disk_area_m2, double airspeed_mps);

}  // namespace sortie::flight
