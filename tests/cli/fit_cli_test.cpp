// `sortie fit cell` and `sortie fit drive` end to end: the bundled synthetic log and bench test
// give models that load and run; bad logs (no rest, a current that never changes, an all-zero
// current, a missing column, text in a number) give a clear warning or a one-line error with
// exit 1 and no file.
#include <doctest/doctest.h>

#include <cmath>
#include <nlohmann/json.hpp>

#include "io/battery_json.hpp"
#include "io/drive_json.hpp"
#include "sim/replay.hpp"
#include "support/cli.hpp"
#include "support/synthetic.hpp"

using namespace sortie;
using namespace sortie::test;
using nlohmann::json;

namespace {

/// A CSV log of the demo cell under `current` (A, per 1 s row), voltages from the replay.
std::string replayed_log(const std::string& name, const std::vector<double>& current, double soc0) {
  battery::Pack p;
  p.cell = io::load_cell_file(source_path(kDemoLogCell));
  p.soc0 = soc0;
  sim::CurrentLog log;
  for (std::size_t k = 0; k < current.size(); ++k) {
    log.time_s.push_back(static_cast<double>(k));
    log.current_A.push_back(current[k]);
  }
  const auto r = sim::replay(p, log);
  std::string csv = "time_s,current_A,voltage_V\n";
  char buf[80];
  for (std::size_t k = 0; k < current.size(); ++k) {
    std::snprintf(buf, sizeof buf, "%zu,%.3f,%.3f\n", k, current[k], std::round(r.v_terminal_V[k] * 1000) / 1000);
    csv += buf;
  }
  return write_work_file(name, csv);
}

/// Expect exit 1, one stderr line holding every fragment, and no model file.
void expect_refused(const std::string& log, const std::vector<std::string>& fragments,
                    std::vector<std::string> extra = {}) {
  const std::string out = work_path("refused-cell.json");
  std::vector<std::string> args = {"fit", "cell", log, "--out", out};
  args.insert(args.end(), extra.begin(), extra.end());
  const auto r = run_sortie(args);
  CHECK(r.exit_code == 1);
  CHECK(r.out.empty());
  CHECK(std::count(r.err.begin(), r.err.end(), '\n') == 1);
  for (const auto& f : fragments) CHECK_MESSAGE(r.err.find(f) != std::string::npos, "missing '" << f << "' in: " << r.err);
  CHECK_FALSE(file_exists(out));
  CHECK_FALSE(file_exists(out + ".part"));
}

}  // namespace

TEST_SUITE("cli") {

TEST_CASE("fit cell: the bundled synthetic log gives a model that loads and runs a discharge") {
  const std::string model = work_path("fitted-demo.json"), report = work_path("fitted-demo.txt"),
                    js = work_path("fitted-demo-report.json"), trace = work_path("fitted-demo-trace.csv");
  const auto r = run_sortie({"fit", "cell", source_path(kDemoLogFile), "--out", model, "--mass-kg", "0.118",
                             "--chemistry", "LiPo", "--name", "demo LiPo fitted from the synthetic log (invented)", "--report", report,
                             "--json", js, "--trace", trace});
  REQUIRE_MESSAGE(r.exit_code == 0, r.err);
  CHECK(r.out.find("voltage RMSE") != std::string::npos);
  CHECK(r.out == read_file(report));
  // The model loads with the ordinary loader: OCV of at least 11 points, strictly rising.
  const battery::Cell c = io::load_cell_file(model);
  CHECK(c.ocv_V.size() >= 11);
  CHECK(c.ocv_V.strictly_increasing_y());
  CHECK(c.rc.size() == 2);
  CHECK(c.mass_kg == doctest::Approx(0.118));
  CHECK(c.capacity_Ah == doctest::Approx(4.91).epsilon(0.01));  // the log's full-to-empty charge
  const json j = json::parse(read_file(js));
  CHECK(j["schema"] == "sortie.fit_cell/1");
  CHECK(j["voltage_rmse_V"].get<double>() < 0.01);
  CHECK(j["counted_voltage_rmse_V"].get<double>() < 0.005);
  CHECK(j["counted_rows"].get<std::size_t>() > 10000);
  CHECK(j["bands"].size() >= 2);
  CHECK(read_file(trace).rfind("time_s,line,current_A,v_measured_V,v_model_V,error_mV,soc\n", 0) == 0);
  // The fitted cell in a 4S pack runs a discharge (the path to a mission).
  const std::string pack = write_work_file("fitted-pack.json", json{{"cell", model}, {"series", 4}, {"soc0", 1.0}}.dump());
  const auto d = run_sortie({"discharge", pack, "--power", "150", "--quiet"});
  CHECK_MESSAGE(d.exit_code == 0, d.err);
}

TEST_CASE("fit cell: a fit that fails its quality gate exits 4 and writes no model unless accepted") {
  // The demo LiPo log declared LFP: its fitted OCV (about 3.3 to 4.2 V) lies outside what an LFP
  // cell can show (2.5 to 3.7 V, fit/chemistry), so the gate fails whatever the RMSE.
  const std::string model = work_path("gate-model.json");
  std::vector<std::string> args = {"fit", "cell", source_path(kDemoLogFile), "--out", model,
                                   "--chemistry", "LFP", "--v-cutoff-V", "3.3"};
  const auto r = run_sortie(args);
  CHECK(r.exit_code == 4);
  CHECK_FALSE(file_exists(model));
  CHECK(r.out.find("quality gate     FAILED") != std::string::npos);
  CHECK(r.out.find("outside what a LFP cell can show") != std::string::npos);
  args.push_back("--accept-poor-fit");
  const auto a = run_sortie(args);
  CHECK_MESSAGE(a.exit_code == 0, a.err);
  const json cell = json::parse(read_file(model));
  CHECK(cell["fit_quality"]["passed"] == false);
  // The demo log as a LiPo passes: held-out RMSE within the 20 mV limit.
  const auto ok = run_sortie({"fit", "cell", source_path(kDemoLogFile), "--out", model, "--chemistry", "LiPo", "--quiet"});
  CHECK(ok.exit_code == 0);
  const json good = json::parse(read_file(model));
  CHECK(good["fit_quality"]["passed"] == true);
  CHECK(good["fit_quality"]["held_out_rmse_V"].get<double>() < 0.020);
  CHECK(good["coverage"]["soc_max"].get<double>() == doctest::Approx(1.0).epsilon(0.001));  // rounded inwards
}

TEST_CASE("fit cell: a log with no rest is fitted with a warning saying so") {
  // Pulses of 4C for 10 s on a 0.5C discharge, never at rest, from full (given by --soc0).
  std::vector<double> i;
  for (int k = 0; k < 6000; ++k) i.push_back(k % 130 < 10 ? 20.0 : 2.5);
  const std::string log = replayed_log("no-rest.csv", i, 1.0);
  const std::string out = work_path("no-rest.json");
  const auto r = run_sortie({"fit", "cell", log, "--out", out, "--soc0", "1", "--capacity-Ah", "5", "--chemistry", "LiPo"});
  REQUIRE_MESSAGE(r.exit_code == 0, r.err);
  CHECK(r.out.find("no rest of 300 s or more") != std::string::npos);
  CHECK(io::load_cell_file(out).ocv_V.size() >= 11);
}

TEST_CASE("fit cell: a current that never changes is refused") {
  const std::string log = replayed_log("constant.csv", std::vector<double>(3000, 2.5), 1.0);
  expect_refused(log, {"constant.csv: the current never changes", "2.500 A in every row"}, {"--soc0", "1", "--capacity-Ah", "5"});
}

TEST_CASE("fit cell: an all-zero current is refused") {
  const std::string log = replayed_log("zero.csv", std::vector<double>(600, 0.0), 0.5);
  expect_refused(log, {"zero.csv: the current is zero in every row", "nothing to fit"});
}

TEST_CASE("fit cell: a missing column and text in a number are one-line errors") {
  const std::string no_v = write_work_file("no-voltage.csv", "time_s,current_A\n0,0\n1,2\n2,0\n");
  expect_refused(no_v, {"no-voltage.csv: no header line naming the time, current and voltage columns"});
  const std::string bad = write_work_file("bad-number.csv", "time_s,current_A,voltage_V\n0,0,3.8\n1,2,x3.7\n2,0,3.8\n");
  expect_refused(bad, {"bad-number.csv: line 3: voltage column 'voltage_V' is not a number (got \"x3.7\""});
  const std::string asked = write_work_file("asked.csv", "t,I,U\n0,0,3.8\n1,2,3.7\n");
  expect_refused(asked, {"asked.csv: no header line", "time=Zeit", "not all found"},
                 {"--columns", "time=Zeit,current=I,voltage=U"});
}

TEST_CASE("fit cell: bad usage exits 2") {
  const std::string log = source_path(kDemoLogFile);
  for (const auto& args : std::vector<std::vector<std::string>>{
           {"fit", "cell", log},                                               // no --out
           {"fit", "cell", log, "--out", work_path("x.json"), "--rc", "3"},  // 1 or 2 pairs
           {"fit", "cell", log, "--out", work_path("x.json"), "--columns", "volts=3"},
           {"fit", "cell", log, "--out", work_path("x.json"), "--discharge-positive", "--discharge-negative"},
           {"fit"}}) {
    const auto r = run_sortie(args);
    CHECK_MESSAGE(r.exit_code == 2, r.err);
    CHECK_FALSE(file_exists(work_path("x.json")));
  }
}

TEST_CASE("fit drive: the bundled synthetic bench gives a drive that sortie drive runs") {
  const std::string model = work_path("fitted-drive.json"), js = work_path("fitted-drive-report.json");
  const auto r = run_sortie({"fit", "drive", source_path(kDemoBenchFile), "--out", model, "--diameter-m", "0.381",
                             "--rotors", "4", "--json", js});
  REQUIRE_MESSAGE(r.exit_code == 0, r.err);
  CHECK(r.out.find("per throttle step") != std::string::npos);
  const auto d = io::load_drive_file(model);
  CHECK(d.rotors == 4);
  CHECK(d.motor.kv_rpm_per_V == doctest::Approx(400.0).epsilon(0.01));  // the invented drive's Kv
  const json j = json::parse(read_file(js));
  CHECK(j["schema"] == "sortie.fit_drive/1");
  CHECK(j["points"].size() == 13);
  CHECK(j["max_power_pct"].get<double>() < 2.0);
  const auto run = run_sortie({"drive", model, "--bus-V", "16", "--thrust-N", "8"});
  CHECK_MESSAGE(run.exit_code == 0, run.err);
}

TEST_CASE("fit drive: no diameter is bad usage and too few steps bad input") {
  const std::string out = work_path("drive-refused.json");
  const auto u = run_sortie({"fit", "drive", source_path(kDemoBenchFile), "--out", out});
  CHECK(u.exit_code == 2);
  CHECK(u.err.find("--diameter-m is required") != std::string::npos);
  CHECK_FALSE(file_exists(out));
  const std::string few = write_work_file("few.csv", "throttle (%),voltage (V),current (A),rpm,thrust (g)\n"
                                                     "0,16,0.02,0,0\n50,16,4,3000,700\n80,16,12,4400,1500\n");
  const auto b = run_sortie({"fit", "drive", few, "--out", out, "--diameter-m", "0.381"});
  CHECK(b.exit_code == 1);
  CHECK(std::count(b.err.begin(), b.err.end(), '\n') == 1);
  CHECK(b.err.find("few.csv: too few rows with the motor turning (got 2") != std::string::npos);
  CHECK_FALSE(file_exists(out));
}

}  // TEST_SUITE

TEST_SUITE("cli") {

TEST_CASE("fit cell: a log with a temperature column gives a model with a thermal block that fly uses") {
  // A synthetic pulse test of the demo cell with 4C steps, its thermal block on, in 18 °C air.
  const battery::Cell truth = io::load_cell_file(source_path(kDemoLogCell));
  sim::PulseTestProtocol p;
  p.step_C = 4.0;
  p.step_rest_s = 2400.0;
  p.thermal = true;
  p.air_C = 18.0;
  const sim::SyntheticLog s = sim::synthetic_pulse_test(truth, p, sim::MeasurementNoise{});
  // Its 4C steps end at the cutoff with charge left (no empty point): --capacity-Ah 5 below.
  std::string csv = "Time (s),Current (A),Voltage (V),Temperature (degC)\n";
  char buf[96];
  for (std::size_t k = 0; k < s.time_s.size(); ++k) {
    std::snprintf(buf, sizeof buf, "%.1f,%.3f,%.3f,%.1f\n", s.time_s[k], s.current_A[k] + 0.0, s.voltage_V[k], s.temperature_C[k]);
    csv += buf;
  }
  const std::string log = write_work_file("thermal-log.csv", csv);
  const std::string model = work_path("thermal-cell.json");
  const auto r = run_sortie({"fit", "cell", log, "--out", model, "--mass-kg", "0.118", "--chemistry", "LiPo", "--capacity-Ah", "5", "--json", "-"});
  REQUIRE_MESSAGE(r.exit_code == 0, r.err);
  const json j = json::parse(r.out);
  REQUIRE(j.contains("thermal"));
  CHECK(j["thermal"]["c_J_per_kgK"].get<double>() == doctest::Approx(1000.0).epsilon(0.05));
  CHECK(j["thermal"]["hA_W_per_K"].get<double>() == doctest::Approx(0.08).epsilon(0.10));
  const json cell = json::parse(read_file(model));
  REQUIRE(cell.contains("thermal"));
  CHECK(cell["thermal"]["c_J_per_kgK"] == j["thermal"]["c_J_per_kgK"]);
  const auto text = run_sortie({"fit", "cell", log, "--out", work_path("thermal-cell-2.json"), "--mass-kg", "0.118", "--chemistry", "LiPo", "--capacity-Ah", "5"});
  CHECK(text.out.find("thermal block     heat capacity") != std::string::npos);
  // The fitted cell flies, and the pack warms in flight.
  const std::string pack =
      write_work_file("thermal-pack.json", json({{"cell", "thermal-cell.json"}, {"series", 6}, {"temperature_C", 10}}).dump());
  const auto fly = run_sortie({"fly", source_path("profiles/demo-quad-water-tank.json"), "--pack", pack, "--json", "-"});
  // Exit 0 for a go (docs/architecture.md "Commands"): a 6S1P of the fitted 5 Ah demo cell at 10 °C flies
  // the quadcopter demo with its reserve, as the demo's own 6S1P pack of that cell does.
  REQUIRE_MESSAGE(fly.exit_code == 0, fly.err);
  const json jf = json::parse(fly.out);
  CHECK(jf["verdict"] == "go");
  REQUIRE(jf.contains("cell_temperature_C"));
  CHECK(jf["cell_temperature_C"]["max"].get<double>() > 10.0);
}

}  // TEST_SUITE
