#pragma once
/// An exponential Runge–Kutta stepper for the Thevenin pack: the RC voltages are linear in
/// themselves, dv_k/dt = −v_k/τ_k + I·R_k/τ_k, so their decay is integrated exactly and the
/// fast pair no longer bounds the step (an explicit stepper is held to a few τ_k by stability).
///
/// Method: ETDRK4 of S. M. Cox and P. C. Matthews, "Exponential time differencing for stiff
/// systems", J. Comput. Phys. 176 (2002) 430–455, eqs. (26)–(29), with the linear part
/// L = diag(0, −1/τ_1, −1/τ_2, 0, 0, 0) frozen at the SoC of the step's start and the rest,
/// N(x) = f(x) − L·x, sampled at four stages. Its coefficients in φ-functions
/// (φ_0 = e^z, φ_{k+1}(z) = (φ_k(z) − 1/k!)/z; M. Hochbruck and A. Ostermann, "Exponential
/// integrators", Acta Numerica 19 (2010) 209–286, eq. (2.10)):
///   x1 = e^{hL}x + h[(φ1 − 3φ2 + 4φ3)N_x + 2(φ2 − 2φ3)(N_a + N_b) + (4φ3 − φ2)N_c].
/// Where L = 0 this is the classical fourth-order Runge–Kutta method. Error estimate: the same
/// combination with N_c replaced by N at x1 (first-same-as-last) — for L = 0 the third-order
/// solution of the stages (1/6, 1/3, 1/3, 0, 1/6) that shares RK4's nodes (an independent
/// derivation: it meets the four order-3 conditions Σb = 1, Σbc = 1/2, Σbc² = 1/3, Σbac = 1/6).
/// Dense output: cubic Hermite from the ends' values and slopes for the slow states; for the
/// RC voltages the exact solution of the linear part with N linear in time over the step,
/// corrected to meet the step's end.
#include <algorithm>
#include <array>
#include <cmath>
#include <limits>
#include <utility>

#include "battery/thevenin.hpp"

namespace sortie::sim {

class ExpStepper {
 public:
  using State = battery::State;

  ExpStepper(double abs_tol, double rel_tol, double max_dt) : atol_(abs_tol), rtol_(rel_tol), max_dt_(max_dt) {}

  void initialize(const State& x0, double t0, double dt0) {
    x1_ = x0;
    t1_ = t0;
    dt_ = dt0;
    have_f1_ = false;
  }

  double current_time() const { return t1_; }
  double current_time_step() const { return dt_; }
  const State& current_state() const { return x1_; }

  /// One accepted step (smaller trial steps until the error is within tolerance).
  std::pair<double, double> do_step(const battery::Thevenin& rhs) {
    x0_ = x1_;
    t0_ = t1_;
    if (!have_f1_) rhs(x0_, f1_, t0_);
    f0_ = f1_;
    // Linear part at the step's start.
    const double soc = x0_[battery::kSoc];
    l_.fill(0.0);
    for (std::size_t k = 0; k < rhs.pack.n_rc; ++k) l_[battery::kV1 + k] = -1.0 / rhs.pack.tau_s[k](soc);
    double cap = max_dt_ > 0 ? max_dt_ : std::numeric_limits<double>::infinity();
    while (true) {
      double h = std::min(dt_, cap);
      const double err = attempt(rhs, h, full_, half_);
      // A state that overflowed is handed back as it is: the caller retries from the step's
      // start or names the non-finite state.
      bool finite_state = true;
      for (double v : xn_) finite_state = finite_state && std::isfinite(v);
      if ((err <= 1.0 && std::isfinite(err)) || !finite_state) {
        h_ = h;
        t1_ = t0_ + h;
        x1_ = xn_;
        f1_ = fn_;
        have_f1_ = true;
        for (std::size_t i = 0; i < 6; ++i) {
          if (l_[i] == 0.0) continue;
          const Phi& p = full_[i];  // φ at h·L, as the step used them
          const double n0 = f0_[i] - l_[i] * x0_[i], n1 = f1_[i] - l_[i] * x1_[i];
          miss_[i] = x1_[i] - (p.e * x0_[i] + h * p.p1 * n0 + h * p.p2 * (n1 - n0));
        }
        // Grow at most fivefold; the local error is O(h^4) in the estimate.
        const double grow = !finite_state ? 1.0 : err > 0 ? 0.9 / std::sqrt(std::sqrt(err)) : 5.0;
        dt_ = h * std::clamp(grow, 1.0, 5.0);
        return {t0_, t1_};
      }
      const double shrink = std::isfinite(err) ? std::max(0.2, 0.9 / std::cbrt(err)) : 0.1;
      dt_ = h * shrink;
      if (!(t0_ + dt_ > t0_)) {  // cannot advance: hand back a zero step for the caller's message
        t1_ = t0_;
        x1_ = x0_;
        return {t0_, t0_};
      }
    }
  }

  /// The state at t inside the last step [t0, t1] by one step of the method from t0 to t: as
  /// accurate as the step itself (four evaluations of the right-hand side), for locating events
  /// and ending a stretch, where the cubic dense output over a long step is not.
  void exact_state(const battery::Thevenin& rhs, double t, State& out) {
    if (t <= t0_) {
      out = x0_;
      return;
    }
    if (t >= t1_) {
      out = x1_;
      return;
    }
    const State keep_xn = xn_, keep_fn = fn_, keep_w3 = w3_;
    std::array<Phi, 6> full, half;  // the step's own φ stay for its dense output
    attempt(rhs, t - t0_, full, half);
    out = xn_;
    xn_ = keep_xn;
    fn_ = keep_fn;
    w3_ = keep_w3;
  }

  /// The state at t inside the last step [t0, t1]: the step's ends exactly, inside it the
  /// dense output below.
  void calc_state(double t, State& out) const {
    if (t == t0_) {
      out = x0_;
      return;
    }
    if (t == t1_) {
      out = x1_;
      return;
    }
    const double h = h_;
    // The middle of the step (each step's watch looks there) reuses the step's own φ at h·L/2.
    const bool middle = h > 0 && std::fabs(t - (t0_ + 0.5 * h)) <= 1e-12 * h;
    const double th = middle ? 0.5 : h > 0 ? (t - t0_) / h : 0.0;
    for (std::size_t i = 0; i < out.size(); ++i) {
      if (l_[i] == 0.0) {
        // Cubic Hermite.
        const double h00 = (1 + 2 * th) * (1 - th) * (1 - th), h10 = th * (1 - th) * (1 - th);
        const double h01 = th * th * (3 - 2 * th), h11 = th * th * (th - 1);
        (void)h00;  // written so that a state that does not move stays bit-exact
        out[i] = x0_[i] + h01 * (x1_[i] - x0_[i]) + h * (h10 * f0_[i] + h11 * f1_[i]);
      } else {
        const double z1 = h * l_[i];
        const double n0 = f0_[i] - l_[i] * x0_[i], n1 = f1_[i] - l_[i] * x1_[i];
        // Exact for N linear in time, at fraction th of the step.
        const Phi p = middle ? half_[i] : phis(th * z1);
        const double lin = p.e * x0_[i] + th * h * p.p1 * n0 + th * h * th * p.p2 * (n1 - n0);
        out[i] = lin + th * th * (3 - 2 * th) * miss_[i];
      }
    }
  }

 private:
  struct Phi {
    double e, p1, p2, p3;
  };
  /// φ1, φ2, φ3 at z from e^z − 1: the recurrence, or a Taylor series near 0 where the
  /// recurrence cancels. φ_0 = e^z = 1 + (e^z − 1).
  static Phi phis_from(double z, double em1) {
    Phi p;
    if (std::fabs(z) < 0.1) {
      // φ_k(z) = Σ_j z^j/(j+k)!; nine terms leave under 1e-17 at |z| < 0.1.
      double s1 = 0, s2 = 0, s3 = 0, zj = 1.0;
      double f1 = 1.0, f2 = 0.5, f3 = 1.0 / 6.0;  // 1/(j+1)!, 1/(j+2)!, 1/(j+3)! at j = 0
      for (int j = 0; j < 9; ++j) {
        s1 += zj * f1;
        s2 += zj * f2;
        s3 += zj * f3;
        zj *= z;
        f1 /= (j + 2);
        f2 /= (j + 3);
        f3 /= (j + 4);
      }
      p.p1 = s1;
      p.p2 = s2;
      p.p3 = s3;
      p.e = 1.0 + z * s1;  // e^z = 1 + z·φ1(z)
    } else {
      p.e = 1.0 + em1;
      p.p1 = em1 / z;
      p.p2 = (p.p1 - 1.0) / z;
      p.p3 = (p.p2 - 0.5) / z;
    }
    return p;
  }
  /// e^z, φ1, φ2, φ3 at z ≤ 0.
  static Phi phis(double z) { return phis_from(z, std::fabs(z) < 0.1 ? 0.0 : std::expm1(z)); }
  /// The same at z/2 and at z from one exponential: e^z − 1 = (e^{z/2} − 1)·(e^{z/2} + 1),
  /// free of cancellation for z ≤ 0 (the second factor lies in (1, 2]).
  static void phis_half_full(double z, Phi& half, Phi& full) {
    const double zh = 0.5 * z;
    half = phis(zh);
    const double em1h = std::fabs(zh) < 0.1 ? zh * half.p1 : half.e - 1.0;
    full = phis_from(z, em1h * (em1h + 2.0));
  }

  double attempt(const battery::Thevenin& rhs, double h, std::array<Phi, 6>& full, std::array<Phi, 6>& half) {
    for (std::size_t i = 0; i < 6; ++i) {
      if (l_[i] == 0.0) full[i] = half[i] = Phi{1.0, 1.0, 0.5, 1.0 / 6.0};
      else phis_half_full(h * l_[i], half[i], full[i]);
    }
    State nx, na, nb, nc, a, b, c, fa, fb, fc;
    for (std::size_t i = 0; i < 6; ++i) {
      nx[i] = f0_[i] - l_[i] * x0_[i];
      a[i] = half[i].e * x0_[i] + 0.5 * h * half[i].p1 * nx[i];
    }
    rhs(a, fa, t0_ + 0.5 * h);
    for (std::size_t i = 0; i < 6; ++i) {
      na[i] = fa[i] - l_[i] * a[i];
      b[i] = half[i].e * x0_[i] + 0.5 * h * half[i].p1 * na[i];
    }
    rhs(b, fb, t0_ + 0.5 * h);
    for (std::size_t i = 0; i < 6; ++i) {
      nb[i] = fb[i] - l_[i] * b[i];
      c[i] = half[i].e * a[i] + 0.5 * h * half[i].p1 * (2.0 * nb[i] - nx[i]);
    }
    rhs(c, fc, t0_ + h);
    for (std::size_t i = 0; i < 6; ++i) {
      nc[i] = fc[i] - l_[i] * c[i];
      const Phi& p = full[i];
      w3_[i] = 4.0 * p.p3 - p.p2;
      xn_[i] = p.e * x0_[i] +
               h * ((p.p1 - 3.0 * p.p2 + 4.0 * p.p3) * nx[i] + 2.0 * (p.p2 - 2.0 * p.p3) * (na[i] + nb[i]) +
                    w3_[i] * nc[i]);
    }
    rhs(xn_, fn_, t0_ + h);
    double err = 0.0;
    for (std::size_t i = 0; i < 6; ++i) {
      const double n1 = fn_[i] - l_[i] * xn_[i];
      const double e = h * w3_[i] * (nc[i] - n1);
      const double scale = atol_ + rtol_ * std::max(std::fabs(x0_[i]), std::fabs(xn_[i]));
      err = std::max(err, std::fabs(e) / scale);
      if (!std::isfinite(xn_[i])) return std::numeric_limits<double>::infinity();
    }
    return err;
  }

  double atol_, rtol_, max_dt_;
  double t0_ = 0, t1_ = 0, dt_ = 1, h_ = 0;
  State x0_{}, x1_{}, f0_{}, f1_{}, xn_{}, fn_{}, w3_{}, miss_{};
  std::array<double, 6> l_{};
  std::array<Phi, 6> full_{}, half_{};  ///< φ at h·L and h·L/2 of the last accepted step
  bool have_f1_ = false;
};

}  // namespace sortie::sim
