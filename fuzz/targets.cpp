#include "targets.hpp"

#include <algorithm>
#include <fstream>
#include <iostream>
#include <sstream>
#include <cmath>
#include <optional>
#include <stdexcept>
#include <string>

#include "battery/pack.hpp"
#include <fcntl.h>
#include <unistd.h>

#include "cli/profile_load.hpp"
#include "cli/run.hpp"
#include "core/error.hpp"
#include "fit/fit_cell.hpp"
#include "io/cell_json_write.hpp"
#include "io/json_reader.hpp"
#include "io/output.hpp"
#include "report/fit_report.hpp"
#include "flight/airframe.hpp"
#include "flight/fixed_wing.hpp"
#include "flight/thrust_need.hpp"
#include "io/airframe_json.hpp"
#include "io/battery_json.hpp"
#include "io/bench_csv.hpp"
#include "io/cell_log_csv.hpp"
#include "io/csv.hpp"
#include "io/drive_json.hpp"
#include "io/load_csv.hpp"
#include "io/log_columns.hpp"
#include "io/profile_json.hpp"
#include "propulsion/bench_map.hpp"
#include "propulsion/operating_point.hpp"
#include "report/compare_report.hpp"
#include "report/discharge_report.hpp"
#include "report/drive_report.hpp"
#include "report/html_compare.hpp"
#include "report/html_discharge.hpp"
#include "report/html_drive.hpp"
#include "report/html_fly.hpp"
#include "report/mission_report.hpp"
#include "report/result_csv.hpp"
#include "sim/compare.hpp"
#include "sim/discharge.hpp"
#include "sim/mission.hpp"
#include "sim/replay.hpp"
#include "support/xml_check.hpp"

namespace sortie::fuzz {

namespace {

// Work bounds for the short simulations: small enough that one input runs in milliseconds,
// large enough that every bundled model and profile runs to its end.
constexpr std::size_t kMaxSteps = 20000;    // per discharge, per mission phase, per replay stretch
constexpr std::size_t kMaxSamples = 20000;  // trace samples per discharge or mission
constexpr double kBriefSeconds = 60.0;      // a brief discharge

std::filesystem::path g_root;  // the models folder (use_models_from)

io::Source source_in(const std::string& folder, const std::string& name) {
  if (g_root.empty()) throw std::logic_error("sortie::fuzz: use_models_from() was not called");
  return io::Source{name, g_root / folder, g_root};
}

/// The demo pack the CSV loads run on (a bundled model, read once).
const battery::Pack& demo_pack() {
  static const battery::Pack pack =
      io::load_pack_file(g_root / "models" / "packs" / "demo-4s1p-lipo-5000.json");
  return pack;
}

/// A model that passed validation must simulate to numbers: a NaN or an infinity here means a
/// range check is missing at load (docs/style.md rule 6), so it is a bug like a crash.
void require_finite(double v, const char* what) {
  if (!std::isfinite(v)) throw std::logic_error(std::string("non-finite ") + what + " from a model that loaded");
}

/// An HTML report must stay well-formed (tests/support/xml_check.hpp, the check the report tests
/// use) and draw at finite coordinates: "nan" or "inf" in a position or a path is a broken plot.
void check_page(const std::string& html, const char* what) {
  const test::XmlCheck c = test::check_xml(html);
  if (!c.ok) throw std::logic_error(std::string(what) + " page is not well-formed: " + c.error);
  for (const auto& e : c.elements) {
    for (const char* a : {"x", "y", "x1", "y1", "x2", "y2", "cx", "cy", "r", "width", "height", "d", "points",
                          "transform", "viewBox"}) {
      const auto it = e.attrs.find(a);
      if (it == e.attrs.end()) continue;
      if (it->second.find("nan") != std::string::npos || it->second.find("inf") != std::string::npos)
        throw std::logic_error(std::string(what) + " page: <" + e.name + " " + a + "=\"" + it->second.substr(0, 80) +
                               "\"> (line " + std::to_string(e.line) + ")");
    }
  }
}

/// Run the reports too: they format every number the simulation produced, and the HTML page
/// draws its plots (ticks, scales) from them.
void report_discharge(const battery::Pack& pack, const std::string& label, const sim::DischargeSpec& spec,
                      const sim::DischargeResult& r) {
  require_finite(r.time_to_end_s, "discharge time");
  require_finite(r.charge_Ah, "discharge charge");
  require_finite(r.energy_Wh, "discharge energy");
  require_finite(r.soc_end, "final state of charge");
  (void)report::discharge_text(pack, label, r);
  (void)report::discharge_json(pack, label, r).dump(2);
  (void)report::discharge_trace_csv(r);
  check_page(report::discharge_html(pack, label, spec, r), "discharge");
}

/// Every report of `sortie drive` on a result: text, JSON, CSV and the HTML page.
void report_drive(const report::DriveResult& r) {
  (void)report::drive_text(r);
  (void)report::drive_json(r).dump(2);
  (void)report::drive_csv(r);
  check_page(report::drive_html(r), "drive");
}

/// A minute at about 1 C, once at constant current and once under a power ramp.
void discharge_briefly(const battery::Pack& pack) {
  const double i_1c = std::min(pack.cell.capacity_Ah * pack.parallel, 1000.0);
  const double v = pack.series * pack.cell.ocv_V(0.5);
  sim::DischargeSpec spec;
  spec.load = sim::DischargeSpec::Load::series;
  spec.cutoff_cell_V = pack.cell.v_cutoff_V;
  spec.sample_s = 1.0;
  spec.max_steps = kMaxSteps;
  spec.max_samples = kMaxSamples;
  spec.series.time_s = {0.0, kBriefSeconds};
  spec.series.quantity = sim::LoadSeries::Quantity::current;
  spec.series.value = {i_1c, i_1c};
  report_discharge(pack, "fuzz current", spec, sim::discharge(pack, spec));
  spec.series.quantity = sim::LoadSeries::Quantity::power;
  spec.series.value = {0.5 * i_1c * v, 2.0 * i_1c * v};
  report_discharge(pack, "fuzz power", spec, sim::discharge(pack, spec));
}

void run_cell(const std::string& text) {
  battery::Pack pack;
  pack.cell = io::parse_cell_json(text, source_in("models/cells", "fuzz-cell.json"));
  pack.series = 4;
  discharge_briefly(pack);
  pack.temperature_C = -10.0;  // the temperature tables' scaling
  discharge_briefly(pack);
}

void run_pack(const std::string& text) {
  discharge_briefly(io::parse_pack_json(text, source_in("models/packs", "fuzz-pack.json")));
}

void run_drive(const std::string& text) {
  const propulsion::Drive d = io::parse_drive_json(text, source_in("models/drives", "fuzz-drive.json"));
  const double v_bus = 14.8, rho = 1.225;
  const auto half = propulsion::at_duty(d, 0.5, 0.0, rho, v_bus);
  const double t = std::isfinite(half.motor.thrust_N) && half.motor.thrust_N > 0 ? half.motor.thrust_N : 5.0;
  const auto hover = propulsion::solve(d, t, 0.0, rho, v_bus);
  (void)propulsion::solve(d, 1.5 * t, 12.0, 0.9 * rho, 22.2);
  (void)propulsion::thrust_available(d, 8.0, rho, v_bus);
  if (hover.motor.status != propulsion::MotorStatus::infeasible)
    (void)propulsion::bus_load(d, hover.motor).power_W(v_bus);
  // As `sortie drive --cells 3,4,6 --sweep --sweep-step-pct 10` with every report.
  report::DriveResult r;
  r.drive_file = "fuzz-drive.json";
  r.drive = d;
  r.rho_kg_m3 = rho;
  for (int cells : {3, 4, 6}) {
    report::DriveCase c;
    c.cells = cells;
    c.cell_V = 3.7;
    c.v_bus_V = cells * c.cell_V;
    c.thrust_available_N = propulsion::thrust_available(d, 0.0, rho, c.v_bus_V);
    for (double pct = 10.0; pct <= 100.0; pct += 10.0)
      c.rows.push_back({pct, propulsion::at_duty(d, pct / 100.0 * d.esc.duty_max, 0.0, rho, c.v_bus_V)});
    r.cases.push_back(std::move(c));
  }
  report_drive(r);
  // As `sortie drive --bus-V 14.8 --thrust-N T`.
  r.cases.clear();
  r.thrust_N = t;
  report::DriveCase one;
  one.v_bus_V = v_bus;
  one.thrust_available_N = propulsion::thrust_available(d, 0.0, rho, v_bus);
  one.rows.push_back({std::nullopt, hover});
  r.cases.push_back(std::move(one));
  report_drive(r);
}

void run_airframe(const std::string& text) {
  const flight::Airframe a = io::parse_airframe_json(text, source_in("models/airframes", "fuzz-airframe.json"));
  flight::FlightCondition c;
  c.mass_kg = flight::all_up_mass_kg(a, 0.6);
  c.rotors = 4;
  c.disk_area_m2 = 0.1;
  for (const auto& [v, vz] : {std::pair{0.0, 0.0}, {12.0, 0.0}, {0.0, 2.0}, {0.0, -3.0}, {15.0, 1.5}, {25.0, -2.0}}) {
    c.airspeed_mps = v;
    c.climb_rate_mps = vz;
    (void)flight::thrust_need(a, c);
  }
  if (const auto* w = std::get_if<flight::FixedWing>(&a)) (void)flight::wing_speeds(*w, c.mass_kg, c.density_kg_m3);
}

void run_profile(const std::string& text) {
  const io::LoadedProfile lp = cli::parse_profile(text, source_in("profiles", "fuzz-profile.json"));
  sim::SimOptions so;
  so.sample_s = 5.0;  // as `sortie fly --trace --sample-s 5`
  so.max_steps_per_phase = kMaxSteps;
  so.max_trace_samples = kMaxSamples;
  const sim::MissionResult r = sim::simulate(lp.mission, so);
  if (r.refused) {
    (void)cli::refusal_message(lp, r);
    return;
  }
  require_finite(r.flight_time_s, "flight time");
  require_finite(r.energy_Wh, "flight energy");
  require_finite(r.landing.soc, "landing state of charge");
  const sim::SpareResult none;
  (void)report::fly_text(lp.mission, r, none);
  (void)report::fly_json(lp.mission, r, none).dump(2);
  (void)report::fly_trace_csv(r);
  (void)report::fly_phases_csv(lp.mission, r);
  // The spare-time solve: whole simulations again (the bundled profiles need 15 to 18), capped.
  sim::SpareOptions sp;
  sp.max_simulations = 25;
  sp.sim = so;
  const sim::SpareResult spare = sim::solve_spare(lp.mission, r, sp);
  (void)report::fly_text(lp.mission, r, spare);
  check_page(report::fly_html(lp.mission, r, spare), "fly");
  // The compare reports on this one pack (compare's rows carry no trace).
  sim::CompareRow row{{"fuzz pack", lp.mission.pack}, r, spare};
  row.result.trace.clear();
  const std::vector<sim::CompareRow> rows{row};
  (void)report::compare_text(lp.mission, rows);
  (void)report::compare_json(lp.mission, rows).dump(2);
  (void)report::compare_csv(rows);
  check_page(report::compare_html(lp.mission, rows), "compare");
}

void run_load_csv(const std::string& text) {
  const io::CsvFile csv = io::parse_csv(text, "fuzz-load.csv");
  // As `sortie discharge --load` (as the file says, no trace), then with --interpolation step
  // and --trace at the default spacing.
  for (const std::optional<bool> step : {std::optional<bool>{}, std::optional<bool>{true}}) {
    sim::DischargeSpec spec;
    spec.load = sim::DischargeSpec::Load::series;
    spec.series = io::read_load_csv(csv, step);
    spec.cutoff_cell_V = demo_pack().cell.v_cutoff_V;
    spec.sample_s = step ? 1.0 : 0.0;
    spec.max_steps = kMaxSteps;
    spec.max_samples = kMaxSamples;
    report_discharge(demo_pack(), "fuzz load", spec, sim::discharge(demo_pack(), spec));
  }
}

void run_cell_log(const std::string& text) {
  const io::DelimitedFile f = io::parse_delimited(text, "fuzz-log.csv");
  io::CellLogOptions numbered;
  numbered.columns = io::parse_column_spec("time=1,current=2,voltage=3", io::cell_log_quantities());
  for (const io::CellLogOptions& opts : {io::CellLogOptions{}, numbered}) {
    battery::CellLog log;
    try {
      log = io::read_cell_log(f, opts);
    } catch (const InputError&) {
      continue;  // the other option set may still read it
    }
    // The replay `sortie fit cell` checks its model with, on the logged current.
    battery::Pack pack = demo_pack();
    pack.series = 1;
    pack.soc0 = 0.9;
    (void)sim::replay(pack, sim::CurrentLog{log.time_s, log.current_A, log.section_starts}, kMaxSteps);
  }
}

void run_bench_csv(const std::string& text) {
  const propulsion::BenchMap map = io::read_bench_csv(io::parse_csv(text, "fuzz-bench.csv"));
  const double lo = map.thrust_min_N(), hi = map.thrust_max_N();
  for (double t : {0.0, lo, 0.5 * (lo + hi), hi, 1.5 * hi})
    (void)propulsion::bus_load(propulsion::bench_at_thrust(map, t)).power_W(map.v_bus_mean_V);
  // As `sortie drive --bench FILE --thrust-N T` with every report.
  report::DriveResult r;
  report::BenchView bv;
  bv.file = "fuzz-bench.csv";
  bv.map = map;
  bv.at_thrust = propulsion::bench_at_thrust(map, 0.5 * (lo + hi));
  r.bench = std::move(bv);
  r.thrust_N = 0.5 * (lo + hi);
  report_drive(r);
}

/// As `sortie fit cell LOG.csv --out CELL.json`: the log, the fit, the model written and read back
/// through the loader, and the text and JSON reports.
void run_fit_cell(const std::string& text) {
  const io::DelimitedFile f = io::parse_delimited(text, "fuzz-fit.csv");
  const battery::CellLog log = io::read_cell_log(f, io::CellLogOptions{});
  fit::CellFitOptions fo;
  fo.rc_pairs = text.size() % 2 ? 1 : 2;
  if (text.size() % 4 < 2) {
    // As `--soc0 0.9 --capacity-Ah 1 --rest-min-s 30`: a short pulse log then reaches the fit
    // itself instead of stopping at "no known full or empty point".
    fo.soc.soc0 = 0.9;
    fo.soc.capacity_Ah = 1.0;
    fo.rest_min_s = 30.0;
  }
  const fit::CellFitResult r = fit::fit_cell(log, fo);
  const nlohmann::json written = nlohmann::json::parse(io::cell_to_json(r.cell, r.note).dump());
  io::ObjectReader reader(written, io::Source{"fuzz-cell.json"}, "");
  (void)io::read_cell(reader);
  (void)report::fit_cell_text(log, r, {}, "fuzz-cell.json");
  (void)report::fit_cell_json(log, r, {}, "fuzz-cell.json").dump();
}

/// The command line: the input is words, one per line, after one of a few command prefixes
/// chosen by its first byte (each naming a bundled model). cli::run parses and runs it in a
/// scratch folder, with '/' in words turned into '_' so that no output can land outside it.
/// Any exit code but 0..4, a temporary left open, or a file left in the scratch folder under
/// the writer's temporary name is a bug.
void run_cli_options(const std::string& text) {
  namespace fs = std::filesystem;
  if (text.empty()) return;
  const std::string m = (g_root / "models").string(), pr = (g_root / "profiles").string();
  const std::vector<std::vector<std::string>> prefixes = {
      {"fly", pr + "/demo-quad-water-tank.json"},
      {"discharge", m + "/packs/demo-4s1p-lipo-5000.json"},
      {"drive", m + "/drives/demo-quad-15in.json"},
      {"fit", "cell", m + "/logs/demo-hppc-synthetic.csv"},
      {"fit", "drive", m + "/logs/demo-bench-synthetic.csv"},
      {"compare", pr + "/demo-quad-water-tank.json"},
      {},
  };
  std::vector<std::string> words = {"sortie"};
  for (const auto& w : prefixes[static_cast<unsigned char>(text[0]) % prefixes.size()]) words.push_back(w);
  std::string word;
  for (std::size_t i = 1; i <= text.size() && words.size() < 40; ++i) {
    if (i == text.size() || text[i] == '\n') {
      words.push_back(word);
      word.clear();
    } else {
      word += text[i] == '/' ? '_' : text[i];
    }
  }
  std::vector<char*> argv;
  for (auto& w : words) argv.push_back(w.data());
  argv.push_back(nullptr);

  const fs::path scratch = g_root / "cli-scratch";
  fs::remove_all(scratch);
  fs::create_directories(scratch);
  const fs::path back = fs::current_path();
  struct Restore {  // the folder and the streams, however the run ends
    fs::path dir;
    std::streambuf* out;
    std::streambuf* err;
    ~Restore() {
      std::error_code ec;
      fs::current_path(dir, ec);
      std::cout.rdbuf(out);
      std::cerr.rdbuf(err);
    }
  };
  std::ostringstream sink;
  Restore restore{back, std::cout.rdbuf(sink.rdbuf()), std::cerr.rdbuf(sink.rdbuf())};
  fs::current_path(scratch);
  // Standard output is written with write(2): keep it off the fuzzer's terminal.
  const int saved = ::dup(1);
  const int null_fd = ::open("/dev/null", O_WRONLY);
  ::dup2(null_fd, 1);
  const int code = cli::run(static_cast<int>(words.size()), argv.data());
  ::dup2(saved, 1);
  ::close(saved);
  ::close(null_fd);
  if (code < 0 || code > 4) throw std::logic_error("cli: exit code " + std::to_string(code));
  if (io::open_temporaries() != 0) throw std::logic_error("cli: a temporary was left registered");
  for (const auto& e : fs::directory_iterator(scratch))
    if (e.path().filename().string().rfind(".sortie-", 0) == 0)
      throw std::logic_error("cli: a temporary was left in the folder: " + e.path().string());
}

}  // namespace

const std::vector<Target>& targets() {
  static const std::vector<Target> all = {
      {"cell", run_cell},         {"pack", run_pack},         {"drive", run_drive},
      {"airframe", run_airframe}, {"profile", run_profile},   {"load_csv", run_load_csv},
      {"cell_log", run_cell_log}, {"bench_csv", run_bench_csv}, {"fit_cell", run_fit_cell},
      {"cli_options", run_cli_options},
  };
  return all;
}

const Target* find_target(std::string_view name) {
  for (const auto& t : targets())
    if (name == t.name) return &t;
  return nullptr;
}

void use_models_from(const std::filesystem::path& source_dir, const std::filesystem::path& folder) {
  namespace fs = std::filesystem;
  fs::create_directories(folder);
  for (const char* sub : {"models", "profiles"})
    fs::copy(source_dir / sub, folder / sub, fs::copy_options::recursive | fs::copy_options::overwrite_existing);
  g_root = fs::canonical(folder);
}

}  // namespace sortie::fuzz
