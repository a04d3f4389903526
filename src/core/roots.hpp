#pragma once
/// Bracketed root finding (Boost.Math TOMS 748) with a bounded iteration count.
#include <cstdint>
#include <functional>
#include <optional>

namespace sortie {

/// Root of f on [a, b] where f(a) and f(b) differ in sign (or one is zero), located to an
/// absolute x tolerance `x_tol`. nullopt when the bracket holds no sign change or an end is
/// not finite; a (when a == b) for a bracket of no width.
/// Throws LimitError when `max_iter` evaluations do not reach the tolerance.
std::optional<double> find_root(const std::function<double(double)>& f, double a, double b,
                                double x_tol, std::uintmax_t max_iter = 200);

/// As find_root, with f(a) and f(b) already known (saves two evaluations).
std::optional<double> find_root(const std::function<double(double)>& f, double a, double b,
                                double fa, double fb, double x_tol, std::uintmax_t max_iter = 200);

}  // namespace sortie
