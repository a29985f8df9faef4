#include "ember/greybody/kerr_emission.hpp"

#include <fmt/format.h>
#include <gsl/gsl_errno.h>
#include <gsl/gsl_integration.h>

#include <cmath>
#include <numbers>

#include "ember/core/errors.hpp"
#include "ember/core/gsl_status.hpp"
#include "ember/core/gsl_tools.hpp"
#include "ember/greybody/tolerances.hpp"

namespace ember::greybody {

double kerr_thermal_factor(const KerrHole& hole, const KerrMode& mode, double x) {
  const double u = (x - mode.m() * hole.angular_velocity) / hole.temperature();
  return mode.twice_spin % 2 == 1 ? 1.0 / (std::expm1(u) + 2.0) : 1.0 / std::expm1(u);
}

namespace {

struct KerrEmissionIntegrand {
  const KerrHole* hole;
  const KerrMode* mode;
  const KerrGamma* gamma;
  int moment;  // 0: number, 1: power, 2: torque (m)
  bool want_error;
};

double kerr_emission_integrand(double x, void* p) {
  const auto* in = static_cast<const KerrEmissionIntegrand*>(p);
  const Estimate g = (*in->gamma)(*in->mode, x);
  const double weight = in->moment == 0 ? 1.0 : in->moment == 1 ? x : in->mode->m();
  const double th = kerr_thermal_factor(*in->hole, *in->mode, x);
  return weight * (in->want_error ? std::abs(g.error * th) : g.value * th) / (2.0 * std::numbers::pi);
}

// int over [lo, hi] by QAGS; the interior points never touch the threshold itself, where Gamma
// and the thermal factor's pole cancel.
Estimate kerr_piece(const KerrEmissionIntegrand& base, double lo, double hi) {
  if (!(hi > lo)) return {};
  const IntegrationWorkspace w = integration_workspace(tolerance::kerr_quadrature_intervals);
  Estimate out;
  for (const bool error_pass : {false, true}) {
    KerrEmissionIntegrand in = base;
    in.want_error = error_pass;
    gsl_function f{kerr_emission_integrand, &in};
    double result = 0, abserr = 0;
    use_gsl_status_codes();
    const int status = gsl_integration_qags(&f, lo, hi, 0.0, tolerance::kerr_quadrature_relative,
                                            tolerance::kerr_quadrature_intervals, w.get(), &result, &abserr);
    // The error pass integrates |error of Gamma| th, which need not be smooth: its estimate is
    // what is wanted, converged or not.
    if (status != GSL_SUCCESS && status != GSL_EROUND && !error_pass)
      throw NumericalError(
          "Kerr emission quadrature (GSL qags)",
          fmt::format("{} on a* = {}, x in [{:.6g}, {:.6g}]: {} (result {:.6e} +- {:.1e})", describe(*base.mode),
                      base.hole->a, lo, hi, gsl_strerror(status), result, abserr));
    if (error_pass) {
      out.error += std::abs(result);
    } else {
      out.value = result;
      out.error += abserr;
    }
  }
  return out;
}

Estimate kerr_mode_moment(const KerrHole& hole, const KerrMode& mode, const KerrGamma& gamma, int moment,
                          double x_cut) {
  const double threshold = mode.m() * hole.angular_velocity;
  const double top = std::max(threshold, 0.0) + tolerance::kerr_thermal_cut * hole.temperature();
  const KerrEmissionIntegrand base{&hole, &mode, &gamma, moment, false};
  Estimate total;
  const auto add = [&](Estimate e) {
    total.value += e.value;
    total.error += e.error;
  };
  if (threshold > x_cut) {
    add(kerr_piece(base, x_cut, threshold));
    add(kerr_piece(base, threshold, top));
  } else {
    add(kerr_piece(base, x_cut, top));
  }
  return total;
}

}  // namespace

KerrEmission kerr_emission_per_dof(const KerrHole& hole, const std::vector<KerrMode>& modes, const KerrGamma& gamma,
                                   double x_cut) {
  KerrEmission e;
  const auto add = [](Estimate& to, Estimate e) {
    to.value += e.value;
    to.error += e.error;
  };
  for (const KerrMode& mode : modes) {
    add(e.number, kerr_mode_moment(hole, mode, gamma, 0, x_cut));
    add(e.power, kerr_mode_moment(hole, mode, gamma, 1, x_cut));
    if (mode.twice_m != 0) add(e.torque, kerr_mode_moment(hole, mode, gamma, 2, x_cut));
  }
  return e;
}

}  // namespace ember::greybody
