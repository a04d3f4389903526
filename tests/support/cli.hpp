#pragma once
// Run the sortie binary from a test and capture exit code, stdout and stderr.
#include <cstddef>
#include <string>
#include <vector>

namespace sortie::test {

struct CliResult {
  int exit_code = -1;
  std::string out;
  std::string err;
};

/// Run `sortie ARGS...` (arguments are shell-quoted here) in the test work directory.
CliResult run_sortie(const std::vector<std::string>& args);

/// Absolute path of a file in the source tree (e.g. "models/packs/demo-4s1p-lipo-5000.json").
std::string source_path(const std::string& relative);

/// This test process's own work directory (created on first use).
std::string work_dir();

/// A fresh path in the test work directory; the file is removed if it exists.
std::string work_path(const std::string& name);

/// Write `content` to work_path(name) and return the path.
std::string write_work_file(const std::string& name, const std::string& content);

bool file_exists(const std::string& path);
std::string read_file(const std::string& path);

/// A CSV file's comment lines, its header and its first `rows` data rows.
std::string csv_head(const std::string& path, std::size_t rows);

}  // namespace sortie::test
