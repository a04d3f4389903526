#pragma once
/// Open-circuit voltage over SoC from a log: the ends of long rests (where the RC pairs have
/// relaxed, corrected by what the model says is left of them), and loaded stretches at a low
/// rate corrected to open circuit by I·R0 + v1 + v2 (common practice: G. Plett, Battery
/// Management Systems, Vol. I, 2015, ch. 2, "OCV testing"). The loaded curve gives the shape
/// between rests; it is shifted to pass through the rest points (the shift, interpolated
/// linearly between rests, absorbs hysteresis and slow relaxation the model does not hold).
#include <cstddef>
#include <optional>
#include <string>
#include <vector>

#include "core/table.hpp"
#include "battery/cell_log.hpp"

namespace sortie::fit {

/// A run of rows at rest, within one section.
struct Rest {
  std::size_t first = 0;  ///< first row at rest
  std::size_t last = 0;   ///< last row at rest
  double duration_s = 0.0;  ///< from the end of the load before it to its last row
};

/// Runs of rows with |I| ≤ i_rest_A.
std::vector<Rest> find_rests(const battery::CellLog& log, double i_rest_A);

/// One open-circuit estimate.
struct OcvPoint {
  double soc = 0.0;
  double v = 0.0;  ///< V
};

struct OcvTable {
  Table ocv;                  ///< over SoC 0..1, strictly increasing
  std::size_t rest_points = 0;    ///< after merging points closer than 0.4 % SoC
  std::size_t loaded_points = 0;  ///< loaded rows used
  double covered_lo = 0.0;    ///< SoC range the data cover
  double covered_hi = 1.0;
  std::vector<std::string> warnings;
};

/// The table on `grid` (SoC, increasing, from 0 to 1) from rest points and loaded points (either
/// may be empty, not both). Outside the covered range the end slope is extended (with a warning
/// when more than 5 % SoC is missing). Values are made strictly increasing. None when no grid
/// point lies within the data (the points sit outside the SoC range the grid spans).
std::optional<OcvTable> build_ocv(std::vector<OcvPoint> rest, const std::vector<OcvPoint>& loaded,
                   const std::vector<double>& grid);

/// An OCV table from values on a fine grid: made strictly rising (pool-adjacent-violators, then
/// at least 0.1 mV per point; a warning when that moved a value by more than 5 mV), then thinned
/// to the points needed to stay within `tolerance_V` of the fine curve (Douglas–Peucker), always
/// keeping the ends and every multiple of 0.1 SoC (ten equal steps when that makes fewer than 11
/// points).
Table ocv_table_from_grid(const std::vector<double>& grid, std::vector<double> values,
                          double tolerance_V, std::vector<std::string>& warnings);

}  // namespace sortie::fit
