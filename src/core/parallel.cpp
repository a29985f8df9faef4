#include "ember/core/parallel.hpp"

#include <algorithm>
#include <atomic>
#include <exception>
#include <thread>
#include <vector>

namespace ember {

int default_threads() {
  return std::max(1u, std::thread::hardware_concurrency());
}

void parallel_for(std::size_t count, int threads, const std::function<void(std::size_t)>& work) {
  std::vector<std::exception_ptr> errors(count);
  std::atomic<std::size_t> next{0};
  const auto worker = [&] {
    for (std::size_t i = next++; i < count; i = next++) {
      try {
        work(i);
      } catch (...) {
        errors[i] = std::current_exception();
      }
    }
  };
  const std::size_t n = std::min<std::size_t>(count, static_cast<std::size_t>(std::max(1, threads)));
  if (n <= 1) {
    worker();
  } else {
    std::vector<std::thread> pool;
    for (std::size_t t = 0; t < n; ++t) pool.emplace_back(worker);
    for (auto& t : pool) t.join();
  }
  for (const auto& e : errors)
    if (e) std::rethrow_exception(e);
}

}  // namespace ember
