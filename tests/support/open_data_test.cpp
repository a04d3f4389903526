// The open-data locator: the folder comes from SORTIE_OPEN_DATA when it is set, at run time, and
// a missing dataset is reported with the skip marker ctest reads.
#include "support/open_data.hpp"

#include <doctest/doctest.h>

#include <cstdlib>
#include <fstream>
#include <sstream>

#include "support/cli.hpp"

using namespace sortie;

namespace {

/// Set SORTIE_OPEN_DATA for one scope and put back what was there.
struct EnvOverride {
  std::optional<std::string> old;
  explicit EnvOverride(const std::string& value) {
    if (const char* v = std::getenv("SORTIE_OPEN_DATA")) old = v;
    setenv("SORTIE_OPEN_DATA", value.c_str(), 1);
  }
  ~EnvOverride() {
    if (old) setenv("SORTIE_OPEN_DATA", old->c_str(), 1);
    else unsetenv("SORTIE_OPEN_DATA");
  }
};

/// What `f` writes to std::cout.
template <class F>
std::string captured(F f) {
  std::ostringstream buf;
  std::streambuf* old = std::cout.rdbuf(buf.rdbuf());
  f();
  std::cout.rdbuf(old);
  return buf.str();
}

}  // namespace

TEST_SUITE("support") {

TEST_CASE("open data: SORTIE_OPEN_DATA names the folder when the test runs") {
  const std::string root = test::work_dir() + "/open-data";
  std::filesystem::create_directories(root + "/some-set");
  std::ofstream(root + "/some-set/probe.csv") << "x\n";
  const EnvOverride env(root);
  CHECK(test::open_data_root() == std::filesystem::path(root));
  std::optional<std::filesystem::path> dir;
  const std::string out = captured([&] { dir = test::open_dataset("some-set", "probe.csv"); });
  REQUIRE(dir.has_value());
  CHECK(*dir == std::filesystem::path(root) / "some-set");
  CHECK(out.empty());
}

TEST_CASE("open data: a missing dataset prints the skip marker and the path looked at") {
  const EnvOverride env(test::work_dir() + "/no-such-folder");
  std::optional<std::filesystem::path> dir;
  const std::string out = captured([&] { dir = test::open_dataset("absent-set", "probe.csv"); });
  CHECK_FALSE(dir.has_value());
  CHECK(out.rfind(std::string(test::kSkipMarker) + ": ", 0) == 0);
  CHECK(out.find("no-such-folder/absent-set/probe.csv") != std::string::npos);
}

TEST_CASE("open data: unset or empty the default is ../shared/data beside the repository") {
  const EnvOverride env("");
  CHECK(test::open_data_root() == std::filesystem::path(SORTIE_SOURCE_DIR) / ".." / "shared" / "data");
}

}  // TEST_SUITE
