#include "io/cell_log_csv.hpp"

#include <algorithm>
#include <cmath>
#include <limits>

#include "core/error.hpp"
#include "core/text.hpp"
#include "io/cell_log_steps.hpp"
#include "io/json_reader.hpp"

namespace sortie::io {

using namespace cell_log_detail;

namespace {

const double kNaN = std::numeric_limits<double>::quiet_NaN();

/// The cell-log quantities and how their headers are recognised (io/log_header.hpp).
const std::vector<ColumnRule>& cell_rules() {
  static const std::vector<ColumnRule> rules = {
      {"time", Quantity::time, {"time", "t", "elapsed", "timestamp", "datetime", "clock"}, {"time"}, {}, true},
      {"current", Quantity::current, {"current", "i", "curr", "amps", "amperes"}, {"current"}, {"i"}, true},
      {"voltage", Quantity::voltage, {"voltage", "v", "u", "volt", "volts"}, {"voltage", "volt", "potential"},
       {"v", "u", "e"}, true},
      {"temp", Quantity::temperature, {"temperature", "temp"}, {"temp"}, {"t"}, false},
      {"exclude", std::nullopt, {"exclude", "excluded", "skip", "ignore"}, {}, {}, false},
      {"mode", std::nullopt, {"mode", "state", "status", "steptype", "stepmode", "kind"}, {"mode"}, {}, false},
  };
  return rules;
}

std::string line_of(std::size_t line) { return "line " + std::to_string(line); }

CellColumns find_cell_columns(const DelimitedFile& f, const CellLogOptions& opts) {
  LogHeader h = find_log_header(f, cell_rules(), opts.columns, "Time(s), Current(A), Voltage(V)");
  CellColumns c;
  c.header_row = h.row;
  c.header = std::move(h.cells);
  c.time = h.columns.at("time");
  c.current = h.columns.at("current");
  c.voltage = h.columns.at("voltage");
  auto optional = [&](const char* q) {
    const auto it = h.columns.find(q);
    return it == h.columns.end() ? std::nullopt : std::optional(it->second);
  };
  c.temp = optional("temp");
  c.exclude = optional("exclude");
  c.mode = optional("mode");
  return c;
}

bool excluded_value(const std::string& file, const std::string& cell, std::size_t line, const ResolvedColumn& c) {
  const std::string s = to_lower(cell);
  if (s.empty() || s == "no" || s == "n" || s == "false" || s == "0" || s == "keep") return false;
  if (s == "yes" || s == "y" || s == "true" || s == "1" || s == "x" || s == "excluded" || s == "exclude") return true;
  throw InputError(message(Source{file, {}}, line_of(line), "exclude column " + c.title + " is neither yes nor no",
                           "\"" + cell + "\"", "yes/no, true/false, 1/0, x or empty"));
}

/// One row's values, or nullopt when its time, current or voltage is empty.
struct RowValues {
  double t, i, v, temp;
};
std::optional<RowValues> parse_row(const DelimitedFile& f, std::size_t r, const CellColumns& cols) {
  const bool decimal_comma = f.delimiter != ',';
  const auto row = f.rows[r];
  const std::size_t line = f.lines[r];
  auto field = [&](const ResolvedColumn& c) { return c.index < row.size() ? row[c.index] : std::string{}; };
  auto bad = [&](const ResolvedColumn& c, const std::string& what, const std::string& got, const std::string& expected) {
    throw InputError(message(Source{f.file, {}}, line_of(line), what + " column " + c.title + " is not a number",
                             "\"" + got + "\"", expected));
  };
  const std::string ts = field(cols.time), is = field(cols.current), vs = field(cols.voltage);
  if (ts.empty() || is.empty() || vs.empty()) return std::nullopt;
  const auto t = parse_log_time(ts, decimal_comma);
  if (!t)
    throw InputError(message(Source{f.file, {}}, line_of(line), "time column " + cols.time.title + " is not a time",
                             "\"" + ts + "\"", "a number or a clock time such as 01:02:03.5"));
  const auto i = parse_log_number(is, decimal_comma);
  if (!i) bad(cols.current, "current", is, "a number");
  const auto v = parse_log_number(vs, decimal_comma);
  if (!v) bad(cols.voltage, "voltage", vs, "a number");
  double temp = kNaN;
  if (cols.temp) {
    const std::string s = field(*cols.temp);
    if (!s.empty()) {
      const auto x = parse_log_number(s, decimal_comma);
      if (!x) bad(*cols.temp, "temperature", s, "a number or an empty cell");
      temp = *x;
    }
  }
  return RowValues{*t, *i, *v, temp};
}

/// Appends a row; a repeated time stamp replaces the row before, a time that goes back starts
/// a new test section.
void append_row(RawRows& raw, const RowValues& x, std::size_t line, const std::string* mode, bool& section_pending) {
  if (std::fabs(x.t - std::round(x.t)) > 1e-9) raw.all_integer_times = false;
  if (!raw.t.empty() && !section_pending) {
    if (x.t == raw.t.back()) {  // duplicate time stamp: the later row stands
      ++raw.duplicates;
      raw.t.pop_back(), raw.i.pop_back(), raw.v.pop_back(), raw.temp.pop_back(), raw.lines.pop_back();
      if (mode) raw.modes.pop_back();
      section_pending = raw.new_section.back() != 0;
      raw.new_section.pop_back();
    } else if (x.t < raw.t.back()) {
      section_pending = true;  // the clock went back: a new test section
    }
  }
  raw.t.push_back(x.t);
  raw.i.push_back(x.i);
  raw.v.push_back(x.v);
  raw.temp.push_back(x.temp);
  raw.lines.push_back(line);
  if (mode) raw.modes.push_back(*mode);
  raw.new_section.push_back(section_pending ? 1 : 0);
  section_pending = false;
}

RawRows read_raw_rows(const DelimitedFile& f, const CellColumns& cols) {
  RawRows raw;
  bool section_pending = true;
  const std::size_t first_data = cols.header_row ? *cols.header_row + 1 : 0;
  for (std::size_t r = first_data; r < f.rows.size(); ++r) {
    const std::size_t line = f.lines[r];
    if (cols.header_row && f.rows[r] == cols.header) {  // a repeated header: the next test section
      section_pending = true;
      continue;
    }
    const auto row = f.rows[r];
    auto field = [&](const ResolvedColumn& c) { return c.index < row.size() ? row[c.index] : std::string{}; };
    if (cols.exclude && excluded_value(f.file, field(*cols.exclude), line, *cols.exclude)) {
      ++raw.excluded;
      continue;
    }
    const auto x = parse_row(f, r, cols);
    if (!x) {
      if (raw.blank++ == 0) raw.first_blank_line = line;
      continue;
    }
    const std::string mode = cols.mode ? field(*cols.mode) : std::string{};
    append_row(raw, *x, line, cols.mode ? &mode : nullptr, section_pending);
  }
  if (raw.size() < 2)
    throw InputError(f.file + ": too few data rows (got " + std::to_string(raw.size()) +
                     " usable rows, expected at least 2)");
  return raw;
}

/// One strictly increasing time axis over the sections, and the per-cell values in SI.
void fill_values(const std::string& file, const RawRows& raw, const CellUnits& u, const CellLogOptions& opts,
                 battery::CellLog& log) {
  const std::size_t n = raw.size();
  log.time_s.resize(n);
  log.current_A.resize(n);
  log.voltage_V.resize(n);
  double offset = 0.0;
  for (std::size_t k = 0; k < n; ++k) {
    const double t = u.time.scale * raw.t[k] + u.time.offset;
    if (k == 0) {
      offset = -t;
      log.section_starts.push_back(0);
    } else if (raw.new_section[k]) {
      // A new section continues the axis one second after the last row; no current flows in the
      // gap (battery::CellLog::section_starts).
      offset = log.time_s[k - 1] + 1.0 - t;
      log.section_starts.push_back(k);
    }
    log.time_s[k] = t + offset;
    // The axis must stay finite and strictly increasing (battery::CellLog): a time that overflows
    // its unit, or one so large (1e300 s) that the rows' steps round away, is refused here.
    if (!std::isfinite(log.time_s[k]))
      throw InputError(message(Source{file, {}}, line_of(raw.lines[k]), "time out of range",
                               "\"" + format_number(raw.t[k]) + "\"", "a finite time in " + u.time.si));
    if (k > 0 && !(log.time_s[k] > log.time_s[k - 1]))
      throw InputError(message(Source{file, {}}, line_of(raw.lines[k]), "time too large to tell apart from the row before",
                               "\"" + format_number(raw.t[k]) + "\"", "times whose steps survive rounding (below about 1e15 s)"));
    log.current_A[k] = u.current.scale * raw.i[k] / opts.parallel;
    log.voltage_V[k] = u.voltage.scale * raw.v[k] / opts.series;
    if (!(log.voltage_V[k] > 0.0) || log.voltage_V[k] > 10.0)
      throw InputError(message(Source{file, {}}, line_of(raw.lines[k]), "cell voltage out of range",
                               format_number(log.voltage_V[k]) + " V", "above 0 and at most 10 V per cell"));
  }
  log.line = raw.lines;
}

void fill_temperature(const RawRows& raw, const CellUnits& u, battery::CellLog& log) {
  log.temperature_C.resize(raw.size());
  for (std::size_t k = 0; k < raw.size(); ++k) log.temperature_C[k] = u.temp.scale * raw.temp[k] + u.temp.offset;
}

void add_row_notes(const RawRows& raw, const CellLogOptions& opts, battery::CellLog& log) {
  if (opts.series > 1 || opts.parallel > 1)
    log.notes.push_back("pack log " + std::to_string(opts.series) + "S" + std::to_string(opts.parallel) +
                        "P: voltage divided by " + std::to_string(opts.series) + ", current by " +
                        std::to_string(opts.parallel));
  if (raw.excluded > 0) log.notes.push_back(std::to_string(raw.excluded) + " rows marked as excluded were left out");
  if (raw.blank > 0)
    log.warnings.push_back(std::to_string(raw.blank) + " rows with an empty time, current or voltage were skipped (first at line " +
                           std::to_string(raw.first_blank_line) + ")");
  if (raw.duplicates > 0)
    log.warnings.push_back(std::to_string(raw.duplicates) + " rows repeated the previous time stamp; the later row of each pair was kept");
}

}  // namespace

const std::vector<std::string>& cell_log_quantities() {
  static const std::vector<std::string> q = rule_keys(cell_rules());
  return q;
}

battery::CellLog read_cell_log(const DelimitedFile& f, const CellLogOptions& opts) {
  if (f.rows.empty()) throw InputError(f.file + ": no data rows (the file is empty)");
  battery::CellLog log;
  log.file = f.file;
  log.section_starts.clear();
  const CellColumns cols = find_cell_columns(f, opts);
  const RawRows raw = read_raw_rows(f, cols);
  const CellUnits units = cell_units(f.file, cols, raw, opts, log);
  fill_values(f.file, raw, units, opts, log);
  if (cols.temp) fill_temperature(raw, units, log);
  orient_current(f.file, opts, log);
  read_modes(raw.modes, log);
  add_row_notes(raw, opts, log);
  return log;
}

battery::CellLog load_cell_log(const std::filesystem::path& path, const CellLogOptions& opts) {
  return read_cell_log(read_delimited(path), opts);
}

}  // namespace sortie::io
