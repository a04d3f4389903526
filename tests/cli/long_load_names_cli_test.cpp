// A long load log integrates to its end, and names from files reach neither the terminal nor the
// HTML page with their control characters.
#include <doctest/doctest.h>

#include <algorithm>
#include <cstdio>
#include <fstream>
#include <string>

#include "support/cli.hpp"

using namespace sortie::test;

TEST_SUITE("cli") {

TEST_CASE("discharge --load: a 100 Hz one-hour log (360 001 rows) runs to the end of the load") {
  // The whole-run step cap did not grow with the log: every row restarts the stepper, so 360 000
  // stretches needed more than the 200 000 steps allowed. The 6S2P 10 Ah demo pack at 2 to 3 A
  // lasts well over the hour, so the run must end with the load.
  const std::string load = work_path("load-100Hz-1h.csv");
  {
    std::ofstream f(load);
    f << "time_s,current_A\n";
    char buf[64];
    for (int k = 0; k <= 360000; ++k) {
      std::snprintf(buf, sizeof buf, "%.2f,%.1f\n", k / 100.0, (k / 50) % 2 ? 3.0 : 2.0);
      f << buf;
    }
  }
  const auto r = run_sortie({"discharge", source_path("models/packs/demo-6s2p-liion-21700.json"), "--load", load, "--format", "json"});
  INFO(r.err);
  REQUIRE(r.exit_code == 0);
  CHECK(r.out.find("\"end_reason\": \"load_end\"") != std::string::npos);
  CHECK(r.out.find("\"time_to_end_s\": 3600") != std::string::npos);
}

TEST_CASE("fly: a profile name with terminal escapes and a newline is shown escaped in the text and the page") {
  const std::string src = SORTIE_SOURCE_DIR;
  const std::string profile = write_work_file(
      "hostile-name.json",
      "{ \"name\": \"tank\\u001b[2J\\u001b]0;owned\\u0007\\nGO: forged line\","
      " \"airframe\": \"" + src + "/models/airframes/demo-quad-15in-inspection.json\","
      " \"drive\": \"" + src + "/models/drives/demo-quad-15in.json\","
      " \"pack\": { \"name\": \"pack\\u001b[31m\", \"cell\": \"" + src + "/models/cells/demo-lipo-5000.json\", \"series\": 6 },"
      " \"phases\": [ { \"kind\": \"climb\", \"to_height_m\": 10, \"rate_mps\": 2 },"
      " { \"kind\": \"hover\", \"label\": \"lab\\u001b[5m\", \"duration_s\": 60 },"
      " { \"kind\": \"descend\", \"to_height_m\": 0, \"rate_mps\": 1 } ] }");
  const std::string html = work_path("hostile-name.html");
  const auto r = run_sortie({"fly", profile, "--html", html});
  INFO(r.err);
  REQUIRE(r.exit_code == 0);
  CHECK(r.out.find('\x1b') == std::string::npos);
  CHECK(r.out.find('\x07') == std::string::npos);
  CHECK(r.out.find("sortie fly: tank\\x1b[2J\\x1b]0;owned\\x07\\x0aGO: forged line\n") != std::string::npos);
  CHECK(r.out.find("pack\\x1b[31m") != std::string::npos);
  CHECK(r.out.find("lab\\x1b[5m") != std::string::npos);
  const std::string page = read_file(html);
  CHECK(page.find('\x1b') == std::string::npos);
  CHECK(page.find('\x07') == std::string::npos);
  CHECK(page.find("tank\\x1b[2J") != std::string::npos);
}

}  // TEST_SUITE
