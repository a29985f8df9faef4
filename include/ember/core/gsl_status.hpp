// GSL reports errors through a process-wide handler that aborts by default. Ember checks every
// GSL status itself and turns failures into NumericalError, so it switches the handler off. The
// switch is process-wide and is never switched back, so concurrent solves cannot race on it.
#pragma once

namespace ember {

void use_gsl_status_codes();  // idempotent

}  // namespace ember
