// Mass functions of primordial black holes at formation: psi(M), normalised so that
// int psi dM = 1; the abundance (abundance.hpp) sets the amplitude.
// Units: masses in GeV, psi in GeV^-1.
//
//   monochromatic      delta(M - M0)
//   lognormal          exp(-ln^2(M/Mc) / (2 s^2)) / (sqrt(2 pi) s M)   (Carr, Raidal, Tenkanen,
//                      Vaskonen & Veermae, PRD 96 (2017) 023514, from memory)
//   power law          ~ M^p between cutoffs; p = -3/2 for scale-invariant fluctuations collapsing
//                      in a radiation era (Carr 1975)
//   critical collapse  ~ M^k exp(-(M/Mf)^k), k = 2.85 (common practice), normalised with
//                      int M^k e^{-(M/Mf)^k} dM = Mf^(k+1) Gamma((k+1)/k) / k (derived)
//   table              psi(M) from a two-column file, normalised numerically
#pragma once

#include <memory>
#include <string>
#include <string_view>
#include <vector>

namespace ember::population {

class MassFunction {
 public:
  virtual ~MassFunction() = default;
  virtual double psi(double mass) const = 0;
  // The range that holds all but ~1e-12 of the integral (GeV); equal ends for a delta function.
  virtual double low() const = 0;
  virtual double high() const = 0;
  virtual bool monochromatic() const { return false; }
  virtual double characteristic_mass() const = 0;
  virtual std::string description() const = 0;
};

std::unique_ptr<MassFunction> monochromatic(double mass);
std::unique_ptr<MassFunction> lognormal(double peak_mass, double width);
std::unique_ptr<MassFunction> power_law(double min_mass, double max_mass, double exponent);
std::unique_ptr<MassFunction> critical_collapse(double cutoff_mass, double exponent);
// mass_unit: g, kg, Msun, Mpl or GeV. Throws InputError naming the file and line.
std::unique_ptr<MassFunction> tabulated(const std::string& file, const std::string& mass_unit);
// The share of the spectrum's abundance (int psi dM) outside [from, to] (GeV): trapezoidal in
// ln M on 4000 points over its own range; for a monochromatic spectrum 0 or 1.
double share_outside(const MassFunction& spectrum, double from, double to);

// The spectrum with no holes below `mass` (GeV), not renormalised: the holes cut away simply do
// not exist, so N falls by their share. It shows how much of a verdict rests on the low tail.
std::unique_ptr<MassFunction> cut_below(std::unique_ptr<MassFunction> spectrum, double mass);
// The same from the file's text; `label` names it in messages.
std::unique_ptr<MassFunction> tabulated_text(std::string_view text, const std::string& label,
                                             const std::string& mass_unit);

}  // namespace ember::population
