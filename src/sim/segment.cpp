#include "sim/segment.hpp"

#include <algorithm>
#include <boost/numeric/odeint.hpp>
#include <cmath>

#include "core/error.hpp"
#include "core/roots.hpp"
#include "sim/exp_stepper.hpp"

namespace sortie::sim {

namespace odeint = boost::numeric::odeint;
using battery::State;

namespace {

Sample make_sample(const battery::Thevenin& rhs, double t, const State& x) {
  return Sample{t, x, rhs.terminal(x, t)};
}

std::string lead(const SegmentOptions& opts) { return opts.context.empty() ? "integration" : opts.context; }

bool finite(const Sample& s) {
  for (double v : s.x)
    if (!std::isfinite(v)) return false;
  return std::isfinite(s.term.current_A) && std::isfinite(s.term.v_terminal_V) && std::isfinite(s.term.discriminant);
}

}  // namespace

SegmentResult run_segment(const battery::PackModel& pack, const battery::Demand& demand, double t0,
                          const State& x0, const std::vector<EventSpec>& events,
                          const SegmentOptions& opts, const StepHook& hook) {
  const battery::Thevenin rhs{pack, demand};
  SegmentResult res;
  struct SaveNext {  // hand the trace position on however the segment ends
    SegmentResult& r;
    double& next;
    ~SaveNext() { r.next_sample_t = next; }
  };
  Sample cur = make_sample(rhs, t0, x0);

  double next_sample = opts.sample_s > 0 ? std::max(opts.next_sample_t, t0) : 0.0;
  SaveNext save_next{res, next_sample};
  auto emit_samples_until = [&](double t_hi, const std::function<Sample(double)>& at,
                                bool inclusive) {
    if (opts.sample_s <= 0) return;
    while (inclusive ? next_sample <= t_hi : next_sample < t_hi) {
      if (opts.samples_done + res.samples.size() >= opts.max_samples)
        throw LimitError(lead(opts) + ": the trace would hold more than " + std::to_string(opts.max_samples) +
                         " samples at a spacing of " + format_number(opts.sample_s) + " s (at t = " +
                         format_number(next_sample) + " s); use a larger sample spacing");
      res.samples.push_back(at(next_sample));
      next_sample += opts.sample_s;
    }
  };

  // Events already at or below zero at the start: terminal ones end the segment at once.
  std::vector<double> g_prev(events.size());
  std::optional<std::size_t> stopped_at_start;
  for (std::size_t k = 0; k < events.size(); ++k) {
    g_prev[k] = events[k].g(cur);
    if (g_prev[k] > 0.0) continue;
    if (!events[k].terminal) res.warnings.push_back({k, cur});
    else if (!stopped_at_start) stopped_at_start = k;
  }
  if (stopped_at_start) {
    emit_samples_until(t0, [&](double) { return cur; }, true);
    res.end = cur;
    res.stopped = stopped_at_start;
    return res;
  }
  if (!(opts.t_end > t0)) {
    emit_samples_until(t0, [&](double) { return cur; }, true);
    res.end = cur;
    return res;
  }

  const double span = std::isfinite(opts.t_end) ? opts.t_end - t0 : 1e4;
  auto finish = [&] {
    res.next_sample_t = next_sample;
    return std::move(res);
  };
  auto integrate = [&](auto& stepper) -> SegmentResult {
    stepper.initialize(x0, t0, std::min(1.0, span / 16.0));

    State tmp{};
    // Made once: a lambda of this size converted to std::function at each step would allocate.
    const std::function<Sample(double)> at = [&](double t) {
      stepper.calc_state(t, tmp);
      return make_sample(rhs, t, tmp);
    };
    // Events and a stretch's end: at the stepper's own accuracy where it offers it (the
    // exponential stepper steps again from ta), else on the dense output.
    auto at_exact = [&](double t) {
      if constexpr (requires { stepper.exact_state(rhs, t, tmp); }) {
        stepper.exact_state(rhs, t, tmp);
        return make_sample(rhs, t, tmp);
      } else {
        return at(t);
      }
    };
    std::vector<double> g_hi(events.size());
    std::vector<Crossing> step_warnings;
    while (true) {
      if (opts.steps_done + res.steps >= opts.max_steps)
        throw LimitError(lead(opts) + ": integration stopped after " + std::to_string(opts.max_steps) +
                         " steps at t = " + format_number(stepper.current_time()) +
                         " s without reaching the end" +
                         (opts.step_cap_hint.empty() ? std::string() : "; " + opts.step_cap_hint));
      auto [ta, tb] = stepper.do_step(rhs);
      ++res.steps;
      if (!(tb > ta))
        throw LimitError(lead(opts) + ": the integration cannot advance from t = " + format_number(ta) +
                         " s (a step of " + format_number(stepper.current_time_step()) +
                         " s is below the resolution of a time that large)");
      const bool reaches_end = tb >= opts.t_end;
      const double t_hi = reaches_end ? opts.t_end : tb;
      const Sample hi = reaches_end ? at_exact(t_hi) : make_sample(rhs, tb, stepper.current_state());
      if (!finite(hi)) {
        // Odeint's error estimate lets a step whose trial stages overflowed through (a NaN error
        // is never "too large"). Take the step again from its start, ten times shorter, until it
        // stays finite; a step too short to advance the time means the model cannot be followed.
        const double dt = (tb - ta) / 10.0;
        if (!(ta + dt > ta))
          throw LimitError(lead(opts) + ": the state of the pack stopped being a finite number at t = " +
                           format_number(ta) + " s (a model value far outside what the integrator can follow)");
        stepper.initialize(cur.x, cur.t, dt);
        continue;
      }

      // Locate every crossing inside (ta, t_hi]; the earliest terminal one ends the segment.
      std::optional<Crossing> first_terminal;
      step_warnings.clear();
      for (std::size_t k = 0; k < events.size(); ++k) {
        g_hi[k] = events[k].g(hi);
        if (!(g_prev[k] > 0.0 && g_hi[k] <= 0.0)) continue;
        auto gk = [&](double t) { return events[k].g(at_exact(t)); };
        const double tc =
            find_root(gk, ta, t_hi, g_prev[k], g_hi[k], opts.time_tol_s).value_or(t_hi);
        // Take the upper end of the final bracket side so the reported state has crossed.
        Crossing c{k, at_exact(std::min(t_hi, tc))};
        if (events[k].terminal) {
          if (!first_terminal || c.at.t < first_terminal->at.t) first_terminal = c;
        } else {
          step_warnings.push_back(c);
        }
      }
      const double t_stop = first_terminal ? first_terminal->at.t : t_hi;
      if (hook) hook(cur, first_terminal ? first_terminal->at : hi, at);
      emit_samples_until(t_stop, at, !first_terminal && !reaches_end);
      std::sort(step_warnings.begin(), step_warnings.end(),
                [](const Crossing& a, const Crossing& b) { return a.at.t < b.at.t; });
      for (auto& w : step_warnings)
        if (w.at.t <= t_stop) res.warnings.push_back(w);
      if (first_terminal) {
        res.end = first_terminal->at;
        res.stopped = first_terminal->event;
        return finish();
      }
      if (reaches_end) {
        res.end = hi;
        return finish();
      }
      g_prev = g_hi;
      cur = hi;
    }
  };
  if (opts.method == SegmentOptions::Method::exponential) {
    ExpStepper stepper(kExpTolFactor * opts.abs_tol, kExpTolFactor * opts.rel_tol, opts.max_dt_s);
    return integrate(stepper);
  }
  auto base = odeint::runge_kutta_dopri5<State>();
  if (opts.max_dt_s > 0) {
    auto stepper = odeint::make_dense_output(opts.abs_tol, opts.rel_tol, opts.max_dt_s, base);
    return integrate(stepper);
  }
  auto stepper = odeint::make_dense_output(opts.abs_tol, opts.rel_tol, base);
  return integrate(stepper);
}

}  // namespace sortie::sim
