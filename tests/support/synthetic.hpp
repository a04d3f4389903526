#pragma once
// Synthetic cell logs for the fit tests and the bundled demo log: sortie's own simulator on an
// invented cell (sim/synthetic_log), written as CSV text.
#include <cstdio>
#include <string>
#include <vector>

#include "sim/synthetic_log.hpp"

namespace sortie::test {

/// The seed of the bundled demo log models/logs/demo-hppc-synthetic.csv (fixed, printed by the
/// tests that use it).
inline constexpr std::uint64_t kDemoLogSeed = 20240611;
inline constexpr const char* kDemoLogCell = "models/cells/demo-lipo-5000.json";
inline constexpr const char* kDemoLogFile = "models/logs/demo-hppc-synthetic.csv";

/// CSV text: `# ` comment lines, then `Time (s),Current (A),Voltage (V)`; time to 0.1 s, current
/// to 1 mA, voltage to 1 mV (the logger's resolution in the noise model).
inline std::string synthetic_csv(const sim::SyntheticLog& log, const std::vector<std::string>& comments) {
  std::string out;
  for (const auto& c : comments) out += "# " + c + "\n";
  out += "Time (s),Current (A),Voltage (V)\n";
  char buf[96];
  for (std::size_t k = 0; k < log.time_s.size(); ++k) {
    std::snprintf(buf, sizeof buf, "%.1f,%.3f,%.3f\n", log.time_s[k], log.current_A[k] + 0.0, log.voltage_V[k]);
    out += buf;
  }
  // "-0.000" would be a distinct text for the same value; write it as 0.000.
  for (std::size_t p = out.find(",-0.000,"); p != std::string::npos; p = out.find(",-0.000,", p))
    out.replace(p, 8, ",0.000,");
  return out;
}

/// The comment lines of the bundled demo log.
inline std::vector<std::string> demo_log_comments() {
  return {"synthetic pulse-test log of an invented cell - not a measurement.",
          "made by sortie's own simulator (sim::synthetic_pulse_test, default protocol, seed 20240611)",
          "on models/cells/demo-lipo-5000.json (invented): 1 mV voltage noise and resolution, 2 mA current",
          "noise, 1 mA resolution; current positive on discharge. tests/fit/demo_log_test.cpp rebuilds it."};
}

inline sim::MeasurementNoise demo_log_noise() {
  sim::MeasurementNoise n;
  n.seed = kDemoLogSeed;
  return n;
}

}  // namespace sortie::test
