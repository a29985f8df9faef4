// Hawking evaporation of one hole over the particle table (evaporation/): f(M), alpha(M), the
// lifetime, the trajectory M(t) and the energy budget; for a hole born spinning, the lifetime and
// a*(M) under the Kerr rates. Masses in g, times in s.
#include <fmt/format.h>

#include <cmath>
#include <memory>
#include <mutex>
#include <optional>

#include "bindings.hpp"
#include "ember/core/errors.hpp"
#include "ember/evaporation/budget.hpp"
#include "ember/evaporation/kerr_trajectory.hpp"
#include "ember/evaporation/spinning_clock.hpp"
#include "ember/evaporation/trajectory.hpp"
#include "ember/greybody/kerr_table.hpp"

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
              const std::optional<std::string>& table, const std::optional<std::string>& kerr_table)
      : kerr_table_(kerr_table) {
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
  // hole_spin 0 is the Schwarzschild trajectory; above 0 the Kerr trajectory, as `ember evaporate
  // --hole-spin`.
  py::object lifetime(py::handle mass, double hole_spin) const {
    if (hole_spin == 0.0)
      return each(mass, [&](double m) { return Trajectory(*mass_loss_, m, trajectory_).lifetime() / u::second; });
    const KerrMassLoss& kerr = kerr_rates(hole_spin);
    return each(mass, [&](double m) { return KerrTrajectory(kerr, m, hole_spin, trajectory_).lifetime() / u::second; });
  }
  // Above a* = 0, on the clock of a spinning population (Kerr, then Schwarzschild once the spin is
  // gone: spinning_clock.hpp).
  double mass_with_lifetime(py::handle lifetime, double hole_spin) const {
    const double t = quantity(lifetime, "lifetime", u::time, u::second);
    if (hole_spin == 0.0) {
      py::gil_scoped_release unlocked;
      return evaporation::mass_with_lifetime(*mass_loss_, t, trajectory_) / u::gram;
    }
    const KerrMassLoss& kerr = kerr_rates(hole_spin);
    py::gil_scoped_release unlocked;
    return spinning_mass_with_lifetime(kerr, *mass_loss_, hole_spin, t, trajectory_) / u::gram;
  }

  // The Kerr trajectory's recorded points: mass_g, hole_spin, age_s, time_left_s,
  // temperature_GeV (the rows of `ember evaporate --hole-spin A --trajectory`), and lifetime_s,
  // cutoff_g.
  py::dict spin_down(py::handle mass, double hole_spin) const {
    if (!(hole_spin > 0)) throw InputError(fmt::format("hole_spin {}: expected a* > 0 for a spin-down", hole_spin));
    const double m0 = quantity(mass, "mass", u::mass, u::gram);
    const KerrTrajectory tr(kerr_rates(hole_spin), m0, hole_spin, trajectory_);
    std::vector<double> masses, spins, age, left, temperature;
    for (const auto& pt : tr.points()) {
      masses.push_back(pt.mass / u::gram);
      spins.push_back(pt.hole_spin);
      age.push_back(pt.age / u::second);
      left.push_back((tr.lifetime() - pt.age) / u::second);
      temperature.push_back(kerr_hawking_temperature(pt.mass, pt.hole_spin));
    }
    py::dict d;
    d["mass_g"] = array(masses);
    d["hole_spin"] = array(spins);
    d["age_s"] = array(age);
    d["time_left_s"] = array(left);
    d["temperature_GeV"] = array(temperature);
    d["lifetime_s"] = tr.lifetime() / u::second;
    d["cutoff_g"] = tr.cutoff_mass() / u::gram;
    return d;
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
  std::optional<std::string> kerr_table_;
  mutable std::shared_ptr<const KerrMassLoss> kerr_;  // built on the first spinning call (seconds)
  mutable std::mutex kerr_mutex_;                     // guards kerr_: the build runs without the GIL

  // The Kerr rates over the same species and options; a* must lie on the Kerr table.
  const KerrMassLoss& kerr_rates(double hole_spin) const {
    if (mass_loss_->options().argument != GreybodyArgument::energy)
      throw InputError(
          "greybody_argument momentum: not with hole_spin; expected energy (the Kerr rates take the greybody factors "
          "at the energy)");
    {
      // The GIL first, then the lock: a thread waiting for the lock never holds the GIL.
      py::gil_scoped_release unlocked;
      const std::lock_guard<std::mutex> lock(kerr_mutex_);
      if (!kerr_) {
        const greybody::KerrTable t =
            kerr_table_ ? greybody::load_kerr_table(*kerr_table_) : greybody::load_default_kerr_table();
        kerr_ = std::make_shared<const KerrMassLoss>(t, mass_loss_->particles(), mass_loss_->options());
      }
    }
    const double top = kerr_->hole_spins().back();
    if (!(hole_spin >= 0 && hole_spin <= top))
      throw InputError(fmt::format(
          "hole_spin {}: expected a* = J c / (G M^2) in [0, {}] (the Kerr greybody table's range)", hole_spin, top));
    return *kerr_;
  }

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
                    const std::optional<std::string>&, const std::optional<std::string>&,
                    const std::optional<std::string>&>(),
           py::arg("qcd_scale") = defaults.qcd_scale, py::arg("qcd_width") = defaults.qcd_width,
           py::arg("greybody_argument") = "energy", py::arg("cutoff") = py::none(), py::arg("species") = py::none(),
           py::arg("particles") = py::none(), py::arg("table") = py::none(), py::arg("kerr_table") = py::none(),
           "qcd_scale in GeV, qcd_width in ln T_H, cutoff a mass (default 1e3 M_Pl); species: only these names "
           "from the particle table; particles, table, kerr_table: other files than the ones that ship.")
      .def("f", &Evaporation::f, py::arg("mass"), "f(M) = alpha(M) / 5.34e25 g^3 s^-1 (MacGibbon 1991); mass in g")
      .def("alpha", &Evaporation::alpha, py::arg("mass"), "alpha(M) = -M^2 dM/dt in g^3/s")
      .def("lifetime", &Evaporation::lifetime, py::arg("mass"), py::arg("hole_spin") = 0.0,
           "the lifetime in s of a hole of this mass (g), born with a* = hole_spin")
      .def("mass_with_lifetime", &Evaporation::mass_with_lifetime, py::arg("lifetime"), py::arg("hole_spin") = 0.0,
           "the initial mass (g) whose lifetime is this (s, or a string such as \"13.787 Gyr\"), born with a* = "
           "hole_spin")
      .def("spin_down", &Evaporation::spin_down, py::arg("mass"), py::arg("hole_spin"),
           "a hole born with a* = hole_spin as numpy arrays along its Kerr trajectory: mass_g, hole_spin, age_s, "
           "time_left_s, temperature_GeV (and lifetime_s, cutoff_g)")
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
