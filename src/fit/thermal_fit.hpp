#pragma once
/// The lumped thermal block of a cell (battery::Thermal) from a log with a temperature column.
///
/// Heat: the fitted circuit's own losses, q = I²·R0(SoC) + Σ v_p²/R_p(SoC), with the RC voltages
/// v_p run along the log's current by the exact interval update — the heat the simulation will
/// use. (The irreversible heat I·(OCV − V) of D. Bernardi, E. Pawlikowski, J. Newman, "A General
/// Energy Balance for Battery Systems", J. Electrochem. Soc. 132(1), 1985, is the same less the
/// energy the RC pairs store; it is not used because a few mV of OCV error in a difference of
/// tens of mV biases the heat.) Over each section of the log, integrated from its first row s to
/// row k (current over (t_{k−1}, t_k], v_p² and temperature by the trapezoid rule):
///   C·(T_k − T_s) = ∫q dt − hA·∫T dt + hA·T_air·(t_k − t_s)
/// which is linear in C = m·c, hA and hA·T_air; solved by least squares over every row (Eigen's
/// column-pivoting QR). With the air temperature given, two unknowns.
///
/// Within physics (fit/cell_priors ThermalPrior): a log whose temperature swings less than
/// kThermalMinSwingK does not excite the block — the defaults are written with a warning; a
/// fitted c or hA outside its bounds is replaced by its default (warned) and the other refitted
/// with it held.
#include <optional>
#include <string>
#include <vector>

#include "battery/cell.hpp"
#include "battery/cell_log.hpp"
#include "fit/cell_priors.hpp"

namespace sortie::fit {

/// Smallest temperature swing over the log that the block is fitted from, K: twenty steps of a
/// usual 0.1 K logger and twice the ~1 K a surface sensor can differ from the cell's core
/// (common practice). Above it the bounds decide what is kept.
inline constexpr double kThermalMinSwingK = 2.0;

struct ThermalFit {
  double heat_capacity_J_per_K = 0.0;  ///< C = m·c
  double hA_W_per_K = 0.0;
  double air_C = 0.0;                  ///< fitted, or as given, or the log's first temperature
  bool air_given = false;
  bool c_fitted = false, hA_fitted = false;  ///< false: the default (ThermalPrior)
  std::string how;                     ///< one line: what was fitted, what is a default and why
  double rmse_K = 0.0;                 ///< the model re-run on the log's heat
  double max_error_K = 0.0;
  double temperature_min_C = 0.0, temperature_max_C = 0.0;
  double heat_J = 0.0;                 ///< ∫q dt over the rows used
  std::size_t rows = 0;
};

/// Fit on the rows with a temperature (blank ones are skipped by the integrals' neighbours).
/// Returns nullopt with `why` set only without a temperature column (or fewer than 3 rows);
/// otherwise a block within the prior's bounds, its defaults warned about in `warnings`.
std::optional<ThermalFit> fit_thermal(const battery::CellLog& log, const std::vector<double>& soc, const battery::Cell& cell,
                                      std::optional<double> air_C, const ThermalPrior& prior,
                                      std::vector<std::string>& warnings, std::string& why);

}  // namespace sortie::fit
