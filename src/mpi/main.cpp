// ember-mpi: the ember command line with `run` spread over MPI ranks (mpirun -np K ember-mpi run
// SCENARIO.yaml). Rank 0 prints and writes exactly what a serial `ember run` would; the other ranks
// compute units and stay silent, except to report their own failure.
#include <fcntl.h>
#include <mpi.h>
#include <unistd.h>

#include <cstdio>
#include <memory>

#include "../cli/command.hpp"
#include "mpi_executor.hpp"

namespace {

// Ranks other than 0 print nothing (every rank parses the same input and would say the same);
// their own fatal errors still reach the terminal through a saved descriptor.
int silence_output() {
  std::fflush(stdout);
  std::fflush(stderr);
  const int saved = ::dup(2);
  const int null = ::open("/dev/null", O_WRONLY);
  if (null >= 0) {
    ::dup2(null, 1);
    ::dup2(null, 2);
    ::close(null);
  }
  return saved >= 0 ? saved : 2;
}

}  // namespace

int main(int argc, char** argv) {
  int provided = 0;
  MPI_Init_thread(&argc, &argv, MPI_THREAD_FUNNELED, &provided);
  int rank = 0;
  MPI_Comm_rank(MPI_COMM_WORLD, &rank);
  const int error_fd = rank == 0 ? 2 : silence_output();
  std::shared_ptr<ember::mpi::MpiExecutor> executor;
  const ember::cli::ExecutorFactory factory = [&](int threads) -> std::unique_ptr<ember::pipeline::Executor> {
    executor = std::make_shared<ember::mpi::MpiExecutor>(MPI_COMM_WORLD, threads, error_fd);
    struct Shared final : ember::pipeline::Executor {  // ember run owns this; the executor outlives it
      std::shared_ptr<ember::mpi::MpiExecutor> e;
      void run(const std::vector<std::size_t>& p, const ember::pipeline::ItemWork& w,
               const ember::pipeline::ItemDone& d) const override {
        e->run(p, w, d);
      }
      std::vector<std::string> share(std::vector<std::string> texts) const override {
        return e->share(std::move(texts));
      }
      bool assembles() const override { return e->assembles(); }
    };
    auto s = std::make_unique<Shared>();
    s->e = executor;
    return s;
  };
  int code = ember::cli::run(argc, argv, factory);
  // Every rank joins the start broadcast once; one that never reached the units joins it here.
  const ember::mpi::MpiExecutor fallback(MPI_COMM_WORLD, 1, error_fd);
  const ember::mpi::MpiExecutor& e = executor ? *executor : fallback;
  const int root = e.start(code);
  if (rank != 0) {
    if (e.cancelled()) code = *e.cancelled();
    if (code != 0 && root == 0) MPI_Abort(MPI_COMM_WORLD, code);  // rank 0 went on without us
  }
  MPI_Finalize();
  return code;
}
