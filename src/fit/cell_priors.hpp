#pragma once
/// What `fit cell` assumes about a cell when its log cannot tell: the temperature dependence of
/// its resistances and the bounds and defaults of its thermal block, from its chemistry and size.
///
/// Arrhenius temperature dependence of the resistances (S. Arrhenius, Z. Phys. Chem. 4, 1889):
///   R(T) = R(T_ref) · exp(E_a/R_gas · (1/T − 1/T_ref)),  T in K, R_gas = 8.314 J/(mol·K).
/// E_a is fitted from the log's current steps when their temperatures spread over at least
/// kArrheniusMinSpreadK; otherwise the prior kArrheniusPriorJPerMol is written. From memory:
/// published Arrhenius fits of whole Li-ion cells' resistance give about 20–50 kJ/mol (the
/// electrolyte's ohmic part lower, the charge transfer higher); 30 kJ/mol is taken.
///
/// Thermal block bounds (docs/physics.md: m·c·dT/dt = q − hA·(T − T_air)):
///   c: 700–1400 J/(kg·K), default 1000 — from memory: measured specific heats of lithium cells
///      are about 0.8–1.2 kJ/(kg·K);
///   area: from the mass at a density of 2500 kg/m³ (from memory: lithium cells are about
///      2.2–2.9 g/cm³), A₀ = 6·(m/ρ)^(2/3) (a cube of that volume, close to a cylindrical cell's
///      own area), up to 3·A₀ for flat pouch cells; default A₀;
///   h (convection plus radiation to the surroundings): 7–40 W/(m²·K), default 10 — common
///      practice: natural convection in still air is about 2–10 W/(m²·K) and radiation from a
///      dark surface near room temperature adds about 5 (4·ε·σ·T³ with ε ≈ 0.9), a fan raises it.
#include <string>
#include <vector>

#include "battery/cell.hpp"
#include "battery/cell_log.hpp"
#include "fit/rc_fit.hpp"

namespace sortie::fit {

inline constexpr double kGasConstant = 8.314462618;       ///< J/(mol·K), CODATA 2018
inline constexpr double kArrheniusPriorJPerMol = 30000.0;  ///< from memory (see above)
inline constexpr double kArrheniusMinSpreadK = 5.0;       ///< below it the prior is used
inline constexpr double kArrheniusMinJPerMol = 5000.0;    ///< a fitted E_a outside 5–120 kJ/mol
inline constexpr double kArrheniusMaxJPerMol = 120000.0;  ///< is not physical: the prior is used

/// The resistances' temperature dependence written into the model.
struct ArrheniusFit {
  double ea_J_per_mol = kArrheniusPriorJPerMol;
  double reference_C = 25.0;   ///< the temperature the fitted resistances belong to
  bool fitted = false;         ///< false: the prior
  double spread_K = 0.0;       ///< of the current steps' temperatures
  std::size_t steps = 0;       ///< current steps with a temperature
  std::string how;             ///< one line: fitted, or the prior and why
};

/// E_a by least squares of ln(R_step / R0(SoC)) on 1/T − 1/T_ref over the current steps (the
/// steps' −ΔV/ΔI against the fitted R0 table, so the SoC dependence cancels). `reference_C`:
/// the temperature the fitted resistances belong to (the log's mean, else the air given, else
/// 25 °C assumed, said in `how`).
ArrheniusFit fit_arrhenius(const battery::CellLog& log, const std::vector<CurrentStep>& steps, const battery::Cell& cell,
                           double reference_C, const std::string& reference_how);

/// The resistance factor table over −20..60 °C (held flat beyond), 1 at the reference.
battery::TemperatureEffect arrhenius_effect(const ArrheniusFit& a);

/// Bounds and defaults of the thermal block for a cell of this mass (see above).
struct ThermalPrior {
  double c_lo = 700.0, c_hi = 1400.0, c_default = 1000.0;  ///< J/(kg·K)
  double area_m2 = 0.0;                                     ///< A₀
  double hA_lo = 0.0, hA_hi = 0.0, hA_default = 0.0;        ///< W/K
};
ThermalPrior thermal_prior(double mass_kg);

}  // namespace sortie::fit
