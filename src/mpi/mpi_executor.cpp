#include "mpi_executor.hpp"

#include <fmt/format.h>
#include <unistd.h>

#include <algorithm>
#include <chrono>
#include <cstring>
#include <deque>
#include <thread>

#include "ember/core/errors.hpp"
#include "work_feed.hpp"

namespace ember::mpi {

namespace {

enum Tag : int { request = 1, assignment = 2, result = 3 };

// Ranks other than 0 stop with rank 0's exit code when it failed before the units.
struct Cancelled : std::runtime_error {
  explicit Cancelled(int c) : std::runtime_error("cancelled by rank 0"), code(c) {}
  int code;
};

void nap() {
  std::this_thread::sleep_for(std::chrono::microseconds(200));  // idle polling, not a busy spin
}

}  // namespace

MpiExecutor::MpiExecutor(MPI_Comm comm, int threads, int error_fd)
    : comm_(comm), threads_(std::max(1, threads)), error_fd_(error_fd) {
  MPI_Comm_rank(comm_, &rank_);
  MPI_Comm_size(comm_, &size_);
}

int MpiExecutor::start(int code) const {
  if (started_) return root_code_;
  started_ = true;
  MPI_Bcast(&code, 1, MPI_INT, 0, comm_);
  root_code_ = code;
  return code;
}

std::vector<std::string> MpiExecutor::share(std::vector<std::string> texts) const {
  unsigned long long n = texts.size();
  MPI_Bcast(&n, 1, MPI_UNSIGNED_LONG_LONG, 0, comm_);
  std::vector<unsigned long long> sizes(n);
  std::string all;
  if (rank_ == 0)
    for (std::size_t i = 0; i < n; ++i) {
      sizes[i] = texts[i].size();
      all += texts[i];
    }
  MPI_Bcast(sizes.data(), static_cast<int>(n), MPI_UNSIGNED_LONG_LONG, 0, comm_);
  unsigned long long total = 0;
  for (const auto z : sizes) total += z;
  all.resize(total);
  // In pieces that fit MPI's int count.
  for (unsigned long long at = 0; at < total; at += 1ULL << 30) {
    const int piece = static_cast<int>(std::min<unsigned long long>(1ULL << 30, total - at));
    MPI_Bcast(all.data() + at, piece, MPI_CHAR, 0, comm_);
  }
  if (rank_ != 0) {
    texts.assign(n, std::string());
    unsigned long long at = 0;
    for (std::size_t i = 0; i < n; ++i) {
      texts[i] = all.substr(at, sizes[i]);
      at += sizes[i];
    }
  }
  return texts;
}

void MpiExecutor::abort_with(int code, const std::string& message) const {
  const std::string line = fmt::format("ember (MPI rank {} of {}): {}\n", rank_, size_, message);
  [[maybe_unused]] const auto written = ::write(error_fd_, line.data(), line.size());
  MPI_Abort(comm_, code);
  std::abort();  // not reached
}

void MpiExecutor::run(const std::vector<std::size_t>& pending, const pipeline::ItemWork& work,
                      const pipeline::ItemDone& done) const {
  if (const int code = start(0); code != 0) {
    cancelled_ = code;
    throw Cancelled(code);
  }
  WorkFeed feed;
  std::vector<std::thread> workers;
  for (int t = 0; t < threads_; ++t)
    workers.emplace_back([&] {
      while (const auto i = feed.pop()) {
        try {
          feed.finished(*i, work(*i));
        } catch (const InputError& e) {
          feed.fail(exit_bad_input, e.what());
        } catch (const NumericalError& e) {
          feed.fail(exit_numerical, std::string("numerical failure in ") + e.what());
        } catch (const OutputError& e) {
          feed.fail(exit_output, e.what());
        } catch (const std::exception& e) {
          feed.fail(exit_internal, std::string("internal error: ") + e.what());
        }
      }
    });
  if (rank_ == 0)
    coordinate(pending, done, feed);
  else
    serve(feed);
  feed.close();
  for (auto& w : workers) w.join();
}

// Rank 0: the queue of units, local threads fed first-come, remote ranks served on request.
void MpiExecutor::coordinate(const std::vector<std::size_t>& pending, const pipeline::ItemDone& done,
                             WorkFeed& feed) const {
  std::deque<std::size_t> queue(pending.begin(), pending.end());
  std::size_t received = 0;
  int active = size_ - 1;  // remote ranks not yet told to stop
  while (received < pending.size() || active > 0) {
    bool busy = false;
    if (const auto f = feed.failure()) abort_with(f->first, f->second);
    for (std::size_t idle = feed.idle(); idle > 0 && !queue.empty(); --idle) {
      feed.push(queue.front());
      queue.pop_front();
      busy = true;
    }
    int flag = 0;
    MPI_Status status;
    MPI_Iprobe(MPI_ANY_SOURCE, MPI_ANY_TAG, comm_, &flag, &status);
    if (flag) {
      busy = true;
      if (status.MPI_TAG == request) {
        int want = 0;
        MPI_Recv(&want, 1, MPI_INT, status.MPI_SOURCE, request, comm_, MPI_STATUS_IGNORE);
        std::vector<unsigned long long> give;
        while (static_cast<int>(give.size()) < want && !queue.empty()) {
          give.push_back(queue.front());
          queue.pop_front();
        }
        if (give.empty()) --active;  // an empty assignment means: stop asking
        MPI_Send(give.data(), static_cast<int>(give.size()), MPI_UNSIGNED_LONG_LONG, status.MPI_SOURCE, assignment,
                 comm_);
      } else if (status.MPI_TAG == result) {
        int bytes = 0;
        MPI_Get_count(&status, MPI_CHAR, &bytes);
        std::string message(static_cast<std::size_t>(bytes), '\0');
        MPI_Recv(message.data(), bytes, MPI_CHAR, status.MPI_SOURCE, result, comm_, MPI_STATUS_IGNORE);
        const std::size_t cut = message.find('\n');
        const int code = std::atoi(message.substr(0, cut).c_str());
        if (code != 0) abort_with(code, message.substr(cut + 1));  // a remote unit failed
        const std::size_t cut2 = message.find('\n', cut + 1);
        done(std::stoull(message.substr(cut + 1, cut2 - cut - 1)), message.substr(cut2 + 1));
        ++received;
      }
    }
    while (auto r = feed.take_result()) {
      done(r->first, r->second);
      ++received;
      busy = true;
    }
    if (!busy) nap();
  }
}

// Other ranks: ask for as many units as there are idle threads, send back each result.
void MpiExecutor::serve(WorkFeed& feed) const {
  bool asked = false, stopped = false;
  long in_flight = 0;
  while (!stopped || in_flight > 0) {
    bool busy = false;
    if (const auto f = feed.failure()) {
      const std::string message = fmt::format("{}\n{}", f->first, f->second);
      MPI_Send(message.data(), static_cast<int>(message.size()), MPI_CHAR, 0, result, comm_);
      abort_with(f->first, f->second);
    }
    if (!stopped && !asked) {
      if (const int idle = static_cast<int>(feed.idle()); idle > 0) {
        MPI_Send(&idle, 1, MPI_INT, 0, request, comm_);
        asked = busy = true;
      }
    }
    int flag = 0;
    MPI_Status status;
    if (asked) MPI_Iprobe(0, assignment, comm_, &flag, &status);
    if (flag) {
      int count = 0;
      MPI_Get_count(&status, MPI_UNSIGNED_LONG_LONG, &count);
      std::vector<unsigned long long> got(static_cast<std::size_t>(count));
      MPI_Recv(got.data(), count, MPI_UNSIGNED_LONG_LONG, 0, assignment, comm_, MPI_STATUS_IGNORE);
      asked = false;
      busy = true;
      if (got.empty()) stopped = true;
      for (const auto i : got) feed.push(static_cast<std::size_t>(i));
      in_flight += count;
    }
    while (auto r = feed.take_result()) {
      const std::string message = fmt::format("0\n{}\n{}", r->first, r->second);
      MPI_Send(message.data(), static_cast<int>(message.size()), MPI_CHAR, 0, result, comm_);
      --in_flight;
      busy = true;
    }
    if (!busy) nap();
  }
}

}  // namespace ember::mpi
