// GSL's splines, Brent root and minimum searches and integration workspaces, owned here (RAII)
// so no module allocates or frees GSL objects by hand, and with each search's stopping rule in
// its arguments, written where it is called.
//
// Nothing is thrown through GSL's C frames: an exception from the function being searched is kept
// and rethrown once GSL has returned. GSL's own failures come back as status codes
// (use_gsl_status_codes, gsl_status.hpp).
#pragma once

#include <gsl/gsl_integration.h>
#include <gsl/gsl_spline.h>

#include <functional>
#include <memory>
#include <string>
#include <vector>

namespace ember {

// y(x) through given points (x increasing), by one of GSL's interpolation types. Copies share the
// same immutable GSL object; GSL keeps its own copy of the points.
class Spline {
 public:
  enum class Kind { linear, cubic, steffen };  // gsl_interp_linear, _cspline (natural), _steffen (monotone)
  // Throws InputError naming `what` when GSL refuses the points.
  Spline(Kind kind, const std::vector<double>& x, const std::vector<double>& y, const std::string& what = "spline");
  double value(double x) const { return gsl_spline_eval(s_.get(), x, nullptr); }
  double slope(double x) const { return gsl_spline_eval_deriv(s_.get(), x, nullptr); }
  double curvature(double x) const { return gsl_spline_eval_deriv2(s_.get(), x, nullptr); }

 private:
  std::shared_ptr<gsl_spline> s_;
};

// The end of a Brent search: where it stopped, its last bracket, and how.
struct BrentResult {
  double x = 0;  // the root, or the minimum's abscissa
  double lower = 0, upper = 0;
  double f_minimum = 0;    // minimum searches: f(x)
  int status = 0;          // GSL_SUCCESS, or GSL's error (a NaN from f, say): x is then not to be used
  bool converged = false;  // the bracket closed to within the tolerance
};

// Brent's method on f over [lo, hi] (a sign change); stops when the bracket is narrower than
// `tolerance` (absolute, in x; gsl_root_test_interval) or after `iterations`.
BrentResult brent_root(const std::function<double(double)>& f, double lo, double hi, double tolerance,
                       int iterations = 200);

// Brent's minimiser on f over [lo, hi] from `guess` (f(guess) below both ends); stops when the
// bracket is narrower than `tolerance` (absolute), after `iterations`, or as soon as the minimum
// found lies below `stop_below` when one is given.
BrentResult brent_minimum(const std::function<double(double)>& f, double guess, double lo, double hi, double tolerance,
                          int iterations = 100, const double* stop_below = nullptr);

// One 21-point Gauss-Kronrod rule over [lo, hi] (gsl_integration_qk21): no error estimate is
// returned, so callers use it on pieces small enough to be converged, and say why.
double gauss_kronrod21(const std::function<double(double)>& f, double lo, double hi);

using IntegrationWorkspace = std::unique_ptr<gsl_integration_workspace, decltype(&gsl_integration_workspace_free)>;
IntegrationWorkspace integration_workspace(std::size_t intervals);

}  // namespace ember
