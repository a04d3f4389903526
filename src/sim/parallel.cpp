#include "sim/parallel.hpp"

#include <algorithm>
#include <atomic>
#include <exception>
#include <mutex>
#include <thread>
#include <vector>

namespace sortie::sim {

unsigned thread_count(unsigned requested) {
  if (requested > 0) return requested;
  return std::max(1u, std::thread::hardware_concurrency());
}

void for_each_index(std::size_t n, unsigned threads, const std::function<void(std::size_t)>& f,
                    const std::function<void(std::size_t, std::size_t)>& progress) {
  const unsigned t = static_cast<unsigned>(std::min<std::size_t>(thread_count(threads), std::max<std::size_t>(n, 1)));
  std::atomic<std::size_t> next{0};
  std::atomic<bool> failed{false};
  std::vector<std::exception_ptr> errors(n);
  std::mutex progress_mutex;
  std::size_t done = 0;
  auto work = [&] {
    for (;;) {
      const std::size_t i = next.fetch_add(1);
      if (i >= n || failed.load()) return;
      try {
        f(i);
      } catch (...) {
        errors[i] = std::current_exception();
        failed = true;
      }
      if (progress) {
        std::lock_guard<std::mutex> lock(progress_mutex);
        progress(++done, n);
      }
    }
  };
  if (t <= 1) {
    work();
  } else {
    std::vector<std::thread> pool;
    for (unsigned k = 0; k < t; ++k) pool.emplace_back(work);
    for (auto& th : pool) th.join();
  }
  for (const auto& e : errors)
    if (e) std::rethrow_exception(e);
}

}  // namespace sortie::sim
