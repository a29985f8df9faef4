// The main job's units spread over MPI ranks, with threads on each rank. Rank 0 hands out unit
// indices on request (dynamic load balancing: B(M) tables differ in cost by orders of magnitude),
// computes with its own threads too, and receives every finished unit's text; it alone
// assembles and writes the outputs, which are the serial run's bytes (units are exact text).
//
// Before the first unit every rank joins one broadcast from rank 0 (start): if rank 0 failed
// before reaching the units (a bad scenario, a foreign checkpoint), the others learn its exit
// code from it instead of waiting for work that never comes.
#pragma once

#include <mpi.h>

#include <optional>
#include <string>

#include "ember/pipeline/executor.hpp"

namespace ember::mpi {

class MpiExecutor final : public pipeline::Executor {
 public:
  MpiExecutor(MPI_Comm comm, int threads, int error_fd);
  void run(const std::vector<std::size_t>& pending, const pipeline::ItemWork& work,
           const pipeline::ItemDone& done) const override;
  // Rank 0's texts to every rank (three broadcasts: the count, the sizes, the bytes).
  std::vector<std::string> share(std::vector<std::string> texts) const override;
  bool assembles() const override { return rank_ == 0; }
  int rank() const { return rank_; }
  int size() const { return size_; }
  // The start broadcast, for a rank that returns before run(): rank 0 passes its exit code.
  // Returns rank 0's code. Idempotent: a rank joins the broadcast once.
  int start(int code) const;
  // Set on a rank other than 0 when rank 0 cancelled the job: its exit code.
  std::optional<int> cancelled() const { return cancelled_; }

 private:
  void coordinate(const std::vector<std::size_t>& pending, const pipeline::ItemDone& done, class WorkFeed& feed) const;
  void serve(class WorkFeed& feed) const;
  [[noreturn]] void abort_with(int code, const std::string& message) const;
  MPI_Comm comm_;
  int rank_ = 0, size_ = 1, threads_ = 1, error_fd_ = 2;
  mutable bool started_ = false;
  mutable int root_code_ = 0;
  mutable std::optional<int> cancelled_;
};

}  // namespace ember::mpi
