// `sortie discharge` end to end: the demo runs, outputs are written, and every kind of bad input
// gives one line naming file, pointer or line, value and expectation, exit 1, and no output file.
#include <doctest/doctest.h>

#include <nlohmann/json.hpp>

#include "support/cli.hpp"

using namespace sortie::test;
using nlohmann::json;

namespace {

const std::string kDemoPack = "models/packs/demo-4s1p-lipo-5000.json";

json base_cell() {
  return json::parse(read_file(source_path("models/cells/demo-lipo-5000.json")));
}

/// Write a cell (mutated by the caller) and a pack referring to it; return the pack path.
std::string write_pack(const std::string& tag, const json& cell, json pack = json()) {
  write_work_file(tag + "-cell.json", cell.dump(2));
  if (pack.is_null()) pack = {{"cell", tag + "-cell.json"}, {"series", 4}, {"soc0", 1.0}};
  return write_work_file(tag + "-pack.json", pack.dump(2));
}

/// Run discharge on `pack` with --json to a fresh file; expect exit 1, one stderr line with every
/// fragment, and no output file.
void expect_refused(const std::string& pack, const std::vector<std::string>& fragments,
                    std::vector<std::string> extra = {"--current", "5"}) {
  const std::string out = work_path("refused.json");
  std::vector<std::string> args = {"discharge", pack, "--json", out};
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

TEST_CASE("discharge: the demo pack runs and writes JSON and trace") {
  const std::string js = work_path("demo.json"), tr = work_path("demo.csv");
  const auto r = run_sortie({"discharge", source_path(kDemoPack), "--power", "300", "--json", js,
                             "--trace", tr, "--sample-s", "5"});
  REQUIRE(r.exit_code == 0);
  CHECK(r.out.find("time to end") != std::string::npos);
  const json j = json::parse(read_file(js));
  CHECK(j["schema"] == "sortie.discharge/1");
  CHECK(j["end_reason"] == "cutoff_voltage");
  for (const char* k : {"time_to_end_s", "charge_Ah", "energy_Wh", "v_min_V", "soc_end"}) CHECK(j[k].is_number());
  CHECK(j["events"].is_array());
  const std::string csv = read_file(tr);
  CHECK(csv.rfind("time_s,current_A,v_terminal_V,v_ocv_V,soc,power_W,cell_temperature_C\n", 0) == 0);
  // Energy = ∫P dt = 300 W · t at constant power.
  CHECK(j["energy_Wh"].get<double>() == doctest::Approx(300.0 * j["time_to_end_s"].get<double>() / 3600).epsilon(1e-6));
}

TEST_CASE("discharge: --json - prints the JSON alone on stdout") {
  const auto r = run_sortie({"discharge", source_path(kDemoPack), "--current", "5", "--json", "-"});
  REQUIRE(r.exit_code == 0);
  CHECK(json::parse(r.out)["end_reason"] == "cutoff_voltage");
}

TEST_CASE("discharge: a load CSV in step mode") {
  const std::string load = write_work_file("load.csv", "# interpolation: step\ntime_s,current_A\n0,10\n60,40\n90,10\n600,10\n");
  const auto r = run_sortie({"discharge", source_path(kDemoPack), "--load", load, "--json", "-"});
  REQUIRE(r.exit_code == 0);
  const json j = json::parse(r.out);
  CHECK(j["end_reason"] == "load_end");
  // Charge of the step profile: (10·60 + 40·30 + 10·510) A·s.
  CHECK(j["charge_Ah"].get<double>() == doctest::Approx((600.0 + 1200.0 + 5100.0) / 3600).epsilon(1e-9));
}

TEST_CASE("discharge: usage errors exit 2") {
  CHECK(run_sortie({"discharge", source_path(kDemoPack)}).exit_code == 2);
  CHECK(run_sortie({"discharge", source_path(kDemoPack), "--current", "5", "--power", "100"}).exit_code == 2);
  CHECK(run_sortie({"discharge", source_path(kDemoPack), "--current", "-5"}).exit_code == 2);
  CHECK(run_sortie({"nosuchcommand"}).exit_code == 2);
}

TEST_CASE("bad input: JSON syntax error names line and column") {
  const std::string p = write_work_file("syntax-pack.json", "{\n  \"series\": 4,\n  \"cell\" \"x.json\"\n}\n");
  expect_refused(p, {"syntax-pack.json", "line 3", "column", "JSON syntax error"});
}

TEST_CASE("bad input: missing field") {
  json c = base_cell();
  c.erase("capacity_Ah");
  expect_refused(write_pack("missing", c), {"missing-cell.json", "/capacity_Ah", "missing field"});
}

TEST_CASE("bad input: unknown field suggests the nearest valid key") {
  json c = base_cell();
  c["capacity_ah"] = c["capacity_Ah"];
  c.erase("capacity_Ah");
  expect_refused(write_pack("unknown", c), {"/capacity_ah", "unknown field", "did you mean 'capacity_Ah'"});
}

TEST_CASE("bad input: zero or negative capacity — resistance — time constant — series — parallel") {
  json c = base_cell();
  c["capacity_Ah"] = 0;
  expect_refused(write_pack("cap0", c), {"/capacity_Ah", "got 0", "> 0 Ah"});
  c = base_cell();
  c["r0_ohm"] = -0.001;
  expect_refused(write_pack("r0neg", c), {"/r0_ohm", "got -0.001", "> 0 ohm"});
  c = base_cell();
  c["r0_ohm"] = {{"soc", {0.0, 1.0}}, {"ohm", {0.003, 0.0}}};
  expect_refused(write_pack("r0tab", c), {"/r0_ohm/ohm/1", "got 0"});
  c = base_cell();
  c["rc"][1]["tau_s"] = 0;
  expect_refused(write_pack("tau0", c), {"/rc/1/tau_s", "got 0", "> 0 s"});
  c = base_cell();
  c["rc"][0]["r_ohm"] = -1;
  expect_refused(write_pack("rneg", c), {"/rc/0/r_ohm"});
  expect_refused(write_pack("s0", base_cell(), {{"cell", "s0-cell.json"}, {"series", 0}}), {"s0-pack.json", "/series", "got 0"});
  expect_refused(write_pack("p0", base_cell(), {{"cell", "p0-cell.json"}, {"series", 4}, {"parallel", -2}}), {"/parallel", "got -2"});
  expect_refused(write_pack("sfrac", base_cell(), {{"cell", "sfrac-cell.json"}, {"series", 3.5}}), {"/series", "whole number"});
}

TEST_CASE("bad input: an extra unknown field is refused with a suggestion") {
  json c = base_cell();
  c["v_cutof_V"] = 3.0;
  expect_refused(write_pack("extra", c), {"/v_cutof_V", "unknown field", "did you mean 'v_cutoff_V'"});
}

TEST_CASE("bad input: OCV not increasing with SoC") {
  json c = base_cell();
  c["ocv"]["V"][3] = 3.60;
  expect_refused(write_pack("ocv", c), {"/ocv/V/3", "OCV not increasing", "got 3.6"});
}

TEST_CASE("bad input: SoC outside 0 to 1") {
  json c = base_cell();
  c["ocv"]["soc"][10] = 1.2;
  expect_refused(write_pack("socrange", c), {"/ocv/soc/10", "got 1.2", "from 0 to 1"});
  expect_refused(write_pack("soc0", base_cell(), {{"cell", "soc0-cell.json"}, {"series", 4}, {"soc0", -0.1}}),
                 {"/soc0", "got -0.1"});
}

TEST_CASE("bad input: tables of unequal length") {
  json c = base_cell();
  c["ocv"]["V"].erase(c["ocv"]["V"].size() - 1);
  expect_refused(write_pack("unequal", c), {"/ocv/V", "unequal length", "10 values", "11"});
}

TEST_CASE("bad input: non-finite and non-numeric values") {
  // JSON has no NaN or infinity literals; an overflowing literal parses to infinity.
  json c = base_cell();
  std::string text = c.dump(2);
  const std::string key = "\"mass_kg\": ";
  const auto p = text.find(key);
  REQUIRE(p != std::string::npos);
  text.replace(p + key.size(), text.find(',', p) - p - key.size(), "1e999");
  write_work_file("inf-cell.json", text);
  const std::string pack = write_work_file("inf-pack.json", json{{"cell", "inf-cell.json"}, {"series", 4}}.dump());
  expect_refused(pack, {"inf-cell.json", "1e999", "finite number"});
  c = base_cell();
  c["v_max_V"] = "NaN";
  expect_refused(write_pack("nan", c), {"/v_max_V", "not a number", "\"NaN\""});
}

TEST_CASE("bad input: cutoff above the maximum voltage") {
  json c = base_cell();
  c["v_cutoff_V"] = 4.3;
  expect_refused(write_pack("cutoff", c), {"/v_cutoff_V", "got 4.3 V", "below v_max_V = 4.2 V"});
}

TEST_CASE("bad input: initial resting voltage outside the OCV table") {
  expect_refused(write_pack("vrest", base_cell(), {{"cell", "vrest-cell.json"}, {"series", 4}, {"v_rest_cell0_V", 4.5}}),
                 {"vrest-pack.json", "/v_rest_cell0_V", "got 4.5 V", "from 3.27 to 4.2 V"});
}

TEST_CASE("bad input: load CSV with a missing column — non-increasing time — text in a number") {
  const std::string pack = source_path(kDemoPack);
  const std::string a = write_work_file("nocol.csv", "time_s,amps\n0,1\n10,1\n");
  expect_refused(pack, {"nocol.csv", "line 1", "missing column", "current_A"}, {"--load", a});
  const std::string b = write_work_file("notime.csv", "time_s,current_A\n0,1\n10,1\n10,2\n");
  expect_refused(pack, {"notime.csv", "line 4", "time not increasing", "got 10 s"}, {"--load", b});
  const std::string c = write_work_file("text.csv", "time_s,current_A\n0,1\n10,abc\n");
  expect_refused(pack, {"text.csv", "line 3", "column 'current_A'", "\"abc\""}, {"--load", c});
}

}  // TEST_SUITE

TEST_SUITE("cli") {

TEST_CASE("discharge: a cell with a thermal block reports its temperature in text JSON and trace") {
  json cell = base_cell();
  cell["thermal"] = {{"c_J_per_kgK", 1000}, {"hA_W_per_K", 0.05}};
  const std::string pack = write_pack("thermal", cell);
  const std::string js = work_path("thermal.json"), tr = work_path("thermal.csv");
  const auto r = run_sortie({"discharge", pack, "--current", "50", "--temperature-C", "0", "--air-C", "-5", "--json", js,
                             "--trace", tr, "--sample-s", "10"});
  REQUIRE(r.exit_code == 0);
  CHECK(r.out.find("cell temperature") != std::string::npos);
  CHECK(r.out.find("(air -5.0 °C)") != std::string::npos);
  const json j = json::parse(read_file(js));
  REQUIRE(j.contains("cell_temperature_C"));
  CHECK(j["cell_temperature_C"]["start"] == 0.0);
  CHECK(j["cell_temperature_C"]["air"] == -5.0);
  CHECK(j["cell_temperature_C"]["max"].get<double>() > 5.0);  // 10C on a cold cell
  CHECK(j["cell_temperature_C"]["end"].get<double>() <= j["cell_temperature_C"]["max"].get<double>());
  const std::string csv = read_file(tr);
  CHECK(csv.rfind("time_s,current_A,v_terminal_V,v_ocv_V,soc,power_W,cell_temperature_C\n", 0) == 0);
  // Without the block: no temperature in the result.
  cell.erase("thermal");
  const auto plain = run_sortie({"discharge", write_pack("isothermal", cell), "--current", "50", "--format", "json"});
  REQUIRE(plain.exit_code == 0);
  CHECK_FALSE(json::parse(plain.out).contains("cell_temperature_C"));
}

TEST_CASE("bad input: thermal block values out of range or unknown keys") {
  json cell = base_cell();
  cell["thermal"] = {{"c_J_per_kgK", 1.0}, {"hA_W_per_K", 0.05}};
  expect_refused(write_pack("thermal-c", cell), {"thermal-c-cell.json", "/thermal/c_J_per_kgK", "1", "100"});
  cell["thermal"] = {{"c_J_per_kgK", 1000}, {"hA_W_per_K", -1}};
  expect_refused(write_pack("thermal-h", cell), {"/thermal/hA_W_per_K", "-1"});
  cell["thermal"] = {{"c_J_per_kgK", 1000}, {"hA_W_per_k", 0.1}};
  expect_refused(write_pack("thermal-key", cell), {"/thermal", "hA_W_per_k", "hA_W_per_K"});
}

}  // TEST_SUITE
