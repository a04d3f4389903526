#include "io/bench_csv.hpp"

#include <algorithm>
#include <cctype>
#include <optional>

#include "core/error.hpp"
#include "core/suggest.hpp"
#include "core/text.hpp"
#include "io/json_reader.hpp"
#include "io/log_header.hpp"

namespace sortie::io {

namespace {

struct Unit {
  std::vector<std::string> names;  ///< lower-case spellings
  double factor;                   ///< SI value = file value · factor (throttle: see below)
  std::string label;               ///< as shown in messages
};

struct BenchQuantity {
  std::string name;
  std::string what;                ///< for messages: "thrust"
  ColumnRule rule;                 ///< how its header is recognised (io/log_header.hpp)
  std::vector<Unit> units;
  bool required = true;
};

// Throttle units: factor 0 marks a pulse width in µs (1000–2000 µs → 0–100 %), 1 a percent.
// Names are matched as words and units, not as any one program's spellings: "Duty command
// (µs)", "supply_voltage_V", "bus_A", "shaft speed [rpm]", "thrust_N" all work.
const std::vector<BenchQuantity>& quantities() {
  using Q = io::Quantity;
  static const std::vector<BenchQuantity> q = {
      {"throttle", "throttle",
       {"throttle", Q::throttle, {"throttle", "duty", "pwm", "signal", "command", "cmd"}, {"throttle", "duty", "signal", "command", "pwm"}, {}, true},
       {{{"us", "µs", "μs"}, 0.0, "us"}, {{"pct", "%", "percent"}, 1.0, "%"}}},
      {"voltage", "bus voltage", {"voltage", Q::voltage, {"voltage", "v", "u", "volt", "volts", "bus"}, {"voltage", "volt"}, {}, true},
       {{{"v"}, 1.0, "V"}, {{"mv"}, 1e-3, "mV"}}},
      {"current", "bus current", {"current", Q::current, {"current", "i", "amps", "bus"}, {"current"}, {}, true},
       {{{"a"}, 1.0, "A"}, {{"ma"}, 1e-3, "mA"}}},
      {"rpm", "rotation speed", {"rpm", Q::speed, {"rpm", "speed", "n"}, {"speed", "rpm"}, {}, true},
       {{{"rpm", "rev/min", "1/min"}, 1.0, "rpm"},
        {{"rps", "rev/s"}, 60.0, "rps"},
        {{"rad/s"}, 60.0 / (2.0 * 3.14159265358979323846), "rad/s"}}},
      {"thrust", "thrust", {"thrust", Q::force, {"thrust"}, {"thrust"}, {}, true},
       {{{"n"}, 1.0, "N"},
        {{"g", "gf"}, 9.80665e-3, "g"},
        {{"kg", "kgf"}, 9.80665, "kgf"},
        {{"lbf"}, 4.4482216152605, "lbf"},
        {{"ozf"}, 0.27801385095378125, "ozf"}}},
      {"torque", "torque", {"torque", Q::torque, {"torque"}, {"torque"}, {}, false},
       {{{"nm", "n·m", "n*m", "n.m", "n-m", "n m"}, 1.0, "N·m"},
        {{"nmm", "n·mm", "n*mm", "n.mm", "mnm", "mn·m", "mn*m"}, 1e-3, "N·mm"},
        {{"kgf·cm", "kgfcm", "kgf*cm", "kgf.cm", "kg·cm", "kgcm"}, 0.0980665, "kgf·cm"}},
       false},
  };
  return q;
}

const BenchQuantity& quantity(const std::string& name) {
  for (const auto& q : quantities())
    if (q.name == name) return q;
  throw std::logic_error("unknown bench quantity " + name);
}

const Unit* find_unit(const BenchQuantity& q, const std::string& unit) {
  const std::string u = to_lower(trim(unit));
  for (const auto& un : q.units)
    if (std::find(un.names.begin(), un.names.end(), u) != un.names.end()) return &un;
  return nullptr;
}

std::string unit_list(const BenchQuantity& q) {
  std::string s;
  for (const auto& u : q.units) s += (s.empty() ? "" : ", ") + u.label;
  return s;
}

struct Found {
  std::size_t col = 0;
  const Unit* unit = nullptr;
};

[[noreturn]] void header_fail(const CsvFile& csv, const std::string& what, const std::string& got,
                              const std::string& expected) {
  throw InputError(message(Source{csv.file, {}}, "line " + std::to_string(csv.header_line), what,
                           got, expected));
}

std::string header_text(const CsvFile& csv) {
  std::string have;
  for (const auto& h : csv.header) have += (have.empty() ? "" : ",") + h;
  return "header \"" + have + "\"";
}

std::optional<Found> locate(const CsvFile& csv, const BenchQuantity& q, const BenchColumns& columns) {
  if (auto it = columns.find(q.name); it != columns.end()) {
    const BenchColumn& bc = it->second;
    const auto col = csv.find_column({bc.header});
    if (!col)
      header_fail(csv, "missing column '" + bc.header + "' named by --columns for " + q.what,
                  header_text(csv), "a column named '" + bc.header + "'");
    std::string unit = bc.unit;
    if (unit.empty()) unit = split_header(csv.header[*col]).unit;
    if (unit.empty() && q.name == "rpm" && split_header(bc.header).base == "rpm") unit = "rpm";
    if (unit.empty())
      header_fail(csv, "column '" + csv.header[*col] + "' declares no unit for " + q.what, "",
                  "--columns " + q.name + "=" + bc.header + ":UNIT with UNIT one of " + unit_list(q));
    const Unit* u = find_unit(q, unit);
    if (!u)
      header_fail(csv, "column '" + csv.header[*col] + "': unknown unit for " + q.what,
                  "'" + unit + "'", unit_list(q));
    return Found{*col, u};
  }
  // The best-matching header cells (io/log_header.hpp): two equally good ones are refused.
  std::optional<Found> found;
  int best = 0;
  for (std::size_t c = 0; c < csv.header.size(); ++c) {
    const int score = match_score(csv.header[c], q.rule);
    if (score == 0 || score < best) continue;
    const HeaderName hp = split_header(csv.header[c]);
    std::string unit = hp.unit;
    if (unit.empty() && q.name == "rpm" && hp.base == "rpm") unit = "rpm";
    const Unit* u = find_unit(q, unit);
    // A name shared by two quantities ("bus") belongs to the one whose unit it carries.
    bool shared = false;
    for (const auto& other : quantities())
      if (&other != &q && match_score(csv.header[c], other.rule) > 0) shared = true;
    if (!u && shared) continue;
    if (!u && unit.empty())
      header_fail(csv, "column '" + csv.header[c] + "' declares no unit for " + q.what, "",
                  "a name like '" + hp.base + "_" + q.units.front().label + "' or '" + hp.base + " (" +
                      q.units.front().label + ")' with a unit among " + unit_list(q));
    if (!u)
      header_fail(csv, "column '" + csv.header[c] + "': unknown unit for " + q.what,
                  "'" + unit + "'", unit_list(q));
    if (found && score == best)
      header_fail(csv, "two columns for " + q.what,
                  "'" + csv.header[found->col] + "' and '" + csv.header[c] + "'",
                  "one (or name it with --columns " + q.name + "=HEADER)");
    found = Found{c, u};
    best = score;
  }
  if (!found && q.required) {
    std::string names;
    for (const auto& b : q.rule.words) names += (names.empty() ? "'" : ", '") + b + "'";
    header_fail(csv, "missing column for " + q.what, header_text(csv),
                "a column named " + names + " with its unit, or --columns " + q.name + "=HEADER:UNIT");
  }
  return found;
}

std::string value_with_unit(double v, const Unit& u) { return format_number(v) + " " + u.label; }

}  // namespace

const std::vector<std::string>& bench_quantities() {
  static const std::vector<std::string> names = [] {
    std::vector<ColumnRule> rules;
    for (const auto& q : quantities()) rules.push_back(q.rule);
    return rule_keys(rules);
  }();
  return names;
}

BenchColumns parse_bench_columns(const std::string& spec) {
  BenchColumns out;
  for (const std::string& item : spec_items(spec)) {
    const auto eq = item.find('=');
    if (eq == std::string::npos)
      throw UsageError("--columns: entry without '=' (got \"" + item +
                       "\", expected quantity=HEADER or quantity=HEADER:UNIT)");
    const std::string qn = to_lower(trim(item.substr(0, eq)));
    std::string header = trim(item.substr(eq + 1));
    check_quantity(qn, bench_quantities());
    BenchColumn bc;
    if (const auto colon = header.rfind(':'); colon != std::string::npos) {
      bc.unit = trim(header.substr(colon + 1));
      header = trim(header.substr(0, colon));
      const BenchQuantity& q = quantity(qn);
      if (bc.unit.empty() || !find_unit(q, bc.unit))
        throw UsageError("--columns: unknown unit for " + qn + " (got '" + bc.unit + "', expected " +
                         unit_list(q) + ")");
    }
    if (header.empty())
      throw UsageError("--columns: empty header name for " + qn + " (expected " + qn + "=HEADER)");
    if (out.count(qn)) throw UsageError("--columns: " + qn + " named twice");
    bc.header = header;
    out[qn] = bc;
  }
  return out;
}

propulsion::BenchMap read_bench_csv(const CsvFile& csv, const BenchColumns& columns) {
  std::map<std::string, Found> at;
  for (const auto& q : quantities())
    if (auto f = locate(csv, q, columns)) at[q.name] = *f;
  const Found th = at.at("throttle"), vo = at.at("voltage"), cu = at.at("current"),
              rp = at.at("rpm"), tr = at.at("thrust");
  const Found* tq = at.count("torque") ? &at.at("torque") : nullptr;  // optional column
  const bool pulse = th.unit->factor == 0.0;

  std::vector<propulsion::BenchRow> rows;
  double last_throttle = 0.0, last_thrust = 0.0;
  for (std::size_t r = 0; r < csv.rows.size(); ++r) {
    propulsion::BenchRow row;
    const double t_raw = csv.number(r, th.col, pulse ? "a pulse width in us" : "a throttle in %");
    if (pulse && (t_raw < 1000.0 || t_raw > 2000.0))
      csv.fail(r, "throttle outside the pulse-width range", value_with_unit(t_raw, *th.unit),
               "1000 to 2000 us");
    if (!pulse && (t_raw < 0.0 || t_raw > 100.0))
      csv.fail(r, "throttle outside 0 to 100 %", value_with_unit(t_raw, *th.unit), "0 to 100 %");
    row.throttle_pct = pulse ? (t_raw - 1000.0) / 10.0 : t_raw;  // 1000–2000 µs → 0–100 %
    const double v_raw = csv.number(r, vo.col, "a bus voltage in " + vo.unit->label);
    row.v_bus_V = v_raw * vo.unit->factor;
    if (!(row.v_bus_V > 0.0))
      csv.fail(r, "bus voltage not positive", value_with_unit(v_raw, *vo.unit), "a voltage > 0");
    const double i_raw = csv.number(r, cu.col, "a bus current in " + cu.unit->label);
    row.i_bus_A = i_raw * cu.unit->factor;
    if (row.i_bus_A < 0.0)
      csv.fail(r, "bus current negative", value_with_unit(i_raw, *cu.unit), "a current >= 0");
    const double n_raw = csv.number(r, rp.col, "a speed in " + rp.unit->label);
    row.rpm = n_raw * rp.unit->factor;
    if (row.rpm < 0.0) csv.fail(r, "rotation speed negative", value_with_unit(n_raw, *rp.unit), "a speed >= 0");
    const double f_raw = csv.number(r, tr.col, "a thrust in " + tr.unit->label);
    row.thrust_N = f_raw * tr.unit->factor;
    if (row.thrust_N < 0.0) csv.fail(r, "thrust negative", value_with_unit(f_raw, *tr.unit), "a thrust >= 0");
    if (tq) {
      const double q_raw = csv.number(r, tq->col, "a torque in " + tq->unit->label);
      if (q_raw < 0.0) csv.fail(r, "torque negative", value_with_unit(q_raw, *tq->unit), "a torque >= 0");
      row.torque_Nm = q_raw * tq->unit->factor;
    }
    if (!rows.empty()) {
      if (!(row.throttle_pct > rows.back().throttle_pct))
        csv.fail(r, "throttle not increasing from the row before", value_with_unit(t_raw, *th.unit),
                 "above " + value_with_unit(last_throttle, *th.unit));
      if (!(row.thrust_N > rows.back().thrust_N))
        csv.fail(r, "thrust not increasing with throttle",
                 value_with_unit(f_raw, *tr.unit) + " at " + value_with_unit(t_raw, *th.unit),
                 "above " + value_with_unit(last_thrust, *tr.unit));
    }
    last_throttle = t_raw;
    last_thrust = f_raw;
    rows.push_back(row);
  }
  if (rows.size() < 2)
    throw InputError(csv.file + ": too few rows (got " + std::to_string(rows.size()) +
                     ", expected at least 2 throttle steps)");
  return propulsion::make_bench_map(std::move(rows));
}

propulsion::BenchMap load_bench_csv(const std::filesystem::path& path, const BenchColumns& columns) {
  return read_bench_csv(read_csv(path), columns);
}

}  // namespace sortie::io
