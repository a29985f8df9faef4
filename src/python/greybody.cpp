// Greybody factors Gamma_{s,l}(x) of a Schwarzschild hole, x = G M omega / c^3: from the table
// that ships (or another), by a direct solve of the wave equation, and the emission per degree of
// freedom (greybody/table.hpp, solver.hpp, emission.hpp).
#include <fmt/format.h>

#include <optional>

#include "bindings.hpp"
#include "ember/core/errors.hpp"
#include "ember/greybody/emission.hpp"
#include "ember/greybody/table.hpp"

namespace ember::python {

namespace {

using namespace ember::greybody;

Table table_from(const std::optional<std::string>& file) {
  return file ? load_table(*file) : load_default_table();
}

Numbers positive_x(py::handle x) {
  Numbers n = numbers(x, "x");
  for (const double v : n.values)
    if (!(v > 0)) throw InputError(fmt::format("x {}: expected a finite x = G M omega / c^3 > 0", v));
  return n;
}

int twice_spin_of(double spin) {
  return make_mode(spin, spin == 0.5 ? 0.5 : spin).twice_spin;  // throws InputError for a spin not 0, 1/2, 1, 2
}

py::object transmission(double spin, double l, py::handle x, const std::optional<std::string>& file) {
  const Mode mode = make_mode(spin, l);
  const Numbers xs = positive_x(x);
  const Table table = table_from(file);
  std::vector<double> out;
  for (const double v : xs.values) out.push_back(table.transmission(mode.twice_spin, mode.twice_l, v).value);
  return shaped(out, xs.scalar);
}

py::object weighted_sum(double spin, py::handle x, const std::optional<std::string>& file) {
  const int ts = twice_spin_of(spin);
  const Numbers xs = positive_x(x);
  const Table table = table_from(file);
  std::vector<double> out;
  for (const double v : xs.values) out.push_back(table.weighted_sum(ts, v).value);
  return shaped(out, xs.scalar);
}

py::tuple solve(double spin, double l, double x) {
  if (!(x > 0) || !std::isfinite(x)) throw InputError(fmt::format("x {}: expected a finite x > 0", x));
  const Mode mode = make_mode(spin, l);
  Transmission t;
  {
    py::gil_scoped_release unlocked;
    t = solve_transmission(mode, x);
  }
  if (t.summary.status != SolveStatus::converged) throw NumericalError("greybody solver", t.summary.message);
  return py::make_tuple(t.gamma.value, t.gamma.error);
}

py::dict emission(double spin, const std::optional<std::string>& file) {
  const Emission e = emission_per_dof(table_from(file), twice_spin_of(spin));
  py::dict d;
  d["power"] = e.power.value;
  d["power_error"] = e.power.error;
  d["number"] = e.number.value;
  d["number_error"] = e.number.error;
  return d;
}

}  // namespace

void add_greybody(py::module_& m) {
  m.def("greybody_transmission", &transmission, py::arg("spin"), py::arg("l"), py::arg("x"),
        py::arg("table") = py::none(),
        "Gamma_{s,l}(x) from the greybody table (the one that ships, or the file `table`); x = G M omega / c^3, "
        "a number or an array. l is the orbital l (spins 0, 1, 2) or the total j (spin 1/2).");
  m.def("greybody_weighted_sum", &weighted_sum, py::arg("spin"), py::arg("x"), py::arg("table") = py::none(),
        "sum over l of (2l+1) Gamma_{s,l}(x) from the table: the absorption cross-section is pi/omega^2 times it.");
  m.def("greybody_solve", &solve, py::arg("spin"), py::arg("l"), py::arg("x"),
        "Gamma_{s,l}(x) by a direct solve of the wave equation: (value, error). Raises NumericalError when the "
        "solve does not converge.");
  m.def("emission", &emission, py::arg("spin"), py::arg("table") = py::none(),
        "Power (hbar c^6 / (G^2 M^2)) and number (c^3 / (G M)) emitted per degree of freedom of a massless "
        "species of this spin, with their errors: dict power, power_error, number, number_error.");
}

}  // namespace ember::python
