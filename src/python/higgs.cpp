// The Standard Model Higgs potential at high field (higgs/): RG running of lambda on an array of
// scales, lambda_eff, the stability verdict with the unseeded decay, and the critical top masses.
#include <fmt/format.h>

#include "bindings.hpp"
#include "ember/core/errors.hpp"
#include "ember/higgs/stability.hpp"
#include "ember/tunnelling/unseeded.hpp"
#include "model.hpp"

namespace ember::python {

StandardModel::StandardModel(const higgs::Inputs& inputs, const higgs::StandardModelOptions& options)
    : inputs_(inputs), options_(options) {
  inputs_.validate();
  py::gil_scoped_release unlocked;
  running_ = std::make_shared<const higgs::Running>(inputs_);
  potential_ = std::make_shared<const higgs::StandardModelPotential>(running_, options_);
}

const higgs::StabilityReport& StandardModel::report() const {
  if (!report_) {
    py::gil_scoped_release unlocked;
    report_ = tunnelling::analyse_unseeded(*potential_);
  }
  return *report_;
}

namespace {

using namespace ember::higgs;

template <class F>
py::object at_scales(const StandardModel& sm, py::handle mu, const char* name, F&& f) {
  const Numbers xs = numbers(mu, name);
  std::vector<double> out;
  for (const double x : xs.values) {
    if (!(x >= sm.running().mu_min() && x <= sm.running().mu_max()))
      throw InputError(
          fmt::format("{} {:.6g} GeV: outside the running's range; expected between M_t = {} GeV and "
                      "{:.3g} GeV",
                      name, x, sm.running().mu_min(), sm.running().mu_max()));
    out.push_back(f(x));
  }
  return shaped(out, xs.scalar);
}

py::object optional_number(const std::optional<double>& v) {
  return v ? py::object(py::float_(*v)) : py::object(py::none());
}

// The keys `ember higgs --json` uses for the same numbers.
py::dict stability_dict(const StabilityReport& r) {
  py::dict d;
  d["verdict"] = name_of(r.verdict);
  d["instability_scale_GeV"] = optional_number(r.instability_scale);
  d["lambda_min"] = r.lambda_min;
  d["lambda_min_scale_GeV"] = r.lambda_min_scale;
  d["lambda_eff_min"] = r.lambda_eff_min;
  d["lambda_eff_min_scale_GeV"] = r.lambda_eff_min_scale;
  d["quartic_min"] = r.quartic_min;
  d["quartic_min_scale_GeV"] = r.quartic_min_scale;
  d["log10_expected_decays"] = optional_number(r.log10_expected_decays);
  const bool bounce = r.log10_expected_decays.has_value();
  d["unseeded_method"] = name_of(r.unseeded_method);
  d["bounce_scale_GeV"] = bounce ? py::object(py::float_(r.bounce_scale)) : py::object(py::none());
  d["bounce_action"] = bounce ? py::object(py::float_(r.bounce_action)) : py::object(py::none());
  d["bounce_at_scan_edge"] = r.bounce_at_scan_edge;
  d["prescription"] = r.prescription;
  return d;
}

double critical(const StandardModel& sm, bool effective) {
  py::gil_scoped_release unlocked;
  return effective ? critical_top_mass_effective(sm.inputs(), sm.options()) : critical_top_mass(sm.inputs());
}

}  // namespace

void add_higgs(py::module_& m) {
  const Inputs d = default_inputs();
  py::class_<StandardModel>(m, "StandardModel",
                            "The Standard Model Higgs potential from the pole masses and alpha_s(M_Z): RG running "
                            "(loops = 3: two-loop plus three-loop QCD terms in g3 and yt), lambda_eff, and the "
                            "Planck-suppressed operators lambda6 h^6/(6 Mbar^2) + lambda8 h^8/(8 Mbar^4).")
      .def(py::init([](double top_mass, double higgs_mass, double alpha_s, double w_mass, int loops, double lambda6,
                       double lambda8, bool coleman_weinberg) {
             return StandardModel(Inputs{top_mass, higgs_mass, alpha_s, w_mass, loops},
                                  StandardModelOptions{coleman_weinberg, lambda6, lambda8});
           }),
           py::arg("top_mass") = d.top_mass, py::arg("higgs_mass") = d.higgs_mass, py::arg("alpha_s") = d.alpha_s,
           py::arg("w_mass") = d.w_mass, py::arg("loops") = d.loops, py::arg("lambda6") = 0.0, py::arg("lambda8") = 0.0,
           py::arg("coleman_weinberg") = false,
           "masses in GeV (pole), alpha_s at M_Z; defaults: the measured central values")
      .def(
          "lambda_running",
          [](const StandardModel& sm, py::handle mu) {
            return at_scales(sm, mu, "mu", [&](double x) { return sm.running().lambda(x); });
          },
          py::arg("mu"), "the MS-bar quartic lambda(mu), mu in GeV: a number or an array")
      .def(
          "lambda_eff",
          [](const StandardModel& sm, py::handle h) {
            return at_scales(sm, h, "h", [&](double x) { return sm.potential().lambda_eff(x); });
          },
          py::arg("h"), "the effective quartic lambda_eff(h) of the potential, h in GeV: a number or an array")
      .def(
          "couplings",
          [](const StandardModel& sm, double mu) {
            const Couplings c = sm.running().couplings(mu);
            py::dict out;
            out["g1"] = c.g1;
            out["g2"] = c.g2;
            out["g3"] = c.g3;
            out["yt"] = c.yt;
            out["lambda"] = c.lambda;
            return out;
          },
          py::arg("mu"), "MS-bar couplings at mu (GeV): g1 (GUT-normalised), g2, g3, yt, lambda")
      .def(
          "stability", [](const StandardModel& sm) { return stability_dict(sm.report()); },
          "the stability report (the keys of `ember higgs --json`): verdict, instability scale, lambda minima, "
          "log10 of the unseeded decays expected in our past light cone")
      .def_property_readonly(
          "verdict", [](const StandardModel& sm) { return name_of(sm.report().verdict); },
          "stable, metastable or unstable")
      .def(
          "critical_top_mass", [](const StandardModel& sm) { return critical(sm, false); },
          "the top mass (GeV) where the MS-bar lambda_min = 0, the other inputs kept; NumericalError when none "
          "is in [160, 185] GeV")
      .def(
          "critical_top_mass_effective", [](const StandardModel& sm) { return critical(sm, true); },
          "the top mass (GeV) where the minimum of 4V/h^4 with these options is 0")
      .def_property_readonly("description", [](const StandardModel& sm) { return sm.potential().description(); });
}

}  // namespace ember::python
