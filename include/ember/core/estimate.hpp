// A result with its error, as GSL returns them: `error` is an honest estimate of |value - truth|.
#pragma once

namespace ember {

struct Estimate {
  double value = 0;
  double error = 0;
};

}  // namespace ember
