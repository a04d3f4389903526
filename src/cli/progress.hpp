#pragma once
/// Progress of a long run on standard error — points done, rate, time left — only when
/// standard error is a terminal; silent otherwise (a pipe or a log file gets nothing).
#include <chrono>
#include <cstddef>
#include <string>

namespace sortie::cli {

class Progress {
 public:
  /// `what`: the unit counted ("points", "samples").
  explicit Progress(std::string what);
  /// Called after each item (one call at a time); redraws at most ten times a second.
  void operator()(std::size_t done, std::size_t total);

 private:
  std::string what_;
  bool tty_;
  std::chrono::steady_clock::time_point start_, last_;
};

}  // namespace sortie::cli
