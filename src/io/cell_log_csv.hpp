#pragma once
/// A cell test log from a CSV (or semicolon/tab separated) file into fit::CellLog.
///
/// Columns are found by `--columns` or by the recognised header names below (compared in lower
/// case with everything but letters and digits removed, after taking off a unit written as
/// "(A)", "[mA]" or "_V"); the first name in each list that the header holds wins:
///   time        time, testtime, totaltime, elapsedtime, elapsed, runtime, t, timestamp, datetime
///   current     current, i, curr, amps, ibat, icell, batterycurrent, cellcurrent
///   voltage     voltage, v, u, volt, volts, vbat, vcell, cellvoltage, batteryvoltage,
///               terminalvoltage, ecell
///   temp        temperature, temp, tcell, celltemperature, celltemp, batterytemperature,
///               auxtemperature, temperature1, temp1, tbat
///   exclude     exclude, excluded, skip, ignore       (yes/y/true/1/x: the row is left out)
///   mode        mode, state, steptype, status          (kept as text, e.g. REST, CHRG, DCHG)
/// Units: declared in the header or after a colon in `--columns`, otherwise detected (voltage:
/// V or mV from the magnitude; time: s, or ms when every time is a whole number and the median
/// step is 100 or more; current: A, or mA when the largest value exceeds 1000 or 50·capacity;
/// temperature: °C, or K above 200) — every detection is reported as a warning.
/// Rows: an excluded row is dropped; a row with an empty time, current or voltage is skipped and
/// counted; any other unreadable value is an error naming the line. A time that goes back, or a
/// repeated header line, starts a new test section. A file without a header is read when every
/// column is given by number in `--columns`.
#include <filesystem>
#include <map>
#include <optional>
#include <string>

#include "fit/cell_log.hpp"
#include "io/log_columns.hpp"

namespace sortie::io {

struct CellLogOptions {
  std::map<std::string, ColumnRef> columns;  ///< keys: time, current, voltage, temp, exclude, mode
  std::optional<bool> discharge_positive;    ///< nullopt: detect from the voltage response
  int series = 1;    ///< cells in series in the logged pack: voltage is divided by it
  int parallel = 1;  ///< cells in parallel: current is divided by it
  std::optional<double> capacity_Ah;  ///< helps tell A from mA when the unit is not declared
};

/// The quantities `--columns` accepts for a cell log.
const std::vector<std::string>& cell_log_quantities();

fit::CellLog read_cell_log(const DelimitedFile& file, const CellLogOptions& opts);
fit::CellLog load_cell_log(const std::filesystem::path& path, const CellLogOptions& opts);

}  // namespace sortie::io
