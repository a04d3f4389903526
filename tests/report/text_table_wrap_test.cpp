// TextTable::wrap_last: a long note in the last column wraps under itself, words whole.
#include <doctest/doctest.h>

#include <sstream>

#include "report/text_table.hpp"

using namespace sortie::report;

TEST_SUITE("report") {

TEST_CASE("text table: the last column wraps at spaces under its own start — and nothing is lost") {
  TextTable t({"t s", "event", "detail"});
  t.wrap_last(20);
  t.add_row({"1.0", "vortex_ring", "axial inflow is inside the vortex-ring band: the estimate is uncertain"});
  t.add_row({"2.5", "reserve", "short note"});
  const std::string out = t.render();
  std::istringstream in(out);
  std::vector<std::string> lines;
  for (std::string l; std::getline(in, l);) lines.push_back(l);
  REQUIRE(lines.size() == 2 + 5 + 1);  // header, rule, five lines of the first note (worked by hand), one of the second
  const auto col = lines[0].find("detail");
  REQUIRE(col != std::string::npos);
  std::string joined;
  for (std::size_t k = 2; k < 7; ++k) {
    CHECK(lines[k].size() - col <= 20);
    if (k > 2) CHECK(lines[k].find_first_not_of(' ') == col);  // continuation under the column
    joined += (joined.empty() ? "" : " ") + lines[k].substr(col);
  }
  CHECK(joined == "axial inflow is inside the vortex-ring band: the estimate is uncertain");
  CHECK(lines[7].substr(col) == "short note");
}

TEST_CASE("text table: a word longer than the wrap width stays whole on its own line") {
  TextTable t({"a", "b"});
  t.wrap_last(5);
  t.add_row({"x", "abcdefghij k"});
  const std::string out = t.render();
  CHECK(out.find("abcdefghij") != std::string::npos);
  CHECK(out.find("  k\n") != std::string::npos);
}

}
