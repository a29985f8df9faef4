// Conversions at the Python boundary: quantities, numbers and arrays, JSON.
#include <fmt/format.h>

#include <cmath>

#include "bindings.hpp"
#include "ember/core/errors.hpp"

namespace ember::python {

double quantity(py::handle value, const std::string& name, units::Kind kind, double unit_value) {
  if (py::isinstance<py::str>(value)) {
    const std::string text = value.cast<std::string>();
    try {
      return units::parse_quantity(text, kind).value;
    } catch (const units::QuantityError& e) {
      throw InputError(fmt::format("{} \"{}\": {}", name, text, e.what()));
    }
  }
  if (py::isinstance<py::bool_>(value) || !(py::isinstance<py::float_>(value) || py::isinstance<py::int_>(value)))
    throw InputError(fmt::format("{}: {} given; expected {} as a number or a string with its unit", name,
                                 std::string(py::str(py::type::of(value).attr("__name__"))), units::describe(kind)));
  const double x = value.cast<double>();
  if (!std::isfinite(x) || !(x > 0)) throw InputError(fmt::format("{} {}: expected a finite number > 0", name, x));
  return x * unit_value;
}

Numbers numbers(py::handle value, const std::string& name) {
  Numbers out;
  if (py::isinstance<py::float_>(value) || py::isinstance<py::int_>(value)) {
    out.values.push_back(value.cast<double>());
  } else {
    try {
      const auto a = py::array_t<double, py::array::c_style | py::array::forcecast>::ensure(value);
      if (!a || a.ndim() > 1) throw py::cast_error();
      out.scalar = a.ndim() == 0;
      out.values.assign(a.data(), a.data() + a.size());
    } catch (const py::error_already_set&) {
      throw InputError(fmt::format("{}: expected a number or a 1-d sequence of numbers", name));
    } catch (const py::cast_error&) {
      throw InputError(fmt::format("{}: expected a number or a 1-d sequence of numbers", name));
    }
  }
  for (const double x : out.values)
    if (!std::isfinite(x)) throw InputError(fmt::format("{}: {} is not finite; expected finite numbers", name, x));
  return out;
}

py::array_t<double> array(const std::vector<double>& values) {
  py::array_t<double> a(static_cast<py::ssize_t>(values.size()));
  std::copy(values.begin(), values.end(), a.mutable_data());
  return a;
}

py::object shaped(const std::vector<double>& values, bool scalar) {
  if (scalar) return py::float_(values.at(0));
  return array(values);
}

py::object masked(const std::vector<double>& values, const std::vector<bool>& present) {
  std::vector<double> filled(values.size());
  py::array_t<bool> mask(static_cast<py::ssize_t>(values.size()));
  for (std::size_t i = 0; i < values.size(); ++i) {
    filled[i] = present[i] ? values[i] : 0.0;
    mask.mutable_data()[i] = !present[i];
  }
  return py::module_::import("numpy.ma").attr("masked_array")(array(filled), mask);
}

py::object from_json_text(const std::string& text) {
  return py::module_::import("json").attr("loads")(text);
}

}  // namespace ember::python
