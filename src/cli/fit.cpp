// `sortie fit cell LOG.csv --out CELL.json` and `sortie fit drive BENCH.csv --out DRIVE.json`:
// models from the user's own measurements.
#include <filesystem>
#include <iostream>
#include <optional>

#include "cli/commands.hpp"
#include "cli/number_option.hpp"
#include "core/error.hpp"
#include "core/text.hpp"
#include "fit/fit_cell.hpp"
#include "fit/fit_drive.hpp"
#include "fit/voltage_error.hpp"
#include "io/battery_json.hpp"
#include "io/cell_json_write.hpp"
#include "io/bench_csv.hpp"
#include "io/cell_log_csv.hpp"
#include "io/drive_json.hpp"
#include "io/drive_json_write.hpp"
#include "io/json_reader.hpp"
#include "io/output.hpp"
#include "report/fit_drive_report.hpp"
#include "report/fit_report.hpp"
#include "report/html_fit.hpp"
#include "sim/replay.hpp"

namespace sortie::cli {

namespace {

/// Exit code of `fit cell` when the fit fails its quality gate and --accept-poor-fit is not given.
constexpr int kExitPoorFit = 4;

struct FitCellOptions {
  std::vector<std::string> log_files;
  std::string out_file;
  std::vector<std::string> columns;  ///< SPEC for every log, FILE@SPEC for one
  bool accept_poor_fit = false;
  bool discharge_positive = false, discharge_negative = false;
  std::optional<double> capacity_Ah, soc0, v_max_V, v_cutoff_V, mass_kg, i_cont_max_A, air_C;
  int rc = 0;  ///< 0: chosen by held-out error
  int series = 1, parallel = 1;
  double soc_band = 0.1, rest_min_s = 300.0;
  std::string name, chemistry;
  std::string report_file, json_file, trace_file;
  std::string html_file;
  bool quiet = false;
};

/// The model as written, read back through the loader: what the user gets is what was checked.
battery::Cell reload(const nlohmann::ordered_json& j, const std::string& out_file) {
  const nlohmann::json plain = nlohmann::json::parse(j.dump());
  const std::filesystem::path p(out_file);
  io::ObjectReader r(plain, io::Source{out_file, p.parent_path()}, "");
  return io::read_cell(r);
}

int run_fit_cell(const FitCellOptions& o) {
  io::CellLogOptions lo;
  const auto columns = io::parse_column_specs_per_file(o.columns, o.log_files, io::cell_log_quantities());
  if (o.discharge_positive) lo.discharge_positive = true;
  if (o.discharge_negative) lo.discharge_positive = false;
  lo.series = o.series;
  lo.parallel = o.parallel;
  lo.capacity_Ah = o.capacity_Ah;
  std::vector<battery::CellLog> logs;
  for (std::size_t k = 0; k < o.log_files.size(); ++k) {
    lo.columns = columns[k];
    logs.push_back(io::load_cell_log(o.log_files[k], lo));
  }

  fit::CellFitOptions fo;
  fo.rc_pairs = o.rc;
  fo.soc.capacity_Ah = o.capacity_Ah;
  fo.soc.soc0 = o.soc0;
  fo.soc.v_max_V = o.v_max_V;
  fo.soc.v_cutoff_V = o.v_cutoff_V;
  fo.soc_band = o.soc_band;
  fo.rest_min_s = o.rest_min_s;
  fo.name = o.name;
  fo.chemistry = o.chemistry;
  fo.mass_kg = o.mass_kg;
  fo.air_C = o.air_C;
  fo.i_cont_max_A = o.i_cont_max_A;
  if (o.v_max_V && o.v_cutoff_V && *o.v_cutoff_V >= *o.v_max_V)
    throw UsageError("--v-cutoff-V: at or above --v-max-V (got " + format_number(*o.v_cutoff_V) + " V, expected below " +
                     format_number(*o.v_max_V) + " V)");
  fit::CellFitResult r = fit::fit_cell(logs, fo);
  // The log the fit saw: the one file, or the files one after the other (fit_cell's order).
  battery::CellLog log;
  if (logs.size() == 1) {
    log = std::move(logs.front());
  } else {
    log.file = "";
    log.section_starts.clear();
    for (const auto& l : logs) {
      for (std::size_t st : l.section_starts) log.section_starts.push_back(log.size() + st);
      log.file += (log.file.empty() ? "" : " + ") + l.file;
      log.time_s.insert(log.time_s.end(), l.time_s.begin(), l.time_s.end());
      log.current_A.insert(log.current_A.end(), l.current_A.begin(), l.current_A.end());
      log.voltage_V.insert(log.voltage_V.end(), l.voltage_V.begin(), l.voltage_V.end());
      log.line.insert(log.line.end(), l.line.begin(), l.line.end());
    }
  }

  // Re-simulate the model on each log's current with the integrator the other commands use,
  // each from its own counted SoC at its first row (it may lie a little outside 0..1: "empty"
  // and "full" are where the log's discharge and charge ended).
  auto resimulate = [&](const battery::Cell& cell) {
    std::vector<double> v(log.size());
    for (std::size_t i = 0; i < r.log_starts.size(); ++i) {
      const std::size_t a = r.log_starts[i], b = i + 1 < r.log_starts.size() ? r.log_starts[i + 1] : log.size();
      battery::Pack pack;
      pack.cell = cell;
      pack.soc0 = r.soc[a];
      // At the temperature the resistances were fitted at; with a thermal block, from the air
      // the block was fitted with (the log starts with the cell at the air).
      if (r.arrhenius) pack.temperature_C = r.arrhenius->reference_C;
      if (r.thermal) pack.temperature_C = r.thermal->air_C, pack.air_C = r.thermal->air_C;
      sim::CurrentLog cl;
      cl.time_s.assign(log.time_s.begin() + static_cast<std::ptrdiff_t>(a), log.time_s.begin() + static_cast<std::ptrdiff_t>(b));
      cl.current_A.assign(log.current_A.begin() + static_cast<std::ptrdiff_t>(a), log.current_A.begin() + static_cast<std::ptrdiff_t>(b));
      for (std::size_t st : log.section_starts)
        if (st > a && st < b) cl.restarts.push_back(st - a);
      const sim::ReplayResult rep = sim::replay(pack, cl);
      std::copy(rep.v_terminal_V.begin(), rep.v_terminal_V.end(), v.begin() + static_cast<std::ptrdiff_t>(a));
    }
    return v;
  };
  nlohmann::ordered_json model = io::cell_to_json(r.cell, r.note);
  const std::vector<double> v_model = resimulate(reload(model, o.out_file));
  std::vector<double> centres;
  for (const auto& b : r.bands) centres.push_back(b.soc);
  fit::VoltageErrors err = fit::voltage_errors(log.voltage_V, v_model, r.soc, centres);
  err.counted = fit::voltage_error_where(log.voltage_V, v_model, r.counted);

  // The quality gate (fit/fit_cell.hpp): the held-out RMSE (else the re-simulation's) within
  // kQualityMaxRmseV and an OCV inside the chemistry's bounds.
  const bool held = r.held_out_rows > 0;
  const double judged = held ? r.held_out_rmse_V : err.all.rmse_V;
  const bool passed = judged <= fit::kQualityMaxRmseV && r.ocv_physical;
  battery::CellFitQuality q;
  q.resimulation_rmse_V = err.all.rmse_V;
  if (held) q.held_out_rmse_V = r.held_out_rmse_V;
  q.threshold_V = fit::kQualityMaxRmseV;
  q.passed = passed;
  r.cell.fit_quality = q;
  if (!passed)
    r.warnings.push_back(std::string("quality gate failed: ") + (held ? "held-out" : "re-simulation") + " voltage RMSE " +
                         format_fixed(1000.0 * judged, 1) + " mV (limit " + format_fixed(1000.0 * fit::kQualityMaxRmseV, 0) +
                         " mV)" + (r.ocv_physical ? "" : ", OCV outside the chemistry's bounds") +
                         (o.accept_poor_fit ? "; model written because --accept-poor-fit was given"
                                            : "; no model written (exit 4): pass --accept-poor-fit to write it anyway"));
  model = io::cell_to_json(r.cell, r.note);
  (void)reload(model, o.out_file);
  const bool write_model = passed || o.accept_poor_fit;

  // Everything is computed before anything is written.
  const std::string model_text = model.dump(2) + "\n";
  const std::string text = report::fit_cell_text(log, r, err, o.out_file);
  const std::string json = o.json_file.empty() ? "" : report::fit_cell_json(log, r, err, o.out_file).dump(2) + "\n";
  const std::string trace = o.trace_file.empty() ? "" : report::fit_cell_trace_csv(log, r, v_model);
  const std::string page = o.html_file.empty() ? "" : report::fit_cell_html(log, r, err, v_model, o.out_file);
  if (write_model) io::write_output(o.out_file, model_text);
  if (!o.report_file.empty()) io::write_output(o.report_file, printable(text, true));
  if (!o.json_file.empty()) io::write_output(o.json_file, json);
  if (!o.trace_file.empty()) io::write_output(o.trace_file, trace);
  if (!o.html_file.empty()) io::write_output(o.html_file, page);
  if (!o.quiet && o.json_file != "-" && o.out_file != "-" && o.report_file != "-" && o.html_file != "-") io::write_output("-", printable(text, true));
  return write_model ? 0 : kExitPoorFit;
}

void add_fit_cell(CLI::App& fit, int& exit_code) {
  auto o = std::make_shared<FitCellOptions>();
  CLI::App* c = fit.add_subcommand("cell", "Fit a cell model (OCV, R0, RC pairs) to a pulse or discharge test log");
  c->add_option("LOG", o->log_files,
                "test logs of one cell: CSV (or ; or tab separated) with time, current and voltage; several are fitted into one model")
      ->required()
      ->check(CLI::ExistingFile);
  c->add_option("--out", o->out_file, "write the cell model (JSON) to FILE")->required()->check(output_path());
  c->add_option("--columns", o->columns,
                "column names or numbers: time=NAME[:UNIT],current=...,voltage=...[,temp=...][,exclude=...][,mode=...]; "
                "FILE@SPEC for one log only (repeat the option)")
      ->allow_extra_args(false)
      ->take_all();
  auto* dp = c->add_flag("--discharge-positive", o->discharge_positive, "the log's current is positive on discharge");
  auto* dn = c->add_flag("--discharge-negative", o->discharge_negative, "the log's current is positive on charge");
  dp->excludes(dn);
  c->add_option("--capacity-Ah", o->capacity_Ah, "cell capacity, Ah, when the log has no full discharge")
      ->check(number_in(above_to(0.0, 1e4, "Ah")));
  c->add_option("--rc", o->rc, "RC pairs to fit: 1 or 2 (default: the structure with the lowest held-out error)")->check(CLI::IsMember({1, 2}));
  c->add_option("--soc0", o->soc0, "state of charge at the first row, 0..1 (when the log has no full or empty point)")
      ->check(number_in(between(0.0, 1.0, "")));
  c->add_option("--v-max-V", o->v_max_V, "full-charge cell voltage, V (default: the constant-voltage level of the log's charges, else the chemistry's)")
      ->check(number_in(between(1.0, 6.0, "V")));
  c->add_option("--v-cutoff-V", o->v_cutoff_V, "end-of-discharge cell voltage, V (default: the top of the chemistry's usual end-of-discharge range)")
      ->check(number_in(between(0.5, 5.0, "V")));
  c->add_option("--series", o->series, "cells in series in a pack log (voltage is divided by it)")->check(whole_in(1, 1000));
  c->add_option("--parallel", o->parallel, "cells in parallel in a pack log (current is divided by it)")->check(whole_in(1, 1000));
  c->add_option("--soc-band", o->soc_band, "width of the SoC bands of the parameter tables (default 0.1)")
      ->check(number_in(between(0.02, 1.0, "")));
  c->add_option("--rest-min-s", o->rest_min_s, "shortest rest whose end counts as an OCV point, s (default 300)")
      ->check(number_in(between(1.0, 1e6, "s")));
  c->add_option("--name", o->name, "name written into the model");
  c->add_option("--chemistry", o->chemistry, "chemistry written into the model (e.g. LiPo, Li-ion)");
  c->add_option("--mass-kg", o->mass_kg, "cell mass, kg (written into the model)")->check(number_in(above_to(0.0, 100.0, "kg")));
  c->add_option("--air-C", o->air_C,
                "air temperature around the cell during the test, °C, for the thermal block (default: fitted)")
      ->check(number_in(between(-60.0, 100.0, "°C")));
  c->add_option("--i-cont-max-A", o->i_cont_max_A, "continuous current limit, A (default: the largest in the log)")
      ->check(number_in(above_to(0.0, 1e5, "A")));
  c->add_option("--report", o->report_file, "write the fit report (text) to FILE")->check(output_path());
  c->add_option("--json", o->json_file, "write the fit report as JSON to FILE, or - for standard output")->check(output_path());
  c->add_option("--trace", o->trace_file, "write measured and model voltage per log row (CSV) to FILE")->check(output_path());
  c->add_option("--html", o->html_file, "write the fit report as one self-contained HTML page (plots inline) to FILE")->check(output_path());
  c->add_flag("--accept-poor-fit", o->accept_poor_fit,
              "write the model even when the fit fails its quality gate (held-out RMSE above 20 mV or an OCV outside the chemistry)");
  c->add_flag("--quiet,-q", o->quiet, "print nothing on success");
  c->callback([o, &exit_code] { exit_code = run_fit_cell(*o); });
}

struct FitDriveOptions {
  std::string bench_file, out_file, columns;
  std::optional<double> diameter_m;
  int rotors = 1;
  std::optional<double> rho_kg_m3;
  std::optional<double> motor_i_max_A, esc_i_max_A, duty_max;
  std::string name, report_file, json_file;
  std::string html_file;
  bool quiet = false;
};

int run_fit_drive(const FitDriveOptions& o) {
  if (!o.diameter_m)
    throw UsageError("fit drive: --diameter-m is required (CT and CP are defined per prop diameter)");
  const propulsion::BenchMap bench = io::load_bench_csv(o.bench_file, o.columns.empty() ? io::BenchColumns{}
                                                                                       : io::parse_bench_columns(o.columns));
  fit::DriveFitOptions fo;
  fo.diameter_m = *o.diameter_m;
  fo.rotors = o.rotors;
  fo.rho_kg_m3 = o.rho_kg_m3;
  fo.name = o.name;
  fo.file = o.bench_file;
  fo.motor_i_max_A = o.motor_i_max_A;
  fo.esc_i_max_A = o.esc_i_max_A;
  fo.duty_max = o.duty_max;
  const fit::DriveFitResult r = fit::fit_drive(bench, fo);
  const nlohmann::ordered_json model = io::drive_to_json(r.drive, r.note);
  {
    // The model as written, read back through the loader (its checks, e.g. CP against momentum
    // theory, apply to what the user gets).
    const nlohmann::json plain = nlohmann::json::parse(model.dump());
    io::ObjectReader reader(plain, io::Source{o.out_file, std::filesystem::path(o.out_file).parent_path()}, "");
    (void)io::read_drive(reader);
  }
  const std::string model_text = model.dump(2) + "\n";
  const std::string text = report::fit_drive_text(o.bench_file, r, o.out_file);
  const std::string json = o.json_file.empty() ? "" : report::fit_drive_json(o.bench_file, r, o.out_file).dump(2) + "\n";
  const std::string page = o.html_file.empty() ? "" : report::fit_drive_html(o.bench_file, r, o.out_file);
  io::write_output(o.out_file, model_text);
  if (!o.report_file.empty()) io::write_output(o.report_file, printable(text, true));
  if (!o.json_file.empty()) io::write_output(o.json_file, json);
  if (!o.html_file.empty()) io::write_output(o.html_file, page);
  if (!o.quiet && o.json_file != "-" && o.out_file != "-" && o.report_file != "-" && o.html_file != "-") io::write_output("-", printable(text, true));
  return 0;
}

void add_fit_drive(CLI::App& fit, int& exit_code) {
  auto o = std::make_shared<FitDriveOptions>();
  CLI::App* c = fit.add_subcommand("drive", "Fit a drive model (Kv, Rm, I0, ESC losses, static CT and CP) to a throttle-step bench test");
  c->add_option("BENCH", o->bench_file, "bench test: CSV with throttle, bus voltage, bus current, rpm, thrust (torque optional)")
      ->required()
      ->check(CLI::ExistingFile);
  c->add_option("--out", o->out_file, "write the drive model (JSON) to FILE")->required()->check(output_path());
  c->add_option("--columns", o->columns, "column names: throttle=NAME[:UNIT],voltage=...,current=...,rpm=...,thrust=...[,torque=...]");
  c->add_option("--diameter-m", o->diameter_m, "prop diameter, m (required: CT and CP are per diameter)")
      ->check(number_in(between(0.01, 10.0, "m")));
  c->add_option("--rotors", o->rotors, "rotors of the drive written (default 1)")->check(whole_in(1, 64));
  c->add_option("--air-density-kg-m3", o->rho_kg_m3, "air density on the bench, kg/m³ (default 1.225, ISA sea level)")
      ->check(number_in(between(0.1, 2.0, "kg/m³")));
  c->add_option("--name", o->name, "name written into the model");
  c->add_option("--motor-i-max-A", o->motor_i_max_A, "motor continuous current limit, A (default: the bench's largest)")
      ->check(number_in(above_to(0.0, 1e5, "A")));
  c->add_option("--esc-i-max-A", o->esc_i_max_A, "ESC continuous current limit, A (default: the bench's largest)")
      ->check(number_in(above_to(0.0, 1e5, "A")));
  c->add_option("--duty-max", o->duty_max, "highest ESC duty, 0..1: duty = throttle x this (default 1)")
      ->check(number_in(between(0.05, 1.0, "")));
  c->add_option("--report", o->report_file, "write the fit report (text) to FILE")->check(output_path());
  c->add_option("--json", o->json_file, "write the fit report as JSON to FILE, or - for standard output")->check(output_path());
  c->add_option("--html", o->html_file, "write the fit report as one self-contained HTML page (plots inline) to FILE")->check(output_path());
  c->add_flag("--quiet,-q", o->quiet, "print nothing on success");
  c->callback([o, &exit_code] { exit_code = run_fit_drive(*o); });
}

}  // namespace

void add_fit_command(CLI::App& app, int& exit_code) {
  CLI::App* fit = app.add_subcommand("fit", "Build cell and drive models from your own measurements");
  fit->require_subcommand(1);
  add_fit_cell(*fit, exit_code);
  add_fit_drive(*fit, exit_code);
}

}  // namespace sortie::cli
