#pragma once
// The steps of reading a cell log (io/cell_log_csv.hpp), shared by its two source files.
#include <cstddef>
#include <optional>
#include <string>
#include <vector>

#include "battery/cell_log.hpp"
#include "io/cell_log_csv.hpp"
#include "io/log_header.hpp"

namespace sortie::io::cell_log_detail {

/// Where the quantities are in the file.
struct CellColumns {
  std::optional<std::size_t> header_row;
  std::vector<std::string> header;
  ResolvedColumn time, current, voltage;
  std::optional<ResolvedColumn> temp, exclude, mode;
};

/// The usable rows as written (units not yet applied), with what was skipped.
struct RawRows {
  std::vector<double> t, i, v, temp;   ///< temp NaN where the cell is empty
  std::vector<std::size_t> lines;
  std::vector<std::string> modes;      ///< the mode column's text, when there is one
  std::vector<char> new_section;       ///< 1 where a test section starts
  std::size_t excluded = 0, blank = 0, duplicates = 0, first_blank_line = 0;
  bool all_integer_times = true;
  std::size_t size() const { return t.size(); }
};

/// The SI conversion of each column.
struct CellUnits {
  UnitFactor time{1.0, 0.0, "s"}, current{1.0, 0.0, "A"}, voltage{1.0, 0.0, "V"}, temp{1.0, 0.0, "°C"};
};

/// Units declared or detected; every detection is a note or a warning in `log`.
CellUnits cell_units(const std::string& file, const CellColumns& cols, const RawRows& raw,
                     const CellLogOptions& opts, battery::CellLog& log);
/// Turns the log's current discharge positive (given, or detected from the voltage response).
void orient_current(const std::string& file, const CellLogOptions& opts, battery::CellLog& log);
/// The mode column's text read by its meaning into "rest", "charge" or "discharge"; text with
/// no such meaning is read from the current's sign and size.
void read_modes(const std::vector<std::string>& text, battery::CellLog& log);

}  // namespace sortie::io::cell_log_detail
