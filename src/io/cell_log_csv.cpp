#include "io/cell_log_csv.hpp"

#include <algorithm>
#include <cctype>
#include <cmath>
#include <limits>

#include "core/error.hpp"
#include "core/text.hpp"
#include "io/json_reader.hpp"

namespace sortie::io {

namespace {

const double kNaN = std::numeric_limits<double>::quiet_NaN();

const std::map<std::string, std::vector<std::string>>& recognised() {
  static const std::map<std::string, std::vector<std::string>> names = {
      {"time", {"time", "testtime", "totaltime", "elapsedtime", "elapsed", "runtime", "t",
                "timestamp", "datetime"}},
      {"current", {"current", "i", "curr", "amps", "ibat", "icell", "batterycurrent", "cellcurrent"}},
      {"voltage", {"voltage", "v", "u", "volt", "volts", "vbat", "vcell", "cellvoltage",
                   "batteryvoltage", "terminalvoltage", "ecell"}},
      {"temp", {"temperature", "temp", "tcell", "celltemperature", "celltemp", "batterytemperature",
                "auxtemperature", "temperature1", "temp1", "tbat"}},
      {"exclude", {"exclude", "excluded", "skip", "ignore"}},
      {"mode", {"mode", "state", "steptype", "status"}},
  };
  return names;
}

std::string fmt(double v) { return format_number(v); }

/// Where one quantity is in the file and how to convert it.
struct Column {
  std::size_t index = 0;
  std::string title;        ///< header text or "column N"
  std::string unit;         ///< declared unit ("" when to be detected)
  bool declared = false;
};

/// Match a --columns name against one header cell: the exact text, or the same normalised
/// name, case-insensitively.
bool header_matches(const std::string& cell, const std::string& wanted) {
  if (to_lower(cell) == to_lower(wanted)) return true;
  const std::string n = normalise_name(wanted);
  return !n.empty() && (normalise_name(cell) == n || split_header(cell).base == n);
}

/// Resolve the columns on a candidate header row; nullopt when time, current or voltage is not
/// there. `header` empty: every column is given by number.
std::optional<std::map<std::string, Column>> resolve(const std::vector<std::string>& header,
                                                     const CellLogOptions& opts) {
  std::map<std::string, Column> out;
  for (const auto& q : cell_log_quantities()) {
    Column c;
    bool found = false;
    if (auto it = opts.columns.find(q); it != opts.columns.end()) {
      const ColumnRef& ref = it->second;
      if (ref.number) {
        c.index = *ref.number - 1;
        c.title = *ref.number - 1 < header.size() ? "column " + std::to_string(*ref.number) + " ('" + header[*ref.number - 1] + "')"
                                                  : "column " + std::to_string(*ref.number);
        found = true;
      } else {
        for (std::size_t i = 0; i < header.size() && !found; ++i)
          if (header_matches(header[i], ref.name)) {
            c.index = i;
            c.title = "'" + header[i] + "'";
            found = true;
          }
      }
      if (!found) {
        if (q == "time" || q == "current" || q == "voltage") return std::nullopt;
        continue;
      }
      if (!ref.unit.empty()) {
        c.unit = ref.unit;
        c.declared = true;
      } else if (!ref.number || *ref.number - 1 < header.size()) {
        const std::size_t i = c.index;
        if (i < header.size()) {
          const HeaderName h = split_header(header[i]);
          if (!h.unit.empty()) {
            c.unit = h.unit;
            c.declared = true;
          }
        }
      }
    } else {
      for (const auto& name : recognised().at(q)) {
        for (std::size_t i = 0; i < header.size() && !found; ++i) {
          const HeaderName h = split_header(header[i]);
          if (h.base == name) {
            c.index = i;
            c.title = "'" + header[i] + "'";
            c.unit = h.unit;
            c.declared = !h.unit.empty();
            found = true;
          }
        }
        if (found) break;
      }
      if (!found) {
        if (q == "time" || q == "current" || q == "voltage") return std::nullopt;
        continue;
      }
    }
    out[q] = c;
  }
  return out;
}

double median(std::vector<double> v) {
  if (v.empty()) return kNaN;
  const auto mid = v.begin() + static_cast<std::ptrdiff_t>(v.size() / 2);
  std::nth_element(v.begin(), mid, v.end());
  return *mid;
}

bool excluded_value(const DelimitedFile& f, std::size_t r, std::size_t line, const Column& c) {
  const auto& row = f.rows[r];
  const std::string s = c.index < row.size() ? to_lower(row[c.index]) : std::string{};
  if (s.empty() || s == "no" || s == "n" || s == "false" || s == "0" || s == "keep") return false;
  if (s == "yes" || s == "y" || s == "true" || s == "1" || s == "x" || s == "excluded" ||
      s == "exclude")
    return true;
  throw InputError(message(Source{f.file, {}}, "line " + std::to_string(line),
                           "exclude column " + c.title + " is neither yes nor no",
                           "\"" + row[c.index] + "\"", "yes/no, true/false, 1/0, x or empty"));
}

/// A unit for a column: the declared one, checked; `detected` otherwise.
UnitFactor factor_for(const std::string& file, const Column& c, Quantity q, const std::string& what) {
  const auto f = unit_factor(q, c.unit);
  if (!f)
    throw InputError(file + ": " + what + " column " + c.title + ": unit '" + c.unit +
                     "' not accepted (expected " + accepted_units(q) + ")");
  return *f;
}

}  // namespace

const std::vector<std::string>& cell_log_quantities() {
  static const std::vector<std::string> q = {"time", "current", "voltage", "temp", "exclude", "mode"};
  return q;
}

fit::CellLog read_cell_log(const DelimitedFile& f, const CellLogOptions& opts) {
  fit::CellLog log;
  log.file = f.file;
  log.section_starts.clear();
  const bool decimal_comma = f.delimiter != ',';
  if (f.rows.empty()) throw InputError(f.file + ": no data rows (the file is empty)");

  // --- find the header (or none when every column is given by number) ---
  const bool all_numbered = opts.columns.count("time") && opts.columns.count("current") &&
                            opts.columns.count("voltage") &&
                            std::all_of(opts.columns.begin(), opts.columns.end(),
                                        [](const auto& kv) { return kv.second.number.has_value(); });
  std::optional<std::size_t> header_row;
  std::map<std::string, Column> cols;
  if (all_numbered) {
    cols = *resolve({}, opts);
    const auto& first = f.rows.front();
    const std::size_t ti = cols.at("time").index;
    if (ti < first.size() && !parse_log_time(first[ti], decimal_comma)) {
      header_row = 0;
      cols = *resolve(first, opts);
    }
  } else {
    const std::size_t scan = std::min<std::size_t>(f.rows.size(), 200);
    for (std::size_t r = 0; r < scan && !header_row; ++r) {
      if (auto c = resolve(f.rows[r], opts)) {
        header_row = r;
        cols = *c;
      }
    }
    if (!header_row) {
      std::string asked;
      for (const auto& [q, ref] : opts.columns)
        asked += (asked.empty() ? "" : ", ") + q + "=" + (ref.number ? std::to_string(*ref.number) : ref.name);
      throw InputError(
          f.file + ": no header line naming the time, current and voltage columns in the first " +
          std::to_string(std::min<std::size_t>(f.rows.size(), 200)) + " lines (" +
          (asked.empty() ? std::string("got none of the recognised names")
                         : "got --columns " + asked + " not all found") +
          ", expected names such as Time(s), Current(A), Voltage(V), or --columns "
          "time=...,current=...,voltage=...)");
    }
  }
  const std::vector<std::string> header =
      header_row ? f.rows[*header_row].to_vector() : std::vector<std::string>{};
  const std::size_t first_data = header_row ? *header_row + 1 : 0;
  const Column ct = cols.at("time"), ci = cols.at("current"), cv = cols.at("voltage");
  const std::optional<Column> ctemp = cols.count("temp") ? std::optional(cols.at("temp")) : std::nullopt;
  const std::optional<Column> cexcl = cols.count("exclude") ? std::optional(cols.at("exclude")) : std::nullopt;
  const std::optional<Column> cmode = cols.count("mode") ? std::optional(cols.at("mode")) : std::nullopt;

  // --- read raw values (units applied later) ---
  std::vector<double> t_raw, i_raw, v_raw, temp_raw;
  std::vector<std::size_t> lines;
  std::vector<std::string> modes;
  std::vector<char> new_section;
  std::size_t excluded = 0, blank = 0, duplicates = 0;
  std::size_t first_blank_line = 0;
  bool section_pending = true;
  bool all_integer_times = true;
  auto field = [&](std::size_t r, const Column& c) -> std::string {
    const auto row = f.rows[r];
    return c.index < row.size() ? row[c.index] : std::string{};
  };
  auto bad = [&](std::size_t line, const Column& c, const std::string& what, const std::string& got,
                 const std::string& expected) {
    throw InputError(message(Source{f.file, {}}, "line " + std::to_string(line),
                             what + " column " + c.title + " is not a number", "\"" + got + "\"", expected));
  };
  for (std::size_t r = first_data; r < f.rows.size(); ++r) {
    const std::size_t line = f.lines[r];
    if (header_row && f.rows[r] == header) {  // a repeated header: the next test section
      section_pending = true;
      continue;
    }
    if (cexcl && excluded_value(f, r, line, *cexcl)) {
      ++excluded;
      continue;
    }
    const std::string& ts = field(r, ct);
    const std::string& is = field(r, ci);
    const std::string& vs = field(r, cv);
    if (ts.empty() || is.empty() || vs.empty()) {
      if (blank++ == 0) first_blank_line = line;
      continue;
    }
    const auto t = parse_log_time(ts, decimal_comma);
    if (!t) {
      throw InputError(message(Source{f.file, {}}, "line " + std::to_string(line),
                               "time column " + ct.title + " is not a time", "\"" + ts + "\"",
                               "a number or a clock time such as 01:02:03.5"));
    }
    const auto i = parse_log_number(is, decimal_comma);
    if (!i) bad(line, ci, "current", is, "a number");
    const auto v = parse_log_number(vs, decimal_comma);
    if (!v) bad(line, cv, "voltage", vs, "a number");
    double temp = kNaN;
    if (ctemp) {
      const std::string& s = field(r, *ctemp);
      if (!s.empty()) {
        const auto x = parse_log_number(s, decimal_comma);
        if (!x) bad(line, *ctemp, "temperature", s, "a number or an empty cell");
        temp = *x;
      }
    }
    if (std::fabs(*t - std::round(*t)) > 1e-9) all_integer_times = false;
    if (!t_raw.empty() && !section_pending) {
      if (*t == t_raw.back()) {  // duplicate time stamp: the later row stands
        ++duplicates;
        t_raw.pop_back(), i_raw.pop_back(), v_raw.pop_back(), temp_raw.pop_back(), lines.pop_back();
        if (cmode) modes.pop_back();
        const bool was_start = new_section.back();
        new_section.pop_back();
        section_pending = was_start;
      } else if (*t < t_raw.back()) {
        section_pending = true;  // the clock went back: a new test section
      }
    }
    t_raw.push_back(*t);
    i_raw.push_back(*i);
    v_raw.push_back(*v);
    temp_raw.push_back(temp);
    lines.push_back(line);
    if (cmode) modes.push_back(field(r, *cmode));
    new_section.push_back(section_pending ? 1 : 0);
    section_pending = false;
  }
  const std::size_t n = t_raw.size();
  if (n < 2)
    throw InputError(f.file + ": too few data rows (got " + std::to_string(n) +
                     " usable rows, expected at least 2)");

  // --- units ---
  auto describe = [&](const Column& c, const std::string& q, const UnitFactor& u, bool detected) {
    log.notes.push_back(q + ": " + c.title + " in " + (c.unit.empty() ? u.si : c.unit) +
                        (detected ? " (detected)" : ""));
  };
  UnitFactor ut{1.0, 0.0, "s"}, ui{1.0, 0.0, "A"}, uv{1.0, 0.0, "V"}, utemp{1.0, 0.0, "°C"};
  {
    bool detected = false;
    Column c = ct;
    if (ct.declared) {
      ut = factor_for(f.file, ct, Quantity::time, "time");
    } else {
      std::vector<double> dt;
      dt.reserve(n);
      for (std::size_t k = 1; k < n; ++k)
        if (!new_section[k]) dt.push_back(t_raw[k] - t_raw[k - 1]);
      const double med = median(dt);
      detected = true;
      if (all_integer_times && med >= 100.0) {
        ut = *unit_factor(Quantity::time, "ms");
        c.unit = "ms";
        log.warnings.push_back("time unit not declared: read as ms (every time is a whole number and the median step is " +
                               fmt(med) + "); declare it with --columns time=NAME:s if it is in seconds");
      } else {
        c.unit = "s";
      }
    }
    describe(c, "time", ut, detected);
  }
  {
    Column c = cv;
    bool detected = false;
    if (cv.declared) {
      uv = factor_for(f.file, cv, Quantity::voltage, "voltage");
    } else {
      std::vector<double> a(v_raw.size());
      for (std::size_t k = 0; k < n; ++k) a[k] = std::fabs(v_raw[k]) / opts.series;
      const double med = median(a);
      detected = true;
      if (med >= 0.5 && med <= 6.0) {
        c.unit = "V";
      } else if (med >= 500.0 && med <= 6000.0) {
        uv = *unit_factor(Quantity::voltage, "mV");
        c.unit = "mV";
        log.warnings.push_back("voltage unit not declared: read as mV (median cell value " + fmt(med) + ")");
      } else {
        throw InputError(f.file + ": voltage column " + cv.title +
                         " looks like neither V nor mV for one cell (got a median of " + fmt(med) +
                         (opts.series > 1 ? " per cell with --series " + std::to_string(opts.series) : std::string{}) +
                         ", expected 0.5 to 6 V or 500 to 6000 mV; for a pack log give --series, or declare the unit "
                         "with --columns voltage=NAME:V)");
      }
    }
    describe(c, "voltage", uv, detected);
  }
  {
    Column c = ci;
    bool detected = false;
    if (ci.declared) {
      ui = factor_for(f.file, ci, Quantity::current, "current");
    } else {
      double imax = 0.0;
      for (double x : i_raw) imax = std::max(imax, std::fabs(x) / opts.parallel);
      const bool big = imax > 1000.0 || (opts.capacity_Ah && imax > 50.0 * *opts.capacity_Ah);
      detected = true;
      if (big) {
        ui = *unit_factor(Quantity::current, "mA");
        c.unit = "mA";
        log.warnings.push_back("current unit not declared: read as mA (largest cell value " + fmt(imax) +
                               "); declare it with --columns current=NAME:A if it is in amperes");
      } else {
        c.unit = "A";
        log.notes.push_back("current unit not declared: read as A (largest cell value " + fmt(imax) +
                            "); declare --columns current=NAME:mA if the log is in milliamperes");
      }
    }
    describe(c, "current", ui, detected);
  }
  if (ctemp) {
    Column c = *ctemp;
    bool detected = false;
    if (ctemp->declared) {
      utemp = factor_for(f.file, *ctemp, Quantity::temperature, "temperature");
    } else {
      std::vector<double> a;
      for (double x : temp_raw)
        if (std::isfinite(x)) a.push_back(x);
      detected = true;
      if (!a.empty() && median(a) > 200.0) {
        utemp = *unit_factor(Quantity::temperature, "K");
        c.unit = "K";
        log.warnings.push_back("temperature unit not declared: read as K (median " + fmt(median(a)) + ")");
      } else {
        c.unit = "C";
      }
    }
    describe(c, "temperature", utemp, detected);
  }
  if (cexcl) log.notes.push_back("exclude: " + cexcl->title);
  if (cmode) log.notes.push_back("mode: " + cmode->title);

  // --- one time axis; cell values ---
  log.time_s.resize(n);
  log.current_A.resize(n);
  log.voltage_V.resize(n);
  double offset = 0.0;
  for (std::size_t k = 0; k < n; ++k) {
    const double t = ut.scale * t_raw[k] + ut.offset;
    if (k == 0) {
      offset = -t;
      log.section_starts.push_back(0);
    } else if (new_section[k]) {
      // A new section continues the axis one second after the last row; no current flows in the
      // gap (fit::CellLog::section_starts).
      offset = log.time_s[k - 1] + 1.0 - t;
      log.section_starts.push_back(k);
    }
    log.time_s[k] = t + offset;
    // The axis must stay finite and strictly increasing (fit::CellLog): a time that overflows
    // its unit, or one so large (1e300 s) that the rows' steps round away, is refused here.
    if (!std::isfinite(log.time_s[k]))
      throw InputError(message(Source{f.file, {}}, "line " + std::to_string(lines[k]), "time out of range",
                               "\"" + fmt(t_raw[k]) + "\"", "a finite time in " + ut.si));
    if (k > 0 && !(log.time_s[k] > log.time_s[k - 1]))
      throw InputError(message(Source{f.file, {}}, "line " + std::to_string(lines[k]),
                               "time too large to tell apart from the row before", "\"" + fmt(t_raw[k]) + "\"",
                               "times whose steps survive rounding (below about 1e15 s)"));
    log.current_A[k] = ui.scale * i_raw[k] / opts.parallel;
    log.voltage_V[k] = uv.scale * v_raw[k] / opts.series;
    if (!(log.voltage_V[k] > 0.0) || log.voltage_V[k] > 10.0)
      throw InputError(message(Source{f.file, {}}, "line " + std::to_string(lines[k]),
                               "cell voltage out of range", fmt(log.voltage_V[k]) + " V",
                               "above 0 and at most 10 V per cell"));
  }
  log.line = std::move(lines);
  log.mode = std::move(modes);
  if (ctemp) {
    log.temperature_C.resize(n);
    for (std::size_t k = 0; k < n; ++k) log.temperature_C[k] = utemp.scale * temp_raw[k] + utemp.offset;
  }

  // --- sign: discharge positive ---
  double sign = 1.0;
  if (opts.discharge_positive) {
    sign = *opts.discharge_positive ? 1.0 : -1.0;
    log.notes.push_back(std::string("current sign: positive on ") +
                        (*opts.discharge_positive ? "discharge" : "charge") + " (as given)");
  } else if (std::all_of(log.current_A.begin(), log.current_A.end(), [](double i) { return i == 0.0; })) {
    log.notes.push_back("current sign: nothing to detect (the current is zero in every row)");
  } else {
    // A current step ΔI moves the terminal voltage by −ΔI·R0 when I is discharge positive, so
    // Σ ΔV·ΔI over the larger steps is negative (Thevenin model; common practice).
    double imax = 0.0;
    for (double x : log.current_A) imax = std::max(imax, std::fabs(x));
    double s = 0.0, scale = 0.0;
    std::size_t steps = 0;
    for (std::size_t k = 1; k < n; ++k) {
      if (log.starts_section(k)) continue;
      const double di = log.current_A[k] - log.current_A[k - 1];
      if (std::fabs(di) < 0.1 * imax || imax == 0.0) continue;
      s += (log.voltage_V[k] - log.voltage_V[k - 1]) * di;
      scale += std::fabs(di);
      ++steps;
    }
    std::string how;
    if (steps > 0 && std::fabs(s) > 1e-6 * scale) {
      sign = s < 0 ? 1.0 : -1.0;
      how = "from the voltage response at " + std::to_string(steps) + " current steps";
    } else {
      // No steps: under a sustained discharge the voltage falls.
      double drift = 0.0;
      for (std::size_t k = 1; k < n; ++k)
        if (!log.starts_section(k)) drift += log.current_A[k] * (log.voltage_V[k] - log.voltage_V[k - 1]);
      if (drift == 0.0)
        throw InputError(f.file + ": cannot tell whether the current is positive on discharge or on charge "
                                  "(no current steps and no voltage drift); give --discharge-positive or --discharge-negative");
      sign = drift < 0 ? 1.0 : -1.0;
      how = "from the voltage drift (no current steps)";
    }
    log.notes.push_back(std::string("current sign: detected positive on ") +
                        (sign > 0 ? "discharge" : "charge") + " " + how +
                        "; give --discharge-positive or --discharge-negative to state it");
  }
  if (sign < 0)
    for (double& x : log.current_A) x = -x;

  if (opts.series > 1 || opts.parallel > 1)
    log.notes.push_back("pack log " + std::to_string(opts.series) + "S" + std::to_string(opts.parallel) +
                        "P: voltage divided by " + std::to_string(opts.series) + ", current by " +
                        std::to_string(opts.parallel));
  if (excluded > 0) log.notes.push_back(std::to_string(excluded) + " rows marked as excluded were left out");
  if (blank > 0)
    log.warnings.push_back(std::to_string(blank) + " rows with an empty time, current or voltage were skipped (first at line " +
                           std::to_string(first_blank_line) + ")");
  if (duplicates > 0)
    log.warnings.push_back(std::to_string(duplicates) + " rows repeated the previous time stamp; the later row of each pair was kept");
  return log;
}

fit::CellLog load_cell_log(const std::filesystem::path& path, const CellLogOptions& opts) {
  return read_cell_log(read_delimited(path), opts);
}

}  // namespace sortie::io
