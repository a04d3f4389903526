#pragma once
/// Shape-preserving piecewise cubic Hermite interpolation (PCHIP): through every point, with
/// slopes chosen so that monotone data give a monotone curve with no overshoot (F. N. Fritsch and
/// R. E. Carlson, "Monotone Piecewise Cubic Interpolation", SIAM J. Numer. Anal. 17, 1980;
/// slopes by the weighted harmonic mean of F. N. Fritsch and J. Butland, SIAM J. Sci. Stat.
/// Comput. 5, 1984, with the three-point end rule, as in C. Moler, Numerical Computing with
/// MATLAB, 2004, §3.4). For measured curves that must not wiggle between their points.
#include <vector>

namespace sortie {

class MonotoneCubic {
 public:
  /// y = 0 everywhere (so that structs holding one can be default-constructed).
  MonotoneCubic() : MonotoneCubic({0.0, 1.0}, {0.0, 0.0}) {}
  /// x strictly increasing, the same length as y, at least two points (checked with assert;
  /// loaders validate first). Two points give a straight line.
  MonotoneCubic(std::vector<double> x, std::vector<double> y);

  /// The interpolant; beyond the ends, the straight line of the end slope.
  double operator()(double x) const;
  /// dy/dx at x (the end slope beyond the ends).
  double slope(double x) const;

  const std::vector<double>& x() const { return x_; }
  const std::vector<double>& y() const { return y_; }

 private:
  std::vector<double> x_, y_, m_;  // m_: slope at each point
};

}  // namespace sortie
