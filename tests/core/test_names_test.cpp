// Every TEST_CASE name must survive ctest discovery: doctest's discovery asks the binary for a
// case's suite with --test-case=<name>, and doctest reads ',' in a filter as a separator, so a
// name with a comma gets no TEST_SUITE label (`ctest -L fit` would skip it); CMake splits lists
// on ';'. This reads the test sources and names any case that breaks the rule.
#include <doctest/doctest.h>

#include <filesystem>
#include <fstream>
#include <regex>
#include <sstream>
#include <string>

namespace fs = std::filesystem;

TEST_SUITE("core") {
TEST_CASE("test names: no comma or semicolon in any TEST_CASE name so every case keeps its ctest label") {
  const fs::path root = fs::path(SORTIE_SOURCE_DIR) / "tests";
  REQUIRE(fs::is_directory(root));
  const std::regex name_re(R"re(TEST_CASE\s*\(\s*"([^"]*)")re");
  int files = 0, names = 0;
  std::string bad;
  for (const auto& e : fs::recursive_directory_iterator(root)) {
    if (!e.is_regular_file() || e.path().extension() != ".cpp") continue;
    ++files;
    std::ifstream in(e.path());
    std::stringstream ss;
    ss << in.rdbuf();
    const std::string text = ss.str();
    for (std::sregex_iterator it(text.begin(), text.end(), name_re), end; it != end; ++it) {
      ++names;
      const std::string n = (*it)[1].str();
      if (n.find_first_of(",;") != std::string::npos)
        bad += "\n  " + fs::relative(e.path(), root).string() + ": \"" + n + "\"";
    }
  }
  CHECK(files > 20);
  CHECK(names > 100);
  INFO("test cases whose names would lose their label:" << bad);
  CHECK(bad.empty());
}
}
