#pragma once
/// A load over time as given (a load file): plain data; sim::discharge runs a pack under it.
#include <vector>

namespace sortie::plan {

/// A load over time from a file: current or power at given times, held (step) or linear.
struct LoadSeries {
  enum class Quantity { current, power };
  Quantity quantity = Quantity::current;
  bool step = false;              ///< true: each value holds until the next time
  std::vector<double> time_s;     ///< strictly increasing
  std::vector<double> value;      ///< A or W
};

}  // namespace sortie::plan
