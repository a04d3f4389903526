// The cell log's time axis is finite and strictly increasing, whatever the file's times are
// (battery::CellLog promises it; sim::replay relies on it).
#include <doctest/doctest.h>

#include <string>

#include "core/error.hpp"
#include "io/cell_log_csv.hpp"

using namespace sortie;

namespace {

std::string error_of(const std::string& text) {
  try {
    io::read_cell_log(io::parse_delimited(text, "log.csv"), {});
  } catch (const InputError& e) {
    return e.what();
  }
  return "";
}

}  // namespace

TEST_SUITE("io") {

TEST_CASE("cell log: a time of 1e300 s before a clock reset is refused — not an axis with equal times") {
  // Found by the cell_log fuzz target (fuzz/regressions/cell_log/time-1e300-then-reset-rounds-axis.csv):
  // the section after the reset continued the axis at 1e300 + 1 s, where steps of 10 s round
  // away; equal times broke sim::replay's assertion that every row lies inside a step.
  const std::string log = "Time(s),Current(A),Voltage(V)\n0,0,3.95\n1e300,0,3.95\n20,0,3.95\n30,2.5,3.92\n40,2.5,3.916\n";
  CHECK(error_of(log) == "log.csv: line 4: time too large to tell apart from the row before "
                         "(got \"20\", expected times whose steps survive rounding (below about 1e15 s))");
}

TEST_CASE("cell log: a time that overflows its unit is refused") {
  const std::string log = "Time(h),Current(A),Voltage(V)\n0,0,3.95\n1e307,2,3.90\n2e307,2,3.89\n";
  CHECK(error_of(log) == "log.csv: line 3: time out of range (got \"1e+307\", expected a finite time in s)");
}

}  // TEST_SUITE
