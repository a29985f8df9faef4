// Who computes the main job's units: threads on this machine (ThreadExecutor), or MPI ranks
// with threads each (the optional ember_mpi library, src/mpi/). Work items are pure functions of
// their index returning exact text (ItemResult), so any executor assembles the same numbers.
#pragma once

#include <cstddef>
#include <functional>
#include <string>
#include <vector>

namespace ember::pipeline {

using ItemWork = std::function<std::string(std::size_t)>;
using ItemDone = std::function<void(std::size_t, const std::string&)>;

class Executor {
 public:
  virtual ~Executor() = default;
  // Computes work(i) for every i in `pending`. On the assembling process done(i, text) is called
  // once per item, never two at a time; if any item throws, the lowest index's error is rethrown.
  // Only the assembling process's `pending` decides the work (MPI: rank 0 hands items out).
  virtual void run(const std::vector<std::size_t>& pending, const ItemWork& work, const ItemDone& done) const = 0;
  // Gives every process the assembling process's texts (MPI: a broadcast from rank 0); called by
  // every process at the same point.
  virtual std::vector<std::string> share(std::vector<std::string> texts) const { return texts; }
  // Whether this process assembles the results and writes the outputs (MPI: rank 0 only).
  virtual bool assembles() const { return true; }
};

class ThreadExecutor final : public Executor {
 public:
  explicit ThreadExecutor(int threads) : threads_(threads) {}
  void run(const std::vector<std::size_t>& pending, const ItemWork& work, const ItemDone& done) const override;

 private:
  int threads_;
};

}  // namespace ember::pipeline
