#include "io/flight_log_csv.hpp"

#include <algorithm>
#include <array>
#include <cmath>
#include <limits>
#include <optional>

#include "core/error.hpp"
#include "core/text.hpp"
#include "io/json_reader.hpp"
#include "io/log_header.hpp"

namespace sortie::io {

namespace {

const double kNaN = std::numeric_limits<double>::quiet_NaN();

/// The flight-log quantities and how their headers are recognised (io/log_header.hpp).
const std::vector<ColumnRule>& flight_rules() {
  static const std::vector<ColumnRule> rules = {
      {"time", Quantity::time, {"time", "t", "elapsed", "timestamp", "flighttime"}, {"time"}, {}, true},
      {"voltage", Quantity::voltage, {"voltage", "v", "volt", "volts"}, {"voltage", "volt"}, {"v"}, true},
      {"current", Quantity::current, {"current", "i", "curr", "amps"}, {"current"}, {"i"}, true},
      {"height", std::nullopt, {"height", "altitude", "alt", "agl"}, {"height", "altitude"}, {}, false},
      {"speed", std::nullopt, {"speed", "airspeed", "groundspeed", "gs", "ias", "tas"}, {"speed"}, {}, false},
      {"throttle", Quantity::throttle, {"throttle", "thr", "duty"}, {"throttle"}, {}, false},
      {"temp", Quantity::temperature, {"temperature", "temp"}, {"temp"}, {"t"}, false},
  };
  return rules;
}

using Column = ResolvedColumn;

/// SI factor for a column; height takes m, ft, km (no log quantity covers lengths).
UnitFactor factor(const std::string& file, const std::string& q, const Column& c) {
  std::optional<UnitFactor> f;
  std::string accepted;
  if (q == "height") {
    const std::string u = to_lower(c.unit);
    if (u.empty() || u == "m") f = UnitFactor{1.0, 0.0, "m"};
    else if (u == "ft") f = UnitFactor{0.3048, 0.0, "m"};
    else if (u == "km") f = UnitFactor{1000.0, 0.0, "m"};
    accepted = "m, ft, km";
  } else if (q == "speed") {
    const std::string u = to_lower(c.unit);
    if (u.empty() || u == "m/s" || u == "mps") f = UnitFactor{1.0, 0.0, "m/s"};
    else if (u == "km/h" || u == "kmh" || u == "kph") f = UnitFactor{1.0 / 3.6, 0.0, "m/s"};
    else if (u == "kn" || u == "kt" || u == "kts") f = UnitFactor{1852.0 / 3600.0, 0.0, "m/s"};
    accepted = "m/s, km/h, kn";
  } else {
    const Quantity k = q == "time" ? Quantity::time
                       : q == "voltage" ? Quantity::voltage
                       : q == "current" ? Quantity::current
                       : q == "throttle" ? Quantity::throttle
                                         : Quantity::temperature;
    f = c.unit.empty() ? (k == Quantity::throttle ? unit_factor(k, "%") : unit_factor(k, k == Quantity::time ? "s" : k == Quantity::voltage ? "V" : k == Quantity::current ? "A" : "C"))
                       : unit_factor(k, c.unit);
    accepted = accepted_units(k);
  }
  if (!f)
    throw InputError(file + ": " + q + " column " + c.title + ": unit '" + c.unit +
                     "' not accepted (expected " + accepted + ")");
  return *f;
}

}  // namespace

const std::vector<std::string>& flight_log_quantities() {
  static const std::vector<std::string> q = rule_keys(flight_rules());
  return q;
}

namespace {

/// The log's text and where its columns are: what each row's reading needs.
struct LogLayout {
  const DelimitedFile& f;
  const ResolvedColumns& cols;
  std::map<std::string, UnitFactor> fac;
  bool decimal_comma = false;

  std::string field(std::size_t r, const Column& c) const {
    const auto& row = f.rows[r];
    return c.index < row.size() ? row[c.index] : std::string{};
  }
  std::string where(std::size_t r) const { return "line " + std::to_string(f.lines[r]); }
};

/// Row r's time, pack voltage and current in SI (time as written, before the first row's is
/// taken off); InputError naming the line for a cell that does not read.
std::array<double, 3> required_values(const LogLayout& L, std::size_t r) {
  std::array<double, 3> vals{};
  const char* req[] = {"time", "voltage", "current"};
  for (int k = 0; k < 3; ++k) {
    const Column& c = L.cols.at(req[k]);
    const std::string s = L.field(r, c);
    const auto v = k == 0 ? parse_log_time(s, L.decimal_comma) : parse_log_number(s, L.decimal_comma);
    if (!v)
      throw InputError(message(Source{L.f.file, {}}, L.where(r),
                               std::string(req[k]) + " column " + c.title + " is not a number",
                               "\"" + s + "\"", k == 0 ? "a number or a clock time such as 01:02:03.5" : "a number"));
    vals[k] = *v * L.fac.at(req[k]).scale + L.fac.at(req[k]).offset;
  }
  return vals;
}

/// The checks of one row against the one before: time increasing, voltage and current in range.
void check_row(const LogLayout& L, std::size_t r, double t, double t_prev, double v, double i) {
  const Source src{L.f.file, {}};
  if (!std::isnan(t_prev) && !(t > t_prev))
    throw InputError(message(src, L.where(r), "time does not increase",
                             format_number(t) + " s after " + format_number(t_prev) + " s", "a later time than the row before"));
  if (!(v > 0.0 && v < 1000.0))
    throw InputError(message(src, L.where(r), "pack voltage out of range", format_number(v) + " V",
                             "a voltage from 0 to 1000 V"));
  if (!(std::abs(i) < 1e5))
    throw InputError(message(src, L.where(r), "pack current out of range", format_number(i) + " A",
                             "a current from -100000 to 100000 A"));
}

/// Row r's optional quantities (height, speed, throttle, temperature) appended to the log, NaN
/// for an empty cell.
void read_optional(const LogLayout& L, std::size_t r, FlightLog& log) {
  std::vector<double>* optional_out[] = {&log.height_m, &log.speed_mps, &log.throttle, &log.temperature_C};
  const char* optional_q[] = {"height", "speed", "throttle", "temp"};
  for (int k = 0; k < 4; ++k) {
    auto it = L.cols.find(optional_q[k]);
    if (it == L.cols.end()) continue;
    const std::string s = L.field(r, it->second);
    double v = kNaN;
    if (!s.empty()) {
      const auto x = parse_log_number(s, L.decimal_comma);
      if (!x)
        throw InputError(message(Source{L.f.file, {}}, L.where(r),
                                 std::string(optional_q[k]) + " column " + it->second.title + " is not a number",
                                 "\"" + s + "\"", "a number or an empty cell"));
      v = *x * L.fac.at(optional_q[k]).scale + L.fac.at(optional_q[k]).offset;
    }
    optional_out[k]->push_back(v);
  }
}

}  // namespace

FlightLog read_flight_log(const DelimitedFile& f, const std::map<std::string, ColumnRef>& columns) {
  FlightLog log;
  log.file = f.file;
  log.comments = f.comments;
  if (f.rows.empty()) throw InputError(f.file + ": no data rows (the file is empty)");
  const LogHeader h = find_log_header(f, flight_rules(), columns, "Time(s), Voltage(V), Current(A)");
  LogLayout L{f, h.columns, {}, f.delimiter != ','};
  for (const auto& [q, c] : h.columns) L.fac[q] = factor(f.file, q, c);
  double t0 = kNaN, t_prev = kNaN;
  for (std::size_t r = h.row ? *h.row + 1 : 0; r < f.rows.size(); ++r) {
    const auto vals = required_values(L, r);
    if (std::isnan(t0)) t0 = vals[0];
    const double t = vals[0] - t0;
    check_row(L, r, t, t_prev, vals[1], vals[2]);
    t_prev = t;
    log.time_s.push_back(t);
    log.voltage_V.push_back(vals[1]);
    log.current_A.push_back(vals[2]);
    log.lines.push_back(f.lines[r]);
    read_optional(L, r, log);
  }
  if (log.time_s.size() < 2)
    throw InputError(f.file + ": fewer than 2 data rows (got " + std::to_string(log.time_s.size()) +
                     ", expected a flight sampled at least twice)");
  return log;
}

FlightLog read_flight_log_file(const std::filesystem::path& path, const std::map<std::string, ColumnRef>& columns) {
  return read_flight_log(read_delimited(path), columns);
}

}  // namespace sortie::io
