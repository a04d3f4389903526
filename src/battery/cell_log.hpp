#pragma once
/// A cell test log as the fit sees it: one time axis, current and voltage per cell, SI units,
/// discharge positive. The reader (io/cell_log_csv) turns a messy CSV into this once.
#include <cstddef>
#include <string>
#include <vector>

namespace sortie::battery {

struct CellLog {
  std::string file;                 ///< as shown in messages
  std::vector<double> time_s;       ///< strictly increasing over the whole log, s
  /// Cell current, A, discharge positive. Sample k's current is taken to have flowed during
  /// (time_s[k-1], time_s[k]] (a logger that records at the end of each interval).
  std::vector<double> current_A;
  std::vector<double> voltage_V;    ///< cell terminal voltage at time_s[k], V
  std::vector<double> temperature_C;  ///< empty without a temperature column; NaN where blank
  std::vector<std::string> mode;    ///< text of a mode/state column; empty without one
  std::vector<std::size_t> line;    ///< 1-based file line of each row
  /// Rows that begin a test section (always row 0): the time before them is a gap of unknown
  /// length with no current, long enough for the cell to relax.
  std::vector<std::size_t> section_starts{0};
  std::vector<std::string> notes;   ///< what the reader recognised or assumed, for the report
  std::vector<std::string> warnings;  ///< rows skipped, units guessed

  std::size_t size() const { return time_s.size(); }
  bool starts_section(std::size_t k) const;
};

}  // namespace sortie::battery
