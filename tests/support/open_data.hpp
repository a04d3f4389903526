#pragma once
// Where the tests find the open datasets (read where they are, never copied into the
// repository), and how a test whose data are absent says it was skipped.
//
// The folder is looked up when the test runs: the environment variable SORTIE_OPEN_DATA if it
// is set and not empty, else ../shared/data beside the repository the tests were built from
// (SORTIE_SOURCE_DIR/../shared/data). A test that finds no data prints kSkipMarker; ctest's
// SKIP_REGULAR_EXPRESSION on every discovered case (tests/CMakeLists.txt) turns that into
// "Skipped" instead of "Passed".
#include <cstdlib>
#include <filesystem>
#include <iostream>
#include <optional>
#include <string>

namespace sortie::test {

/// The text ctest looks for to report a case skipped (tests/CMakeLists.txt).
inline constexpr const char* kSkipMarker = "SORTIE-TEST-SKIPPED";

/// The open-data folder: $SORTIE_OPEN_DATA, else SORTIE_SOURCE_DIR/../shared/data.
inline std::filesystem::path open_data_root() {
  if (const char* env = std::getenv("SORTIE_OPEN_DATA"); env && *env) return std::filesystem::path(env);
  return std::filesystem::path(SORTIE_SOURCE_DIR) / ".." / "shared" / "data";
}

/// Print the skip marker with the reason (to standard output, where ctest reads it).
inline void report_skipped(const std::string& why) {
  std::cout << kSkipMarker << ": " << why << std::endl;
}

/// The dataset folder `name` under the open-data root when it holds `probe` (a file every
/// use needs); otherwise none, after reporting the case skipped with the path looked at.
inline std::optional<std::filesystem::path> open_dataset(const std::string& name, const std::string& probe) {
  const std::filesystem::path dir = open_data_root() / name;
  std::error_code ec;
  if (std::filesystem::is_regular_file(dir / probe, ec)) return dir;
  report_skipped("open dataset absent: " + (dir / probe).string() +
                 " (set SORTIE_OPEN_DATA to the folder holding " + name + "/)");
  return std::nullopt;
}

}  // namespace sortie::test
