#include "ember/core/gsl_status.hpp"

#include <gsl/gsl_errno.h>

namespace ember {

void use_gsl_status_codes() {
  gsl_set_error_handler_off();
}

}  // namespace ember
