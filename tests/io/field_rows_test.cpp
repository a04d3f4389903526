// The compact row store of measurement logs (io/log_columns FieldRows): a row reads back as the
// fields that were split from its line, whatever their lengths, empty fields included.
#include <doctest/doctest.h>

#include <string>
#include <vector>

#include "io/csv.hpp"
#include "io/log_columns.hpp"

using namespace sortie;

TEST_SUITE("io") {

TEST_CASE("field rows: every row reads back as the fields split from its line") {
  const std::vector<std::string> lines = {"Time (s),Current (A),Voltage (V)", "0.0,,3.270",
                                          "\"1,5\",2.5,3.1", "2.0,\"a \"\"quoted\"\" word\",", "x"};
  io::FieldRows rows;
  for (const auto& l : lines) rows.push_back(io::split_csv_line(l));
  REQUIRE(rows.size() == lines.size());
  for (std::size_t k = 0; k < lines.size(); ++k) {
    const std::vector<std::string> want = io::split_csv_line(lines[k]);
    CHECK(rows[k].to_vector() == want);
    CHECK(rows[k] == want);
    CHECK(rows[k].size() == want.size());
  }
  CHECK(rows[2][0] == "1,5");
  CHECK(rows[3][1] == "a \"quoted\" word");
  CHECK(rows[1][1].empty());
  CHECK_FALSE(rows[1] == rows[2].to_vector());
}

TEST_CASE("field rows: a parsed log keeps its rows and their file lines") {
  const io::DelimitedFile f = io::parse_delimited("# note\nt;i;v\n0;1,5;3,9\n\n1;2;3,8\n", "log.csv");
  CHECK(f.delimiter == ';');
  REQUIRE(f.rows.size() == 3);
  CHECK(f.rows[1] == std::vector<std::string>{"0", "1,5", "3,9"});
  CHECK(f.lines == std::vector<std::size_t>{2, 3, 5});
  CHECK(f.comments == std::vector<std::string>{"note"});
}

}  // TEST_SUITE
