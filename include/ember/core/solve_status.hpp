// How an iterative solve ended, for every solver's summary (greybody waves, bounces).
#pragma once

namespace ember {

enum class SolveStatus { converged, not_converged };

}  // namespace ember
