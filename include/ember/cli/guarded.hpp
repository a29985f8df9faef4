// The one place where errors become exit codes (DEVELOPERS.md, "Errors and exit codes"):
// InputError -> 2, NumericalError -> 3, OutputError -> 4, any other exception -> 1, each with one line on stderr
// ("ember: ..."); stdout is flushed first so a partial text never interleaves with the message.
#pragma once

#include <functional>

namespace ember::cli {

int run_guarded(const std::function<int()>& body);

}  // namespace ember::cli
