// Corpus replay: every seed in fuzz/corpus/<target>/ and every fixed crash input in
// fuzz/regressions/<target>/ goes through the same loader entry point as the libFuzzer target
// (fuzz/targets.hpp), with the normal compiler. Each must load or throw InputError or
// LimitError; the bundled models and profiles must load and run.
#include <doctest/doctest.h>

#include <algorithm>
#include <filesystem>
#include <stdexcept>
#include <string>
#include <typeinfo>
#include <vector>

#include "core/error.hpp"
#include "support/cli.hpp"
#include "targets.hpp"

namespace fs = std::filesystem;
using sortie::InputError;
using sortie::LimitError;

namespace {

void prepare() {
  static const bool done = [] {
    sortie::fuzz::use_models_from(SORTIE_SOURCE_DIR, sortie::test::work_dir() + "/fuzz-models");
    return true;
  }();
  (void)done;
}

enum class Outcome { loaded, refused, other };

/// Run one file through a target; `what` gets the exception's type and message.
Outcome replay(const sortie::fuzz::Target& t, const fs::path& file, std::string& what) {
  try {
    t.run(sortie::test::read_file(file.string()));
    return Outcome::loaded;
  } catch (const InputError& e) {
    what = e.what();
    return Outcome::refused;
  } catch (const LimitError& e) {
    what = e.what();
    return Outcome::refused;
  } catch (const std::exception& e) {
    what = std::string(typeid(e).name()) + ": " + e.what();
    return Outcome::other;
  }
}

std::vector<fs::path> files_in(const fs::path& dir) {
  std::vector<fs::path> out;
  if (!fs::is_directory(dir)) return out;
  for (const auto& e : fs::recursive_directory_iterator(dir))
    if (e.is_regular_file()) out.push_back(e.path());
  std::sort(out.begin(), out.end());
  return out;
}

/// Every input of one target, from the corpus and the regressions.
std::size_t replay_target(const char* name) {
  prepare();
  const auto* t = sortie::fuzz::find_target(name);
  REQUIRE(t != nullptr);
  std::size_t n = 0;
  for (const char* folder : {"fuzz/corpus/", "fuzz/regressions/"}) {
    for (const auto& f : files_in(sortie::test::source_path(std::string(folder) + name))) {
      std::string what;
      const Outcome o = replay(*t, f, what);
      INFO(f.string(), ": ", what);
      CHECK(o != Outcome::other);
      ++n;
    }
  }
  return n;
}

/// Bundled files must load, and their short simulation run, without any error.
void bundled_load(const char* name, const char* folder) {
  prepare();
  const auto* t = sortie::fuzz::find_target(name);
  REQUIRE(t != nullptr);
  const auto files = files_in(sortie::test::source_path(folder));
  CHECK(!files.empty());
  for (const auto& f : files) {
    // Field and route geometry beside the profiles (.geojson) is read by `route`, not here.
    if (f.extension() != ".json") continue;
    std::string what;
    const Outcome o = replay(*t, f, what);
    INFO(f.string(), ": ", what);
    CHECK(o == Outcome::loaded);
  }
}

}  // namespace

TEST_SUITE("fuzz") {

TEST_CASE("fuzz replay: every corpus and regression folder names a target") {
  for (const char* folder : {"fuzz/corpus", "fuzz/regressions"}) {
    const fs::path dir = sortie::test::source_path(folder);
    if (!fs::is_directory(dir)) continue;
    for (const auto& e : fs::directory_iterator(dir)) {
      INFO(e.path().string());
      CHECK(e.is_directory());
      CHECK(sortie::fuzz::find_target(e.path().filename().string()) != nullptr);
    }
  }
}

TEST_CASE("fuzz replay: cell inputs load or throw InputError or LimitError") { CHECK(replay_target("cell") > 0); }
TEST_CASE("fuzz replay: pack inputs load or throw InputError or LimitError") { CHECK(replay_target("pack") > 0); }
TEST_CASE("fuzz replay: drive inputs load or throw InputError or LimitError") { CHECK(replay_target("drive") > 0); }
TEST_CASE("fuzz replay: airframe inputs load or throw InputError or LimitError") {
  CHECK(replay_target("airframe") > 0);
}
TEST_CASE("fuzz replay: profile inputs load or throw InputError or LimitError") {
  CHECK(replay_target("profile") > 0);
}
TEST_CASE("fuzz replay: load CSV inputs load or throw InputError or LimitError") {
  CHECK(replay_target("load_csv") > 0);
}
TEST_CASE("fuzz replay: cell log inputs load or throw InputError or LimitError") {
  CHECK(replay_target("cell_log") > 0);
}
TEST_CASE("fuzz replay: fit cell inputs fit or throw InputError or LimitError") { CHECK(replay_target("fit_cell") > 0); }
TEST_CASE("fuzz replay: command lines end with an exit code from 0 to 3 and leave no temporary") {
  // The regressions are the command lines that crashed or hung before the option validator.
  CHECK(replay_target("cli_options") > 0);
}
TEST_CASE("fuzz replay: bench CSV inputs load or throw InputError or LimitError") {
  CHECK(replay_target("bench_csv") > 0);
}

TEST_CASE("fuzz targets: the bundled models and profiles load and run") {
  bundled_load("cell", "models/cells");
  bundled_load("pack", "models/packs");
  bundled_load("drive", "models/drives");
  bundled_load("airframe", "models/airframes");
  bundled_load("profile", "profiles");
}

TEST_CASE("fuzz targets: a model path outside the models folder is refused — not opened") {
  prepare();
  const auto* pack = sortie::fuzz::find_target("pack");
  REQUIRE(pack != nullptr);
  for (const char* cell : {"/etc/passwd", "../../../../../../etc/passwd", "../../../cells/x.json"}) {
    const std::string text = std::string("{\"cell\": \"") + cell + "\", \"series\": 1}";
    INFO(text);
    CHECK_THROWS_WITH_AS(pack->run(text), doctest::Contains("outside the folder models are read from"),
                         InputError);
  }
}

}  // TEST_SUITE
