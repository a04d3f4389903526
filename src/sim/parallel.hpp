#pragma once
/// Run f(0) … f(n − 1) on a pool of threads that take the next index from a shared counter.
/// Each call writes only its own slot of the caller's output, so the results do not depend on
/// the number of threads or on which thread ran which index.
#include <cstddef>
#include <functional>

namespace sortie::sim {

/// `threads` 0: one per core. `progress(done, n)` is called after each index, from the
/// thread that finished it, one call at a time. An exception thrown by f is kept; after every
/// thread has stopped, the one of the lowest index is rethrown (the same error for any thread
/// count); indices not yet started are then skipped.
void for_each_index(std::size_t n, unsigned threads, const std::function<void(std::size_t)>& f,
                    const std::function<void(std::size_t, std::size_t)>& progress = {});

/// The thread count for `requested` (0: std::thread::hardware_concurrency, at least 1).
unsigned thread_count(unsigned requested);

}  // namespace sortie::sim
