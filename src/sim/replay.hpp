#pragma once
/// Re-simulate a pack on a logged current, through the whole log (no cutoff, no events): the
/// terminal voltage the model predicts at every log time, for comparing with the measured one.
/// Each stretch of constant current is one sim::run_segment (Dormand–Prince, dense output); the
/// model is evaluated at every log time inside the stretch from the dense output.
#include <cstddef>
#include <vector>

#include "battery/pack.hpp"

namespace sortie::sim {

/// A measured current. Sample k's current flowed during (time_s[k-1], time_s[k]]; at a restart
/// row (a new test section) the RC pairs start relaxed and no current is counted before it.
struct CurrentLog {
  std::vector<double> time_s;     ///< strictly increasing, s
  std::vector<double> current_A;  ///< pack current, discharge positive, A
  std::vector<std::size_t> restarts;  ///< rows that begin a section, increasing (row 0 implied)
};

struct ReplayResult {
  std::vector<double> v_terminal_V;  ///< pack terminal voltage at each log time, V
  std::vector<double> soc;           ///< state of charge at each log time
  std::size_t segments = 0;          ///< run_segment calls
  std::size_t steps = 0;             ///< integrator steps in all
};

/// Starts at pack.soc0 with the RC pairs relaxed. Throws LimitError when a stretch needs more
/// than `max_steps_per_segment` steps.
ReplayResult replay(const battery::Pack& pack, const CurrentLog& log,
                    std::size_t max_steps_per_segment = 100000);

}  // namespace sortie::sim
