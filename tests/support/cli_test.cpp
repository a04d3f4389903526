// Support code for end-to-end tests (compiled into the test binary; it holds no test cases).
#include "support/cli.hpp"

#include <sys/wait.h>
#include <unistd.h>

#include <cstdio>
#include <filesystem>
#include <fstream>
#include <sstream>

namespace sortie::test {

namespace {
std::string quote(const std::string& s) {
  std::string q = "'";
  for (char c : s) {
    if (c == '\'') q += "'\\''";
    else q += c;
  }
  return q + "'";
}
}  // namespace

std::string source_path(const std::string& relative) {
  return std::string(SORTIE_SOURCE_DIR) + "/" + relative;
}

std::string work_dir() {
  // One folder per test process: ctest runs test cases in parallel processes.
  static const std::string dir = std::string(SORTIE_TEST_WORK_DIR) + "/p" + std::to_string(::getpid());
  std::filesystem::create_directories(dir);
  return dir;
}

std::string work_path(const std::string& name) {
  const std::string p = work_dir() + "/" + name;
  std::filesystem::remove(p);
  return p;
}

std::string write_work_file(const std::string& name, const std::string& content) {
  const std::string p = work_path(name);
  std::ofstream(p, std::ios::binary) << content;
  return p;
}

bool file_exists(const std::string& path) { return std::filesystem::exists(path); }

std::string read_file(const std::string& path) {
  std::ifstream in(path, std::ios::binary);
  std::ostringstream ss;
  ss << in.rdbuf();
  return ss.str();
}

std::string csv_head(const std::string& path, std::size_t rows) {
  std::istringstream in(read_file(path));
  std::string line, out;
  std::size_t data = 0;
  bool header = false;
  while (std::getline(in, line)) {
    const bool is_data = header && !line.empty() && line[0] != '#';
    if (!header && !line.empty() && line[0] != '#') header = true;
    if (is_data && ++data > rows) break;
    out += line + "\n";
  }
  return out;
}

CliResult run_sortie(const std::vector<std::string>& args) {
  static int counter = 0;
  const std::string base = work_path("cli-" + std::to_string(++counter));
  // Under -DSORTIE_SANITIZE=ON a sanitizer report would exit 1, the code of bad input: give it
  // codes of its own so that a test expecting exit 1 cannot pass on one.
  std::string cmd = "ASAN_OPTIONS=\"$ASAN_OPTIONS:exitcode=86\" UBSAN_OPTIONS=\"$UBSAN_OPTIONS:exitcode=87\" ";
  cmd += quote(SORTIE_BIN);
  for (const auto& a : args) cmd += " " + quote(a);
  cmd += " >" + quote(base + ".out") + " 2>" + quote(base + ".err") + " </dev/null";
  const int status = std::system(cmd.c_str());
  CliResult r;
  r.exit_code = WIFEXITED(status) ? WEXITSTATUS(status) : -1;
  r.out = read_file(base + ".out");
  r.err = read_file(base + ".err");
  std::filesystem::remove(base + ".out");
  std::filesystem::remove(base + ".err");
  return r;
}

}  // namespace sortie::test
