// Units, current sign and step modes of a cell log: what the file does not declare is detected,
// and every detection is reported.
#include <algorithm>
#include <cmath>
#include <limits>

#include "core/error.hpp"
#include "core/text.hpp"
#include "io/cell_log_steps.hpp"

namespace sortie::io::cell_log_detail {

namespace {

std::string fmt(double v) { return format_number(v); }

double median(std::vector<double> v) {
  if (v.empty()) return std::numeric_limits<double>::quiet_NaN();
  const auto mid = v.begin() + static_cast<std::ptrdiff_t>(v.size() / 2);
  std::nth_element(v.begin(), mid, v.end());
  return *mid;
}

/// A declared unit, checked against what the quantity accepts.
UnitFactor declared(const std::string& file, const ResolvedColumn& c, Quantity q, const std::string& what) {
  const auto f = unit_factor(q, c.unit);
  if (!f)
    throw InputError(file + ": " + what + " column " + c.title + ": unit '" + c.unit +
                     "' not accepted (expected " + accepted_units(q) + ")");
  return *f;
}

void describe(battery::CellLog& log, const ResolvedColumn& c, const std::string& q, const std::string& unit, bool detected) {
  log.notes.push_back(q + ": " + c.title + " in " + unit + (detected ? " (detected)" : ""));
}

/// Time: s, or ms when every time is a whole number and the median step is 100 or more.
UnitFactor time_unit(const std::string& file, const ResolvedColumn& c, const RawRows& raw, battery::CellLog& log) {
  if (c.declared) {
    const UnitFactor u = declared(file, c, Quantity::time, "time");
    describe(log, c, "time", c.unit, false);
    return u;
  }
  std::vector<double> dt;
  dt.reserve(raw.size());
  for (std::size_t k = 1; k < raw.size(); ++k)
    if (!raw.new_section[k]) dt.push_back(raw.t[k] - raw.t[k - 1]);
  const double med = median(dt);
  if (raw.all_integer_times && med >= 100.0) {
    log.warnings.push_back("time unit not declared: read as ms (every time is a whole number and the median step is " +
                           fmt(med) + "); declare it with --columns time=NAME:s if it is in seconds");
    describe(log, c, "time", "ms", true);
    return *unit_factor(Quantity::time, "ms");
  }
  describe(log, c, "time", "s", true);
  return UnitFactor{1.0, 0.0, "s"};
}

/// Voltage: V or mV from the median per-cell magnitude.
UnitFactor voltage_unit(const std::string& file, const ResolvedColumn& c, const RawRows& raw,
                        const CellLogOptions& opts, battery::CellLog& log) {
  if (c.declared) {
    const UnitFactor u = declared(file, c, Quantity::voltage, "voltage");
    describe(log, c, "voltage", c.unit, false);
    return u;
  }
  std::vector<double> a(raw.size());
  for (std::size_t k = 0; k < raw.size(); ++k) a[k] = std::fabs(raw.v[k]) / opts.series;
  const double med = median(a);
  if (med >= 0.5 && med <= 6.0) {
    describe(log, c, "voltage", "V", true);
    return UnitFactor{1.0, 0.0, "V"};
  }
  if (med >= 500.0 && med <= 6000.0) {
    log.warnings.push_back("voltage unit not declared: read as mV (median cell value " + fmt(med) + ")");
    describe(log, c, "voltage", "mV", true);
    return *unit_factor(Quantity::voltage, "mV");
  }
  throw InputError(file + ": voltage column " + c.title + " looks like neither V nor mV for one cell (got a median of " +
                   fmt(med) + (opts.series > 1 ? " per cell with --series " + std::to_string(opts.series) : std::string{}) +
                   ", expected 0.5 to 6 V or 500 to 6000 mV; for a pack log give --series, or declare the unit "
                   "with --columns voltage=NAME:V)");
}

/// Current: A, or mA when the largest per-cell value exceeds 1000 (or 50 × the capacity).
UnitFactor current_unit(const std::string& file, const ResolvedColumn& c, const RawRows& raw,
                        const CellLogOptions& opts, battery::CellLog& log) {
  if (c.declared) {
    const UnitFactor u = declared(file, c, Quantity::current, "current");
    describe(log, c, "current", c.unit, false);
    return u;
  }
  double imax = 0.0;
  for (double x : raw.i) imax = std::max(imax, std::fabs(x) / opts.parallel);
  if (imax > 1000.0 || (opts.capacity_Ah && imax > 50.0 * *opts.capacity_Ah)) {
    log.warnings.push_back("current unit not declared: read as mA (largest cell value " + fmt(imax) +
                           "); declare it with --columns current=NAME:A if it is in amperes");
    describe(log, c, "current", "mA", true);
    return *unit_factor(Quantity::current, "mA");
  }
  log.notes.push_back("current unit not declared: read as A (largest cell value " + fmt(imax) +
                      "); declare --columns current=NAME:mA if the log is in milliamperes");
  describe(log, c, "current", "A", true);
  return UnitFactor{1.0, 0.0, "A"};
}

/// Temperature: °C, or K when the median is above 200.
UnitFactor temp_unit(const std::string& file, const ResolvedColumn& c, const RawRows& raw, battery::CellLog& log) {
  if (c.declared) {
    const UnitFactor u = declared(file, c, Quantity::temperature, "temperature");
    describe(log, c, "temperature", c.unit, false);
    return u;
  }
  std::vector<double> a;
  for (double x : raw.temp)
    if (std::isfinite(x)) a.push_back(x);
  if (!a.empty() && median(a) > 200.0) {
    log.warnings.push_back("temperature unit not declared: read as K (median " + fmt(median(a)) + ")");
    describe(log, c, "temperature", "K", true);
    return *unit_factor(Quantity::temperature, "K");
  }
  describe(log, c, "temperature", "C", true);
  return UnitFactor{1.0, 0.0, "°C"};
}

/// The sign that makes the current discharge positive, and how it was found. A current step ΔI
/// moves the terminal voltage by −ΔI·R0 when I is discharge positive, so Σ ΔV·ΔI over the
/// larger steps is negative (Thevenin model; common practice); with no steps, the voltage falls
/// under a sustained discharge.
double detected_sign(const std::string& file, const battery::CellLog& log, std::string& how) {
  const std::size_t n = log.size();
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
  if (steps > 0 && std::fabs(s) > 1e-6 * scale) {
    how = "from the voltage response at " + std::to_string(steps) + " current steps";
    return s < 0 ? 1.0 : -1.0;
  }
  double drift = 0.0;
  for (std::size_t k = 1; k < n; ++k)
    if (!log.starts_section(k)) drift += log.current_A[k] * (log.voltage_V[k] - log.voltage_V[k - 1]);
  if (drift == 0.0)
    throw InputError(file + ": cannot tell whether the current is positive on discharge or on charge "
                            "(no current steps and no voltage drift); give --discharge-positive or --discharge-negative");
  how = "from the voltage drift (no current steps)";
  return drift < 0 ? 1.0 : -1.0;
}

/// A mode cell's meaning from its words: rest, charge or discharge ("" when it says none).
/// Letters only, lower case; "dis…"/"dch…" before "ch…" since a discharge word holds "charge".
std::string mode_meaning(const std::string& text) {
  const std::string w = normalise_name(text);
  auto starts = [&](const char* p) { return w.rfind(p, 0) == 0; };
  auto has = [&](const char* p) { return w.find(p) != std::string::npos; };
  if (w.empty()) return "";
  if (w == "d" || starts("dis") || starts("dch") || has("discharg") || has("dchg")) return "discharge";
  if (w == "c" || starts("ch") || has("charg") || has("chg")) return "charge";
  if (w == "r" || starts("rest") || starts("pause") || starts("idle") || starts("relax") || starts("wait") ||
      starts("ocv") || starts("open"))
    return "rest";
  return "";
}

}  // namespace

CellUnits cell_units(const std::string& file, const CellColumns& cols, const RawRows& raw,
                     const CellLogOptions& opts, battery::CellLog& log) {
  CellUnits u;
  u.time = time_unit(file, cols.time, raw, log);
  u.voltage = voltage_unit(file, cols.voltage, raw, opts, log);
  u.current = current_unit(file, cols.current, raw, opts, log);
  if (cols.temp) u.temp = temp_unit(file, *cols.temp, raw, log);
  if (cols.exclude) log.notes.push_back("exclude: " + cols.exclude->title);
  if (cols.mode) log.notes.push_back("mode: " + cols.mode->title);
  return u;
}

void orient_current(const std::string& file, const CellLogOptions& opts, battery::CellLog& log) {
  double sign = 1.0;
  if (opts.discharge_positive) {
    sign = *opts.discharge_positive ? 1.0 : -1.0;
    log.notes.push_back(std::string("current sign: positive on ") +
                        (*opts.discharge_positive ? "discharge" : "charge") + " (as given)");
  } else if (std::all_of(log.current_A.begin(), log.current_A.end(), [](double i) { return i == 0.0; })) {
    log.notes.push_back("current sign: nothing to detect (the current is zero in every row)");
  } else {
    std::string how;
    sign = detected_sign(file, log, how);
    log.notes.push_back(std::string("current sign: detected positive on ") + (sign > 0 ? "discharge" : "charge") + " " +
                        how + "; give --discharge-positive or --discharge-negative to state it");
  }
  if (sign < 0)
    for (double& x : log.current_A) x = -x;
}

void read_modes(const std::vector<std::string>& text, battery::CellLog& log) {
  if (text.empty()) return;
  // Text with no meaning of its own: rest at or below 1 % of the largest current (common
  // practice for a cycler's zero-current steps), else charge or discharge by the current's sign.
  double imax = 0.0;
  for (double x : log.current_A) imax = std::max(imax, std::fabs(x));
  std::size_t by_current = 0;
  std::string first_unread;
  log.mode.resize(text.size());
  for (std::size_t k = 0; k < text.size(); ++k) {
    std::string m = mode_meaning(text[k]);
    if (m.empty()) {
      ++by_current;
      if (first_unread.empty() && !text[k].empty()) first_unread = text[k];
      const double i = log.current_A[k];
      m = std::fabs(i) <= 0.01 * imax ? "rest" : i > 0 ? "discharge" : "charge";
    }
    log.mode[k] = std::move(m);
  }
  if (by_current > 0)
    log.notes.push_back("mode: " + std::to_string(by_current) + " rows " +
                        (first_unread.empty() ? std::string("with an empty mode")
                                              : "with a mode such as \"" + first_unread + "\" that names no rest, charge or discharge") +
                        " read from the current (rest at or below 1 % of the largest current)");
}

}  // namespace sortie::io::cell_log_detail
