#include "fit/levenberg_marquardt.hpp"

#include <algorithm>
#include <cassert>
#include <cmath>

namespace sortie::fit {

const char* to_string(LmStatus s) {
  switch (s) {
    case LmStatus::converged: return "converged";
    case LmStatus::iteration_cap: return "iteration cap reached";
    case LmStatus::stalled: return "stalled";
  }
  return "?";
}

LmResult levenberg_marquardt(const LeastSquaresProblem& f, Eigen::VectorXd x,
                             const Eigen::VectorXd& lower, const Eigen::VectorXd& upper,
                             const LmOptions& opts) {
  const Eigen::Index n = x.size();
  assert(lower.size() == n && upper.size() == n);
  x = x.cwiseMax(lower).cwiseMin(upper);
  NormalEquations cur, trial;
  double lambda = opts.lambda0;
  LmResult res;
  auto finish = [&](LmStatus s) {
    res.status = s;
    res.x = x;
    res.cost = cur.cost;
    return res;
  };
  int tries = 0;
  while (true) {
    f(x, true, cur);
    // Active bounds: at a bound with the descent direction −g pointing outside.
    Eigen::MatrixXd a = cur.jtj;
    Eigen::VectorXd g = cur.jtr;
    for (Eigen::Index i = 0; i < n; ++i) {
      const bool at_lo = x[i] <= lower[i] && g[i] > 0.0;
      const bool at_hi = x[i] >= upper[i] && g[i] < 0.0;
      if (at_lo || at_hi) {
        a.row(i).setZero();
        a.col(i).setZero();
        a(i, i) = 1.0;
        g[i] = 0.0;
      }
    }
    if (n == 0 || g.cwiseAbs().maxCoeff() == 0.0) return finish(LmStatus::converged);
    // Marquardt scaling: damp each parameter in proportion to its own curvature; a floor keeps
    // a parameter the data do not see from giving a singular system.
    const Eigen::VectorXd d =
        a.diagonal().cwiseMax(1e-12 * std::max(1e-300, a.diagonal().maxCoeff()));
    while (true) {
      if (tries >= opts.max_iterations) return finish(LmStatus::iteration_cap);
      ++tries;
      res.iterations = tries;
      Eigen::MatrixXd m = a;
      m.diagonal() += lambda * d;
      const Eigen::VectorXd step = m.ldlt().solve(-g);
      const Eigen::VectorXd xn = (x + step).cwiseMax(lower).cwiseMin(upper);
      const double moved = (xn - x).cwiseAbs().maxCoeff();
      if (std::isfinite(moved)) {
        f(xn, false, trial);
        if (std::isfinite(trial.cost) && trial.cost < cur.cost) {
          const double drop = (cur.cost - trial.cost) / std::max(cur.cost, 1e-300);
          x = xn;
          cur.cost = trial.cost;
          lambda = std::max(lambda / 3.0, 1e-12);
          if (drop < opts.cost_rel_tol || moved < opts.step_tol) return finish(LmStatus::converged);
          break;  // accepted: new Jacobian
        }
        // Even the damped step no longer changes anything: x is a minimum to tolerance.
        if (moved < opts.step_tol) return finish(LmStatus::converged);
      }
      lambda *= 4.0;
      if (lambda > 1e16) return finish(LmStatus::stalled);
    }
  }
}

}  // namespace sortie::fit
