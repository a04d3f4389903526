#pragma once
/// A piecewise-linear table y(x) over strictly increasing x, held flat beyond its ends.
/// A table of one point is a constant, so a number and a table share one type.
#include <cstddef>
#include <vector>

namespace sortie {

class Table {
 public:
  Table() = default;
  /// A constant y for every x.
  explicit Table(double constant) : x_{0.0}, y_{constant} {}
  /// x strictly increasing, same length as y, at least one point (checked with assert;
  /// loaders validate first and name the field).
  Table(std::vector<double> x, std::vector<double> y);

  /// Linear interpolation; y held at the end values outside [x.front(), x.back()].
  double operator()(double x) const;
  /// The x where this table, which must be strictly increasing in y, takes the value y.
  /// y outside [y.front(), y.back()] is clamped to the end x.
  double inverse(double y) const;
  /// dy/dx of the segment holding x (0 outside the table or for a constant).
  double slope(double x) const;

  bool is_constant() const { return x_.size() == 1; }
  bool strictly_increasing_y() const;
  const std::vector<double>& x() const { return x_; }
  const std::vector<double>& y() const { return y_; }
  std::size_t size() const { return x_.size(); }
  /// The table with every y multiplied by k.
  Table scaled(double k) const;

 private:
  std::size_t segment(double x) const;
  std::vector<double> x_{0.0};
  std::vector<double> y_{0.0};
};

}  // namespace sortie
