// Errors become exit codes in one place (include/ember/cli/guarded.hpp); the command-line test
// (tests/cli/test_cli.sh) checks 2 and 3 from real commands, and this checks the whole mapping,
// including 1 for an internal error, which no correct input can reach.
#include <doctest/doctest.h>

#include <stdexcept>

#include "ember/cli/guarded.hpp"
#include "ember/core/errors.hpp"

using ember::cli::run_guarded;

TEST_CASE("exceptions map to the documented exit codes (DEVELOPERS.md)") {
  CHECK(run_guarded([] { return 0; }) == ember::exit_ok);
  CHECK(run_guarded([]() -> int { throw ember::InputError("a.yaml:3: bad; expected good"); }) == 2);
  CHECK(run_guarded([]() -> int { throw ember::NumericalError("a solver", "did not converge: 1e-3 > 1e-8"); }) == 3);
  CHECK(run_guarded([]() -> int { throw ember::OutputError("out/: cannot write the results: disk full"); }) == 4);
  CHECK(run_guarded([]() -> int { throw std::logic_error("a bug"); }) == 1);
  CHECK(run_guarded([]() -> int { throw std::bad_alloc(); }) == 1);
}
