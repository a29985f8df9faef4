#include "ember/core/gsl_tools.hpp"

#include <fmt/format.h>
#include <gsl/gsl_errno.h>
#include <gsl/gsl_min.h>
#include <gsl/gsl_roots.h>

#include <exception>

#include "ember/core/errors.hpp"
#include "ember/core/gsl_status.hpp"

namespace ember {

namespace {

const gsl_interp_type* type_of(Spline::Kind k) {
  switch (k) {
    case Spline::Kind::linear: return gsl_interp_linear;
    case Spline::Kind::cubic: return gsl_interp_cspline;
    case Spline::Kind::steffen: return gsl_interp_steffen;
  }
  return gsl_interp_cspline;
}

// f behind GSL's C interface; an exception is kept (and f's value is NaN) until GSL returns.
struct Call {
  const std::function<double(double)>* f;
  std::exception_ptr error;
};
double call(double x, void* p) {
  auto* c = static_cast<Call*>(p);
  try {
    return (*c->f)(x);
  } catch (...) {
    c->error = std::current_exception();
    return NAN;
  }
}
// A kept exception first; then GSL's status.
int checked(const Call& c, int status) {
  if (c.error) std::rethrow_exception(c.error);
  return status;
}

}  // namespace

Spline::Spline(Kind kind, const std::vector<double>& x, const std::vector<double>& y, const std::string& what)
    : s_(gsl_spline_alloc(type_of(kind), x.size()), gsl_spline_free) {
  use_gsl_status_codes();
  if (!s_ || x.size() != y.size() || gsl_spline_init(s_.get(), x.data(), y.data(), x.size()) != GSL_SUCCESS)
    throw InputError(fmt::format("{}: GSL cannot interpolate these {} points; expected increasing x", what, x.size()));
}

BrentResult brent_root(const std::function<double(double)>& f, double lo, double hi, double tolerance, int iterations) {
  use_gsl_status_codes();
  const std::unique_ptr<gsl_root_fsolver, decltype(&gsl_root_fsolver_free)> s(
      gsl_root_fsolver_alloc(gsl_root_fsolver_brent), gsl_root_fsolver_free);
  Call c{&f, nullptr};
  gsl_function g{call, &c};
  BrentResult r{0.5 * (lo + hi), lo, hi, 0, GSL_SUCCESS, false};
  if ((r.status = checked(c, gsl_root_fsolver_set(s.get(), &g, lo, hi))) != GSL_SUCCESS) return r;
  for (int i = 0; i < iterations && !r.converged; ++i) {
    if ((r.status = checked(c, gsl_root_fsolver_iterate(s.get()))) != GSL_SUCCESS) return r;
    r.x = gsl_root_fsolver_root(s.get());
    r.lower = gsl_root_fsolver_x_lower(s.get());
    r.upper = gsl_root_fsolver_x_upper(s.get());
    r.converged = gsl_root_test_interval(r.lower, r.upper, tolerance, 0) == GSL_SUCCESS;
  }
  return r;
}

BrentResult brent_minimum(const std::function<double(double)>& f, double guess, double lo, double hi, double tolerance,
                          int iterations, const double* stop_below) {
  use_gsl_status_codes();
  const std::unique_ptr<gsl_min_fminimizer, decltype(&gsl_min_fminimizer_free)> m(
      gsl_min_fminimizer_alloc(gsl_min_fminimizer_brent), gsl_min_fminimizer_free);
  Call c{&f, nullptr};
  gsl_function g{call, &c};
  BrentResult r{guess, lo, hi, 0, GSL_SUCCESS, false};
  if ((r.status = checked(c, gsl_min_fminimizer_set(m.get(), &g, guess, lo, hi))) != GSL_SUCCESS) return r;
  for (int i = 0; i < iterations && !r.converged; ++i) {
    if ((r.status = checked(c, gsl_min_fminimizer_iterate(m.get()))) != GSL_SUCCESS) return r;
    r.x = gsl_min_fminimizer_x_minimum(m.get());
    r.f_minimum = gsl_min_fminimizer_f_minimum(m.get());
    r.lower = gsl_min_fminimizer_x_lower(m.get());
    r.upper = gsl_min_fminimizer_x_upper(m.get());
    if (stop_below && r.f_minimum < *stop_below) break;
    r.converged = gsl_min_test_interval(r.lower, r.upper, tolerance, 0) == GSL_SUCCESS;
  }
  return r;
}

double gauss_kronrod21(const std::function<double(double)>& f, double lo, double hi) {
  Call c{&f, nullptr};
  gsl_function g{call, &c};
  double r = 0, e = 0, ra = 0, rs = 0;
  gsl_integration_qk21(&g, lo, hi, &r, &e, &ra, &rs);
  if (c.error) std::rethrow_exception(c.error);
  return r;
}

IntegrationWorkspace integration_workspace(std::size_t intervals) {
  return {gsl_integration_workspace_alloc(intervals), gsl_integration_workspace_free};
}

}  // namespace ember
