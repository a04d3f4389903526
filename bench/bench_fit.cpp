// Fit benchmarks: `fit cell` on a 10-hour pulse-test log logged at 1 Hz (36,000 rows and more),
// made once by sortie's own simulator from the invented demo cell.
#include <string>

#include "bench.hpp"
#include "fit/fit_cell.hpp"
#include "fit/voltage_error.hpp"
#include "io/battery_json.hpp"
#include "io/cell_json_write.hpp"
#include "io/cell_log_csv.hpp"
#include "sim/replay.hpp"
#include "sim/synthetic_log.hpp"

namespace {

using namespace sortie;

/// The pulse test of the demo cell logged every `sample_s` throughout (rests too), with rests
/// long enough that the log runs 10 hours.
sim::SyntheticLog pulse_test_10h(double sample_s) {
  const battery::Cell cell = io::load_cell_file(SORTIE_SOURCE_DIR "/models/cells/demo-lipo-5000.json");
  sim::PulseTestProtocol p;
  p.sample_s = p.pulse_sample_s = p.rest_sample_s = sample_s;
  p.start_rest_s = 1200.0;
  p.step_rest_s = 2000.0;
  sim::MeasurementNoise noise;
  noise.seed = 11;
  return sim::synthetic_pulse_test(cell, p, noise);
}

/// Logged every second: 36,048 rows.
const sim::SyntheticLog& log_10h() {
  static const sim::SyntheticLog log = pulse_test_10h(1.0);
  return log;
}

fit::CellFitOptions lipo() {
  fit::CellFitOptions o;
  o.chemistry = "LiPo";  // the demo cell's
  return o;
}

std::string as_csv(const sim::SyntheticLog& s) {
  std::string out = "Time (s),Current (A),Voltage (V)\n";
  char buf[96];
  for (std::size_t k = 0; k < s.time_s.size(); ++k) {
    std::snprintf(buf, sizeof buf, "%.3f,%.3f,%.3f\n", s.time_s[k], s.current_A[k], s.voltage_V[k]);
    out += buf;
  }
  return out;
}

// The identification alone (SoC, OCV, R0 and two RC pairs over SoC bands).
const bool reg_fit = bench::add_case(
    "fit_cell_10h_1Hz",
    [] {
      static const battery::CellLog log = sim::to_cell_log(log_10h(), "bench");
      bench::keep(fit::fit_cell(log, lipo()).fit_rmse_V);
    },
    5);

// What `sortie fit cell` does apart from the disk: parse the CSV text, fit, write and reload the
// model, re-simulate it on the log's current, and the voltage errors.
void fit_command(const std::string& csv) {
  const battery::CellLog log = io::read_cell_log(io::parse_delimited(csv, "bench.csv"), io::CellLogOptions{});
  const fit::CellFitResult r = fit::fit_cell(log, lipo());
  const nlohmann::json j = nlohmann::json::parse(io::cell_to_json(r.cell, r.note).dump());
  io::ObjectReader reader(j, io::Source{"bench.json", {}}, "");
  battery::Pack pack;
  pack.cell = io::read_cell(reader);
  pack.soc0 = r.soc.front();
  const sim::ReplayResult rep = sim::replay(pack, {log.time_s, log.current_A, log.section_starts});
  bench::keep(fit::voltage_errors(log.voltage_V, rep.v_terminal_V, r.soc, {}).all.rmse_V);
}

const bool reg_command = bench::add_case(
    "fit_cell_command_10h_1Hz",
    [] {
      static const std::string csv = as_csv(log_10h());
      fit_command(csv);
    },
    5);

/// The same ten-hour pulse test logged every 36 ms throughout: a million rows, the size of a
/// high-rate cycler export.
const sim::SyntheticLog& log_1M() {
  static const sim::SyntheticLog log = pulse_test_10h(0.036);
  return log;
}

// `fit cell` apart from the disk on a million-row log (parse, fit, write, reload, re-simulate).
const bool reg_command_1M = bench::add_case(
    "fit_cell_command_1M_rows",
    [] {
      static const std::string csv = as_csv(log_1M());
      fit_command(csv);
    },
    1);

}  // namespace
