// The boundary-value variants fuzz/run.sh starts each target from (fuzz/sweep.hpp): one variant
// per number of the seed and extreme, each differing from the seed in that one number only.
#include <doctest/doctest.h>

#include <nlohmann/json.hpp>
#include <set>
#include <string>
#include <utility>
#include <vector>

#include "sweep.hpp"

using nlohmann::json;

TEST_SUITE("fuzz") {

// Regression: sweep_seeds iterated `doc.flatten().items()`, whose flattened document is a
// temporary destroyed before the loop ran (AddressSanitizer: stack-use-after-scope in
// sweep_json, the first thing fuzz/run.sh ran).
TEST_CASE("fuzz sweep: each JSON number is set to each extreme in turn and nothing else changes") {
  const std::string seed = R"({"name": "x", "a": 1.5, "b": {"c": [2, "s", 3], "d": true}, "e": null})";
  const json doc = json::parse(seed);
  const json flat = doc.flatten();
  const std::vector<std::string> v = sortie::fuzz::json_variants(seed);
  const auto& extremes = sortie::fuzz::json_extremes();
  REQUIRE(v.size() == 3 * extremes.size());  // the numbers at /a, /b/c/0 and /b/c/2
  std::set<std::pair<std::string, double>> seen;
  for (const std::string& text : v) {
    INFO(text);
    const json f = json::parse(text).flatten();
    REQUIRE(f.size() == flat.size());
    int changed = 0;
    for (const auto& [pointer, value] : f.items()) {
      if (value == flat.at(pointer)) continue;
      ++changed;
      CHECK(value.is_number_float());
      seen.emplace(pointer, value.get<double>());
    }
    // 0 replacing a number that is already 0 would change nothing: the seed has none.
    CHECK(changed == 1);
  }
  for (const char* pointer : {"/a", "/b/c/0", "/b/c/2"})
    for (double x : extremes) CHECK(seen.count({pointer, x}) == 1);
  CHECK(sortie::fuzz::json_variants("{not json").empty());
}

TEST_CASE("fuzz sweep: each CSV number is set to each extreme in turn and nothing else changes") {
  const std::string seed = "t,I\n0.5,1.5\n10,x\n";
  const std::vector<std::string> v = sortie::fuzz::csv_variants(seed);
  const auto& extremes = sortie::fuzz::csv_extremes();
  REQUIRE(v.size() == 3 * extremes.size());  // 0.5 and 1.5 on line 2, 10 on line 3
  CHECK(v[0] == "t,I\n0,1.5\n10,x\n");
  CHECK(v[extremes.size() + 2] == "t,I\n0.5,1e300\n10,x\n");
  CHECK(v.back() == "t,I\n0.5,1.5\n,x\n");
  CHECK(sortie::fuzz::csv_variants("a;b\n+2;c\n")[1] == "a;b\n1e-300;c\n");
}

}  // TEST_SUITE
