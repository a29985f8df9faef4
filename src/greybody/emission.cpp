#include "ember/greybody/emission.hpp"

#include <fmt/format.h>
#include <gsl/gsl_errno.h>
#include <gsl/gsl_integration.h>

#include <cmath>
#include <memory>

#include "ember/core/errors.hpp"
#include "ember/core/finite.hpp"
#include "ember/core/gsl_status.hpp"
#include "ember/core/gsl_tools.hpp"
#include "ember/units/constants.hpp"

namespace ember::greybody {

namespace {

using units::pi;
// e^{-8 pi x} < 1e-30 beyond this x: the thermal tail is negligible there.
constexpr double x_upper = 2.75;
constexpr double quadrature_relative = 1e-10;
constexpr std::size_t workspace_size = 200;

struct Integrand {
  const std::function<Estimate(double)>* weighted;
  bool fermion;
  int moment;
  bool want_error;
};

double integrand(double x, void* p) {
  const auto* in = static_cast<const Integrand*>(p);
  if (x <= 0) return 0.0;
  const Estimate s = (*in->weighted)(x);
  // 1/(e^{8 pi x} -+ 1) written with expm1 so small x keeps its digits.
  const double a = 8 * pi * x;
  const double thermal = in->fermion ? 1.0 / (std::expm1(a) + 2.0) : 1.0 / std::expm1(a);
  return std::pow(x, in->moment) * (in->want_error ? s.error : s.value) * thermal / (2 * pi);
}

double integrate(const Integrand& in, double* abserr) {
  const IntegrationWorkspace w = integration_workspace(workspace_size);
  gsl_function f{integrand, const_cast<Integrand*>(&in)};
  double result = 0;
  use_gsl_status_codes();
  const int status =
      gsl_integration_qags(&f, 0.0, x_upper, 0.0, quadrature_relative, workspace_size, w.get(), &result, abserr);
  if (status != GSL_SUCCESS && status != GSL_EROUND)
    throw NumericalError(
        "thermal emission quadrature (GSL qags)",
        fmt::format("moment {}: {} (result {:.6e} +- {:.1e})", in.moment, gsl_strerror(status), result, *abserr));
  return result;
}

}  // namespace

Estimate thermal_moment(const std::function<Estimate(double)>& weighted_sum, bool fermion, int moment) {
  double quad_err = 0, ignored = 0;
  const double value = integrate({&weighted_sum, fermion, moment, false}, &quad_err);
  const double propagated = integrate({&weighted_sum, fermion, moment, true}, &ignored);
  return {value, quad_err + std::abs(propagated)};
}

Emission emission_per_dof(const Table& table, int twice_spin) {
  const std::function<Estimate(double)> s = [&](double x) { return table.weighted_sum(twice_spin, x); };
  const bool fermion = twice_spin % 2 == 1;
  const Emission e{thermal_moment(s, fermion, 1), thermal_moment(s, fermion, 0)};
  // Module boundary (no NaN leaves a module): emission coefficients leave the greybody module finite.
  const auto inputs = [&] { return fmt::format("spin {}/2", twice_spin); };
  const char* hint = "rebuilding the greybody table (ember greybody --rebuild)";
  require_finite(e.power.value, "greybody: thermal emission", "power per dof", inputs, hint);
  require_finite(e.number.value, "greybody: thermal emission", "number rate per dof", inputs, hint);
  return e;
}

}  // namespace ember::greybody
