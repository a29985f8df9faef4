#include "ember/scenario/scenario.hpp"

#include <cmath>
#include <stdexcept>

#include "ember/core/text.hpp"
#include "ember/units/quantity.hpp"

namespace ember::scenario {

namespace {

// The resolved document has already been validated; these only convert canonical text.
double num(const YAML::Node& n) {
  return parse_real(n.Scalar()).value();
}
int whole(const YAML::Node& n) {
  return static_cast<int>(parse_whole(n.Scalar()).value());
}
double qty(const YAML::Node& n, units::Kind kind) {
  return units::parse_quantity(n.Scalar(), kind, units::Sign::any).value;
}
double mass(const YAML::Node& n) {
  return qty(n, units::mass);
}
std::vector<double> numbers(const YAML::Node& n) {
  std::vector<double> out;
  for (const auto& item : n) out.push_back(num(item));
  return out;
}
std::vector<std::string> words(const YAML::Node& n) {
  std::vector<std::string> out;
  for (const auto& item : n) out.push_back(item.Scalar());
  return out;
}

Spectrum read_spectrum(const YAML::Node& n) {
  const std::string shape = n["shape"].Scalar();
  if (shape == "monochromatic") return Monochromatic{mass(n["mass"])};
  if (shape == "lognormal") return Lognormal{mass(n["peak_mass"]), num(n["width"])};
  if (shape == "power_law") return PowerLaw{mass(n["min_mass"]), mass(n["max_mass"]), num(n["exponent"])};
  if (shape == "critical_collapse") return CriticalCollapse{mass(n["cutoff_mass"]), num(n["exponent"])};
  return TabulatedSpectrum{n["file"].Scalar(), n["mass_unit"].Scalar()};
}

HoleSpin read_hole_spin(const YAML::Node& n) {
  const std::string d = n["distribution"].Scalar();
  if (d == "uniform") return UniformSpin{num(n["low"]), num(n["high"])};
  if (d == "gaussian") return GaussianSpin{num(n["mean"]), num(n["width"])};
  if (d == "table") return TabulatedSpin{n["file"].Scalar()};
  return FixedSpin{num(n["value"])};
}

Abundance read_abundance(const YAML::Node& n) {
  const std::string m = n["measure"].Scalar();
  const AbundanceMeasure measure = m == "beta"    ? AbundanceMeasure::beta
                                   : m == "f_pbh" ? AbundanceMeasure::f_pbh
                                                  : AbundanceMeasure::lightcone_count;
  return Abundance{measure, num(n["value"])};
}

PotentialForm read_potential(const YAML::Node& n) {
  const std::string form = n["form"].Scalar();
  if (form == "polynomial") return PolynomialForm{qty(n["scale"], units::energy), numbers(n["coefficients"])};
  if (form == "table") return TabulatedForm{n["file"].Scalar()};
  return StandardModelForm{{n["coleman_weinberg"].Scalar() == "true", num(n["lambda6"]), num(n["lambda8"])}};
}

Prescription read_prescription(const std::string& s) {
  if (const auto p = tunnelling::prescription_named(s)) return *p;
  throw std::logic_error("read_prescription: unvalidated name " + s);
}

TunnellingChoices read_tunnelling(const YAML::Node& n) {
  TunnellingChoices t;
  for (const auto& name : words(n["prescriptions"])) t.prescriptions.push_back(read_prescription(name));
  t.prefactor = n["prefactor"].Scalar() == "light_crossing" ? Prefactor::light_crossing : Prefactor::root_action;
  t.semiclassical_floor = mass(n["semiclassical_floor"]);
  t.hot_bubble_volume = num(n["hot_bubble_volume"]);
  t.minimum_action = num(n["minimum_action"]);
  t.hot_era = n["hot_era"].Scalar() == "count" ? population::HotEra::count : population::HotEra::postpone;
  t.spin_limit = num(n["spin_limit"]);
  const YAML::Node wall = n["thin_wall"];
  if (wall["tension"]) t.wall_tension = qty(wall["tension"], {units::Dimension::energy, 3});
  if (wall["energy_gap"]) t.energy_gap = qty(wall["energy_gap"], {units::Dimension::energy, 4});
  return t;
}

EvaporationChoices read_evaporation(const YAML::Node& n) {
  EvaporationChoices e;
  e.mass_loss.qcd_scale = qty(n["qcd_scale"], units::energy);
  e.mass_loss.qcd_width = num(n["qcd_width"]);
  e.mass_loss.argument = n["greybody_argument"].Scalar() == "momentum" ? evaporation::GreybodyArgument::momentum
                                                                       : evaporation::GreybodyArgument::energy;
  e.trajectory.cutoff_mass = mass(n["cutoff_mass"]);
  if (n["kerr_table"]) e.kerr_table = n["kerr_table"].Scalar();
  if (n["greybody_table"].Scalar() == "computed") {
    e.computed_greybody.emplace();
    e.computed_greybody->points_per_mode = whole(n["greybody_points"]);
  }
  return e;
}

BandAxis read_axis(const YAML::Node& n, bool is_mass) {
  return BandAxis{is_mass ? mass(n["sigma"]) : num(n["sigma"]), num(n["span"]), whole(n["points"])};
}

Thresholds read_thresholds(const YAML::Node& n) {
  Thresholds t{{}, num(n["span"]), whole(n["points"]), num(n["tolerance"])};
  for (const std::string& w : words(n["inputs"]))
    t.inputs.push_back(w == "top_mass"     ? ThresholdInput::top_mass
                       : w == "higgs_mass" ? ThresholdInput::higgs_mass
                                           : ThresholdInput::alpha_s);
  return t;
}

ScanChoices read_scan(const YAML::Node& n) {
  const YAML::Node m = n["masses"], b = n["band"];
  const auto end = [&](const char* key) { return m[key] ? std::optional<double>(mass(m[key])) : std::nullopt; };
  return ScanChoices{MassGrid{end("from"), end("to"), whole(m["points"])}, numbers(n["widths"]),
                     Band{read_axis(b["top_mass"], true), read_axis(b["higgs_mass"], true),
                          read_axis(b["alpha_s"], false), numbers(b["lambda6"]), numbers(b["lambda8"])},
                     read_thresholds(n["thresholds"])};
}

// N > max_decays; a confidence level CL is the same rule at max_decays = -ln(1 - CL) (e^-N < 1 - CL).
ExclusionRule exclusion_rule(const YAML::Node& n) {
  if (n["confidence_level"]) return ExclusionRule{-std::log1p(-num(n["confidence_level"]))};
  return ExclusionRule{num(n["max_decays"])};
}

}  // namespace

std::string name_of(ThresholdInput input) {
  switch (input) {
    case ThresholdInput::top_mass: return "top_mass";
    case ThresholdInput::higgs_mass: return "higgs_mass";
    case ThresholdInput::alpha_s: return "alpha_s";
  }
  return "?";
}

Scenario read_scenario(const YAML::Node& r) {
  const YAML::Node pop = r["population"], sm = r["standard_model"], ev = r["evaporation"], cos = r["cosmology"],
                   out = r["output"];
  return Scenario{
      r["title"].Scalar(),
      Population{read_spectrum(pop["spectrum"]), read_abundance(pop["abundance"]), num(pop["collapse_fraction"]),
                 pop["cut_below"] ? std::optional<double>(mass(pop["cut_below"])) : std::nullopt,
                 read_hole_spin(pop["hole_spin"])},
      StandardModelInputs{
          {mass(sm["top_mass"]), mass(sm["higgs_mass"]), num(sm["alpha_s"]), mass(sm["w_mass"]), whole(sm["loops"])},
          read_potential(sm["potential"])},
      read_evaporation(ev),
      read_tunnelling(r["tunnelling"]),
      CosmologyInputs{num(cos["hubble"]), num(cos["omega_b_h2"]), num(cos["omega_cdm_h2"]),
                      qty(cos["cmb_temperature"], units::temperature), num(cos["n_eff"])},
      read_scan(r["scan"]),
      exclusion_rule(r["exclusion"]),
      OutputChoices{out["directory"].Scalar(), words(out["files"]), words(out["plot_formats"])},
      cos["dof_table"] ? std::optional<std::filesystem::path>(cos["dof_table"].Scalar()) : std::nullopt,
  };
}

}  // namespace ember::scenario
