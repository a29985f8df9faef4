// import ember: see bindings.hpp.
#include "bindings.hpp"
#include "ember/version.hpp"

PYBIND11_MODULE(ember, m) {
  using namespace ember::python;
  m.doc() =
      "Ember: Higgs-vacuum-decay constraints on primordial black holes. Greybody factors, evaporation, the Higgs "
      "potential, seeded bounces and whole scenario runs, computed in-process. Masses in g, times in s, energies "
      "in GeV; strings carry their own unit (\"1e15 g\").";
  m.attr("__version__") = ember::version;
  add_errors(m);
  add_greybody(m);
  add_evaporation(m);
  add_higgs(m);
  add_bounce(m);
  add_run(m);
}
