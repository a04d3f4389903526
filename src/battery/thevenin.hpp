#pragma once
/// Thevenin equivalent-circuit dynamics of a pack (G. Plett, Battery Management Systems, Vol. I,
/// 2015, ch. 2), as an Odeint right-hand side. Per cell: OCV(SoC) source, series R0, up to two
/// RC pairs; the pack scales them by S/P (docs/physics.md).
#include <array>
#include <cstddef>

#include "battery/pack.hpp"
#include "core/table.hpp"

namespace sortie::battery {

/// State: SoC, the two RC voltages of the pack, the integrals of charge and energy out, and the
/// cell temperature.
using State = std::array<double, 6>;
inline constexpr std::size_t kSoc = 0;     ///< state of charge, 0..1
inline constexpr std::size_t kV1 = 1;      ///< first RC pair voltage (pack), V
inline constexpr std::size_t kV2 = 2;      ///< second RC pair voltage (pack), V
inline constexpr std::size_t kCharge = 3;  ///< charge delivered since the start, C
inline constexpr std::size_t kEnergy = 4;  ///< energy delivered at the terminals, J
inline constexpr std::size_t kTemp = 5;    ///< cell temperature, °C (constant without a thermal model)

/// What the load asks of the pack, over one segment starting at t0:
/// current:  I(t) = a + a_rate·(t − t0)
/// power:    P(t, V) = a + a_rate·(t − t0) + b·V  (b·V: loads whose draw grows with bus voltage,
///           such as ESC switching loss k·V·I_m)
struct Demand {
  enum class Kind { current, power };
  Kind kind = Kind::current;
  double a = 0.0;       ///< A or W
  double a_rate = 0.0;  ///< A/s or W/s
  double b = 0.0;       ///< W/V (power only)
  double t0 = 0.0;      ///< s

  static Demand current(double amps) { return {Kind::current, amps, 0.0, 0.0, 0.0}; }
  static Demand power(double watts, double watts_per_volt = 0.0) {
    return {Kind::power, watts, 0.0, watts_per_volt, 0.0};
  }
};

/// The pack with every table scaled to pack level at its temperature, ready for the hot path.
struct PackModel {
  explicit PackModel(const Pack& pack);

  int series;
  int parallel;
  double capacity_C;      ///< usable charge, C (3600·Q_Ah·P·soh·capacity_factor)
  double v_max_cell_V;
  double i_cont_max_cell_A;
  Table ocv_cell_V;       ///< over SoC
  Table r0_pack_ohm;      ///< S/P·R0_cell·soh_resistance·r_factor + R_wiring, over SoC
  std::size_t n_rc;       ///< 0, 1 or 2
  std::array<Table, 2> r_pack_ohm;  ///< S/P·R_k,cell·r_factor, over SoC
  std::array<Table, 2> tau_s;
  // Thermal model (battery::Thermal), per cell. The tables above hold the resistances at the
  // starting temperature; at temperature T they are multiplied by r_factor(T)/r_factor(T0)
  // (the wiring excepted). The capacity stays that of the starting temperature.
  bool thermal = false;
  double wiring_ohm = 0.0;
  double t0_C = 25.0;             ///< starting cell temperature, °C
  double air_C = 25.0;            ///< air temperature, °C
  double heat_capacity_J_per_K = 0.0;  ///< m·c of one cell
  double hA_W_per_K = 0.0;        ///< of one cell
  Table r_factor_T{1.0};          ///< the cell's resistance factor over °C
  double r_factor_t0 = 1.0;

  double ocv_pack(double soc) const { return series * ocv_cell_V(soc); }
  /// Resistance multiplier at cell temperature T relative to the start (1 without a thermal
  /// model).
  double r_scale(double temperature_C) const {
    return thermal ? r_factor_T(temperature_C) / r_factor_t0 : 1.0;
  }
  /// Pack series resistance at SoC and cell temperature.
  double r0_pack(double soc, double temperature_C) const {
    if (!thermal) return r0_pack_ohm(soc);
    return (r0_pack_ohm(soc) - wiring_ohm) * r_scale(temperature_C) + wiring_ohm;
  }
  /// Initial state: SoC given, RC pairs relaxed, nothing delivered, cells at the start
  /// temperature.
  State initial_state(double soc0) const { return {soc0, 0.0, 0.0, 0.0, 0.0, t0_C}; }
};

/// Terminal quantities at one instant.
struct Terminal {
  double current_A = 0.0;   ///< pack current, discharge positive
  double v_terminal_V = 0.0;
  double v_ocv_V = 0.0;     ///< pack open-circuit voltage
  double power_W = 0.0;     ///< V·I at the terminals
  double discriminant = 1.0;  ///< (E + b·R0)² − 4·R0·(a + b·E) for power loads; < 0: collapse
  bool collapsed = false;   ///< the pack cannot deliver the power asked for
};

/// Solve the terminal current for a demand at effective EMF E = S·OCV − v1 − v2 and series R0.
/// Constant power with a bus-voltage term, P = a + b·V, V = E − R0·I, V·I = P:
///   R0·I² − (E + b·R0)·I + (a + b·E) = 0,  I = [(E + b·R0) − √D] / (2·R0)
/// the smaller root (the stable operating point). D < 0: the pack cannot deliver P (power
/// collapse); the current at the vertex, (E + b·R0)/(2·R0), is returned with `collapsed` set so
/// that an integrator can step on while the event locator brackets the crossing D = 0.
Terminal solve_terminal(double emf_V, double r0_ohm, double ocv_V, const Demand& d, double t);

/// Odeint right-hand side (docs/style.md rule 2):
///   dSoC/dt = −I/C_pack,   dv_k/dt = −v_k/τ_k + I·R_k/τ_k,   dq/dt = I,   dE/dt = V·I,
///   per cell m·c·dT/dt = (I²·R0_cells + Σ v_k²/R_k)/(S·P) − hA·(T − T_air)  (thermal model;
///   R0_cells is the pack's series resistance without the wiring, whose heat is not in a cell)
struct Thevenin {
  const PackModel& pack;
  Demand demand;

  Terminal terminal(const State& x, double t) const;
  void operator()(const State& x, State& dxdt, double t) const;
};

}  // namespace sortie::battery
