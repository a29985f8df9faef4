// Running independent pieces of work on several threads, with results that do not depend on
// the thread count: work item i writes only its own result slot, and items are pure functions of
// their index.
#pragma once

#include <cstddef>
#include <functional>

namespace ember {

// The number of threads to use by default: the cores available (at least 1).
int default_threads();

// Calls work(i) for every i in [0, count) on up to `threads` threads. If any calls throw, the
// exception of the lowest index is rethrown after all have finished.
void parallel_for(std::size_t count, int threads, const std::function<void(std::size_t)>& work);

}  // namespace ember
