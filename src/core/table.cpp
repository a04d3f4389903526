#include "core/table.hpp"

#include <algorithm>
#include <cassert>

namespace sortie {

Table::Table(std::vector<double> x, std::vector<double> y) : x_(std::move(x)), y_(std::move(y)) {
  assert(!x_.empty() && x_.size() == y_.size());
  assert(std::is_sorted(x_.begin(), x_.end()));
}

std::size_t Table::segment(double x) const {
  // Index i of the segment [x_i, x_{i+1}] holding x; x_ has at least two points here.
  auto it = std::upper_bound(x_.begin() + 1, x_.end() - 1, x);
  return static_cast<std::size_t>(it - x_.begin()) - 1;
}

double Table::operator()(double x) const {
  if (x_.size() == 1 || x <= x_.front()) return y_.front();
  if (x >= x_.back()) return y_.back();
  const std::size_t i = segment(x);
  const double w = (x - x_[i]) / (x_[i + 1] - x_[i]);
  return y_[i] + w * (y_[i + 1] - y_[i]);
}

double Table::slope(double x) const {
  if (x_.size() == 1 || x < x_.front() || x > x_.back()) return 0.0;
  const std::size_t i = segment(x);
  return (y_[i + 1] - y_[i]) / (x_[i + 1] - x_[i]);
}

double Table::inverse(double y) const {
  assert(strictly_increasing_y());
  if (x_.size() == 1 || y <= y_.front()) return x_.front();
  if (y >= y_.back()) return x_.back();
  auto it = std::upper_bound(y_.begin() + 1, y_.end() - 1, y);
  const std::size_t i = static_cast<std::size_t>(it - y_.begin()) - 1;
  const double w = (y - y_[i]) / (y_[i + 1] - y_[i]);
  return x_[i] + w * (x_[i + 1] - x_[i]);
}

bool Table::strictly_increasing_y() const {
  for (std::size_t i = 1; i < y_.size(); ++i)
    if (!(y_[i] > y_[i - 1])) return false;
  return true;
}

Table Table::scaled(double k) const {
  Table t = *this;
  for (double& v : t.y_) v *= k;
  return t;
}

}  // namespace sortie
