// Bad, odd and hostile input, as a careless script would give it: every case must end with its
// exit code (1 bad input, 2 bad usage) and one line on stderr saying what is wrong, and leave the
// folder it could write into exactly as it was — no file created, changed, replaced or touched
// (names, kinds, link targets, contents and modification times compared), no temporary left.
#include <doctest/doctest.h>
#include <fcntl.h>
#include <sys/stat.h>
#include <sys/wait.h>
#include <unistd.h>

#include <algorithm>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <map>
#include <string>
#include <vector>

#include "support/cli.hpp"

using namespace sortie::test;
namespace fs = std::filesystem;

namespace {

/// One entry of a folder as lstat(2) and readlink(2) see it.
struct Entry {
  mode_t type = 0;
  long long mtime_ns = 0;
  std::string content;  ///< file contents, or a link's target
  bool operator==(const Entry& o) const = default;
};

std::map<std::string, Entry> snapshot(const std::string& dir) {
  std::map<std::string, Entry> out;
  for (const auto& e : fs::recursive_directory_iterator(dir)) {
    struct stat st {};
    REQUIRE(::lstat(e.path().c_str(), &st) == 0);
    Entry en;
    en.type = st.st_mode & S_IFMT;
    en.mtime_ns = static_cast<long long>(st.st_mtim.tv_sec) * 1000000000LL + st.st_mtim.tv_nsec;
    if (S_ISREG(st.st_mode)) en.content = read_file(e.path().string());
    if (S_ISLNK(st.st_mode)) en.content = fs::read_symlink(e.path()).string();
    out[fs::relative(e.path(), dir).string()] = en;
  }
  return out;
}

std::string replace_all(std::string s, const std::string& from, const std::string& to) {
  for (std::size_t p = s.find(from); p != std::string::npos; p = s.find(from, p + to.size())) s.replace(p, from.size(), to);
  return s;
}

/// Every case's folder: inputs that a wrong output could destroy, and odd things at output paths.
/// Each file is dated 2001 so that a rewrite with the same content still shows.
void make_fixture(const std::string& dir, const std::map<std::string, std::string>& extra) {
  fs::remove_all(dir);
  fs::create_directories(dir + "/sub");
  const std::string src = std::string(SORTIE_SOURCE_DIR);
  auto put = [&](const std::string& name, const std::string& content) {
    std::ofstream(dir + "/" + name, std::ios::binary) << replace_all(replace_all(content, "@S", src), "@D", dir);
  };
  put("keep.txt", "keep\n");
  put("log.csv", read_file(source_path("models/logs/demo-hppc-synthetic.csv")));
  put("bench.csv", read_file(source_path("models/logs/demo-bench-synthetic.csv")));
  put("load.csv", "time_s,current_A\n0,5\n60,8\n120,5\n");
  put("pack.json", replace_all(read_file(source_path("models/packs/demo-4s1p-lipo-5000.json")), "\"../cells/",
                               "\"" + src + "/models/cells/"));
  for (const auto& [name, content] : extra) put(name, content);
  REQUIRE(::mkfifo((dir + "/fifo").c_str(), 0644) == 0);
  fs::create_symlink("keep.txt", dir + "/keep-link.txt");
  fs::create_symlink("log.csv", dir + "/log-link.csv");
  fs::create_symlink("nowhere.json", dir + "/dangling.json");
  fs::create_hard_link(dir + "/log.csv", dir + "/log-hard.csv");
  const struct timespec old[2] = {{978307200, 0}, {978307200, 0}};  // 2001-01-01 00:00 UTC
  for (const auto& e : fs::recursive_directory_iterator(dir))
    ::utimensat(AT_FDCWD, e.path().c_str(), old, AT_SYMLINK_NOFOLLOW);
}

struct Case {
  const char* name;
  std::vector<std::string> args;  ///< @D: the case's folder, @S: the source tree
  int exit_code;
  std::string message;  ///< must appear in the one stderr line
  std::map<std::string, std::string> files = {};  ///< extra fixture files (@S, @D expanded)
  bool stdout_full = false;  ///< standard output is /dev/full
};

const std::string P = "@S/profiles/demo-quad-water-tank.json";
const std::string K = "@D/pack.json";
const std::string DR = "@S/models/drives/demo-quad-15in.json";
const std::string FC = "@D/log.csv";
const std::string FB = "@D/bench.csv";

// A pack file with one change, for the JSON cases.
std::string pack_json(const std::string& body) {
  return "{ \"cell\": \"@S/models/cells/demo-lipo-5000.json\", " + body + " }";
}
// A profile with the demo's models by absolute path and the given phases.
std::string profile_json(const std::string& name, const std::string& phases) {
  return "{ \"name\": " + name +
         ", \"airframe\": \"@S/models/airframes/demo-quad-15in-inspection.json\","
         " \"drive\": \"@S/models/drives/demo-quad-15in.json\","
         " \"pack\": { \"cell\": \"@S/models/cells/demo-lipo-5000.json\", \"series\": 6, \"parallel\": 1 },"
         " \"phases\": [" + phases + "] }";
}

const std::vector<Case> kCases = {
    // ---- the writer: devices, FIFOs, folders, links, the run's own inputs, two outputs on one file
    {"json onto a character device", {"fly", P, "--json", "/dev/null"}, 1,
     "sortie: /dev/null: not a regular file (got a character device, expected a regular file, or - for standard output)"},
    {"trace onto a FIFO", {"fly", P, "--trace", "@D/fifo"}, 1, "@D/fifo: not a regular file (got a FIFO (named pipe)"},
    {"json onto a folder", {"fly", P, "--json", "@D/sub"}, 1, "@D/sub: not a regular file (got a directory"},
    {"html onto a folder", {"drive", DR, "--bus-V", "22", "--html", "@D/sub"}, 1, "not a regular file (got a directory"},
    {"drive json onto /dev/null", {"drive", DR, "--bus-V", "22", "--json", "/dev/null"}, 1, "/dev/null: not a regular file"},
    {"compare json onto a FIFO", {"compare", P, "--series", "4,6", "--capacity-Ah", "5", "--json", "@D/fifo"}, 1,
     "@D/fifo: not a regular file"},
    {"a dangling symbolic link", {"fly", P, "--json", "@D/dangling.json"}, 1,
     "@D/dangling.json: a symbolic link whose target cannot be reached (got a link to nowhere.json"},
    {"fit cell --out onto its own log", {"fit", "cell", FC, "--chemistry", "LiPo", "--out", FC}, 1,
     "@D/log.csv: the output is an input of this run (got the same file as @D/log.csv, expected another path)"},
    {"fit cell --report onto a hard link of its log", {"fit", "cell", FC, "--chemistry", "LiPo", "--out", "@D/m.json", "--report", "@D/log-hard.csv"}, 1,
     "@D/log-hard.csv: the output is an input of this run"},
    {"fit cell --out onto a symbolic link to its log", {"fit", "cell", FC, "--chemistry", "LiPo", "--out", "@D/log-link.csv"}, 1,
     "@D/log-link.csv: the output is an input of this run"},
    {"fit cell --json through ./ onto its log", {"fit", "cell", FC, "--chemistry", "LiPo", "--out", "@D/m.json", "--json", "@D/sub/../log.csv"}, 1,
     "the output is an input of this run"},
    {"fit drive --out onto its bench file", {"fit", "drive", FB, "--diameter-m", "0.381", "--out", FB}, 1,
     "@D/bench.csv: the output is an input of this run"},
    {"fly --json onto its --pack", {"fly", P, "--pack", K, "--json", K}, 1, "@D/pack.json: the output is an input of this run"},
    {"discharge --trace onto its --load", {"discharge", K, "--load", "@D/load.csv", "--trace", "@D/load.csv"}, 1,
     "@D/load.csv: the output is an input of this run"},
    {"discharge --json onto its pack", {"discharge", K, "--current", "5", "--json", K}, 1, "the output is an input of this run"},
    {"json and trace onto one file", {"fly", P, "--json", "@D/a.json", "--trace", "@D/a.json"}, 1,
     "@D/a.json: written twice in this run (got the same file as the output @D/a.json, expected another path)"},
    {"json and html onto one file by two names", {"fly", P, "--json", "@D/b.json", "--html", "@D/sub/../b.json"}, 1,
     "written twice in this run"},
    {"fit cell --out and --report on one file", {"fit", "cell", FC, "--chemistry", "LiPo", "--out", "@D/keep.txt", "--report", "@D/keep-link.txt"}, 1,
     "written twice in this run"},
    {"an output in a missing folder", {"fly", P, "--json", "@D/ok.json", "--trace", "@D/missing/t.csv"}, 1,
     "@D/missing/t.csv: cannot write the file"},
    {"--json with an empty path (an unset shell variable)", {"fly", P, "--json", ""}, 2,
     "sortie: --json: an empty path (got \"\", expected a file name, or - for standard output)"},
    {"fit cell --out with an empty path", {"fit", "cell", FC, "--chemistry", "LiPo", "--out", ""}, 2, "sortie: --out: an empty path"},
    {"an output below a file", {"fly", P, "--json", "@D/keep.txt/x.json"}, 1, "@D/keep.txt/x.json: cannot write the file (Not a directory)"},
    // ---- checked standard output
    {"fly --json - onto a full disk", {"fly", P, "--json", "-"}, 1, "sortie: standard output: cannot write (No space left on device)",
     {}, true},
    {"discharge text onto a full disk", {"discharge", K, "--current", "5", "--json", "@D/d.json"}, 1,
     "standard output: cannot write", {}, true},
    {"fit cell --out - onto a full disk, with a JSON file", {"fit", "cell", FC, "--chemistry", "LiPo", "--out", "-", "--json", "@D/fit.json"}, 1,
     "standard output: cannot write", {}, true},
    {"drive csv onto a full disk", {"drive", DR, "--bus-V", "22", "--format", "csv"}, 1, "standard output: cannot write", {}, true},
    // ---- finite numbers on the command line (each once crashed, hung or ran on garbage)
    {"fit drive --diameter-m nan (was SIGSEGV)", {"fit", "drive", FB, "--out", "@D/m.json", "--diameter-m", "nan"}, 2,
     "sortie: --diameter-m: not a finite number (got NaN, expected a number from 0.01 to 10 m)"},
    {"fit drive --air-density-kg-m3 nan (was SIGSEGV)",
     {"fit", "drive", FB, "--out", "@D/m.json", "--diameter-m", "0.381", "--air-density-kg-m3", "nan"}, 2,
     "--air-density-kg-m3: not a finite number (got NaN, expected a number from 0.1 to 2 kg/m³)"},
    {"drive --sweep-step-pct nan (was a hang)", {"drive", DR, "--bus-V", "22", "--sweep-step-pct", "nan"}, 2,
     "--sweep-step-pct: not a finite number (got NaN, expected a number from 0.01 to 100 %)"},
    {"fit cell --soc0 nan (was a hang)", {"fit", "cell", FC, "--chemistry", "LiPo", "--out", "@D/m.json", "--soc0", "nan"}, 2,
     "--soc0: not a finite number (got NaN, expected a number from 0 to 1)"},
    {"fly --sample-s nan (was GO on a garbage trace)", {"fly", P, "--trace", "@D/t.csv", "--sample-s", "nan"}, 2,
     "sortie: --sample-s: not a finite number (got NaN, expected a number from 0.001 to 1000000 s)"},
    {"discharge --power 1e300", {"discharge", K, "--power", "1e300"}, 2,
     "--power: out of range (got 1e+300, expected a number above 0, up to 1000000 W)"},
    {"discharge --power inf", {"discharge", K, "--power", "inf"}, 2, "--power: not a finite number (got inf"},
    {"discharge --power -inf", {"discharge", K, "--power", "-inf"}, 2, "--power: not a finite number (got -inf"},
    {"discharge --current 1e999 (overflows to inf)", {"discharge", K, "--current", "1e999"}, 2,
     "--current: not a finite number (got inf, expected a number above 0, up to 100000 A)"},
    {"discharge --current 0", {"discharge", K, "--current", "0"}, 2, "--current: out of range (got 0, expected a number above 0"},
    {"discharge --current text", {"discharge", K, "--current", "5A"}, 2, "--current: not a number (got 5A, expected a number above 0"},
    {"discharge --current empty", {"discharge", K, "--current", ""}, 2, "--current: not a number (got , expected"},
    {"discharge --soc0 1.5", {"discharge", K, "--current", "5", "--soc0", "1.5"}, 2,
     "--soc0: out of range (got 1.5, expected a number from 0 to 1)"},
    {"discharge --soc-floor nan", {"discharge", K, "--current", "5", "--soc-floor", "nan"}, 2, "--soc-floor: not a finite number"},
    {"discharge --temperature-C below absolute zero", {"discharge", K, "--current", "5", "--temperature-C", "-300"}, 2,
     "--temperature-C: out of range (got -300, expected a number from -60 to 100 °C)"},
    {"discharge --air-C inf", {"discharge", K, "--current", "5", "--air-C", "inf"}, 2, "--air-C: not a finite number (got inf"},
    {"discharge --cutoff-cell-V nan", {"discharge", K, "--current", "5", "--cutoff-cell-V", "nan"}, 2,
     "--cutoff-cell-V: not a finite number (got NaN, expected a number from 0.5 to 10 V)"},
    {"discharge --sample-s 0", {"discharge", K, "--current", "5", "--trace", "@D/t.csv", "--sample-s", "0"}, 2,
     "--sample-s: out of range (got 0, expected a number from 0.001 to 1000000 s)"},
    {"discharge --sample-s -nan", {"discharge", K, "--current", "5", "--trace", "@D/t.csv", "--sample-s", "-nan"}, 2,
     "--sample-s: not a finite number (got NaN"},
    {"drive --bus-V nan", {"drive", DR, "--bus-V", "nan"}, 2, "--bus-V: not a finite number (got NaN, expected a number from 0.1 to 1000 V)"},
    {"drive --thrust-N -1", {"drive", DR, "--bus-V", "22", "--thrust-N", "-1"}, 2,
     "--thrust-N: out of range (got -1, expected a number from 0 to 100000 N)"},
    {"drive --cells 3,nan", {"drive", DR, "--cells", "3,nan"}, 2,
     "--cells: not a finite number (got NaN, expected a whole number from 1 to 50)"},
    {"drive --cells 3.5", {"drive", DR, "--cells", "3.5"}, 2, "--cells: not a whole number (got 3.5, expected a whole number from 1 to 50)"},
    {"drive --cells 0", {"drive", DR, "--cells", "0"}, 2, "--cells: out of range (got 0, expected a whole number from 1 to 50)"},
    {"drive --airspeed-mps inf", {"drive", DR, "--bus-V", "22", "--airspeed-mps", "inf"}, 2, "--airspeed-mps: not a finite number"},
    {"drive --density-kg-m3 0", {"drive", DR, "--bus-V", "22", "--density-kg-m3", "0"}, 2,
     "--density-kg-m3: out of range (got 0, expected a number from 0.05 to 2 kg/m³)"},
    {"drive --altitude-m 1e5", {"drive", DR, "--bus-V", "22", "--altitude-m", "1e5"}, 2,
     "--altitude-m: out of range (got 100000, expected a number from -500 to 11000 m)"},
    {"drive --cell-V nan", {"drive", DR, "--cells", "4", "--cell-V", "nan"}, 2, "--cell-V: not a finite number"},
    {"drive --sweep-from-pct -5", {"drive", DR, "--bus-V", "22", "--sweep-from-pct", "-5"}, 2,
     "--sweep-from-pct: out of range (got -5, expected a number from 0 to 100 %)"},
    {"fit cell --capacity-Ah nan", {"fit", "cell", FC, "--chemistry", "LiPo", "--out", "@D/m.json", "--capacity-Ah", "nan"}, 2, "--capacity-Ah: not a finite number"},
    {"fit cell --v-max-V inf", {"fit", "cell", FC, "--chemistry", "LiPo", "--out", "@D/m.json", "--v-max-V", "inf"}, 2,
     "--v-max-V: not a finite number (got inf, expected a number from 1 to 6 V)"},
    {"fit cell --rest-min-s -1", {"fit", "cell", FC, "--chemistry", "LiPo", "--out", "@D/m.json", "--rest-min-s", "-1"}, 2, "--rest-min-s: out of range"},
    {"fit cell --mass-kg 0", {"fit", "cell", FC, "--chemistry", "LiPo", "--out", "@D/m.json", "--mass-kg", "0"}, 2,
     "--mass-kg: out of range (got 0, expected a number above 0, up to 100 kg)"},
    {"fit cell --i-cont-max-A nan", {"fit", "cell", FC, "--chemistry", "LiPo", "--out", "@D/m.json", "--i-cont-max-A", "nan"}, 2, "--i-cont-max-A: not a finite number"},
    {"fit cell --series 0", {"fit", "cell", FC, "--chemistry", "LiPo", "--out", "@D/m.json", "--series", "0"}, 2,
     "--series: out of range (got 0, expected a whole number from 1 to 1000)"},
    {"fit cell --soc-band nan", {"fit", "cell", FC, "--chemistry", "LiPo", "--out", "@D/m.json", "--soc-band", "nan"}, 2, "--soc-band: not a finite number"},
    {"fit cell --air-C -1e9", {"fit", "cell", FC, "--chemistry", "LiPo", "--out", "@D/m.json", "--air-C", "-1e9"}, 2, "--air-C: out of range (got -1000000000"},
    {"fit cell --v-cutoff-V above --v-max-V", {"fit", "cell", FC, "--chemistry", "LiPo", "--out", "@D/m.json", "--v-max-V", "3", "--v-cutoff-V", "3.5"}, 2,
     "sortie: --v-cutoff-V: at or above --v-max-V (got 3.5 V, expected below 3 V)"},
    {"discharge --soc-floor above --soc0", {"discharge", K, "--current", "5", "--soc0", "0.5", "--soc-floor", "0.6"}, 2,
     "sortie: --soc-floor: at or above the initial state of charge (got 0.6, expected below 0.5, the --soc0)"},
    {"discharge --soc-floor above the pack file's soc0 (ran for 0 s)", {"discharge", "@D/p.json", "--current", "5", "--soc-floor", "0.5"}, 2,
     "sortie: --soc-floor: at or above the initial state of charge (got 0.5, expected below 0.3, the soc0 of @D/p.json)",
     {{"p.json", pack_json("\"series\": 4, \"soc0\": 0.3")}}},
    {"fit drive --duty-max nan", {"fit", "drive", FB, "--out", "@D/m.json", "--diameter-m", "0.381", "--duty-max", "nan"}, 2,
     "--duty-max: not a finite number"},
    {"fit drive --rotors 1e9", {"fit", "drive", FB, "--out", "@D/m.json", "--diameter-m", "0.381", "--rotors", "1e9"}, 2,
     "--rotors: not a whole number (got 1e9, expected a whole number from 1 to 64)"},
    {"fit drive --motor-i-max-A -inf", {"fit", "drive", FB, "--out", "@D/m.json", "--diameter-m", "0.381", "--motor-i-max-A", "-inf"}, 2,
     "--motor-i-max-A: not a finite number"},
    {"compare --capacity-Ah nan", {"compare", P, "--series", "4", "--capacity-Ah", "5,nan"}, 2,
     "--capacity-Ah: not a finite number (got NaN, expected a number from 0.01 to 10000 Ah)"},
    {"compare --parallel 0", {"compare", P, "--series", "4", "--capacity-Ah", "5", "--parallel", "0"}, 2,
     "--parallel: out of range (got 0, expected a whole number from 1 to 1000)"},
    {"fly --sample-s 1e999", {"fly", P, "--trace", "@D/t.csv", "--sample-s", "1e999"}, 2, "--sample-s: not a finite number (got inf"},
    // ---- repeated values in compare's lists: refused, not run twice
    {"compare --series 6,6", {"compare", P, "--series", "6,6", "--capacity-Ah", "5"}, 2,
     "sortie: --series: 6 given twice (expected each value once)"},
    {"compare --capacity-Ah 5,5", {"compare", P, "--series", "4", "--capacity-Ah", "5,5"}, 2, "--capacity-Ah: 5 given twice"},
    {"compare --parallel 1,2,1", {"compare", P, "--series", "4", "--capacity-Ah", "5", "--parallel", "1,2,1"}, 2,
     "--parallel: 1 given twice"},
    {"compare --pack twice", {"compare", P, "--pack", K, "--pack", K}, 2, "--pack: @D/pack.json given twice"},
    // ---- JSON: duplicate keys with their pointer, numbers past their bounds, hostile names
    {"pack with a key twice", {"discharge", "@D/dup.json", "--current", "5"}, 1,
     "@D/dup.json: /series: key given twice in one object (expected each key once)",
     {{"dup.json", pack_json("\"series\": 4, \"parallel\": 1, \"series\": 6")}}},
    {"pack with a nested key twice", {"discharge", "@D/dup.json", "--current", "5"}, 1,
     "@D/dup.json: /soh/capacity: key given twice in one object",
     {{"dup.json", pack_json("\"series\": 4, \"soh\": { \"capacity\": 1.0, \"capacity\": 0.8 }")}}},
    {"profile with a key twice inside a phase", {"fly", "@D/dup.json"}, 1,
     "@D/dup.json: /phases/1/duration_s: key given twice in one object",
     {{"dup.json", profile_json("\"dup\"", "{ \"kind\": \"climb\", \"to_height_m\": 10, \"rate_mps\": 2 },"
                                           " { \"kind\": \"hover\", \"duration_s\": 5, \"duration_s\": 600 }")}}},
    {"a key with a slash twice (pointer escaped)", {"discharge", "@D/dup.json", "--current", "5"}, 1,
     "@D/dup.json: /a~1b: key given twice",
     {{"dup.json", pack_json("\"series\": 4, \"a/b\": 1, \"a/b\": 2")}}},
    {"a number too large for a double", {"discharge", "@D/big.json", "--current", "5"}, 1,
     "sortie: @D/big.json: line 2, column 17: number too large for a double (got 1e999, expected a finite number)",
     {{"big.json", "{ \"series\": 4,\n  \"wiring_ohm\": 1e999, \"cell\": \"@S/models/cells/demo-lipo-5000.json\" }"}}},
    {"soc0 past full", {"discharge", "@D/p.json", "--current", "5"}, 1,
     "@D/p.json: /soc0: out of range (got 1.5, expected a number from 0 to 1)", {{"p.json", pack_json("\"series\": 4, \"soc0\": 1.5")}}},
    {"series zero", {"discharge", "@D/p.json", "--current", "5"}, 1, "@D/p.json: /series: out of range (got 0",
     {{"p.json", pack_json("\"series\": 0")}}},
    {"an unknown key holding terminal escapes", {"discharge", "@D/esc.json", "--current", "5"}, 1,
     "@D/esc.json: /\\x1b[2J\\x1b[31mx: unknown field '\\x1b[2J\\x1b[31mx'",
     {{"esc.json", pack_json("\"series\": 4, \"\\u001b[2J\\u001b[31mx\": 1")}}},
    {"an unknown key holding a newline", {"discharge", "@D/nl.json", "--current", "5"}, 1, "unknown field 'a\\x0asortie: forged'",
     {{"nl.json", pack_json("\"series\": 4, \"a\\nsortie: forged\": 1")}}},
};

/// Run one case with the folder prepared; stdout to a file or to /dev/full.
CliResult run_case(const Case& c, const std::string& dir) {
  std::string cmd = "ASAN_OPTIONS=\"$ASAN_OPTIONS:exitcode=86\" UBSAN_OPTIONS=\"$UBSAN_OPTIONS:exitcode=87\" '" +
                    std::string(SORTIE_BIN) + "'";
  for (const auto& a : c.args) {
    std::string q = "'";
    for (char ch : replace_all(replace_all(a, "@S", SORTIE_SOURCE_DIR), "@D", dir)) q += ch == '\'' ? std::string("'\\''") : std::string(1, ch);
    cmd += " " + q + "'";
  }
  const std::string out = dir + ".out", err = dir + ".err";
  cmd += (c.stdout_full ? std::string(" >/dev/full") : " >'" + out + "'") + " 2>'" + err + "' </dev/null";
  const int status = std::system(cmd.c_str());
  CliResult r;
  r.exit_code = WIFEXITED(status) ? WEXITSTATUS(status) : -1;
  r.out = c.stdout_full ? "" : read_file(out);
  r.err = read_file(err);
  fs::remove(out);
  fs::remove(err);
  return r;
}

}  // namespace

TEST_SUITE("cli") {

TEST_CASE("bad input: every case exits with its code and one line and leaves its folder untouched") {
  REQUIRE(kCases.size() >= 60);
  std::size_t n = 0;
  for (const auto& c : kCases) {
    const std::string dir = work_dir() + "/bad-" + std::to_string(++n);
    make_fixture(dir, c.files);
    const auto before = snapshot(dir);
    struct stat null_before {};
    ::stat("/dev/null", &null_before);
    const CliResult r = run_case(c, dir);
    const std::string expected = replace_all(replace_all(c.message, "@S", SORTIE_SOURCE_DIR), "@D", dir);
    INFO("case " << n << ": " << c.name << "\nstderr: " << r.err);
    CHECK(r.exit_code == c.exit_code);
    CHECK(r.err.find(expected) != std::string::npos);
    CHECK(r.err.rfind("sortie: ", 0) == 0);
    // One line, and no control character reaches the terminal.
    REQUIRE_FALSE(r.err.empty());
    CHECK(r.err.find('\n') == r.err.size() - 1);
    CHECK(std::find_if(r.err.begin(), r.err.end() - 1, [](char ch) { return static_cast<unsigned char>(ch) < 0x20; }) ==
          r.err.end() - 1);
    CHECK(r.out.empty());
    CHECK(snapshot(dir) == before);
    struct stat null_after {};
    ::stat("/dev/null", &null_after);
    CHECK(S_ISCHR(null_after.st_mode));
    CHECK(null_after.st_rdev == null_before.st_rdev);
    fs::remove_all(dir);
  }
  MESSAGE(kCases.size() << " bad-input cases");
}

}  // TEST_SUITE
