// Durations in the text reports.
#include "report/discharge_report.hpp"

#include <doctest/doctest.h>

#include <cmath>

using sortie::report::duration_hms;

TEST_SUITE("report") {

TEST_CASE("duration_hms: hours — minutes and seconds") {
  CHECK(duration_hms(3725.0) == "1 h 02 min 05 s");
  CHECK(duration_hms(750.0) == "12 min 30.0 s");
  CHECK(duration_hms(42.3) == "42.3 s");
  CHECK(duration_hms(-90.0) == "-1 min 30.0 s");
  CHECK(duration_hms(std::nan("")) == "-");
}

TEST_CASE("duration_hms: a time too long for a long integer is formatted — not converted") {
  // A load file spanning 1e300 s ran to its end in a few hundred steps; converting its hours
  // to long was undefined behaviour (UBSan: float-cast-overflow).
  CHECK(duration_hms(1e300) == "2.778e+296 h");
  CHECK(duration_hms(-4e22) == "-1.111e+19 h");
  CHECK(duration_hms(3.6e9) == "1e+06 h");
  CHECK(duration_hms(3.6e9 - 1.0) == "999999 h 59 min 59 s");
}

}  // TEST_SUITE
