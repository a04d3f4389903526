#pragma once
/// How far a model's voltage is from the measured one over a log: RMSE and the largest error,
/// over all rows and per SoC band.
#include <cstddef>
#include <vector>

namespace sortie::fit {

struct VoltageError {
  std::size_t rows = 0;
  double rmse_V = 0.0;
  double max_abs_V = 0.0;   ///< largest |model − measured|
  std::size_t max_row = 0;  ///< where it is
  double mean_V = 0.0;      ///< mean of model − measured (bias)
};

struct VoltageErrors {
  VoltageError all;
  VoltageError counted;             ///< over the rows the fit counts (set by the caller)
  std::vector<VoltageError> bands;  ///< one per band centre, rows nearest to it by SoC
};

/// Errors of `model` against `measured`; rows are given to the band whose centre (SoC) is
/// nearest. `band_centres` may be empty.
VoltageErrors voltage_errors(const std::vector<double>& measured, const std::vector<double>& model,
                             const std::vector<double>& soc, const std::vector<double>& band_centres);

/// The errors over the rows with rows[k] != 0 only (no bands).
VoltageError voltage_error_where(const std::vector<double>& measured, const std::vector<double>& model,
                                 const std::vector<char>& rows);

}  // namespace sortie::fit
