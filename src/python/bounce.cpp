// The seeded bounce around a hole (tunnelling/): B, Gamma_D, Gamma_H and the branching ratio per
// prescription, for one seed mass or an array, on the Standard Model potential.
#include <fmt/format.h>

#include "bindings.hpp"
#include "ember/core/errors.hpp"
#include "ember/core/parallel.hpp"
#include "ember/core/text.hpp"
#include "ember/tunnelling/rate.hpp"
#include "model.hpp"

namespace ember::python {

const evaporation::MassLoss& StandardModel::mass_loss() const {
  if (!mass_loss_) {
    const greybody::Table table = greybody::load_default_table();
    evaporation::ParticleSet particles = evaporation::load_default_particles();
    py::gil_scoped_release unlocked;
    mass_loss_ = std::make_shared<const evaporation::MassLoss>(table, std::move(particles));
  }
  return *mass_loss_;
}

namespace {

using namespace ember::tunnelling;
namespace u = ember::units;

// The prescriptions the Standard Model potential takes (as `ember bounce`): not thin_wall.
const std::vector<Prescription> standard_model_prescriptions = {Prescription::entropy_drop, Prescription::probe_field,
                                                                Prescription::hot_bubble, Prescription::no_seed};

Prescription prescription_of(const std::string& name) {
  const auto p = prescription_named(name);
  if (!p || *p == Prescription::thin_wall) {
    std::vector<std::string> names;
    for (const auto q : standard_model_prescriptions) names.push_back(name_of(q));
    throw InputError(fmt::format("prescription \"{}\": unknown for the Standard Model potential; expected {}", name,
                                 join_alternatives(names, "or")));
  }
  return *p;
}

struct Point {
  ActionPoint action;
  Rates rates;
};

// One prescription over the seed masses, as arrays: B (masked where no bubble forms), its error,
// the remnant, Gamma_D and Gamma_H (per s), the branching ratio and the flags.
py::dict over_masses(const std::vector<Point>& points, bool scalar) {
  std::vector<double> b, b_error, remnant, decay, evaporation, branching;
  std::vector<bool> has_b;
  py::list flags;
  for (const Point& p : points) {
    const bool finite = !p.action.flags.no_decay && std::isfinite(p.action.action.value);
    has_b.push_back(finite);
    b.push_back(finite ? p.action.action.value : 0.0);
    b_error.push_back(finite ? p.action.action.error : 0.0);
    remnant.push_back(p.action.remnant_mass / u::planck_mass);
    decay.push_back(p.rates.decay_rate * u::second);
    evaporation.push_back(p.rates.evaporation_rate * u::second);
    branching.push_back(p.rates.branching_ratio);
    flags.append(py::cast(p.action.flags.list()));
  }
  py::dict d;
  if (scalar) {
    d["B"] = has_b[0] ? py::object(py::float_(b[0])) : py::object(py::none());
    d["B_error"] = has_b[0] ? py::object(py::float_(b_error[0])) : py::object(py::none());
    d["flags"] = flags[0];
    d["note"] = points[0].action.note;
  } else {
    d["B"] = masked(b, has_b);
    d["B_error"] = masked(b_error, has_b);
    d["flags"] = flags;
  }
  d["remnant_mass_Mpl"] = shaped(remnant, scalar);
  d["decay_rate_per_s"] = shaped(decay, scalar);
  d["evaporation_rate_per_s"] = shaped(evaporation, scalar);
  d["branching_ratio"] = shaped(branching, scalar);
  return d;
}

py::object bounce(const StandardModel& sm, py::handle seed_mass, py::handle prescription, const std::string& prefactor,
                  double minimum_action, double hot_bubble_volume, int threads) {
  std::vector<double> seeds;
  bool scalar = true;
  if (py::isinstance<py::str>(seed_mass)) {
    seeds.push_back(quantity(seed_mass, "seed_mass", u::mass, u::gram));
  } else {
    const Numbers n = numbers(seed_mass, "seed_mass");
    scalar = n.scalar;
    for (const double m : n.values) {
      if (!(m > 0)) throw InputError(fmt::format("seed_mass {}: expected a mass in g > 0", m));
      seeds.push_back(m * u::gram);
    }
  }
  if (prefactor != "root_action" && prefactor != "light_crossing")
    throw InputError(fmt::format("prefactor {}: unknown; expected root_action or light_crossing", prefactor));
  if (!(minimum_action > 0)) throw InputError("minimum_action: expected a number > 0");
  if (!(hot_bubble_volume > 0)) throw InputError("hot_bubble_volume: expected a number > 0");
  std::vector<Prescription> chosen;
  if (prescription.is_none())
    chosen = standard_model_prescriptions;
  else
    chosen.push_back(prescription_of(prescription.cast<std::string>()));
  TunnellingSetup setup;
  setup.potential = &sm.potential();
  setup.standard_model = &sm.potential();
  setup.minimum_action = minimum_action;
  setup.hot_bubble_volume = hot_bubble_volume;
  const Prefactor pf = prefactor == "root_action" ? Prefactor::root_action : Prefactor::light_crossing;
  const evaporation::MassLoss& ml = sm.mass_loss();
  std::vector<std::vector<Point>> points(chosen.size(), std::vector<Point>(seeds.size()));
  {
    py::gil_scoped_release unlocked;
    parallel_for(chosen.size() * seeds.size(), threads > 0 ? threads : default_threads(), [&](std::size_t k) {
      const std::size_t p = k / seeds.size(), i = k % seeds.size();
      Point& out = points[p][i];
      out.action = action_at(chosen[p], setup, seeds[i]);
      out.rates = rates_at(out.action, ml, pf, setup.newton_G);
    });
  }
  if (!prescription.is_none()) return over_masses(points[0], scalar);
  py::dict all;
  for (std::size_t p = 0; p < chosen.size(); ++p) all[py::str(name_of(chosen[p]))] = over_masses(points[p], scalar);
  return all;
}

}  // namespace

void add_bounce(py::module_& m) {
  const TunnellingSetup defaults;
  py::reinterpret_borrow<py::class_<StandardModel>>(m.attr("StandardModel"))
      .def("bounce", &bounce, py::arg("seed_mass"), py::arg("prescription") = py::none(),
           py::arg("prefactor") = "root_action", py::arg("minimum_action") = defaults.minimum_action,
           py::arg("hot_bubble_volume") = defaults.hot_bubble_volume, py::arg("threads") = 0,
           "The seeded bounce around a hole of seed_mass (g: a number, an array, or a string with its unit) under "
           "one prescription (entropy_drop, probe_field, hot_bubble, no_seed), or every one as a dict by name: B "
           "(None, or masked, where no bubble forms), B_error, remnant_mass_Mpl, decay_rate_per_s (Gamma_D), "
           "evaporation_rate_per_s (Gamma_H), branching_ratio Gamma_D/(Gamma_D+Gamma_H), flags. threads: 0 for "
           "every core.");
  m.def("prescriptions", [] {
    std::vector<std::string> names;
    for (const auto p : all_prescriptions) names.push_back(name_of(p));
    return names;
  });
}

}  // namespace ember::python
