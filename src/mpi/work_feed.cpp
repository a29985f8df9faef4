#include "work_feed.hpp"

namespace ember::mpi {

void WorkFeed::push(std::size_t index) {
  {
    const std::lock_guard<std::mutex> lock(mutex_);
    queue_.push_back(index);
  }
  ready_.notify_one();
}

void WorkFeed::close() {
  {
    const std::lock_guard<std::mutex> lock(mutex_);
    closed_ = true;
  }
  ready_.notify_all();
}

std::optional<std::size_t> WorkFeed::pop() {
  std::unique_lock<std::mutex> lock(mutex_);
  ++waiting_;
  ready_.wait(lock, [&] { return !queue_.empty() || closed_; });
  --waiting_;
  if (queue_.empty()) return std::nullopt;
  const std::size_t i = queue_.front();
  queue_.pop_front();
  return i;
}

std::size_t WorkFeed::idle() const {
  const std::lock_guard<std::mutex> lock(mutex_);
  return waiting_ > queue_.size() ? waiting_ - queue_.size() : 0;
}

void WorkFeed::finished(std::size_t index, std::string text) {
  const std::lock_guard<std::mutex> lock(mutex_);
  results_.emplace_back(index, std::move(text));
}

std::optional<std::pair<std::size_t, std::string>> WorkFeed::take_result() {
  const std::lock_guard<std::mutex> lock(mutex_);
  if (results_.empty()) return std::nullopt;
  auto r = std::move(results_.front());
  results_.pop_front();
  return r;
}

void WorkFeed::fail(int exit_code, std::string message) {
  const std::lock_guard<std::mutex> lock(mutex_);
  if (!failure_) failure_ = std::pair{exit_code, std::move(message)};
}

std::optional<std::pair<int, std::string>> WorkFeed::failure() const {
  const std::lock_guard<std::mutex> lock(mutex_);
  return failure_;
}

}  // namespace ember::mpi
