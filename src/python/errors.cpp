// Ember's error kinds as Python exceptions, with the same located messages as the command line:
// InputError (ScenarioError) for bad input (exit 2 there), NumericalError for a failed solve
// (exit 3), OutputError when results cannot be written (exit 4).
#include "ember/core/errors.hpp"

#include "bindings.hpp"
#include "ember/scenario/resolve.hpp"

namespace ember::python {

void add_errors(py::module_& m) {
  // pybind11 tries the translators last registered first: the derived ScenarioError after its base.
  const auto input = py::register_exception<InputError>(m, "InputError", PyExc_ValueError);
  input.doc() = "Bad input: the message names the file, line, key and what was expected.";
  py::register_exception<NumericalError>(m, "NumericalError", PyExc_RuntimeError).doc() =
      "A solver failed: the message names the solver and the numbers.";
  py::register_exception<OutputError>(m, "OutputError", PyExc_OSError).doc() =
      "Results could not be written (disk full, read-only, no permission).";
  py::register_exception<scenario::ScenarioError>(m, "ScenarioError", input.ptr()).doc() =
      "A scenario with problems: every one, each with its line and key.";
}

}  // namespace ember::python
