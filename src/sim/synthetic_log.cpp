#include "sim/synthetic_log.hpp"

#include <cmath>
#include <random>

#include "battery/thevenin.hpp"
#include "core/error.hpp"
#include "sim/segment.hpp"

namespace sortie::sim {

namespace {

/// Standard normal deviates by the Box–Muller transform (G. E. P. Box, M. E. Muller, "A Note on
/// the Generation of Random Normal Deviates", Ann. Math. Stat. 29, 1958) on std::mt19937_64,
/// whose output the C++ standard fixes, so a seed gives the same log everywhere.
class Normal {
 public:
  explicit Normal(std::uint64_t seed) : gen_(seed) {}
  double operator()() {
    if (has_spare_) {
      has_spare_ = false;
      return spare_;
    }
    const double u1 = (static_cast<double>(gen_() >> 11) + 1.0) * 0x1.0p-53;  // (0, 1]
    const double u2 = static_cast<double>(gen_() >> 11) * 0x1.0p-53;          // [0, 1)
    const double r = std::sqrt(-2.0 * std::log(u1));
    const double a = 2.0 * 3.14159265358979323846 * u2;
    spare_ = r * std::sin(a);
    has_spare_ = true;
    return r * std::cos(a);
  }

 private:
  std::mt19937_64 gen_;
  double spare_ = 0.0;
  bool has_spare_ = false;
};

double quantise(double v, double step) { return step > 0 ? std::round(v / step) * step : v; }

class Runner {
 public:
  Runner(const battery::Cell& cell, const PulseTestProtocol& p, const MeasurementNoise& noise)
      : pack_(make_pack(cell, p)), model_(pack_), p_(p), noise_(noise), normal_(noise.seed) {
    x_ = model_.initial_state(p.soc_start);
    record(0.0, terminal(0.0).v_terminal_V);
  }

  /// Hold `current_A` for `duration_s`, logging every `dt_s`.
  void hold(double current_A, double duration_s, double dt_s) {
    const double t_end = t_ + duration_s;
    while (t_ < t_end - 1e-9) step(current_A, std::min(dt_s, t_end - t_));
  }

  /// Hold a discharge `current_A` for `duration_s`, or until the terminal voltage reaches
  /// v_limit_V (a cycler's safety limit ends the step there).
  void discharge_limited(double current_A, double duration_s, double dt_s, double v_limit_V) {
    const double t_end = t_ + duration_s;
    while (t_ < t_end - 1e-9)
      if (step(current_A, std::min(dt_s, t_end - t_)) <= v_limit_V) return;
  }

  /// Hold `current_A` until the terminal voltage passes `v_limit_V` (downwards for a discharge,
  /// upwards for a charge), logging every `dt_s`.
  void until_voltage(double current_A, double v_limit_V, double dt_s) {
    for (std::size_t n = 0;; ++n) {
      if (n > 10000000) throw LimitError("synthetic log: a stretch did not reach its voltage limit");
      const double v = step(current_A, dt_s);
      if (current_A > 0 ? v <= v_limit_V : v >= v_limit_V) return;
    }
  }

  /// Constant voltage: each interval's current is the one that brings the terminal to v_V at
  /// the interval's end, until |I| falls below `taper_A`.
  void constant_voltage(double v_V, double taper_A, double dt_s) {
    for (std::size_t n = 0;; ++n) {
      if (n > 10000000) throw LimitError("synthetic log: the constant-voltage charge did not taper");
      const double i = current_for_voltage(v_V, dt_s);
      if (std::fabs(i) < taper_A) return;
      step(i, dt_s);
    }
  }

  /// A charge at `current_A` (negative) for `duration_s`, held at v_limit_V by a constant-voltage
  /// phase when it would go above (as a cycler does).
  void charge_limited(double current_A, double duration_s, double dt_s, double v_limit_V) {
    const double t_end = t_ + duration_s;
    while (t_ < t_end - 1e-9) {
      const double dt = std::min(dt_s, t_end - t_);
      step(std::max(current_A, current_for_voltage(v_limit_V, dt)), dt);
    }
  }

  double soc() const { return x_[battery::kSoc]; }
  SyntheticLog take() { return std::move(log_); }

 private:
  static battery::Pack make_pack(const battery::Cell& cell, const PulseTestProtocol& pr) {
    battery::Pack p;
    p.cell = cell;
    if (!pr.thermal) p.cell.thermal.reset();  // a test held at 25 °C: the log's model is isothermal
    p.soc0 = pr.soc_start;
    p.temperature_C = pr.thermal ? pr.air_C : 25.0;
    p.air_C = p.temperature_C;
    return p;
  }

  /// The constant current over the next dt_s that ends with the terminal at v_V, from the exact
  /// interval update of the RC pairs, v_p' = R_p·I·(1 − a_p) + a_p·v_p, and the OCV slope:
  ///   v_V = OCV(s) − OCV'(s)·I·dt/C − R0·I − Σ (R_p·I·(1 − a_p) + a_p·v_p)
  double current_for_voltage(double v_V, double dt_s) const {
    const double soc = x_[battery::kSoc];
    const double rs = model_.r_scale(x_[battery::kTemp]);
    double num = model_.ocv_pack(soc) - v_V, den = model_.r0_pack(soc, x_[battery::kTemp]);
    den += model_.series * model_.ocv_cell_V.slope(soc) * dt_s / model_.capacity_C;
    for (std::size_t k = 0; k < model_.n_rc; ++k) {
      const double a = std::exp(-dt_s / model_.tau_s[k](soc));
      num -= a * x_[battery::kV1 + k];
      den += model_.r_pack_ohm[k](soc) * rs * (1.0 - a);
    }
    return num / den;
  }

  battery::Terminal terminal(double current_A) const {
    const battery::Thevenin rhs{model_, battery::Demand::current(current_A)};
    return rhs.terminal(x_, t_);
  }

  /// One logged interval at constant current; returns the true terminal voltage at its end.
  double step(double current_A, double dt_s) {
    SegmentOptions opts;
    opts.t_end = t_ + dt_s;
    opts.abs_tol = 1e-10;
    opts.rel_tol = 1e-10;
    const SegmentResult r = run_segment(model_, battery::Demand::current(current_A), t_, x_, {}, opts);
    t_ = r.end.t;
    x_ = r.end.x;
    i_last_ = current_A;
    record(t_, r.end.term.v_terminal_V);
    return r.end.term.v_terminal_V;
  }

  void record(double t, double v_true) {
    log_.time_s.push_back(t);
    log_.soc_true.push_back(x_[battery::kSoc]);
    log_.v_true_V.push_back(v_true);
    log_.i_true_A.push_back(i_last_);
    log_.voltage_V.push_back(quantise(v_true + noise_.voltage_sd_V * normal_(), noise_.voltage_step_V));
    log_.current_A.push_back(quantise(i_last_ + noise_.current_sd_A * normal_(), noise_.current_step_A));
    if (p_.thermal) {  // drawn after the others, so an isothermal log is the same as before
      const double T = x_[battery::kTemp];
      log_.temperature_true_C.push_back(T);
      log_.temperature_C.push_back(quantise(T + noise_.temperature_sd_C * normal_(), noise_.temperature_step_C));
    }
  }

  battery::Pack pack_;
  battery::PackModel model_;
  PulseTestProtocol p_;
  MeasurementNoise noise_;
  Normal normal_;
  battery::State x_{};
  double t_ = 0.0;
  double i_last_ = 0.0;
  SyntheticLog log_;
};

}  // namespace

SyntheticLog synthetic_pulse_test(const battery::Cell& cell, const PulseTestProtocol& p,
                                  const MeasurementNoise& noise) {
  const double c = cell.capacity_Ah;  // 1C, A
  Runner run(cell, p, noise);
  run.hold(0.0, p.start_rest_s, p.rest_sample_s);
  run.until_voltage(-p.charge_C * c, cell.v_max_V, p.sample_s);
  run.constant_voltage(cell.v_max_V, p.taper_C * c, p.sample_s);
  run.hold(0.0, p.full_rest_s, p.rest_sample_s);
  // Pulse sets while a whole step is left above the cutoff; the last discharge to the cutoff.
  const double step_s = p.step_soc * 3600.0 / p.step_C;
  auto pulses = [&] {
    const double dt = p.pulse_sample_s;
    run.discharge_limited(p.pulse_C * c, p.pulse_s, dt, cell.v_cutoff_V);
    run.hold(0.0, p.pulse_rest_s, dt);
    run.charge_limited(-p.charge_pulse_C * c, p.charge_pulse_s, dt, cell.v_max_V);
    run.hold(0.0, p.pulse_rest_s, dt);
  };
  while (run.soc() > 1.5 * p.step_soc) {
    pulses();
    run.hold(p.step_C * c, step_s, p.sample_s);
    run.hold(0.0, p.step_rest_s, p.rest_sample_s);
  }
  pulses();
  run.until_voltage(p.step_C * c, cell.v_cutoff_V, p.sample_s);
  return run.take();
}

battery::CellLog to_cell_log(const SyntheticLog& s, const std::string& file) {
  battery::CellLog log;
  log.file = file;
  log.time_s = s.time_s;
  log.current_A = s.current_A;
  log.voltage_V = s.voltage_V;
  log.temperature_C = s.temperature_C;
  for (std::size_t k = 0; k < s.time_s.size(); ++k) log.line.push_back(k + 2);
  return log;
}

}  // namespace sortie::sim
