// `sortie drive DRIVE.json (--bus-V V | --cells LIST) [--thrust-N T | --sweep]
//  [--bench FILE.csv [--columns SPEC]]`: propulsion operating points of one rotor.
#include <cmath>
#include <iostream>
#include <optional>

#include "cli/commands.hpp"
#include "cli/number_option.hpp"
#include "cli/report_output.hpp"
#include "core/constants.hpp"
#include "core/error.hpp"
#include "core/text.hpp"
#include "flight/atmosphere.hpp"
#include "io/bench_csv.hpp"
#include "io/drive_json.hpp"
#include "io/output.hpp"
#include "propulsion/operating_point.hpp"
#include "report/drive_report.hpp"
#include "report/html_drive.hpp"
#include "report/result_csv.hpp"

namespace sortie::cli {

namespace {

struct DriveOptions {
  std::string drive_file;
  std::optional<double> bus_V;
  std::vector<int> cells;
  double cell_V = 3.7;
  std::optional<double> thrust_N;
  bool sweep = false;
  double sweep_from_pct = 10.0, sweep_to_pct = 100.0, sweep_step_pct = 10.0;
  double airspeed_mps = 0.0;
  std::optional<double> density_kg_m3, altitude_m;
  std::string bench_file, columns;
  std::string json_file;
  bool quiet = false;
  ReportOutput report;
};

// Throttle steps from..to inclusive (to within a millionth of a step, so 10:100:5 ends at 100).
std::vector<double> sweep_steps(const DriveOptions& o) {
  std::vector<double> out;
  const double span = (o.sweep_to_pct - o.sweep_from_pct) / o.sweep_step_pct;
  const auto n = static_cast<std::size_t>(std::floor(span + 1e-6)) + 1;
  for (std::size_t k = 0; k < n; ++k) out.push_back(o.sweep_from_pct + static_cast<double>(k) * o.sweep_step_pct);
  return out;
}

report::DriveCase run_case(const propulsion::Drive& d, const DriveOptions& o, double rho,
                           double v_bus, std::optional<int> cells) {
  report::DriveCase c;
  c.v_bus_V = v_bus;
  c.cells = cells;
  c.cell_V = o.cell_V;
  c.thrust_available_N = propulsion::thrust_available(d, o.airspeed_mps, rho, v_bus);
  if (o.thrust_N) {
    c.rows.push_back({std::nullopt, propulsion::solve(d, *o.thrust_N, o.airspeed_mps, rho, v_bus)});
  } else {
    for (double t : sweep_steps(o))
      c.rows.push_back({t, propulsion::at_duty(d, t / 100.0 * d.esc.duty_max, o.airspeed_mps, rho, v_bus)});
  }
  return c;
}

int run_drive(const DriveOptions& o) {
  const bool print = print_format(o.report, {{"--json", &o.json_file}}, o.quiet);
  report::DriveResult r;
  r.v_axial_mps = o.airspeed_mps;
  r.thrust_N = o.thrust_N;
  r.rho_kg_m3 = core::kSeaLevelDensity;
  if (o.density_kg_m3) {
    r.rho_kg_m3 = *o.density_kg_m3;
    r.density_given = true;
  } else if (o.altitude_m) {
    const auto air = flight::isa_air(*o.altitude_m);
    if (!air)
      throw UsageError("--altitude-m: outside the ISA troposphere (got " + format_number(*o.altitude_m) +
                       " m, expected -500 to 11000 m)");
    r.rho_kg_m3 = air->density_kg_m3;
    r.altitude_m = o.altitude_m;
  }
  // Read everything first, so that bad input fails before any output is written.
  std::optional<propulsion::BenchMap> map;
  if (!o.bench_file.empty()) map = io::load_bench_csv(o.bench_file, io::parse_bench_columns(o.columns));
  if (!o.drive_file.empty()) {
    r.drive_file = o.drive_file;
    r.drive = io::load_drive_file(o.drive_file);
    const propulsion::Drive& d = *r.drive;
    if (o.cells.empty()) {
      r.cases.push_back(run_case(d, o, r.rho_kg_m3, *o.bus_V, std::nullopt));
    } else {
      for (int n : o.cells) r.cases.push_back(run_case(d, o, r.rho_kg_m3, n * o.cell_V, n));
    }
  }
  if (map) {
    report::BenchView bv;
    bv.file = o.bench_file;
    bv.v_bus_asked_V = o.bus_V;
    if (r.drive)
      for (const auto& row : map->rows)
        bv.model_at_rows.push_back(propulsion::solve(*r.drive, row.thrust_N, 0.0, r.rho_kg_m3, row.v_bus_V));
    if (o.thrust_N) bv.at_thrust = propulsion::bench_at_thrust(*map, *o.thrust_N);
    bv.map = std::move(*map);
    r.bench = std::move(bv);
  }
  const std::string html = o.report.html_file.empty() ? "" : report::drive_html(r);
  if (!o.json_file.empty()) io::write_output(o.json_file, report::drive_json(r).dump(2) + "\n");
  if (!o.report.html_file.empty()) io::write_output(o.report.html_file, html);
  if (print && o.report.format == "json") io::write_output("-", report::drive_json(r).dump(2) + "\n");
  if (print && o.report.format == "csv") io::write_output("-", report::drive_csv(r));
  if (print && o.report.format == "text") io::write_output("-", printable(report::drive_text(r), true));
  return 0;
}

}  // namespace

void add_drive_command(CLI::App& app, int& exit_code) {
  auto o = std::make_shared<DriveOptions>();
  CLI::App* c = app.add_subcommand(
      "drive", "Operating points of one rotor of a drive: throttle sweep or one thrust, at a bus voltage");
  c->add_option("DRIVE", o->drive_file, "drive model (JSON)")->check(CLI::ExistingFile);
  auto* bus = c->add_option("--bus-V", o->bus_V, "bus voltage at the ESCs, V")->check(number_in(between(0.1, 1000.0, "V")));
  auto* cells = c->add_option("--cells", o->cells, "cell counts to compare, e.g. 3,4,6 (bus = cells × --cell-V)")
                    ->delimiter(',')
                    ->check(whole_in(1, 50));
  c->add_option("--cell-V", o->cell_V, "voltage per cell with --cells, V (default 3.7)")->check(number_in(between(0.5, 10.0, "V")));
  bus->excludes(cells);
  auto* thrust = c->add_option("--thrust-N", o->thrust_N, "thrust per rotor, N")->check(number_in(between(0.0, 1e5, "N")));
  auto* sweep = c->add_flag("--sweep", o->sweep, "a throttle sweep (the default without --thrust-N)");
  thrust->excludes(sweep);
  c->add_option("--sweep-from-pct", o->sweep_from_pct, "first throttle of the sweep, % of the ESC's duty limit (default 10)")
      ->check(number_in(between(0.0, 100.0, "%")));
  c->add_option("--sweep-to-pct", o->sweep_to_pct, "last throttle of the sweep, % (default 100)")->check(number_in(between(0.0, 100.0, "%")));
  c->add_option("--sweep-step-pct", o->sweep_step_pct, "throttle step of the sweep, % (default 10)")->check(number_in(between(0.01, 100.0, "%")));
  c->add_option("--airspeed-mps", o->airspeed_mps, "axial airspeed through the prop, m/s (default 0)")->check(number_in(between(0.0, 200.0, "m/s")));
  auto* rho = c->add_option("--density-kg-m3", o->density_kg_m3, "air density, kg/m³ (default 1.225, ISA sea level)")
                  ->check(number_in(between(0.05, 2.0, "kg/m³")));
  auto* alt = c->add_option("--altitude-m", o->altitude_m, "pressure altitude for ISA air density, m")
                  ->check(number_in(between(-500.0, flight::kTropopauseHeight, "m")));
  rho->excludes(alt);
  auto* bench = c->add_option("--bench", o->bench_file, "measured bench CSV of one rotor (see README)")->check(CLI::ExistingFile);
  c->add_option("--columns", o->columns, "bench CSV columns: quantity=HEADER[:UNIT],... (throttle, voltage, current, rpm, thrust, torque)")
      ->needs(bench);
  c->add_option("--json", o->json_file, "write the result as JSON to FILE, or - for standard output")->check(output_path());
  add_report_options(c, o->report, {"text", "json", "csv"});
  c->add_flag("--quiet,-q", o->quiet, "print nothing on success");
  c->callback([o, &exit_code] {
    if (o->drive_file.empty() && o->bench_file.empty())
      throw UsageError("drive: give a drive model DRIVE.json, a --bench CSV, or both");
    if (!o->drive_file.empty() && !o->bus_V && o->cells.empty())
      throw UsageError("drive: give the bus voltage with --bus-V V or --cells LIST");
    if (o->drive_file.empty() && !o->cells.empty())
      throw UsageError("--cells: needs a drive model (a bench map holds one bus voltage)");
    if (!o->thrust_N && o->sweep_to_pct < o->sweep_from_pct)
      throw UsageError("--sweep-to-pct: below --sweep-from-pct (got " + format_number(o->sweep_to_pct) +
                       ", expected at least " + format_number(o->sweep_from_pct) + ")");
    exit_code = run_drive(*o);
  });
}

}  // namespace sortie::cli
