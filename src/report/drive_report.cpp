#include "report/drive_report.hpp"

#include "core/text.hpp"

#include <cmath>

#include "report/text_table.hpp"

namespace sortie::report {

namespace {

using propulsion::BusStatus;
using propulsion::kStandardGravity;
using propulsion::OperatingPoint;

double grams(double newtons) { return newtons / kStandardGravity * 1000.0; }

std::string pct(double fraction, int digits = 1) { return fixed(fraction * 100.0, digits); }

// The first column of a TextTable is left-aligned: pad a number there so its digits line up.
std::string first_column(double v, int digits, std::size_t width = 5) {
  std::string s = fixed(v, digits);
  if (s.size() < width) s.insert(0, width - s.size(), ' ');
  return s;
}

std::string thrust_words(double n) { return fixed(n, 2) + " N"; }

std::string case_label(const DriveCase& c) {
  if (c.cells) return std::to_string(*c.cells) + "S";
  return fixed(c.v_bus_V, 2) + " V";
}

std::string air_words(const DriveResult& r) {
  std::string s = "air " + fixed(r.rho_kg_m3, 4) + " kg/m³";
  if (r.altitude_m) s += " (ISA at " + fixed(*r.altitude_m, 0) + " m)";
  else if (r.density_given) s += " (as given)";
  else s += " (ISA sea level)";
  return s + ", axial airspeed " + fixed(r.v_axial_mps, 1) + " m/s";
}

// In the order of the physics: the ESC's duty turns the motor, the rotor's speed makes the
// thrust, the shaft power it takes, the bus power and current that feed it; then the
// efficiencies along that chain and thrust per bus power.
const std::vector<std::string> kRowHeader = {"duty %",    "rpm",       "thrust N",     "shaft W",
                                             "bus W",     "bus A",     "motor η %",    "ESC η %",
                                             "drive η %", "g/W",       "status"};

std::vector<std::string> row_cells(const DriveRow& row) {
  const auto& m = row.op.motor;
  const auto& b = row.op.bus;
  return {first_column(b.duty * 100.0, 1), fixed(m.rpm, 0),      fixed(m.thrust_N, 2),
          fixed(m.shaft_W, 1),             fixed(b.bus_W, 1),    fixed(b.bus_A, 2),
          pct(b.eta_motor),                pct(b.eta_esc),       pct(b.eta_system),
          fixed(b.g_per_W, 2),             propulsion::to_string(b.status)};
}

// One line for each kind of trouble in a case (the first row showing it), so a sweep that runs
// into the current limit says so once.
std::string case_notes(const propulsion::Drive& d, const DriveCase& c, bool sweep) {
  std::string out;
  bool said_sat = false, said_cur = false, said_table = false, said_inf = false;
  for (const auto& row : c.rows) {
    const auto& m = row.op.motor;
    const auto& b = row.op.bus;
    const std::string where = sweep && row.throttle_pct
                                  ? "from duty " + pct(row.op.bus.duty, 0) + " %: "
                                  : "";
    if (b.saturated && !said_sat) {
      said_sat = true;
      out += "  saturated: " + where + "needs duty " + pct(b.duty) + " % above the ESC's " +
             pct(d.esc.duty_max, 0) + " %; " + thrust_words(b.thrust_available_N.value_or(0.0)) +
             " available at " + fixed(c.v_bus_V, 2) + " V\n";
    }
    if (b.over_current && !said_cur) {
      said_cur = true;
      std::string which;
      if (m.motor_over_current) which = "the motor's " + fixed(d.motor.i_max_A, 1) + " A";
      if (m.esc_over_current)
        which += (which.empty() ? "" : " and ") + std::string("the ESC's ") + fixed(d.esc.i_max_A, 1) + " A";
      out += "  over_current: " + where + "motor current " + fixed(m.i_motor_A, 2) + " A above " +
             which;
      if (m.thrust_at_current_limit_N)
        out += "; the limit is reached at " + thrust_words(*m.thrust_at_current_limit_N);
      out += "\n";
    }
    if (b.status == BusStatus::infeasible && !said_inf) {
      said_inf = true;
      out += "  infeasible: " + where +
             "no operating point (the prop would drive the motor, or the thrust is out of reach)\n";
    }
    if (m.beyond_prop_table && m.rpm > 0.0 && !said_table) {
      said_table = true;
      out += "  note: " + where + "advance ratio J = " + fixed(m.advance_ratio, 2) +
             " beyond the prop tables (to J = " + fixed(d.prop.j_covered_max(), 2) +
             "): coefficients held at their last values\n";
    }
  }
  return out;
}

std::string bench_text(const DriveResult& r, const BenchView& bv) {
  const auto& map = bv.map;
  std::string out = "\nmeasured map: " + bv.file + ", " + std::to_string(map.rows.size()) +
                    " rows, bus " + fixed(map.v_bus_min_V, 2) + " to " + fixed(map.v_bus_max_V, 2) +
                    " V (mean " + fixed(map.v_bus_mean_V, 2) + " V), one rotor\n";
  std::vector<std::string> header = {"throttle %", "rpm", "thrust N", "bus V", "bus A", "bus W", "g/W"};
  if (map.has_torque) {
    header.push_back("shaft W");
    header.push_back("system η %");
  }
  const bool model = !bv.model_at_rows.empty();
  if (model) {
    header.push_back("model bus W");
    header.push_back("model − bench %");
  }
  TextTable t(header);
  for (std::size_t i = 0; i < map.rows.size(); ++i) {
    const auto& row = map.rows[i];
    const double bus_W = row.bus_W();
    std::vector<std::string> cells = {
        first_column(row.throttle_pct, 1), fixed(row.rpm, 0), fixed(row.thrust_N, 2), fixed(row.v_bus_V, 2),
        fixed(row.i_bus_A, 2), fixed(bus_W, 1), bus_W > 0.0 ? fixed(grams(row.thrust_N) / bus_W, 2) : "-"};
    if (map.has_torque) {
      cells.push_back(fixed(row.shaft_W(), 1));
      cells.push_back(bus_W > 0.0 ? pct(row.shaft_W() / bus_W) : "-");
    }
    if (model) {
      const auto& op = bv.model_at_rows[i];
      cells.push_back(fixed(op.bus.bus_W, 1));
      cells.push_back(bus_W > 0.0 && row.thrust_N > 0.0 ? fixed((op.bus.bus_W / bus_W - 1.0) * 100.0, 1)
                                                        : "-");
    }
    t.add_row(std::move(cells));
  }
  out += t.render();
  if (bv.v_bus_asked_V && std::fabs(*bv.v_bus_asked_V / map.v_bus_mean_V - 1.0) > 0.05)
    out += "  note: the map was measured at " + fixed(map.v_bus_mean_V, 2) + " V, not " +
           fixed(*bv.v_bus_asked_V, 2) +
           " V: duty and switching loss differ at another voltage and the map is not corrected\n";
  if (bv.at_thrust) {
    const auto& p = *bv.at_thrust;
    out += "  map at " + thrust_words(p.thrust_N) + ": bus " + fixed(p.bus_W, 1) + " W, " +
           fixed(p.bus_A, 2) + " A, " + fixed(p.rpm, 0) + " rpm, " + fixed(p.g_per_W, 2) + " g/W";
    if (map.has_torque) out += ", system η " + pct(p.eta_system) + " %";
    out += "\n";
    if (p.status == BusStatus::saturated)
      out += "  saturated: above the largest measured thrust, " +
             thrust_words(p.thrust_available_N.value_or(0.0)) +
             "; the figures are extrapolated from the last two rows\n";
    else if (p.extrapolated)
      out += "  note: below the smallest measured thrust; the figures are extrapolated\n";
    if (r.drive && !r.cases.empty() && !r.cases.front().rows.empty()) {
      const auto& op = r.cases.front().rows.front().op;
      if (p.bus_W > 0.0 && std::isfinite(op.bus.bus_W))
        out += "  model at " + fixed(r.cases.front().v_bus_V, 2) + " V: bus " + fixed(op.bus.bus_W, 1) +
               " W (" + (op.bus.bus_W >= p.bus_W ? "+" : "") +
               fixed((op.bus.bus_W / p.bus_W - 1.0) * 100.0, 1) + " % against the map)\n";
    }
  }
  return out;
}

nlohmann::json number_or_null(double v) {
  if (!std::isfinite(v)) return nullptr;
  return v;
}

nlohmann::json point_json(const propulsion::Drive& d, const DriveCase& c, const DriveRow& row) {
  const auto& m = row.op.motor;
  const auto& b = row.op.bus;
  nlohmann::json j;
  if (c.cells) {
    j["cells"] = *c.cells;
    j["cell_V"] = c.cell_V;
  }
  j["bus_V"] = c.v_bus_V;
  j["throttle_pct"] = number_or_null(row.throttle_pct ? *row.throttle_pct : b.duty / d.esc.duty_max * 100.0);
  j["duty"] = number_or_null(b.duty);
  j["thrust_N"] = number_or_null(m.thrust_N);
  j["thrust_g"] = number_or_null(grams(m.thrust_N));
  j["rpm"] = number_or_null(m.rpm);
  j["advance_ratio"] = number_or_null(m.advance_ratio);
  j["beyond_prop_table"] = m.beyond_prop_table;
  j["torque_Nm"] = number_or_null(m.torque);
  j["shaft_W"] = number_or_null(m.shaft_W);
  j["i_motor_A"] = number_or_null(m.i_motor_A);
  j["v_motor_V"] = number_or_null(m.v_motor_V);
  j["motor_loss_W"] = number_or_null(m.motor_loss_W);
  j["esc_loss_W"] = number_or_null(b.esc_loss_W);
  j["bus_A"] = number_or_null(b.bus_A);
  j["bus_W"] = number_or_null(b.bus_W);
  j["eta_motor"] = number_or_null(b.eta_motor);
  j["eta_esc"] = number_or_null(b.eta_esc);
  j["eta_system"] = number_or_null(b.eta_system);
  j["g_per_W"] = number_or_null(b.g_per_W);
  j["drive_thrust_N"] = number_or_null(d.rotors * m.thrust_N);
  j["drive_bus_W"] = number_or_null(d.rotors * b.bus_W);
  j["drive_bus_A"] = number_or_null(d.rotors * b.bus_A);
  j["status"] = propulsion::to_string(b.status);
  j["motor_over_current"] = m.motor_over_current;
  j["esc_over_current"] = m.esc_over_current;
  if (b.thrust_available_N) j["thrust_available_N"] = *b.thrust_available_N;
  if (m.thrust_at_current_limit_N) j["thrust_at_current_limit_N"] = *m.thrust_at_current_limit_N;
  return j;
}

// One row per pack (or bus voltage) at the asked thrust, the columns in the order of the physics.
std::string cases_at_thrust(const DriveResult& r) {
  TextTable t({"pack", "bus V", "duty %", "rpm", "shaft W", "motor A", "motor V", "ESC loss W", "bus A",
               "bus W", "motor η %", "ESC η %", "drive η %", "g/W", "available N", "status"});
  for (const auto& c : r.cases) {
    const OperatingPoint& op = c.rows.front().op;
    t.add_row({case_label(c), fixed(c.v_bus_V, 2), pct(op.bus.duty), fixed(op.motor.rpm, 0),
               fixed(op.motor.shaft_W, 1), fixed(op.motor.i_motor_A, 2), fixed(op.motor.v_motor_V, 2),
               fixed(op.bus.esc_loss_W, 2), fixed(op.bus.bus_A, 2), fixed(op.bus.bus_W, 1),
               pct(op.bus.eta_motor), pct(op.bus.eta_esc), pct(op.bus.eta_system), fixed(op.bus.g_per_W, 2),
               fixed(c.thrust_available_N, 2), propulsion::to_string(op.bus.status)});
  }
  return t.render();
}

}  // namespace

std::string drive_text(const DriveResult& r) {
  std::string out;
  if (r.drive) {
    const auto& d = *r.drive;
    out += "sortie drive: " + printable(d.name.empty() ? r.drive_file : d.name) + "\n";
    out += "  " + std::to_string(d.rotors) + (d.rotors == 1 ? " rotor" : " rotors") + "; prop " +
           fixed(d.prop.diameter_m, 3) + " m (" + fixed(d.prop.diameter_m / 0.0254, 1) +
           " in); motor " + fixed(d.motor.kv_rpm_per_V, 0) + " rpm/V, " + fixed(d.motor.rm_ohm, 3) +
           " Ω, I0 " + fixed(d.motor.i0_A, 2) + " A; ESC duty limit " + pct(d.esc.duty_max, 0) + " %\n";
    out += "  " + air_words(r) + "\n";
    out += "  values per rotor";
    if (d.rotors > 1)
      out += ": the drive gives " + std::to_string(d.rotors) + "× the thrust and draws " +
             std::to_string(d.rotors) + "× the bus power";
    out += "\n";
    const bool sweep = !r.thrust_N;
    if (!sweep && r.cases.size() > 1) {
      out += "\nat " + thrust_words(*r.thrust_N) + " per rotor\n";
      out += cases_at_thrust(r);
      for (const auto& c : r.cases) {
        // Each note line of this case, led by the case's label ("  3S saturated: ...").
        const std::string notes = case_notes(d, c, false);
        for (std::size_t p = 0; p < notes.size();) {
          const std::size_t e = notes.find('\n', p);
          out += "  " + case_label(c) + " " + notes.substr(p + 2, e - p - 1);
          p = e + 1;
        }
      }
    } else {
      for (const auto& c : r.cases) {
        out += "\nbus " + fixed(c.v_bus_V, 2) + " V";
        if (c.cells) out += " (" + std::to_string(*c.cells) + " cells × " + fixed(c.cell_V, 2) + " V)";
        if (sweep)
          out += ", throttle sweep (throttle = duty / " + pct(d.esc.duty_max, 0) + " %); " +
                 thrust_words(c.thrust_available_N) + " available";
        else
          out += ", " + thrust_words(*r.thrust_N) + " per rotor; " + thrust_words(c.thrust_available_N) +
                 " available";
        out += "\n";
        TextTable t(kRowHeader);
        for (const auto& row : c.rows) t.add_row(row_cells(row));
        out += t.render();
        out += case_notes(d, c, sweep);
      }
    }
  } else {
    out += "sortie drive: measured map only (static, at the bench's air and bus voltage)\n";
  }
  if (r.bench) out += bench_text(r, *r.bench);
  out += "\nAn estimate from a model, not a guarantee: respect the motor and ESC makers' limits.\n";
  return out;
}

nlohmann::json drive_json(const DriveResult& r) {
  nlohmann::json j;
  j["schema"] = kDriveSchema;
  if (r.drive) {
    const auto& d = *r.drive;
    j["drive"] = {{"name", d.name},
                  {"file", r.drive_file},
                  {"rotors", d.rotors},
                  {"prop_diameter_m", d.prop.diameter_m},
                  {"kv_rpm_per_V", d.motor.kv_rpm_per_V},
                  {"duty_max", d.esc.duty_max},
                  {"motor_i_max_A", d.motor.i_max_A},
                  {"esc_i_max_A", d.esc.i_max_A},
                  {"mass_kg", d.mass_kg()}};
  } else {
    j["drive"] = nullptr;
  }
  j["air"] = {{"density_kg_m3", r.rho_kg_m3}};
  if (r.altitude_m) j["air"]["altitude_m"] = *r.altitude_m;
  j["airspeed_mps"] = r.v_axial_mps;
  j["mode"] = r.thrust_N ? "thrust" : "sweep";
  if (r.thrust_N) j["thrust_N_per_rotor"] = *r.thrust_N;
  nlohmann::json cases = nlohmann::json::array();
  nlohmann::json points = nlohmann::json::array();
  if (r.drive) {
    for (const auto& c : r.cases) {
      nlohmann::json cj = {{"bus_V", c.v_bus_V}, {"thrust_available_N", c.thrust_available_N}};
      if (c.cells) {
        cj["cells"] = *c.cells;
        cj["cell_V"] = c.cell_V;
      }
      cases.push_back(cj);
      for (const auto& row : c.rows) points.push_back(point_json(*r.drive, c, row));
    }
  }
  j["buses"] = cases;
  j["points"] = points;
  if (r.bench) {
    const auto& bv = *r.bench;
    const auto& map = bv.map;
    nlohmann::json b;
    b["file"] = bv.file;
    b["v_bus_mean_V"] = map.v_bus_mean_V;
    b["v_bus_min_V"] = map.v_bus_min_V;
    b["v_bus_max_V"] = map.v_bus_max_V;
    nlohmann::json rows = nlohmann::json::array();
    for (std::size_t i = 0; i < map.rows.size(); ++i) {
      const auto& row = map.rows[i];
      nlohmann::json rj = {{"throttle_pct", row.throttle_pct}, {"bus_V", row.v_bus_V},
                           {"bus_A", row.i_bus_A},             {"bus_W", row.bus_W()},
                           {"rpm", row.rpm},                   {"thrust_N", row.thrust_N},
                           {"thrust_g", grams(row.thrust_N)}};
      if (row.torque_Nm) {
        rj["torque_Nm"] = *row.torque_Nm;
        rj["shaft_W"] = row.shaft_W();
      }
      if (!bv.model_at_rows.empty()) rj["model_bus_W"] = number_or_null(bv.model_at_rows[i].bus.bus_W);
      rows.push_back(rj);
    }
    b["rows"] = rows;
    if (bv.at_thrust) {
      const auto& p = *bv.at_thrust;
      b["at_thrust"] = {{"thrust_N", p.thrust_N},
                        {"throttle_pct", number_or_null(p.throttle_pct)},
                        {"rpm", number_or_null(p.rpm)},
                        {"bus_W", number_or_null(p.bus_W)},
                        {"bus_A", number_or_null(p.bus_A)},
                        {"shaft_W", number_or_null(p.shaft_W)},
                        {"eta_system", number_or_null(p.eta_system)},
                        {"g_per_W", number_or_null(p.g_per_W)},
                        {"status", propulsion::to_string(p.status)},
                        {"extrapolated", p.extrapolated}};
      if (p.thrust_available_N) b["at_thrust"]["thrust_available_N"] = *p.thrust_available_N;
    }
    j["bench"] = b;
  }
  return j;
}

}  // namespace sortie::report
