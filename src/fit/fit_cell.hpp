#pragma once
/// `fit cell`: a Thevenin cell model (battery::Cell) from a test log.
///
/// Steps (each in its own header):
///  1. SoC by Coulomb counting from full/empty points; capacity from a full discharge (fit/soc).
///  2. R0 first guess from the voltage step at current steps, R0 = −ΔV/ΔI (fit/rc_fit).
///  3. A first OCV from rest ends and low-rate rows corrected by the step R0 (fit/ocv).
///  4. Constant R0, R_p, τ_p and the OCV on a 1 % SoC grid, fitted together by Levenberg–Marquardt
///     from several starting τ (fit/rc_fit); long charges and the rests after them are not
///     counted (charge-side hysteresis).
///  5. Tables over SoC knots placed at the current steps, started from the constants, the OCV
///     refitted with them; time constants per band only where they beat the voltage resolution.
///  6. Per band: standard errors from the Gauss–Newton covariance σ²·(JᵀJ)⁻¹; bands with loose
///     estimates, and SoC stretches without current steps, are reported as having too little
///     excitation. When fewer than two bands are excited the constants are written instead.
#include <array>
#include <optional>
#include <string>
#include <vector>

#include "battery/cell.hpp"
#include "battery/cell_log.hpp"
#include "fit/levenberg_marquardt.hpp"
#include "fit/soc.hpp"
#include "fit/cell_priors.hpp"
#include "fit/thermal_fit.hpp"

namespace sortie::fit {

/// How far beyond the SoC its log covers the fitted OCV table reaches (the fitted curve's end
/// slope carried on): 2 % of SoC. Beyond that the model has no OCV of its own.
inline constexpr double kOcvMarginSoc = 0.02;
/// Rows of a rest later than this after its load are not counted (except its last kRestEndS).
inline constexpr double kRestTailS = 600.0;
inline constexpr double kRestEndS = 60.0;
/// The quality gate: a fit whose held-out voltage RMSE (else its re-simulation RMSE) is above
/// this, or whose OCV leaves the chemistry's bounds, fails (`fit cell` exit code 4; the model is
/// written only with --accept-poor-fit).
inline constexpr double kQualityMaxRmseV = 0.020;

struct CellFitOptions {
  int rc_pairs = 0;            ///< 1 or 2; 0: chosen by held-out error with the time-constant cap
  SocOptions soc;              ///< capacity, soc0, v_max, v_cutoff
  double soc_band = 0.1;       ///< spacing of the SoC knots of R0, R_p, τ_p
  double rest_min_s = 300.0;   ///< shortest rest whose end is taken as an OCV point, s
  double low_rate_C = 0.6;     ///< loaded rows at or below this C-rate inform the OCV (C/2 tests pass)
  std::string name;            ///< default: "cell fitted from <file>"
  std::string chemistry;
  std::optional<double> mass_kg;
  std::optional<double> i_cont_max_A;
  int max_iterations = 200;    ///< per Levenberg–Marquardt run
  std::optional<double> air_C;  ///< air around the cell in the test, °C (thermal fit; else fitted)
};

/// The fit in one SoC band (a knot and half the spacing either side).
struct BandFit {
  double soc = 0.0, soc_lo = 0.0, soc_hi = 0.0;
  double r0_ohm = 0.0;
  std::array<double, 2> r_ohm{0.0, 0.0};
  std::array<double, 2> tau_s{0.0, 0.0};
  double r0_step_ohm = 0.0;   ///< median −ΔV/ΔI of the band's current steps (NaN: none)
  std::size_t steps = 0;      ///< current steps in the band
  std::size_t rows = 0;       ///< log rows in the band
  double se_r0 = 0.0;         ///< relative standard errors (from log-parameter variances)
  std::array<double, 2> se_r{0.0, 0.0};
  std::array<double, 2> se_tau{0.0, 0.0};
  bool excited = true;
  std::string why;            ///< when not excited
};

/// One structure tried when the RC pairs are chosen by held-out error.
struct RcCandidate {
  int rc_pairs = 2;
  double tau_max_s = 0.0;        ///< the time constants' upper bound
  double held_out_rmse_V = 0.0;  ///< of the constants fitted with it, two folds
  bool chosen = false;
};

struct CellFitResult {
  battery::Cell cell;
  std::string note;           ///< for the model file
  // The log.
  std::size_t rows = 0, sections = 0;
  double duration_s = 0.0, dt_min_s = 0.0, dt_max_s = 0.0;
  double temperature_mean_C = 0.0, temperature_min_C = 0.0, temperature_max_C = 0.0;
  bool has_temperature = false;
  std::vector<double> soc;    ///< per row
  std::vector<char> counted;  ///< per row: 1 where the fit counts the row (not a long charge)
  SocEstimate soc_estimate;
  // OCV.
  std::size_t rests = 0, ocv_rest_points = 0, ocv_loaded_points = 0;
  // Parameters.
  std::size_t steps = 0;
  /// Rows the RC fit evaluates residuals on: held-current stretches of a fast log are merged
  /// into steps of up to 1 s (fit/rc_fit RowMerge), so this can be below `rows`.
  std::size_t rows_evaluated = 0;
  int n_rc = 2;
  bool tables = false;        ///< SoC-dependent tables written
  bool tau_tables = false;    ///< the time constants too (else one per pair)
  std::vector<BandFit> bands;
  int iterations = 0;         ///< Levenberg–Marquardt steps in all
  LmStatus status = LmStatus::converged;
  bool ocv_physical = true;   ///< the OCV stays inside the chemistry's bounds
  double fit_rmse_V = 0.0;
  std::size_t held_out_blocks = 0;  ///< blocks between long rests (two folds when >= 2)
  std::size_t held_out_rows = 0;
  double held_out_rmse_V = 0.0;     ///< predicted on rows the fold's parameters never saw
  std::vector<RcCandidate> rc_candidates;  ///< empty: the RC pairs were given (or one block only)
  std::vector<std::size_t> log_starts{0};  ///< first row of each input log (several logs)
  std::vector<std::string> files;          ///< the input logs
  std::optional<ThermalFit> thermal;  ///< with a temperature column (fitted within bounds, or defaults)
  std::optional<ArrheniusFit> arrhenius;  ///< the resistances over temperature written (fitted or the prior)
  std::vector<std::string> notes;
  std::vector<std::string> warnings;
};

/// Throws InputError for a log that cannot give a model (all-zero current, a current that never
/// changes, no known SoC point, no OCV information), naming the file and what is missing.
CellFitResult fit_cell(const battery::CellLog& log, const CellFitOptions& opts);

/// Several logs of one cell into one model: each log a section of its own (an unknown gap, the
/// cell relaxed), its SoC counted from its own known points (--soc0 is the first log's) with one
/// capacity — the mean of those the logs measure, else --capacity-Ah.
CellFitResult fit_cell(const std::vector<battery::CellLog>& logs, const CellFitOptions& opts);

}  // namespace sortie::fit
