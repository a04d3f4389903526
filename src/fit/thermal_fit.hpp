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
#include <optional>
#include <string>
#include <vector>

#include "battery/cell.hpp"
#include "fit/cell_log.hpp"

namespace sortie::fit {

struct ThermalFit {
  double heat_capacity_J_per_K = 0.0;  ///< C = m·c
  double hA_W_per_K = 0.0;
  double air_C = 0.0;                  ///< fitted, or as given
  bool air_given = false;
  double rmse_K = 0.0;                 ///< the fitted model re-run on the log's heat
  double max_error_K = 0.0;
  double temperature_min_C = 0.0, temperature_max_C = 0.0;
  double heat_J = 0.0;                 ///< ∫q dt over the rows used
  std::size_t rows = 0;
};

/// Fit on the rows with a temperature (blank ones are skipped by the integrals' neighbours).
/// Returns nullopt with `why` set when the log cannot tell the parameters: too small a temperature
/// swing or too little heat, or a solution that is not physical (C or hA not positive).
std::optional<ThermalFit> fit_thermal(const CellLog& log, const std::vector<double>& soc, const battery::Cell& cell,
                                      std::optional<double> air_C, std::string& why);

}  // namespace sortie::fit
