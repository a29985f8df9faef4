// Hawking evaporation of one hole over the particle table (evaporation/): f(M), alpha(M), the
// lifetime, the trajectory M(t) and the energy budget. Masses in g, times in s.
#include <fmt/format.h>

#include <cmath>
#include <memory>
#include <optional>

#include "bindings.hpp"
#include "ember/core/errors.hpp"
#include "ember/evaporation/budget.hpp"
#include "ember/evaporation/trajectory.hpp"

namespace ember::python {

namespace {

using namespace ember::evaporation;
namespace u = ember::units;

// The mass-loss model and the trajectory options, built once (the alpha(M) table takes a
// moment) and shared by every call.
class Evaporation {
 public:
  Evaporation(double qcd_scale, double qcd_width, const std::string& argument, py::handle cutoff,
              const std::optional<std::vector<std::string>>& species, const std::optional<std::string>& particles,
              const std::optional<std::string>& table) {
    MassLossOptions o;
    o.qcd_scale = qcd_scale;
    o.qcd_width = qcd_width;
    if (argument != "energy" && argument != "momentum")
      throw InputError(fmt::format("greybody_argument {}: unknown; expected energy or momentum", argument));
    o.argument = argument == "momentum" ? GreybodyArgument::momentum : GreybodyArgument::energy;
    o.validate();
    trajectory_.cutoff_mass =
        cutoff.is_none() ? TrajectoryOptions{}.cutoff_mass : quantity(cutoff, "cutoff", u::mass, u::gram);
    trajectory_.validate();
    ParticleSet set = particles ? load_particles(*particles) : load_default_particles();
    if (species) set = set.only(*species);
    const greybody::Table t = table ? greybody::load_table(*table) : greybody::load_default_table();
    py::gil_scoped_release unlocked;
    mass_loss_ = std::make_shared<const MassLoss>(t, std::move(set), o);
  }

  py::object f(py::handle mass) const {
    return each(mass, [&](double m) { return mass_loss_->f(m); });
  }
  py::object alpha(py::handle mass) const {
    const double cgs = u::gram * u::gram * u::gram / u::second;
    return each(mass, [&](double m) { return mass_loss_->alpha(m) / cgs; });
  }
  py::object lifetime(py::handle mass) const {
    return each(mass, [&](double m) { return Trajectory(*mass_loss_, m, trajectory_).lifetime() / u::second; });
  }
  double mass_with_lifetime(py::handle lifetime) const {
    const double t = quantity(lifetime, "lifetime", u::time, u::second);
    py::gil_scoped_release unlocked;
    return evaporation::mass_with_lifetime(*mass_loss_, t, trajectory_) / u::gram;
  }

  // The same rows as `ember evaporate --trajectory`: `points` + 1 masses log-uniform from M down
  // to a thousandth of the cutoff (or of M), into the analytic tail.
  py::dict trajectory(py::handle mass, int points) const {
    if (points < 2 || points > 1000000)
      throw InputError(fmt::format("points {}: expected a whole number from 2 to 1000000", points));
    const double m0 = quantity(mass, "mass", u::mass, u::gram);
    const Trajectory tr(*mass_loss_, m0, trajectory_);
    const double top = std::log(m0), bottom = std::log(std::min(tr.cutoff_mass(), m0) * 1e-3);
    std::vector<double> age, left, masses, temperature;
    for (int i = 0; i <= points; ++i) {
      const double m = std::exp(top + (bottom - top) * i / points);
      age.push_back(tr.age_at(m) / u::second);
      left.push_back(tr.time_left(m) / u::second);
      masses.push_back(m / u::gram);
      temperature.push_back(hawking_temperature(m));
    }
    py::dict d;
    d["age_s"] = array(age);
    d["time_left_s"] = array(left);
    d["mass_g"] = array(masses);
    d["temperature_GeV"] = array(temperature);
    d["lifetime_s"] = tr.lifetime() / u::second;
    d["cutoff_g"] = tr.cutoff_mass() / u::gram;
    return d;
  }

  // Each species' share of the power emitted now, by name.
  py::dict power_shares(py::handle mass) const {
    const std::vector<double> s = evaporation::power_shares(*mass_loss_, quantity(mass, "mass", u::mass, u::gram));
    py::dict d;
    for (std::size_t i = 0; i < s.size(); ++i) d[py::str(mass_loss_->particles().species[i].name)] = s[i];
    return d;
  }

  double relative_error() const { return mass_loss_->relative_error(); }
  std::vector<std::string> species() const {
    std::vector<std::string> names;
    for (const auto& s : mass_loss_->particles().species) names.push_back(s.name);
    return names;
  }

 private:
  std::shared_ptr<const MassLoss> mass_loss_;
  TrajectoryOptions trajectory_;

  template <class F>
  static py::object each(py::handle mass, F&& f) {
    if (py::isinstance<py::str>(mass)) return py::float_(f(quantity(mass, "mass", u::mass, u::gram)));
    const Numbers ms = numbers(mass, "mass");
    std::vector<double> out;
    for (const double m : ms.values) {
      if (!(m > 0)) throw InputError(fmt::format("mass {}: expected a mass in g > 0", m));
      out.push_back(f(m * u::gram));
    }
    return shaped(out, ms.scalar);
  }
};

}  // namespace

void add_evaporation(py::module_& m) {
  const MassLossOptions defaults;
  py::class_<Evaporation>(m, "Evaporation",
                          "Hawking evaporation over the particle table: primary emission, greybody factors at the "
                          "energy (or momentum) of massive species, partons above the QCD scale and hadrons below.")
      .def(py::init<double, double, const std::string&, py::handle, const std::optional<std::vector<std::string>>&,
                    const std::optional<std::string>&, const std::optional<std::string>&>(),
           py::arg("qcd_scale") = defaults.qcd_scale, py::arg("qcd_width") = defaults.qcd_width,
           py::arg("greybody_argument") = "energy", py::arg("cutoff") = py::none(), py::arg("species") = py::none(),
           py::arg("particles") = py::none(), py::arg("table") = py::none(),
           "qcd_scale in GeV, qcd_width in ln T_H, cutoff a mass (default 1e3 M_Pl); species: only these names "
           "from the particle table; particles, table: other files than the ones that ship.")
      .def("f", &Evaporation::f, py::arg("mass"), "f(M) = alpha(M) / 5.34e25 g^3 s^-1 (MacGibbon 1991); mass in g")
      .def("alpha", &Evaporation::alpha, py::arg("mass"), "alpha(M) = -M^2 dM/dt in g^3/s")
      .def("lifetime", &Evaporation::lifetime, py::arg("mass"), "the lifetime in s of a hole of this mass (g)")
      .def("mass_with_lifetime", &Evaporation::mass_with_lifetime, py::arg("lifetime"),
           "the initial mass (g) whose lifetime is this (s, or a string such as \"13.787 Gyr\")")
      .def("trajectory", &Evaporation::trajectory, py::arg("mass"), py::arg("points") = 400,
           "M(t) as numpy arrays: age_s, time_left_s, mass_g, temperature_GeV (and lifetime_s, cutoff_g)")
      .def("power_shares", &Evaporation::power_shares, py::arg("mass"),
           "each species' share of the power emitted at this mass, by name")
      .def_property_readonly("relative_error", &Evaporation::relative_error, "relative error of alpha(M)")
      .def_property_readonly("species", &Evaporation::species);
  m.def(
      "hawking_temperature",
      [](py::handle mass) { return hawking_temperature(quantity(mass, "mass", u::mass, u::gram)); }, py::arg("mass"),
      "T_H = M_Pl^2 / (8 pi M) in GeV, mass in g");
}

}  // namespace ember::python
