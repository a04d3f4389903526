#pragma once
/// State of health of a pack from flight logs: the capacity and resistance factors of the `soh`
/// block (battery::Pack::soh_capacity, soh_resistance) that make the pack model's voltage, driven
/// by the logged current, best match the logged voltage.
///
/// Model (per log row k, sample k's current I_k flowing over (t_{k-1}, t_k]):
///   SoC_k  = SoC_0 − q_k / (c·C_rated),     q_k = Σ_{j≤k} I_j·(t_j − t_{j−1})
///   v_i,k  = v_i,k−1·e^{−Δt/τ_i} + R_i·I_k·(1 − e^{−Δt/τ_i})   (exact for a constant current)
///   V_k    = S·OCV(SoC_k) − v_1,k − v_2,k − (r·R0_cells(SoC_k)·s_T + R_wiring)·I_k
/// with the cell's thermal block (if any) stepped the same way (explicit, one step per row) and
/// s_T its resistance factor relative to the start temperature; the RC pairs start relaxed.
/// Parameters: c (capacity factor), r (R0 factor) and each flight's start SoC unless it is known.
/// Capacity shows only through the SoC drift over a flight (so a log must use enough charge);
/// resistance only through the voltage's response to changes in current (a constant current's
/// R0·I drop is indistinguishable from a lower start SoC), so a log must vary its current.
///
/// Fit: bounded Levenberg–Marquardt (fit/levenberg_marquardt) on the voltage residuals, central
/// differences for the Jacobian. Uncertainty: σ²·(JᵀJ)⁻¹ with σ² = Σr²/(n − p), inflated by
/// n / n_eff where n_eff = Σ_flights n_j·(1 − ρ_j)/(1 + ρ_j) and ρ_j the lag-1 autocorrelation of
/// flight j's residuals (the AR(1) effective sample size; D. S. Wilks, Statistical Methods in the
/// Atmospheric Sciences, eq. for the variance of a time average, from memory). ρ_j < 0 is taken
/// as 0 (never narrows the interval).
#include <optional>
#include <string>
#include <vector>

#include "battery/pack.hpp"
#include "sim/flight_check.hpp"

namespace sortie::estimate {

/// One flight log for the estimate.
struct HealthFlight {
  std::string name;            ///< file, for messages
  sim::MeasuredFlight log;     ///< time from the first row, pack voltage, pack current
  std::optional<double> soc0;  ///< the start SoC when known (a rested start); fitted otherwise
  std::string soc0_source;     ///< how soc0 was found, when given
};

/// Refusal thresholds and fit settings. Every threshold is reported with the result.
struct HealthOptions {
  /// A flight must use at least this fraction of the pack's rated charge (at soh 1 and the
  /// pack temperature): below it the SoC drift, the only trace of capacity, is too small.
  double min_depth = 0.15;
  /// sd(I) / mean(I) over the flight at least this: below it R0·I is a near-constant offset
  /// that the start SoC absorbs, so resistance is not seen.
  double min_current_spread = 0.03;
  std::size_t min_rows = 30;
  /// The fit is refused when |corr(c, r)| exceeds this (the logs cannot tell them apart).
  double max_correlation = 0.98;
  double capacity_lo = 0.2, capacity_hi = 1.5;      ///< fit bounds on c
  double resistance_lo = 0.2, resistance_hi = 6.0;  ///< fit bounds on r
};

struct FlightHealth {
  std::string name;
  std::size_t rows = 0;
  double depth = 0.0;           ///< charge used / rated charge
  double current_spread = 0.0;  ///< sd(I) / mean(I)
  double charge_Ah = 0.0;
  std::string refused;          ///< why this log was left out (empty: used)
  double soc0 = 0.0, soc0_sd = 0.0;  ///< fitted (or given) start SoC
  bool soc0_fitted = false;
  bool soc0_at_bound = false;   ///< the fit held soc0 at 0 or 1 (its σ is then with it fixed)
  std::string soc0_source;
  double rmse_V = 0.0;
  double lag1 = 0.0;            ///< residual lag-1 autocorrelation
  double n_eff = 0.0;
};

struct HealthEstimate {
  bool refused = false;
  std::string why_refused;      ///< one line, when refused
  double capacity = 0.0, capacity_sd = 0.0;      ///< soh_capacity
  double resistance = 0.0, resistance_sd = 0.0;  ///< soh_resistance
  double correlation = 0.0;     ///< corr(c, r) from the covariance
  double rmse_V = 0.0;
  double sigma_V = 0.0;         ///< √(Σr²/(n − p))
  double inflation = 1.0;       ///< n / n_eff applied to the covariance
  std::size_t rows_used = 0, logs_used = 0, parameters = 0;
  int iterations = 0;
  std::string status;           ///< LM status
  std::vector<FlightHealth> flights;
  HealthOptions options;
};

/// Voltage the model predicts at each row for capacity factor c, R0 factor r and start SoC.
/// `nominal`'s own soh factors are ignored (c and r replace them).
std::vector<double> health_model_voltage(const battery::Pack& nominal, const sim::MeasuredFlight& f,
                                         double c, double r, double soc0);

/// Never throws for a log that cannot be used: it is refused with the reason.
HealthEstimate estimate_health(const battery::Pack& nominal, const std::vector<HealthFlight>& flights,
                               const HealthOptions& opts = {});

}  // namespace sortie::estimate
