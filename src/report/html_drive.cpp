#include "report/html_drive.hpp"

#include <cmath>

#include "report/html_page.hpp"
#include "report/svg_plot.hpp"
#include "report/text_table.hpp"

namespace sortie::report {

namespace {

using html::number_cell;
using html::text_cell;

// One colour per bus voltage, in the order given.
const char* kCaseColours[] = {"#0b6e8a", "#c46a00", "#7a3d8c", "#5c7f1f", "#9c2f3f", "#3c4f9a", "#6b5b3e"};
const char* kMeasured = "#1d2733";

std::string case_name(const DriveCase& c) {
  if (c.cells) return std::to_string(*c.cells) + "S, " + fixed(c.v_bus_V, 2) + " V";
  return fixed(c.v_bus_V, 2) + " V";
}

double throttle_of(const propulsion::Drive& d, const DriveRow& row) {
  return row.throttle_pct ? *row.throttle_pct : row.op.bus.duty / d.esc.duty_max * 100.0;
}

double finite_or_nan(double v) { return std::isfinite(v) ? v : std::nan(""); }

std::string eta_plot(const DriveResult& r, const char* id, const std::string& what, double propulsion::BusPoint::*eta,
                     bool with_bench) {
  svg::LinePlot p;
  p.id = id;
  p.title = what + " against throttle";
  p.x = {"throttle", "%", 0.0, 100.0};
  p.y = {what, "%", 0.0, 100.0};
  p.width = 420;
  p.height = 360;
  if (r.drive) {
    for (std::size_t k = 0; k < r.cases.size(); ++k) {
      const auto& c = r.cases[k];
      svg::Line l{case_name(c), {}, {}, kCaseColours[k % std::size(kCaseColours)]};
      for (const auto& row : c.rows) {
        l.x.push_back(throttle_of(*r.drive, row));
        l.y.push_back(finite_or_nan(row.op.bus.*eta * 100.0));
      }
      l.markers = c.rows.size() <= 3;
      p.lines.push_back(l);
    }
  }
  if (with_bench && r.bench && r.bench->map.has_torque) {
    svg::Line m{"measured", {}, {}, kMeasured, svg::Side::left, svg::Stroke::dotted, 1.6, true};
    for (const auto& row : r.bench->map.rows) {
      const double bus_W = row.bus_W();
      if (bus_W <= 0) continue;
      m.x.push_back(row.throttle_pct);
      m.y.push_back(row.shaft_W() / bus_W * 100.0);
    }
    p.lines.push_back(m);
  }
  return svg::render(p);
}

std::string case_table(const propulsion::Drive& d, const DriveCase& c, std::size_t& point) {
  html::Table t({"throttle %", "duty %", "rpm", "thrust N", "thrust g", "shaft W", "bus A", "bus W", "motor η %",
                 "ESC η %", "system η %", "g/W", "status"});
  for (const auto& row : c.rows) {
    const std::string k = "points." + std::to_string(point++) + ".";
    const auto& m = row.op.motor;
    const auto& b = row.op.bus;
    const bool ok = b.status == propulsion::BusStatus::ok;
    t.add_row({number_cell(fixed(throttle_of(d, row), 1) + " %", k + "throttle_pct"),
               number_cell(fixed(b.duty * 100, 1) + " %", k + "duty"), number_cell(fixed(m.rpm, 0), k + "rpm"),
               number_cell(fixed(m.thrust_N, 2), k + "thrust_N"), number_cell(fixed(m.thrust_N / propulsion::kStandardGravity * 1000, 0), k + "thrust_g"),
               number_cell(fixed(m.shaft_W, 1), k + "shaft_W"), number_cell(fixed(b.bus_A, 2), k + "bus_A"),
               number_cell(fixed(b.bus_W, 1), k + "bus_W"), number_cell(fixed(b.eta_motor * 100, 1) + " %", k + "eta_motor"),
               number_cell(fixed(b.eta_esc * 100, 1) + " %", k + "eta_esc"),
               number_cell(fixed(b.eta_system * 100, 1) + " %", k + "eta_system"),
               number_cell(fixed(b.g_per_W, 2), k + "g_per_W"),
               html::html_cell(html::esc(propulsion::to_string(b.status)), false, ok ? "" : "fail")},
              ok ? "" : "fail");
  }
  return t.render();
}

std::string bench_table(const BenchView& bv) {
  std::vector<std::string> header = {"throttle %", "bus V", "bus A", "bus W", "rpm", "thrust N"};
  if (bv.map.has_torque) header.push_back("system η %");
  html::Table t(header);
  for (std::size_t i = 0; i < bv.map.rows.size(); ++i) {
    const auto& row = bv.map.rows[i];
    const std::string k = "bench.rows." + std::to_string(i) + ".";
    std::vector<html::Cell> cells = {
        number_cell(fixed(row.throttle_pct, 1) + " %", k + "throttle_pct"), number_cell(fixed(row.v_bus_V, 2), k + "bus_V"),
        number_cell(fixed(row.i_bus_A, 2), k + "bus_A"), number_cell(fixed(row.bus_W(), 1), k + "bus_W"),
        number_cell(fixed(row.rpm, 0), k + "rpm"), number_cell(fixed(row.thrust_N, 2), k + "thrust_N")};
    if (bv.map.has_torque)
      cells.push_back(number_cell(row.bus_W() > 0 ? fixed(row.shaft_W() / row.bus_W() * 100, 1) + " %" : "-"));
    t.add_row(cells);
  }
  return t.render();
}

}  // namespace

std::string drive_html(const DriveResult& r) {
  const std::string name = r.drive ? (r.drive->name.empty() ? r.drive_file : r.drive->name)
                                   : "measured map " + (r.bench ? r.bench->file : std::string());
  std::string sub = "sortie drive · ";
  if (r.drive) sub += std::to_string(r.drive->rotors) + (r.drive->rotors == 1 ? " rotor" : " rotors") + " · ";
  sub += "air " + fixed(r.rho_kg_m3, 4) + " kg/m³";
  if (r.altitude_m) sub += " (ISA at " + fixed(*r.altitude_m, 0) + " m)";
  sub += " · axial airspeed " + fixed(r.v_axial_mps, 1) + " m/s";
  html::Page page("Drive: " + name, sub);

  if (r.drive) {
    const auto& d = *r.drive;
    page.section("Drive", html::facts({
                              {"rotors", std::to_string(d.rotors) + " (values below are per rotor)"},
                              {"propeller", fixed(d.prop.diameter_m, 3) + " m (" + fixed(d.prop.diameter_m / 0.0254, 1) + " in)"},
                              {"motor", fixed(d.motor.kv_rpm_per_V, 0) + " rpm/V, " + fixed(d.motor.rm_ohm, 3) + " Ω, I0 " +
                                            fixed(d.motor.i0_A, 2) + " A, limit " + fixed(d.motor.i_max_A, 1) + " A"},
                              {"ESC", "duty limit " + fixed(d.esc.duty_max * 100, 0) + " %, limit " +
                                          fixed(d.esc.i_max_A, 1) + " A"},
                          }));
  }
  const bool bench_eta = r.bench && r.bench->map.has_torque;
  std::string plots;
  if (r.drive) {
    plots += "<div class=\"grid3\">\n";
    plots += html::figure("System efficiency", eta_plot(r, kDrivePlots[0], "system efficiency", &propulsion::BusPoint::eta_system, true));
    plots += html::figure("Motor efficiency", eta_plot(r, kDrivePlots[1], "motor efficiency", &propulsion::BusPoint::eta_motor, false));
    plots += html::figure("ESC efficiency", eta_plot(r, kDrivePlots[2], "ESC efficiency", &propulsion::BusPoint::eta_esc, false));
    plots += "</div>\n<p class=\"note\">Throttle is duty over the ESC's duty limit. System efficiency is shaft power "
             "over bus power, motor × ESC. At one thrust, a higher bus voltage runs a lower duty and the ESC's "
             "switching loss weighs more.</p>\n";
  } else if (bench_eta) {
    plots += html::figure("System efficiency, measured",
                          eta_plot(r, kDrivePlots[0], "system efficiency", &propulsion::BusPoint::eta_system, true));
  } else {
    plots += "<p>The bench file has no torque column, so no efficiency can be drawn from it.</p>\n";
  }
  page.section("Efficiency against throttle", plots);

  if (r.drive) {
    std::size_t point = 0;
    for (const auto& c : r.cases) {
      std::string head = "Bus " + fixed(c.v_bus_V, 2) + " V";
      if (c.cells) head += " (" + std::to_string(*c.cells) + " cells × " + fixed(c.cell_V, 2) + " V)";
      head += ": " + fixed(c.thrust_available_N, 2) + " N per rotor available";
      page.section(head, case_table(*r.drive, c, point));
    }
  }
  if (r.bench)
    page.section("Measured map: " + r.bench->file, bench_table(*r.bench) +
                                                    "<p class=\"note\">One rotor on the bench, at the bench's air and "
                                                    "bus voltage.</p>\n");
  return page.render();
}

}  // namespace sortie::report
