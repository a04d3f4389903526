// `sortie discharge PACK.json (--power W | --current A | --load FILE.csv)`: a pack under a load.
#include <iostream>
#include <optional>

#include "cli/commands.hpp"
#include "cli/number_option.hpp"
#include "cli/report_output.hpp"
#include "core/error.hpp"
#include "core/text.hpp"
#include "io/battery_json.hpp"
#include "io/load_csv.hpp"
#include "io/output.hpp"
#include "report/discharge_report.hpp"
#include "report/html_discharge.hpp"
#include "report/text_table.hpp"
#include "sim/discharge.hpp"

namespace sortie::cli {

namespace {

struct DischargeOptions {
  std::string pack_file;
  std::optional<double> power_W, current_A;
  std::string load_file;
  std::string interpolation;
  std::optional<double> cutoff_cell_V, soc0, temperature_C, air_C;
  double soc_floor = 0.0;
  double sample_s = 1.0;
  std::string json_file, trace_file;
  bool quiet = false;
  bool stop_at_coverage = false;
  ReportOutput report;
};

int run_discharge(const DischargeOptions& o) {
  const bool print = print_format(o.report, {{"--json", &o.json_file}, {"--trace", &o.trace_file}}, o.quiet);
  battery::Pack pack = io::load_pack_file(o.pack_file);
  if (o.soc0) pack.soc0 = *o.soc0;
  // The floor is checked against the start actually used: the pack file's soc0 when --soc0 is
  // not given (a floor above it ended the run at t = 0 with a report of nothing).
  if (o.soc_floor >= pack.soc0)
    throw UsageError("--soc-floor: at or above the initial state of charge (got " + format_number(o.soc_floor) +
                     ", expected below " + format_number(pack.soc0) + ", the " +
                     (o.soc0 ? std::string("--soc0") : "soc0 of " + o.pack_file) + ")");
  if (o.temperature_C) pack.temperature_C = *o.temperature_C;
  if (o.air_C) pack.air_C = *o.air_C;
  sim::DischargeSpec spec;
  spec.cutoff_cell_V = o.cutoff_cell_V.value_or(pack.cell.v_cutoff_V);
  if (spec.cutoff_cell_V >= pack.cell.v_max_V)
    throw UsageError("--cutoff-cell-V: at or above the cell's maximum voltage (got " +
                     format_number(spec.cutoff_cell_V) + " V, expected below " +
                     format_number(pack.cell.v_max_V) + " V)");
  spec.soc_floor = o.soc_floor;
  spec.stop_at_coverage = o.stop_at_coverage;
  spec.sample_s = o.trace_file.empty() && o.report.html_file.empty() && o.report.format != "csv" ? 0.0 : o.sample_s;
  std::string label;
  if (o.current_A) {
    spec.load = sim::DischargeSpec::Load::current;
    spec.value = *o.current_A;
    label = "constant current " + report::fixed(*o.current_A, 2) + " A";
  } else if (o.power_W) {
    spec.load = sim::DischargeSpec::Load::power;
    spec.value = *o.power_W;
    label = "constant power " + report::fixed(*o.power_W, 1) + " W";
  } else {
    spec.load = sim::DischargeSpec::Load::series;
    std::optional<bool> step;
    if (!o.interpolation.empty()) step = o.interpolation == "step";
    spec.series = io::load_load_csv(o.load_file, step);
    spec.context = "discharge: " + o.load_file;
    label = std::string("load from ") + o.load_file + " (" + (spec.series.step ? "step" : "linear") + ")";
  }
  const sim::DischargeResult r = sim::discharge(pack, spec);

  const std::string html = o.report.html_file.empty() ? "" : report::discharge_html(pack, label, spec, r);
  if (!o.json_file.empty())
    io::write_output(o.json_file, report::discharge_json(pack, label, r).dump(2) + "\n");
  if (!o.trace_file.empty()) io::write_output(o.trace_file, report::discharge_trace_csv(r));
  if (!o.report.html_file.empty()) io::write_output(o.report.html_file, html);
  if (print && o.report.format == "json") io::write_output("-", report::discharge_json(pack, label, r).dump(2) + "\n");
  if (print && o.report.format == "csv") io::write_output("-", report::discharge_trace_csv(r));
  if (print && o.report.format == "text") io::write_output("-", printable(report::discharge_text(pack, label, r), true));
  return 0;
}

}  // namespace

void add_discharge_command(CLI::App& app, int& exit_code) {
  auto o = std::make_shared<DischargeOptions>();
  CLI::App* c = app.add_subcommand("discharge", "Run a pack under a load until it ends");
  c->add_option("PACK", o->pack_file, "pack model (JSON)")->required()->check(CLI::ExistingFile);
  auto* p = c->add_option("--power", o->power_W, "constant power at the terminals, W")
                ->check(number_in(above_to(0.0, 1e6, "W")));
  auto* i = c->add_option("--current", o->current_A, "constant current, A")->check(number_in(above_to(0.0, 1e5, "A")));
  auto* l = c->add_option("--load", o->load_file, "load over time: CSV with time_s and current_A or power_W")
                ->check(CLI::ExistingFile);
  p->excludes(i)->excludes(l);
  i->excludes(l);
  c->add_option("--interpolation", o->interpolation, "how --load values join: step or linear")
      ->check(CLI::IsMember({"step", "linear"}));
  c->add_option("--cutoff-cell-V", o->cutoff_cell_V, "loaded cell voltage that ends the run, V (default: the cell's)")
      ->check(number_in(between(0.5, 10.0, "V")));
  c->add_option("--soc0", o->soc0, "initial state of charge, 0..1 (default: the pack's)")->check(number_in(between(0.0, 1.0, "")));
  c->add_option("--soc-floor", o->soc_floor, "state of charge that ends the run, 0..1 (default 0)")
      ->check(number_in(between(0.0, 1.0, "")));
  c->add_flag("--stop-at-coverage", o->stop_at_coverage,
              "end the run where the state of charge falls below the lowest the cell model has data for "
              "(its coverage soc_min, or its OCV table's first point)");
  c->add_option("--temperature-C", o->temperature_C, "cell temperature (at the start, with a thermal model), °C (default: the pack's)")
      ->check(number_in(between(-60.0, 100.0, "°C")));
  c->add_option("--air-C", o->air_C,
                "air the cells give their heat to, °C, for cells with a thermal model (default: the pack's air_temperature_C, else its temperature)")
      ->check(number_in(between(-60.0, 100.0, "°C")));
  c->add_option("--json", o->json_file, "write the result as JSON to FILE, or - for standard output")->check(output_path());
  c->add_option("--trace", o->trace_file, "write a CSV trace to FILE")->check(output_path());
  add_report_options(c, o->report, {"text", "json", "csv"});
  c->add_option("--sample-s", o->sample_s, "trace spacing, s, for --trace, --html and --format csv (default 1)")->check(number_in(between(1e-3, 1e6, "s")));
  c->add_flag("--quiet,-q", o->quiet, "print nothing on success");
  c->callback([o, c, &exit_code] {
    if (!o->power_W && !o->current_A && o->load_file.empty())
      throw CLI::RequiredError("one of --power, --current or --load");
    (void)c;
    exit_code = run_discharge(*o);
  });
}

}  // namespace sortie::cli
