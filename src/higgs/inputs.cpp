#include "ember/higgs/inputs.hpp"

#include <fmt/format.h>
#include <yaml-cpp/yaml.h>

#include <cmath>

#include "ember/core/embedded.hpp"
#include "ember/core/errors.hpp"
#include "ember/core/text.hpp"
#include "ember/units/quantity.hpp"

namespace ember::higgs {

namespace {

Measured read_measured(const YAML::Node& doc, const char* key, bool is_mass) {
  const YAML::Node n = doc[key];
  const auto read = [&](const char* field) {
    const std::string text = n[field].Scalar();
    return is_mass ? units::parse_quantity(text, units::mass).value : parse_real(text).value();
  };
  return {read("value"), read("sigma")};
}

MeasuredInputs parse_measured() {
  const YAML::Node doc = YAML::Load(std::string(embedded::standard_model_yaml()));
  return {read_measured(doc, "top_mass", true), read_measured(doc, "higgs_mass", true),
          read_measured(doc, "alpha_s", false), read_measured(doc, "w_mass", true)};
}

// Central values of the fits in Buttazzo et al. 2013.
constexpr double fit_mt = 173.34, fit_mh = 125.15, fit_as = 0.1184, fit_mw = 80.384;

}  // namespace

const MeasuredInputs& measured_inputs() {
  static const MeasuredInputs m = parse_measured();  // immutable, parsed once from the embedded file
  return m;
}

Inputs default_inputs() {
  const MeasuredInputs& m = measured_inputs();
  Inputs in;
  in.top_mass = m.top_mass.value;
  in.higgs_mass = m.higgs_mass.value;
  in.alpha_s = m.alpha_s.value;
  in.w_mass = m.w_mass.value;
  return in;
}

std::string loop_order_name(int loops) {
  switch (loops) {
    case 1: return "one-loop running";
    case 2: return "two-loop running";
    case 3: return "two-loop running plus three-loop QCD terms in g3 and yt";
  }
  throw InputError(fmt::format("Higgs inputs: loops = {}: expected 1, 2 or 3", loops));
}

std::string loop_order_choices() {
  return fmt::format("1 = {}, 2 = {}, 3 = {}", loop_order_name(1), loop_order_name(2), loop_order_name(3));
}

void Inputs::validate() const {
  const auto require = [](bool ok, const char* field, double value, const char* rule) {
    if (!ok) throw InputError(fmt::format("Higgs inputs: {} = {}: {}", field, format_real(value), rule));
  };
  require(top_mass >= 150 && top_mass <= 200, "top_mass", top_mass, "expected between 150 and 200 GeV");
  require(higgs_mass >= 100 && higgs_mass <= 150, "higgs_mass", higgs_mass, "expected between 100 and 150 GeV");
  require(alpha_s >= 0.1 && alpha_s <= 0.14, "alpha_s", alpha_s, "expected between 0.1 and 0.14");
  require(w_mass >= 75 && w_mass <= 85, "w_mass", w_mass, "expected between 75 and 85 GeV");
  require(loops >= 1 && loops <= 3, "loops", loops, "expected 1, 2 or 3");
}

Couplings couplings_at_top(const Inputs& in) {
  const double dt = in.top_mass - fit_mt, dh = in.higgs_mass - fit_mh, da = (in.alpha_s - fit_as) / 0.0007,
               dw = (in.w_mass - fit_mw) / 0.014;
  // Buttazzo et al., JHEP 12 (2013) 089, the fits of the MS-bar couplings at mu = M_t.
  const double lambda = 0.12604 + 0.00206 * dh - 0.00004 * dt;
  const double yt = 0.93690 + 0.00556 * dt - 0.00042 * da;
  const double g3 = 1.1666 + 0.00314 * da - 0.00046 * dt;
  const double g2 = 0.64779 + 0.00004 * dt + 0.00011 * dw;
  const double gY = 0.35830 + 0.00011 * dt - 0.00020 * dw;
  return {std::sqrt(5.0 / 3.0) * gY, g2, g3, yt, lambda};
}

std::vector<std::string> fit_warnings(const Inputs& in) {
  std::vector<std::string> w;
  const auto check = [&](const char* name, double value, double centre, double range, const char* unit) {
    if (std::abs(value - centre) > range)
      w.push_back(
          fmt::format("{} = {}{} lies more than {}{} from {}{}, where the boundary-value fits of Buttazzo et al. "
                      "(2013) were made; the couplings at M_t are extrapolated",
                      name, format_real(value), unit, format_real(range), unit, format_real(centre), unit));
  };
  check("M_t", in.top_mass, fit_mt, 3.0, " GeV");
  check("M_h", in.higgs_mass, fit_mh, 3.0, " GeV");
  check("alpha_s", in.alpha_s, fit_as, 0.003, "");
  check("M_W", in.w_mass, fit_mw, 0.1, " GeV");
  return w;
}

}  // namespace ember::higgs
