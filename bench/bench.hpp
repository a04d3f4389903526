#pragma once
/// The benchmark program's case registry. Each bench_*.cpp registers cases at static
/// initialisation; main times each and prints `<case-name> <median-microseconds> us ...`.
#include <functional>
#include <string>
#include <vector>

namespace sortie::bench {

struct Case {
  std::string name;            ///< what it times, e.g. discharge_1C_4S2RC
  std::function<void()> run;   ///< one repetition of the timed work
  int repetitions = 50;
};

std::vector<Case>& cases();

/// Register a case; returns true so it can initialise a file-scope constant.
bool add_case(std::string name, std::function<void()> run, int repetitions = 50);

/// Keep a value alive so the optimiser cannot drop the work that made it.
void keep(double v);

}  // namespace sortie::bench
