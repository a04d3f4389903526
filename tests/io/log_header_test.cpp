// Columns recognised by what their names and units say rather than by any one program's
// spellings; step modes read by their meaning; `--columns` for one log of several.
// Unit factors: 1 h = 3600 s, T/°C = T/K − 273.15 (BIPM, "The International System of Units",
// 9th edition, 2019, tables 4 and 8).
#include "io/log_header.hpp"

#include <doctest/doctest.h>

#include <cmath>
#include <filesystem>
#include <fstream>
#include <sstream>

#include "core/error.hpp"
#include "io/cell_log_csv.hpp"
#include "support/cli.hpp"

using namespace sortie;

namespace {

battery::CellLog read(const std::string& text, io::CellLogOptions o = {}) {
  return io::read_cell_log(io::parse_delimited(text, "log.csv"), o);
}

std::string usage_of(const std::vector<std::string>& values, const std::vector<std::string>& files) {
  try {
    io::parse_column_specs_per_file(values, files, io::cell_log_quantities());
  } catch (const UsageError& e) {
    return e.what();
  }
  return "";
}

}  // namespace

TEST_SUITE("io") {

TEST_CASE("log header: words and units find the columns and a per-step clock is second choice") {
  // Total time in hours, a per-step clock in seconds, the current in mA, the voltage in mV and
  // the temperature in K, under names no list spells out.
  const auto log = read(
      "Step time (s),Total time (h),Cell current (mA),Terminal voltage (mV),Cell temp (K)\n"
      "0.5,0,0,3800,298.15\n1.0,0.001,2000,3780,298.65\n1.5,0.002,2000,3779,298.65\n2.0,0.003,0,3799,298.15\n");
  REQUIRE(log.size() == 4);
  CHECK(log.time_s[1] == doctest::Approx(3.6));    // 0.001 h · 3600 s/h, not the step clock's 0.5 s
  CHECK(log.current_A[1] == doctest::Approx(2.0));  // 2000 mA
  CHECK(log.voltage_V[1] == doctest::Approx(3.78));
  REQUIRE(log.temperature_C.size() == 4);
  CHECK(log.temperature_C[1] == doctest::Approx(25.5));  // 298.65 K − 273.15
  // The README's example header.
  const auto e = read("Elapsed (h),Cell current (mA),Terminal voltage (mV),Cell temp (K)\n"
                      "0,0,3800,298.15\n0.001,2000,3780,298.65\n0.002,0,3799,298.15\n");
  CHECK(e.time_s[2] == doctest::Approx(7.2));
  CHECK(e.temperature_C[1] == doctest::Approx(25.5));
}

TEST_CASE("log header: the same symbol is a time or a temperature by its unit") {
  const auto log = read("Index,t (°C),t (s),I (A),U (V)\n1,21.5,0,0,3.8\n2,21.5,1,2,3.78\n3,22,2,2,3.779\n");
  REQUIRE(log.size() == 3);
  CHECK(log.time_s[1] == doctest::Approx(1.0));
  REQUIRE(log.temperature_C.size() == 3);
  CHECK(log.temperature_C[2] == doctest::Approx(22.0));
  CHECK(log.current_A[1] == doctest::Approx(2.0));  // "I (A)", not "Index"

  io::ColumnRule time{"time", io::Quantity::time, {"time", "t"}, {"time"}, {}, true};
  CHECK(io::match_score("t (°C)", time) == 0);  // a unit of another quantity rules it out
  CHECK(io::match_score("t (s)", time) > io::match_score("step time (s)", time));
  CHECK(io::match_score("Index", io::ColumnRule{"current", io::Quantity::current, {"current", "i"}, {"current"}, {"i"}, true}) == 0);
}

TEST_CASE("log header: a step mode is read by its meaning or else from the current") {
  io::CellLogOptions o;
  o.discharge_positive = true;
  const auto log = read(
      "time_s,current_A,voltage_V,step_mode\n"
      "0,0,3.8,Rest\n1,2,3.78,Discharge CC\n2,2,3.779,discharging\n3,0,3.799,pause\n"
      "4,-1,3.81,Charge\n5,-1,3.811,CV hold\n6,0,3.8,\n7,0,3.8,R\n8,1,3.79,D\n",
      o);
  const std::vector<std::string> want = {"rest", "discharge", "discharge", "rest", "charge",
                                         "charge", "rest", "rest", "discharge"};
  CHECK(log.mode == want);
  bool noted = false;
  for (const auto& n : log.notes) noted = noted || n.find("mode: 2 rows") != std::string::npos;
  CHECK(noted);  // "CV hold" and the empty cell, read from the current
}

TEST_CASE("log header: --columns FILE@SPEC applies to that log only") {
  const std::vector<std::string> files = {"a.csv", "dir/b.csv", "c.csv"};
  const auto cols = io::parse_column_specs_per_file({"time=T,current=I,voltage=V", "b.csv@time=Zeit,current=3,voltage=4:mV"},
                                                    files, io::cell_log_quantities());
  REQUIRE(cols.size() == 3);
  CHECK(cols[0].at("time").name == "T");
  CHECK(cols[1].at("time").name == "Zeit");
  CHECK(*cols[1].at("current").number == 3);
  CHECK(cols[1].at("voltage").unit == "mV");
  CHECK(cols[2].at("voltage").name == "V");
  CHECK(io::parse_column_specs_per_file({"dir/b.csv@time=x"}, files, io::cell_log_quantities())[1].at("time").name == "x");
  // An '@' after the '=' is part of a header name.
  CHECK(io::parse_column_specs_per_file({"time=t@start"}, files, io::cell_log_quantities())[2].at("time").name == "t@start");
  CHECK(usage_of({"x.csv@time=1"}, files).find("'x.csv@' names no log of this run") != std::string::npos);
  CHECK(usage_of({"time=1", "time=2"}, files).find("given twice for every log") != std::string::npos);
  CHECK(usage_of({"a.csv@time=1", "a.csv@time=2"}, files).find("log a.csv given columns twice") != std::string::npos);
}

TEST_CASE("fit cell: two logs with --columns for the second fit into one model") {
  // The invented demo pulse test, and the same rows under headers no rule knows.
  const std::string demo = test::source_path("models/logs/demo-hppc-synthetic.csv");
  std::ifstream in(demo);
  std::stringstream ss;
  ss << in.rdbuf();
  std::string text = ss.str();
  const std::string head = "Time (s),Current (A),Voltage (V)";
  const auto at = text.find(head);
  REQUIRE(at != std::string::npos);
  text.replace(at, head.size(), "Zeit,Strom,Spannung");
  const std::string other = test::write_work_file("renamed.csv", text);
  const std::string out = test::work_path("two.json");
  const std::vector<std::string> base = {"fit", "cell", demo, other, "--out", out, "--chemistry", "LiPo", "--quiet", "--accept-poor-fit"};
  const auto refused = test::run_sortie(base);
  CHECK(refused.exit_code == 1);
  CHECK(refused.err.find("renamed.csv: no header line naming the time, current and voltage columns") != std::string::npos);
  auto args = base;
  args.insert(args.end(), {"--columns", "renamed.csv@time=Zeit:s,current=Strom:A,voltage=Spannung:V"});
  const auto r = test::run_sortie(args);
  CHECK(r.exit_code == 0);
  CHECK(r.err.find("no header line") == std::string::npos);
  CHECK(test::file_exists(out));
}

}  // TEST_SUITE
