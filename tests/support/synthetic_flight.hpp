#pragma once
// A synthetic flight log: a profile's mission flown by sortie's own simulator on its pack with
// the given state of health and start SoC, logged every second with Gaussian noise on the pack
// voltage and current from a fixed seed (test::normal, Box–Muller on std::mt19937, the same on
// every standard library). For the bundled demo flight log and the invented pack-ageing series
// of examples/pack-ageing/; never a substitute for a measurement.
#include <cstdio>
#include <random>
#include <string>

#include "io/profile_json.hpp"
#include "sim/mission.hpp"
#include "support/normal.hpp"

namespace sortie::test {

struct SyntheticFlight {
  double soh_capacity = 1.0, soh_resistance = 1.0;
  double soc0 = 1.0;
  double sigma_V = 0.02, sigma_A = 0.05;  ///< noise, 1 sd
  unsigned seed = 1;
};

/// The data rows of the log ("t,V,I,height,throttle" with 3, 3, 3, 1 and 1 decimals), under
/// the header "Time (s),Voltage (V),Current (A),Altitude (m),Throttle (%)".
inline std::string synthetic_flight_rows(sim::Mission m, const SyntheticFlight& f) {
  m.pack.soh_capacity = f.soh_capacity;
  m.pack.soh_resistance = f.soh_resistance;
  m.pack.soc0 = f.soc0;
  sim::SimOptions so;
  so.sample_s = 1.0;
  const sim::MissionResult r = sim::simulate(m, so);
  std::mt19937 g(f.seed);
  std::string out = "Time (s),Voltage (V),Current (A),Altitude (m),Throttle (%)\n";
  char buf[160];
  for (const auto& p : r.trace) {
    const double v = p.s.term.v_terminal_V + f.sigma_V * normal(g);
    const double i = p.s.term.current_A + f.sigma_A * normal(g);
    std::snprintf(buf, sizeof buf, "%.3f,%.3f,%.3f,%.1f,%.1f\n", p.s.t, v, i, p.height_m, 100.0 * p.duty);
    out += buf;
  }
  return out;
}

}  // namespace sortie::test
