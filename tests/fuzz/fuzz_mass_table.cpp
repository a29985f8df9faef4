// Fuzz target: the mass-function table reader (population/mass_function.hpp). The first byte
// picks the mass unit; the rest is the file's text. A table that loads gives a finite,
// non-negative psi over its range.
#include <cmath>

#include "ember/core/errors.hpp"
#include "ember/population/mass_function.hpp"
#include "fuzz_support.hpp"

using namespace ember;

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  if (size == 0) return 0;
  static const char* units[] = {"g", "kg", "Msun", "Mpl", "GeV"};
  const std::string unit = units[data[0] % std::size(units)];
  std::unique_ptr<population::MassFunction> f;
  try {
    f = population::tabulated_text(fuzz::as_text(data + 1, size - 1), "fuzz.tsv", unit);
  } catch (const InputError&) {
    return 0;
  }
  const double lo = f->low(), hi = f->high();
  fuzz::require(std::isfinite(lo) && std::isfinite(hi) && lo > 0 && hi > lo, "the table's range is finite");
  for (double m : {lo, std::sqrt(lo) * std::sqrt(hi), hi, f->characteristic_mass()}) {
    const double p = f->psi(m);
    fuzz::require(std::isfinite(p) && p >= 0, "psi is finite and >= 0 inside the range");
  }
  return 0;
}
