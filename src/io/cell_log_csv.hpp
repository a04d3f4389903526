#pragma once
/// A cell test log from a CSV (or semicolon/tab separated) file into battery::CellLog.
///
/// Columns are found by `--columns` or by what their header says (io/log_header.hpp): the name
/// compared in lower case with everything but letters and digits removed, after taking off a
/// unit written as "(A)", "[mA]" or "_V", read as words, and the declared unit:
///   time        a name that is or holds "time" (also t, elapsed, timestamp, datetime, clock),
///               unit s, ms, min, h or none; a per-step or per-cycle clock is second choice
///   current     current, i, curr, amps, or a name holding "current"; i before a noun (ibat,
///               icell); unit A, mA or none
///   voltage     voltage, volt(s), v, u, or a name holding "volt"; v, u or e before a noun
///               (vcell, ecell); unit V, mV or none
///   temp        a name holding "temp"; t before a noun (tcell), or t with a temperature unit
///   exclude     exclude, excluded, skip, ignore       (yes/y/true/1/x: the row is left out)
///   mode        mode, state, status, step type/mode   (read by meaning, see below)
/// A unit of another quantity rules a column out ("t (°C)" is no time). The best match wins;
/// the leftmost on a tie.
/// Modes: a mode cell whose words mean rest (rest, pause, idle, relax, wait, OCV, R), charge
/// (charge, chg, C) or discharge (discharge, dis, dch, D) is written as "rest", "charge" or
/// "discharge"; any other text, or an empty cell, is read from the current: rest at or below 1 %
/// of the largest current, else by its sign. Without a mode column `mode` stays empty.
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

#include "battery/cell_log.hpp"
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

battery::CellLog read_cell_log(const DelimitedFile& file, const CellLogOptions& opts);
battery::CellLog load_cell_log(const std::filesystem::path& path, const CellLogOptions& opts);

}  // namespace sortie::io
