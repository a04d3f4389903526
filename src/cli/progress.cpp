#include "cli/progress.hpp"

#include <unistd.h>

#include <cstdio>

namespace sortie::cli {

Progress::Progress(std::string what)
    : what_(std::move(what)), tty_(::isatty(2) != 0), start_(std::chrono::steady_clock::now()), last_(start_) {}

void Progress::operator()(std::size_t done, std::size_t total) {
  if (!tty_ || total < 2) return;
  const auto now = std::chrono::steady_clock::now();
  if (done < total && now - last_ < std::chrono::milliseconds(100)) return;
  last_ = now;
  const double elapsed = std::chrono::duration<double>(now - start_).count();
  const double rate = elapsed > 0 ? static_cast<double>(done) / elapsed : 0.0;
  const double left = rate > 0 ? static_cast<double>(total - done) / rate : 0.0;
  std::fprintf(stderr, "\r  %zu/%zu %s, %.1f/s, %.0f s left   ", done, total, what_.c_str(), rate, left);
  if (done == total) std::fprintf(stderr, "\r%60s\r", "");
  std::fflush(stderr);
}

}  // namespace sortie::cli
