#pragma once
/// Does a flight log come from a pack of this many cells in series? The log's pack voltage per
/// cell must fit the cell's OCV table (a 4S log read against a 6S pack rests at 2.8 V a cell, a
/// 6S log against a 4S pack at 6.3 V). Two bounds, each with a tolerance of `tolerance_V` per cell:
///   - resting voltage per cell, from above: max_k (V_k + I_k·R_dc·margin)/S ≥ OCV(SoC 0) − tol,
///     on rows with I_k ≥ 0 (discharge or rest), R_dc the pack's whole DC resistance
///     (R0 + ΣR_i at full charge, at the pack temperature and soh, plus wiring) times
///     `resistance_margin`: V + I·R_dc is the OCV once the RC pairs have settled (V = OCV − I·R0
///     − v1 − v2, v_i → R_i·I). Only the fullest row counts, so a legitimate log is refused only
///     when every row reads below an empty cell, which a pack of this cell count cannot do
///     unless it is over-discharged all through the log;
///   - loaded voltage per cell, from below: max_k V_k/S ≤ max(OCV(SoC 1), v_max) + tol on the
///     same rows (a discharging or resting pack is never above its OCV).
/// Rows with a charging current (I < 0, regeneration) are left out of both.
#include <string>

#include "battery/pack.hpp"
#include "sim/flight_check.hpp"

namespace sortie::estimate {

struct CellCountOptions {
  double tolerance_V = 0.10;       ///< per cell, on both bounds
  double resistance_margin = 1.0;  ///< on the pack's DC resistance, for the resting estimate
};

struct CellCountCheck {
  bool ok = true;
  double rest_cell_max_V = 0.0;   ///< highest resting-voltage estimate per cell
  std::size_t rest_row = 0;       ///< its row
  double load_cell_max_V = 0.0;   ///< highest loaded voltage per cell (I ≥ 0)
  std::size_t load_row = 0;
  double ocv_lo_V = 0.0, ocv_hi_V = 0.0;  ///< the cell's OCV range (hi: with v_max)
  double r_dc_ohm = 0.0;          ///< the pack's DC resistance used (with the margin)
  std::string why;                ///< one line when not ok: "FILE: line N: ... (got ..., expected ...)"
};

/// The check itself; `file` names the log in `why`. A log with no row at I ≥ 0 passes
/// (nothing to judge).
CellCountCheck check_cell_count(const battery::Pack& pack, const sim::MeasuredFlight& log, const std::string& file,
                                const CellCountOptions& opts = {});

/// The same, throwing InputError with `why` when the log does not fit the pack: what `check`,
/// `health`, `remaining` and `logbook add-flight` call after reading a log.
void require_cell_count(const battery::Pack& pack, const sim::MeasuredFlight& log, const std::string& file,
                        const CellCountOptions& opts = {});

}  // namespace sortie::estimate
