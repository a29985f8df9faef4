#include "band.hpp"

#include <fmt/format.h>

#include <cmath>

#include "ember/core/text.hpp"
#include "ember/units/constants.hpp"

namespace ember::report::detail {

namespace {

std::string cell(std::optional<double> v) {
  return v && std::isfinite(*v) ? fmt::format("{:.8e}", *v) : std::string();
}

// N at a scan row for the scenario's abundance: counts are linear in it, and beta_max (f_max) is
// the abundance that gives max_decays there, so N = max_decays x value / allowed (derived). The
// light-cone-count measure has no per-row allowed value here: empty.
std::optional<double> row_count(const scenario::Scenario& s, std::optional<double> beta_max,
                                std::optional<double> f_max) {
  const auto& a = s.population.abundance;
  if (a.measure == population::AbundanceMeasure::beta && beta_max) return s.exclusion.max_decays * a.value / *beta_max;
  if (a.measure == population::AbundanceMeasure::f_pbh && f_max) return s.exclusion.max_decays * a.value / *f_max;
  return std::nullopt;
}

}  // namespace

std::string band_csv(const scenario::LoadedScenario& l, const pipeline::JobResults& r, const std::string& header) {
  std::string out = header;
  out +=
      "point,label,top_mass_GeV,higgs_mass_GeV,alpha_s,lambda6,lambda8,sigmas,prescription,mass_g,width,beta_max,"
      "f_max,N_row,N_scenario\n";
  for (std::size_t p = 0; p < r.band.size(); ++p) {
    const pipeline::BandPoint& b = r.band[p];
    for (std::size_t k = 0; k < r.outcomes.size() && k < b.beta_max.size(); ++k)
      for (std::size_t row = 0; row < b.beta_max[k].size() && row < r.outcomes[k].curve.size(); ++row) {
        const pipeline::CurveRow& c = r.outcomes[k].curve[row];
        out += fmt::format("{},\"{}\",{:.6g},{:.6g},{:.6g},{:.6g},{:.6g},{:.3g},{},{:.8e},{},{},{},{},{}\n", p,
                           b.point.label.empty() ? "central" : b.point.label, b.point.inputs.top_mass,
                           b.point.inputs.higgs_mass, b.point.inputs.alpha_s, b.point.lambda6, b.point.lambda8,
                           b.point.sigmas, tunnelling::name_of(r.outcomes[k].prescription), c.mass / units::gram,
                           c.width > 0 ? format_real(c.width) : "", cell(b.beta_max[k][row]), cell(b.f_max[k][row]),
                           cell(row_count(l.scenario, b.beta_max[k][row], b.f_max[k][row])),
                           k < b.lightcone.size() ? cell(b.lightcone[k]) : std::string());
      }
  }
  return out;
}

std::optional<std::string> flat_band_note(const pipeline::JobResults& r) {
  if (r.band.size() < 2) return std::nullopt;
  for (const auto& o : r.outcomes)
    for (const auto& c : o.curve)
      if (c.band_low && c.band_high && std::abs(*c.band_high - *c.band_low) > 1e-6 * *c.band_low) return std::nullopt;
  bool certain = true;
  for (const auto& o : r.outcomes)
    for (const auto& resp : o.scan)
      if (resp.decay.evaporated && resp.decay.probability > 0 && resp.decay.probability < 1 - 1e-12) certain = false;
  return certain ? std::string(
                       "the band is flat: at every band point each evaporating hole decays for certain "
                       "(P_decay = 1), so beta_max depends only on how many holes form in our past light "
                       "cone, not on M_t, M_h or alpha_s")
                 : std::string("the band is flat: beta_max agrees to 1e-6 at every band point");
}

}  // namespace ember::report::detail
