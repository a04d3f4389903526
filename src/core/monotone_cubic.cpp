#include "core/monotone_cubic.hpp"

#include <algorithm>
#include <cassert>
#include <cmath>

namespace sortie {

namespace {

bool same_sign(double a, double b) { return (a > 0.0 && b > 0.0) || (a < 0.0 && b < 0.0); }

// Three-point end slope, kept shape-preserving (Moler 2004, §3.4, pchipend):
//   m = ((2·h0 + h1)·δ0 − h0·δ1)/(h0 + h1); 0 if its sign differs from δ0; 3·δ0 at most where
//   the data turn (δ0 and δ1 of different signs).
double end_slope(double h0, double h1, double d0, double d1) {
  double m = ((2.0 * h0 + h1) * d0 - h0 * d1) / (h0 + h1);
  if (!same_sign(m, d0)) m = 0.0;
  else if (!same_sign(d0, d1) && std::fabs(m) > std::fabs(3.0 * d0)) m = 3.0 * d0;
  return m;
}

}  // namespace

MonotoneCubic::MonotoneCubic(std::vector<double> x, std::vector<double> y)
    : x_(std::move(x)), y_(std::move(y)), m_(x_.size(), 0.0) {
  const std::size_t n = x_.size();
  assert(n >= 2 && y_.size() == n);
  std::vector<double> h(n - 1), d(n - 1);  // interval widths and secant slopes δ
  for (std::size_t k = 0; k + 1 < n; ++k) {
    h[k] = x_[k + 1] - x_[k];
    assert(h[k] > 0.0);
    d[k] = (y_[k + 1] - y_[k]) / h[k];
  }
  if (n == 2) {
    m_[0] = m_[1] = d[0];
    return;
  }
  // Interior: 0 where the data turn or stay flat, else the weighted harmonic mean
  //   (w1 + w2)/m_k = w1/δ_{k−1} + w2/δ_k,  w1 = 2·h_k + h_{k−1},  w2 = h_k + 2·h_{k−1}.
  for (std::size_t k = 1; k + 1 < n; ++k) {
    if (!same_sign(d[k - 1], d[k])) continue;
    const double w1 = 2.0 * h[k] + h[k - 1], w2 = h[k] + 2.0 * h[k - 1];
    m_[k] = (w1 + w2) / (w1 / d[k - 1] + w2 / d[k]);
  }
  m_[0] = end_slope(h[0], h[1], d[0], d[1]);
  m_[n - 1] = end_slope(h[n - 2], h[n - 3], d[n - 2], d[n - 3]);
}

double MonotoneCubic::operator()(double x) const {
  if (x <= x_.front()) return y_.front() + m_.front() * (x - x_.front());
  if (x >= x_.back()) return y_.back() + m_.back() * (x - x_.back());
  const auto it = std::upper_bound(x_.begin() + 1, x_.end() - 1, x);
  const std::size_t k = static_cast<std::size_t>(it - x_.begin()) - 1;
  const double h = x_[k + 1] - x_[k], t = (x - x_[k]) / h;
  // Cubic Hermite basis: y = h00·y_k + h10·h·m_k + h01·y_{k+1} + h11·h·m_{k+1}
  const double h00 = (1.0 + 2.0 * t) * (1.0 - t) * (1.0 - t), h10 = t * (1.0 - t) * (1.0 - t);
  const double h01 = t * t * (3.0 - 2.0 * t), h11 = t * t * (t - 1.0);
  return h00 * y_[k] + h10 * h * m_[k] + h01 * y_[k + 1] + h11 * h * m_[k + 1];
}

double MonotoneCubic::slope(double x) const {
  if (x <= x_.front()) return m_.front();
  if (x >= x_.back()) return m_.back();
  const auto it = std::upper_bound(x_.begin() + 1, x_.end() - 1, x);
  const std::size_t k = static_cast<std::size_t>(it - x_.begin()) - 1;
  const double h = x_[k + 1] - x_[k], t = (x - x_[k]) / h;
  // Derivatives of the Hermite basis with respect to x (d/dt divided by h).
  const double d00 = 6.0 * t * (t - 1.0) / h, d10 = (1.0 - t) * (1.0 - 3.0 * t);
  const double d01 = -d00, d11 = t * (3.0 * t - 2.0);
  return d00 * y_[k] + d10 * m_[k] + d01 * y_[k + 1] + d11 * m_[k + 1];
}

}  // namespace sortie
