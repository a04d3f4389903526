// A failing run leaves no output file, whichever of its outputs failed and whenever.
#include <doctest/doctest.h>

#include "support/cli.hpp"

using namespace sortie::test;

TEST_SUITE("cli") {

TEST_CASE("fly: a trace that cannot be written leaves no JSON either") {
  // The JSON result was renamed into place before the trace failed: a half-done run on disk.
  const std::string json = work_path("half-run.json");
  const std::string trace = work_dir() + "/no-such-folder/trace.csv";
  const auto r = run_sortie({"fly", source_path("profiles/demo-quad-water-tank.json"), "--json", json, "--trace", trace});
  CHECK(r.exit_code == 1);
  CHECK(r.err.find("no-such-folder/trace.csv: cannot write the file") != std::string::npos);
  CHECK_FALSE(file_exists(json));
  CHECK_FALSE(file_exists(json + ".part"));
}

TEST_CASE("discharge: a trace too fine for the run is one line — exit 1 — and no file written") {
  // 5 Ah at 10 mA is 500 h: at 1 ms spacing that is 1.8e9 trace rows, more than any memory.
  const std::string json = work_path("fine-trace.json"), trace = work_path("fine-trace.csv");
  const auto r = run_sortie({"discharge", source_path("models/packs/demo-4s1p-lipo-5000.json"), "--current", "0.01",
                             "--trace", trace, "--sample-s", "0.001", "--json", json});
  CHECK(r.exit_code == 1);
  CHECK(r.err.find("sortie: discharge: the trace would hold more than 1000000 samples at a spacing of 0.001 s") == 0);
  CHECK(r.err.find('\n') == r.err.size() - 1);  // one line
  CHECK_FALSE(file_exists(json));
  CHECK_FALSE(file_exists(trace));
  CHECK_FALSE(file_exists(trace + ".part"));
}

}  // TEST_SUITE
