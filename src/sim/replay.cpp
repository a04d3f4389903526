#include "sim/replay.hpp"

#include <algorithm>
#include <cassert>

#include "battery/thevenin.hpp"
#include "sim/segment.hpp"

namespace sortie::sim {

ReplayResult replay(const battery::Pack& pack, const CurrentLog& log,
                    std::size_t max_steps_per_segment) {
  const std::size_t n = log.time_s.size();
  assert(log.current_A.size() == n);
  const battery::PackModel model(pack);
  ReplayResult out;
  out.v_terminal_V.resize(n);
  out.soc.resize(n);
  if (n == 0) return out;

  SegmentOptions opts;
  opts.max_steps = max_steps_per_segment;
  opts.sample_s = 0.0;
  // Tolerances: 1e-9 V on voltages of a few volts is far below any measurement resolution.
  opts.abs_tol = 1e-9;
  opts.rel_tol = 1e-9;
  const std::vector<EventSpec> no_events;

  battery::State x = model.initial_state(pack.soc0);
  auto is_restart = [&](std::size_t k) {
    return std::binary_search(log.restarts.begin(), log.restarts.end(), k);
  };
  // The voltage shown at a log time belongs to the current that flowed up to it.
  auto record = [&](std::size_t k, const Sample& s) {
    out.v_terminal_V[k] = s.term.v_terminal_V;
    out.soc[k] = s.x[battery::kSoc];
  };
  {
    const battery::Thevenin rhs{model, battery::Demand::current(log.current_A[0])};
    record(0, Sample{log.time_s[0], x, rhs.terminal(x, log.time_s[0])});
  }
  std::size_t k = 1;
  while (k < n) {
    if (is_restart(k)) {  // a gap: the RC pairs relax, the charge stays
      x[battery::kV1] = 0.0;
      x[battery::kV2] = 0.0;
      const battery::Thevenin rhs{model, battery::Demand::current(log.current_A[k])};
      record(k, Sample{log.time_s[k], x, rhs.terminal(x, log.time_s[k])});
      ++k;
      continue;
    }
    // The stretch k..last of one current value, with no restart inside.
    std::size_t last = k;
    while (last + 1 < n && log.current_A[last + 1] == log.current_A[k] && !is_restart(last + 1)) ++last;
    const battery::Demand demand = battery::Demand::current(log.current_A[k]);
    opts.t_end = log.time_s[last];
    std::size_t next = k;  // the next log row to evaluate inside this stretch
    const StepHook hook = [&](const Sample&, const Sample& b, const std::function<Sample(double)>& at) {
      const double tb = b.t;
      while (next < last && log.time_s[next] <= tb) {
        record(next, at(log.time_s[next]));
        ++next;
      }
    };
    const SegmentResult seg = run_segment(model, demand, log.time_s[k - 1], x, no_events, opts, hook);
    ++out.segments;
    out.steps += seg.steps;
    assert(next == last);  // every earlier row lies inside some step, the last one is the end
    record(last, seg.end);
    x = seg.end.x;
    k = last + 1;
  }
  return out;
}

}  // namespace sortie::sim
