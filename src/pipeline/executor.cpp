#include "ember/pipeline/executor.hpp"

#include <mutex>

#include "ember/core/parallel.hpp"

namespace ember::pipeline {

void ThreadExecutor::run(const std::vector<std::size_t>& pending, const ItemWork& work, const ItemDone& done) const {
  std::mutex mutex;
  parallel_for(pending.size(), threads_, [&](std::size_t i) {
    const std::string text = work(pending[i]);
    const std::lock_guard<std::mutex> lock(mutex);
    done(pending[i], text);
  });
}

}  // namespace ember::pipeline
