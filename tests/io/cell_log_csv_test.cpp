// Reading messy cell logs: recognised header names, units declared or detected, semicolons and
// decimal commas, excluded and blank rows, repeated headers and clock resets as sections,
// headerless files by column number, and the current sign from the voltage response.
#include "io/cell_log_csv.hpp"

#include <doctest/doctest.h>

#include <cmath>

#include "core/error.hpp"

using namespace sortie;

namespace {

battery::CellLog read(const std::string& text, io::CellLogOptions o = {}) {
  return io::read_cell_log(io::parse_delimited(text, "log.csv"), o);
}

std::string error_of(const std::string& text, io::CellLogOptions o = {}) {
  try {
    read(text, o);
  } catch (const InputError& e) {
    return e.what();
  }
  return "";
}

/// A small log: rest, a 2 A discharge step (voltage falls by 20 mV: R = 10 mΩ), rest.
const char* kBasic =
    "Time(s),Current(A),Voltage(V)\n"
    "0,0,3.800\n1,0,3.800\n2,2,3.780\n3,2,3.779\n4,0,3.799\n5,0,3.800\n";

}  // namespace

TEST_SUITE("io") {

TEST_CASE("cell log: header names with units in brackets are recognised") {
  const auto log = read(kBasic);
  REQUIRE(log.size() == 6);
  CHECK(log.time_s[5] == doctest::Approx(5.0));
  CHECK(log.current_A[2] == doctest::Approx(2.0));
  CHECK(log.voltage_V[2] == doctest::Approx(3.780));
  CHECK(log.line[0] == 2);  // the header is line 1
  CHECK(log.section_starts == std::vector<std::size_t>{0});
}

TEST_CASE("cell log: mA and mV and ms declared in the header are converted") {
  const auto log = read("t [ms],I_mA,U (mV)\n0,0,3800\n1000,2000,3780\n2000,2000,3779\n3000,0,3799\n");
  CHECK(log.time_s[1] == doctest::Approx(1.0));
  CHECK(log.current_A[1] == doctest::Approx(2.0));
  CHECK(log.voltage_V[1] == doctest::Approx(3.780));
}

TEST_CASE("cell log: undeclared mV and ms are detected and said so") {
  const auto log = read("time,current,voltage\n0,0,3800\n1000,2,3780\n2000,2,3779\n3000,0,3799\n");
  CHECK(log.voltage_V[0] == doctest::Approx(3.8));
  CHECK(log.time_s[3] == doctest::Approx(3.0));
  std::string all;
  for (const auto& w : log.warnings) all += w + "\n";
  CHECK(all.find("read as mV") != std::string::npos);
  CHECK(all.find("read as ms") != std::string::npos);
}

TEST_CASE("cell log: semicolons with decimal commas and a preamble before the header") {
  const auto log = read("Test: bench 3\nOperator;x\nZeit;Strom;Spannung;Time (s);Current (A);Voltage (V)\n"
                        "a;b;c;0;0;3,800\na;b;c;1,5;2,5;3,775\na;b;c;3;0;3,799\n");
  REQUIRE(log.size() == 3);
  CHECK(log.time_s[1] == doctest::Approx(1.5));
  CHECK(log.current_A[1] == doctest::Approx(2.5));
  CHECK(log.voltage_V[1] == doctest::Approx(3.775));
  // Every number with a decimal comma: more commas than semicolons, still read right.
  const auto l2 = read("time;current;voltage\n0,0;0,0;3,800\n1,5;2,5;3,775\n3,0;0,0;3,799\n");
  CHECK(l2.current_A[1] == doctest::Approx(2.5));
}

TEST_CASE("cell log: excluded rows and blank fields and trailing commas") {
  const auto log = read("Exclude,Time(s),Current(A),Voltage(V),Temp(C),\n"
                        "No,0,0,3.800,25,\nYes,1,99,0.1,,\nNo,2,2,3.780,,\nNo,3,,3.780,26,\nNo,4,0,3.799,27,\n");
  REQUIRE(log.size() == 3);  // the excluded row and the one with no current are left out
  CHECK(log.time_s[1] == doctest::Approx(2.0));
  CHECK(std::isnan(log.temperature_C[1]));
  CHECK(log.temperature_C[2] == doctest::Approx(27.0));
  std::string all;
  for (const auto& w : log.warnings) all += w;
  CHECK(all.find("1 rows with an empty time, current or voltage were skipped (first at line 5)") != std::string::npos);
}

TEST_CASE("cell log: a clock that restarts and a repeated header start new sections") {
  const auto log = read("time_s,current_A,voltage_V\n0,0,3.8\n10,1,3.79\n20,0,3.8\n"
                        "time_s,current_A,voltage_V\n0,0,3.7\n10,1,3.69\n5,0,3.7\n6,1,3.69\n");
  REQUIRE(log.size() == 7);
  CHECK(log.section_starts == std::vector<std::size_t>{0, 3, 5});
  for (std::size_t k = 1; k < log.size(); ++k) CHECK(log.time_s[k] > log.time_s[k - 1]);
  CHECK(log.time_s[4] - log.time_s[3] == doctest::Approx(10.0));  // steps inside a section kept
}

TEST_CASE("cell log: clock times and dates are read as seconds") {
  const auto log = read("timestamp,current,voltage\n2024-03-31 23:59:59.5,0,3.8\n2024-04-01 00:00:01,1,3.79\n");
  CHECK(log.time_s[1] - log.time_s[0] == doctest::Approx(1.5));
  const auto t = io::parse_log_time("1:02:03.25", false);
  REQUIRE(t);
  CHECK(*t == doctest::Approx(3723.25));
  CHECK_FALSE(io::parse_log_time("12:75", false));
}

TEST_CASE("cell log: without a header the columns are given by number and the current sign as given") {
  io::CellLogOptions o;
  o.columns = io::parse_column_spec("time=2,current=4,voltage=3", io::cell_log_quantities());
  o.discharge_positive = false;
  const auto log = read("x,0,3.8,0\nx,1,3.78,-2\nx,2,3.799,0\n", o);
  REQUIRE(log.size() == 3);
  CHECK(log.current_A[1] == doctest::Approx(2.0));  // charge-positive flipped to discharge-positive
}

TEST_CASE("cell log: the current sign is detected from the voltage response") {
  // Charge-positive log: the voltage falls when the current goes negative.
  const auto log = read("time,current,voltage\n0,0,3.8\n1,-2,3.78\n2,-2,3.779\n3,0,3.799\n");
  CHECK(log.current_A[1] == doctest::Approx(2.0));
  bool said = false;
  for (const auto& n : log.notes) said = said || n.find("detected positive on charge") != std::string::npos;
  CHECK(said);
}

TEST_CASE("cell log: a pack log is scaled to one cell by --series and --parallel") {
  io::CellLogOptions o;
  o.series = 4;
  o.parallel = 2;
  const auto log = read("time,current,voltage\n0,0,15.2\n1,4,15.12\n2,0,15.2\n", o);
  CHECK(log.voltage_V[1] == doctest::Approx(3.78));
  CHECK(log.current_A[1] == doctest::Approx(2.0));
}

TEST_CASE("cell log: bad logs are one-line errors naming the file and line and value") {
  CHECK(error_of("time,current\n0,1\n1,2\n").find("no header line naming the time, current and voltage") !=
        std::string::npos);
  const std::string e = error_of("time,current,voltage\n0,0,3.8\n1,abc,3.7\n");
  CHECK(e.find("log.csv: line 3: current column 'current' is not a number (got \"abc\"") != std::string::npos);
  CHECK(error_of("time (furlongs),current,voltage\n0,0,3.8\n1,1,3.7\n").find("unit 'furlongs' not accepted") !=
        std::string::npos);
  CHECK(error_of("time,current,voltage\n0,0,80\n1,1,79\n").find("looks like neither V nor mV") != std::string::npos);
  CHECK(error_of("time,current,voltage\n0,0,3.8\n").find("too few data rows") != std::string::npos);
  CHECK(error_of("Exclude,time,current,voltage\nmaybe,0,0,3.8\nNo,1,1,3.7\n").find("neither yes nor no") !=
        std::string::npos);
  for (const auto& m : {error_of("time,current\n0,1\n"), e}) CHECK(m.find('\n') == std::string::npos);
}

TEST_CASE("cell log: --columns is checked with the nearest quantity suggested") {
  const auto q = io::cell_log_quantities();
  CHECK_THROWS_WITH_AS(io::parse_column_spec("volts=3", q), doctest::Contains("did you mean 'voltage'"), UsageError);
  CHECK_THROWS_AS(io::parse_column_spec("time", q), UsageError);
  CHECK_THROWS_AS(io::parse_column_spec("time=0", q), UsageError);
  const auto m = io::parse_column_spec("time=Zeit [s],current=I:mA", q);
  CHECK(m.at("time").name == "Zeit [s]");
  CHECK(m.at("current").unit == "mA");
}

}  // TEST_SUITE
