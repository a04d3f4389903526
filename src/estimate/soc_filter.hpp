#pragma once
/// In-flight state of charge and the time left to each reserve rule, as an aircraft's computer
/// would estimate them from pack voltage and current alone.
///
/// Filter: an extended Kalman filter on the discrete pack model of estimate/pack_step (state
/// x = [SoC, v1, v2]; the cell temperature is carried along deterministically). Per row k:
///   predict  x⁻ = f(x, I_k),  F = diag(1, a1, a2),
///            Q = G·Gᵀ·σ_I² + Δt·diag(q_soc², q_v², q_v²),  G = [−Δt/C, R1(1−a1), R2(1−a2)]ᵀ
///            (the current sensor's error σ_I drives all three states; q_soc, q_v the model's own
///            error per √s)
///   update   y = V_k − h(x⁻),  H = [∂V/∂SoC, −1, −1] (the OCV slope less ∂R0/∂SoC·I),
///            S = H·P·Hᵀ + σ_V² + (R0·σ_I)²,  K = P·Hᵀ/S,  Joseph form for P
/// (R. E. Kalman 1960; the EKF on an equivalent circuit as in G. L. Plett, "Extended Kalman
/// filtering for battery management systems of LiPB-based HEV battery packs", J. Power Sources
/// 134, 2004). The correlation of the current error between f and h is ignored.
///
/// Time left: from the filtered state at the cut, the pack model (sim::run_segment) run forward
/// at the present power (the mean V·I of the log over the last `power_window_s` before the
/// cut) until each reserve rule's limit: landing SoC, resting cell voltage (OCV), loaded cell
/// voltage, and the cell's cutoff / power collapse; the hover-reserve rule's time is the first
/// of those less its hover time, at the present power standing for the hover power. Its sd comes
/// from two more runs at SoC ± sd.
#include <optional>
#include <string>
#include <vector>

#include "battery/pack.hpp"
#include "estimate/pack_step.hpp"
#include "flight/mission.hpp"
#include "sim/flight_check.hpp"

namespace sortie::estimate {

struct FilterOptions {
  double current_sd_A = 0.05;      ///< current-sensor error, A (1 sd)
  double voltage_sd_V = 0.02;      ///< voltage-sensor error, V (1 sd)
  double soc_rate_sd = 1e-5;       ///< model error of SoC, per √s
  double v_rate_sd_V = 1e-4;       ///< model error of each RC voltage, V per √s
  std::optional<double> soc0;      ///< start SoC guess; none: from the first row's voltage
  double soc0_sd = 0.10;           ///< sd of the start guess
  double v_rc0_sd_V = 0.05;        ///< sd of the RC voltages at the start (taken as 0)
};

struct FilterRow {
  double t_s = 0.0;
  double soc = 0.0, soc_sd = 0.0;
  double v1 = 0.0, v2 = 0.0;
  double innovation_V = 0.0, innovation_sd_V = 0.0;  ///< measured − predicted voltage, its sd
};

struct FilterResult {
  std::vector<FilterRow> rows;
  StepState state;             ///< after the last row
  double cov[3][3] = {};       ///< of [SoC, v1, v2]
  std::string soc0_source;     ///< "given" or "first row's voltage"
  double soc0_guess = 0.0;
};

/// Runs over rows 0..rows−1 of `log` (all when rows exceeds the log). The pack's soh factors
/// are used.
FilterResult run_soc_filter(const battery::Pack& pack, const sim::MeasuredFlight& log, std::size_t rows,
                            const FilterOptions& opts = {});

struct RuleTime {
  std::string rule;         ///< soc_min, v_rest_cell_min_V, v_load_cell_min_V, hover_s, cutoff
  std::string unit;
  double limit = 0.0;
  std::optional<double> time_s;  ///< none: not reached before the pack's end
  double sd_s = 0.0;
  bool already = false;     ///< past the limit at the cut
};

struct RemainingOptions {
  double power_window_s = 30.0;
  double horizon_s = 86400.0;  ///< forward runs stop here
};

struct Remaining {
  double t_cut_s = 0.0;
  std::size_t rows = 0;
  double soc = 0.0, soc_sd = 0.0;
  double power_W = 0.0;        ///< present power
  double window_s = 0.0;       ///< the stretch it was averaged over
  std::vector<RuleTime> rules;
  std::string end;             ///< what ended the forward run from the filtered state
};

/// The forward run from a state (the rule times, no sd).
std::vector<RuleTime> time_to_rules(const battery::Pack& pack, const flight::Reserve& reserve, const StepState& x,
                                    double power_W, double horizon_s, std::string* end = nullptr);

/// The mean V·I of the rows in [t_cut − window, t_cut], with the window actually used.
double present_power(const sim::MeasuredFlight& log, std::size_t rows, double window_s, double* used_s = nullptr);

/// Filter the log up to time t_cut (rows with t ≤ t_cut) and project each rule.
Remaining remaining_time(const battery::Pack& pack, const flight::Reserve& reserve, const sim::MeasuredFlight& log,
                         double t_cut_s, const FilterOptions& fo = {}, const RemainingOptions& ro = {});

}  // namespace sortie::estimate
