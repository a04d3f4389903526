#pragma once
// Synthetic cell logs for the fit tests and the bundled demo log: sortie's own simulator on an
// invented cell (sim/synthetic_log), written as CSV text.
#include <cmath>
#include <cstdio>
#include <random>
#include <string>
#include <vector>

#include "propulsion/operating_point.hpp"
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

/// The bundled demo bench test models/logs/demo-bench-synthetic.csv: the invented demo quad
/// drive on a static stand at 16 V (constant I0), 13 throttle steps, seed below.
inline constexpr std::uint64_t kDemoBenchSeed = 20240612;
inline constexpr const char* kDemoBenchDrive = "models/drives/demo-quad-15in.json";
inline constexpr const char* kDemoBenchFile = "models/logs/demo-bench-synthetic.csv";

/// A throttle-step bench test made by the propulsion model (propulsion::at_duty at J = 0, duty
/// = throttle), with Gaussian noise: rpm 0.3 %, thrust 0.5 %, current 0.5 %, voltage 0.1 %, torque
/// 1 % (std::mt19937_64 with our own Box–Muller, so the same text on every platform). CSV with
/// the bench reader's header names; `comments` as `# ` lines first.
inline std::string synthetic_bench_csv(const propulsion::Drive& d, double v_bus, std::uint64_t seed,
                                       const std::vector<std::string>& comments) {
  std::mt19937_64 gen(seed);
  auto z = [&gen] {  // one standard normal deviate (Box–Muller, cosine branch)
    const double u1 = (static_cast<double>(gen() >> 11) + 1.0) * 0x1.0p-53;
    const double u2 = static_cast<double>(gen() >> 11) * 0x1.0p-53;
    return std::sqrt(-2.0 * std::log(u1)) * std::cos(2.0 * 3.14159265358979323846 * u2);
  };
  std::string out;
  for (const auto& c : comments) out += "# " + c + "\n";
  out += "throttle (%),voltage (V),current (A),rpm,thrust (g),torque (Nm)\n";
  char buf[160];
  for (int i = 0; i <= 12; ++i) {
    const double duty = i == 0 ? 0.0 : 0.2 + 0.8 * (i - 1) / 11.0;
    const auto op = propulsion::at_duty(d, duty, 0.0, 1.225, v_bus);
    const double bus_W = duty > 0 ? op.bus.bus_W : d.esc.p_idle_W;
    const double v = v_bus * (1.0 + 0.001 * z());
    const double a = bus_W / v_bus * (1.0 + 0.005 * z());
    const double rpm = op.motor.rpm * (1.0 + 0.003 * z());
    const double g = op.motor.thrust_N / 9.80665e-3 * (1.0 + 0.005 * z());
    const double q = op.motor.torque * (1.0 + 0.01 * z());
    std::snprintf(buf, sizeof buf, "%.1f,%.3f,%.3f,%.0f,%.1f,%.4f\n", 100.0 * duty, v, a, rpm, g, q);
    out += buf;
  }
  return out;
}

inline std::vector<std::string> demo_bench_comments() {
  return {"synthetic thrust-bench test of an invented drive - not a measurement.",
          "made by sortie's propulsion model (propulsion::at_duty, duty = throttle, J = 0) on",
          "models/drives/demo-quad-15in.json (invented) with a constant I0, 16 V supply, seed 20240612;",
          "noise rpm 0.3 %, thrust 0.5 %, current 0.5 %, voltage 0.1 %, torque 1 %. Prop diameter 0.381 m.",
          "tests/fit/demo_log_test.cpp rebuilds it."};
}

}  // namespace sortie::test
