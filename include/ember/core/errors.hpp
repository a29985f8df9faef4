// Error kinds that decide Ember's exit codes (see DEVELOPERS.md):
//   InputError     -> exit 2: the user's input is wrong; the message names where and what was expected.
//   NumericalError -> exit 3: a solver failed; the message names the solver and the numbers.
//   OutputError    -> exit 4: results could not be written (disk full, no permission, I/O error):
//                     not the input's fault; the message names the folder or file.
// Anything else escaping to main is an internal error -> exit 1.
#pragma once

#include <stdexcept>
#include <string>

namespace ember {

inline constexpr int exit_ok = 0;
inline constexpr int exit_internal = 1;
inline constexpr int exit_bad_input = 2;
inline constexpr int exit_numerical = 3;
inline constexpr int exit_output = 4;

class InputError : public std::runtime_error {
 public:
  using std::runtime_error::runtime_error;
};

class OutputError : public std::runtime_error {
 public:
  using std::runtime_error::runtime_error;
};

class NumericalError : public std::runtime_error {
 public:
  NumericalError(std::string solver, const std::string& message)
      : std::runtime_error(solver + ": " + message), solver_(std::move(solver)) {}
  const std::string& solver() const { return solver_; }

 private:
  std::string solver_;
};

}  // namespace ember
