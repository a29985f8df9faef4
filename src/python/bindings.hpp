// The Python module `ember` (pybind11): the computations themselves, not a wrapper around the
// binary. One file per area, each adding its functions to the module.
//
// Units at this boundary: masses in g, times in s, energies in GeV as plain numbers; a string
// is read as a quantity with its unit ("1e15 g", "13.787 Gyr"), as on the command line.
#pragma once

#include <pybind11/numpy.h>
#include <pybind11/pybind11.h>
#include <pybind11/stl.h>

#include <string>
#include <vector>

#include "ember/units/quantity.hpp"

namespace ember::python {

namespace py = pybind11;

void add_errors(py::module_& m);
void add_greybody(py::module_& m);
void add_evaporation(py::module_& m);
void add_higgs(py::module_& m);
void add_bounce(py::module_& m);
void add_run(py::module_& m);

// A number in `unit` (internal value unit_value), or a string with its own unit; InputError
// naming `name` otherwise.
double quantity(py::handle value, const std::string& name, units::Kind kind, double unit_value);

// A scalar or a sequence/array of numbers as doubles, and whether it was a scalar.
struct Numbers {
  std::vector<double> values;
  bool scalar = true;
};
Numbers numbers(py::handle value, const std::string& name);

// Back to Python: a float for a scalar input, else a 1-d numpy array.
py::object shaped(const std::vector<double>& values, bool scalar);
py::array_t<double> array(const std::vector<double>& values);
// A numpy masked array: missing values are masked, never NaN.
py::object masked(const std::vector<double>& values, const std::vector<bool>& present);

// Python's json.loads of a JSON text: results as plain dicts, lists and numbers.
py::object from_json_text(const std::string& text);

}  // namespace ember::python
