// The thread side of the MPI executor: worker threads take unit indices from a feed and put
// finished texts in an outbox; only the main thread talks MPI (MPI_THREAD_FUNNELED).
#pragma once

#include <condition_variable>
#include <cstddef>
#include <deque>
#include <mutex>
#include <optional>
#include <string>
#include <utility>

namespace ember::mpi {

class WorkFeed {
 public:
  void push(std::size_t index);
  void close();                      // no more indices: waiting workers return none
  std::optional<std::size_t> pop();  // blocks until an index or close()
  std::size_t idle() const;          // workers waiting, less indices already queued for them
  void finished(std::size_t index, std::string text);
  std::optional<std::pair<std::size_t, std::string>> take_result();
  void fail(int exit_code, std::string message);  // the first failure wins
  std::optional<std::pair<int, std::string>> failure() const;

 private:
  mutable std::mutex mutex_;
  std::condition_variable ready_;
  std::deque<std::size_t> queue_;
  std::deque<std::pair<std::size_t, std::string>> results_;
  std::size_t waiting_ = 0;
  bool closed_ = false;
  std::optional<std::pair<int, std::string>> failure_;
};

}  // namespace ember::mpi
