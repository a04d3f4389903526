#pragma once
/// Bounded nonlinear least squares: Levenberg–Marquardt with Marquardt's diagonal scaling
/// (K. Levenberg 1944; D. W. Marquardt, "An Algorithm for Least-Squares Estimation of Nonlinear
/// Parameters", SIAM J. Appl. Math. 11, 1963), on the normal equations
///   (JᵀJ + λ·diag(JᵀJ))·δ = −Jᵀr,
/// with box bounds kept by projection: a parameter at a bound whose gradient pushes it out is
/// held there for the step (an active-set rule, as in projected Gauss–Newton methods).
/// The problem hands over JᵀJ and Jᵀr rather than J, so a long log never needs J in memory.
#include <functional>
#include <string>

#include <Eigen/Dense>

namespace sortie::fit {

/// What a least-squares problem returns at a point x.
struct NormalEquations {
  double cost = 0.0;       ///< ½·Σ r², in the residuals' units squared
  Eigen::MatrixXd jtj;     ///< JᵀJ (only when asked)
  Eigen::VectorXd jtr;     ///< Jᵀr (only when asked)
};

/// Evaluate at x; fill jtj and jtr when `with_jacobian`.
using LeastSquaresProblem = std::function<void(const Eigen::VectorXd& x, bool with_jacobian,
                                               NormalEquations& out)>;

struct LmOptions {
  int max_iterations = 200;      ///< accepted or rejected steps in all
  double cost_rel_tol = 1e-8;    ///< stop when an accepted step lowers the cost by less
  double step_tol = 1e-9;        ///< stop when no parameter moves by more (absolute, in x units)
  double lambda0 = 1e-3;         ///< initial damping
};

enum class LmStatus {
  converged,       ///< cost or step below its tolerance
  iteration_cap,   ///< max_iterations reached (the best point so far is returned)
  stalled          ///< no step lowers the cost even with heavy damping
};
const char* to_string(LmStatus s);

struct LmResult {
  Eigen::VectorXd x;
  double cost = 0.0;
  int iterations = 0;
  LmStatus status = LmStatus::converged;
};

/// Minimise from x0 within [lower, upper] (x0 is clamped into the box first).
LmResult levenberg_marquardt(const LeastSquaresProblem& f, Eigen::VectorXd x0,
                             const Eigen::VectorXd& lower, const Eigen::VectorXd& upper,
                             const LmOptions& opts = {});

}  // namespace sortie::fit
