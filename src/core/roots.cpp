#include "core/roots.hpp"

#include <boost/math/tools/roots.hpp>
#include <boost/math/tools/toms748_solve.hpp>
#include <cmath>
#include <utility>

#include "core/error.hpp"

namespace sortie {

std::optional<double> find_root(const std::function<double(double)>& f, double a, double b,
                                double x_tol, std::uintmax_t max_iter) {
  return find_root(f, a, b, f(a), f(b), x_tol, max_iter);
}

std::optional<double> find_root(const std::function<double(double)>& f, double a, double b,
                                double fa, double fb, double x_tol, std::uintmax_t max_iter) {
  if (a > b) {
    std::swap(a, b);
    std::swap(fa, fb);
  }
  if (fa == 0.0) return a;
  if (fb == 0.0) return b;
  if (!std::isfinite(fa) || !std::isfinite(fb) || (fa > 0) == (fb > 0)) return std::nullopt;
  std::uintmax_t iters = max_iter;
  auto tol = [x_tol](double lo, double hi) { return std::fabs(hi - lo) <= x_tol; };
  auto [lo, hi] = boost::math::tools::toms748_solve(f, a, b, fa, fb, tol, iters);
  if (iters >= max_iter && !tol(lo, hi))
    throw LimitError("root finder did not converge in " + std::to_string(max_iter) +
                     " iterations on [" + format_number(a) + ", " + format_number(b) + "]");
  return 0.5 * (lo + hi);
}

}  // namespace sortie
