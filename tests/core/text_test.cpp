// Text helpers every report uses: numbers a reader can take in at a glance, and names that
// cannot drive the terminal.
#include "core/text.hpp"

#include <doctest/doctest.h>

#include "report/svg_plot.hpp"
#include "report/text_table.hpp"

using namespace sortie;

TEST_SUITE("core") {

TEST_CASE("format_fixed: scientific form from 1e9 up and for tiny values the decimals would show as zero") {
  // A 1e300 used to print as a 301-digit integer.
  CHECK(format_fixed(1e300, 1) == "1.000e+300");
  CHECK(format_fixed(-2.5e9, 0) == "-2.500e+09");
  CHECK(format_fixed(999999999.0, 0) == "999999999");  // just below the bound: fixed
  CHECK(format_fixed(1e8, 1) == "100000000.0");
  CHECK(format_fixed(2.5e-9, 3) == "2.500e-09");
  CHECK(format_fixed(1e-7, 9) == "0.000000100");       // the decimals show it: fixed
  CHECK(format_fixed(0.004, 2) == "0.00");             // above 1e-6: an ordinary rounding
  CHECK(format_fixed(0.0, 2) == "0.00");
  CHECK(format_fixed(-0.0001, 1) == "0.0");
}

TEST_CASE("text table: a number in scientific form is still a number column (right-aligned)") {
  report::TextTable t({"what", "value W"});
  t.add_row({"small", "12.0"});
  t.add_row({"huge", format_fixed(1e300, 1)});
  const std::string s = t.render("");
  CHECK(s.find("small        12.0\n") != std::string::npos);
  CHECK(s.find("huge   1.000e+300\n") != std::string::npos);
}

TEST_CASE("printable: control characters shown as escapes with text and UTF-8 kept") {
  CHECK(printable("a\x1b[2Jb") == "a\\x1b[2Jb");
  CHECK(printable("x\ny\tz\x7f") == "x\\x0ay\\x09z\\x7f");
  CHECK(printable("x\ny\tz", true) == "x\ny\tz");
  CHECK(printable("csi \xc2\x9b" "31m") == "csi \\u009b31m");  // U+009B, the one-byte CSI
  CHECK(printable("15 \xc2\xb0" "C, \xce\xb7") == "15 \xc2\xb0" "C, \xce\xb7");  // °, η untouched
}

TEST_CASE("text table and key-value lines escape control characters in cells") {
  report::TextTable t({"name", "x"});
  t.add_row({"evil\x1b[31m\nline", "1"});
  CHECK(t.render("").find("evil\\x1b[31m\\x0aline") != std::string::npos);
  report::KeyValues kv;
  kv.add("pack", "p\x07");
  CHECK(kv.render("") == "pack  p\\x07\n");
}

TEST_CASE("svg/html escape: markup escaped and C0 controls (which XML 1.0 forbids) shown as text") {
  CHECK(report::svg::escape("<a & \"b\">") == "&lt;a &amp; &quot;b&quot;&gt;");
  CHECK(report::svg::escape("x\x1b[2J\x01") == "x\\x1b[2J\\x01");
  CHECK(report::svg::escape("tab\tline\n") == "tab\tline\n");
}

}  // TEST_SUITE
