// The JSON model reader's shared mechanism: model paths, nesting depth, text entry points.
// Regression tests for inputs that once escaped as something other than an InputError.
#include "io/json_reader.hpp"

#include <doctest/doctest.h>

#include <filesystem>
#include <string>

#include "core/error.hpp"
#include "io/battery_json.hpp"
#include "support/cli.hpp"

using namespace sortie;

namespace {

std::string pack_error(const std::string& content) {
  const std::string path = test::write_work_file("reader-pack.json", content);
  try {
    io::load_pack_file(path);
  } catch (const InputError& e) {
    return e.what();
  }
  return "";
}

}  // namespace

TEST_SUITE("io") {

TEST_CASE("json_reader: a model path too long for the file system is bad input — not a filesystem_error") {
  // A file name longer than NAME_MAX (255 on Linux) made std::filesystem::is_regular_file throw
  // std::filesystem::filesystem_error ("File name too long"), reported as an internal error.
  const std::string name(5000, 'a');
  const std::string err = pack_error("{\"cell\": \"" + name + ".json\", \"series\": 1}");
  CHECK(err.find("/cell: model file not found") != std::string::npos);
}

TEST_CASE("json_reader: a file nested a million levels deep is refused — not a stack overflow") {
  // Parsing or quoting such a value in a message recursed once per level and crashed.
  const std::string deep = std::string(1000000, '[') + std::string(1000000, ']');
  const std::string err = pack_error("{\"cell\": " + deep + "}");
  // `{"cell": ` takes columns 1 to 9; the 64th '[' (column 73) opens level 65.
  CHECK(err.find("line 1, column 73: JSON nested too deeply (got more than 64 levels of [ and {, expected at most 64)") !=
        std::string::npos);
}

TEST_CASE("json_reader: nesting up to the depth limit still loads — brackets inside strings do not count") {
  std::string deep = std::string(io::kMaxJsonDepth - 1, '[') + std::string(io::kMaxJsonDepth - 1, ']');
  const auto j = io::parse_json_text("{\"a\": " + deep + ", \"b\": \"[[[[{{{{\\\"[[[\"}", "text.json");
  CHECK(j.at("b").get<std::string>() == "[[[[{{{{\"[[[");
  CHECK_THROWS_AS(io::parse_json_text("{\"a\": " + deep.insert(0, "[") + "]}", "text.json"), InputError);
}

TEST_CASE("json_reader: a JSON text is read with its display name in every message") {
  const io::Source src{"inline cell", {}};
  CHECK_THROWS_WITH_AS(io::parse_cell_json("{\"capacity_Ah\": -1}", src),
                       "inline cell: /capacity_Ah: out of range (got -1, expected a number > 0 Ah)", InputError);
  CHECK_THROWS_WITH_AS(io::parse_cell_json("{\"capacity_Ah\": ", src),
                       doctest::Contains("inline cell: line 1, column 17: JSON syntax error"), InputError);
  CHECK_THROWS_WITH_AS(io::parse_cell_json("[1]", src), doctest::Contains("inline cell: not an object"), InputError);
}

TEST_CASE("json_reader: a root folder keeps model paths inside it") {
  const std::string models = test::source_path("models");
  const io::Source inside{"pack.json", models + "/packs", models};
  const battery::Pack p = io::parse_pack_json("{\"cell\": \"../cells/demo-lipo-5000.json\", \"series\": 2}", inside);
  CHECK(p.cell.capacity_Ah == doctest::Approx(5.0));  // the bundled demo cell (models/cells)
  for (const std::string cell : {"../../profiles/demo-quad-water-tank.json", "/etc/hostname",
                                 "../cells/../../models/../README.md"}) {
    INFO(cell);
    CHECK_THROWS_WITH_AS(io::parse_pack_json("{\"cell\": \"" + cell + "\", \"series\": 2}", inside),
                         doctest::Contains("pack.json: /cell: model file outside the folder models are read from"),
                         InputError);
  }
  // Without a root the same relative path resolves as always.
  const io::Source free{"pack.json", models + "/packs"};
  CHECK(io::parse_pack_json("{\"cell\": \"../cells/demo-lipo-5000.json\", \"series\": 2}", free).series == 2);
}

}  // TEST_SUITE
