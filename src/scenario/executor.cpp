#include "ember/scenario/executor.hpp"

#include <mutex>

#include "ember/core/parallel.hpp"

namespace ember::scenario {

void ThreadExecutor::run(const std::vector<std::size_t>& pending, const UnitWork& work, const UnitDone& done) const {
  std::mutex mutex;
  parallel_for(pending.size(), threads_, [&](std::size_t i) {
    const std::string text = work(pending[i]);
    const std::lock_guard<std::mutex> lock(mutex);
    done(pending[i], text);
  });
}

}  // namespace ember::scenario
