// sortie's benchmark program (not run by ctest). One line per case:
//   <case-name> <median-microseconds> us  min=<us> max=<us> reps=<n>
// Usage: sortie_bench [FILTER]   (runs the cases whose name contains FILTER)
#include <algorithm>
#include <chrono>
#include <cstdio>
#include <string>
#include <vector>

#include "bench.hpp"

namespace sortie::bench {

std::vector<Case>& cases() {
  static std::vector<Case> all;
  return all;
}

bool add_case(std::string name, std::function<void()> run, int repetitions) {
  cases().push_back({std::move(name), std::move(run), repetitions});
  return true;
}

namespace {
volatile double sink = 0.0;
}
void keep(double v) { sink = sink + v; }

}  // namespace sortie::bench

int main(int argc, char** argv) {
  using clock = std::chrono::steady_clock;
  const std::string filter = argc > 1 ? argv[1] : "";
  auto& all = sortie::bench::cases();
  std::sort(all.begin(), all.end(), [](const auto& a, const auto& b) { return a.name < b.name; });
  for (const auto& c : all) {
    if (!filter.empty() && c.name.find(filter) == std::string::npos) continue;
    c.run();  // warm-up
    std::vector<double> us;
    us.reserve(c.repetitions);
    for (int i = 0; i < c.repetitions; ++i) {
      const auto t0 = clock::now();
      c.run();
      us.push_back(std::chrono::duration<double, std::micro>(clock::now() - t0).count());
    }
    std::sort(us.begin(), us.end());
    const double median = us[us.size() / 2];
    std::printf("%s %.1f us  min=%.1f max=%.1f reps=%d\n", c.name.c_str(), median, us.front(),
                us.back(), c.repetitions);
  }
  return 0;
}
