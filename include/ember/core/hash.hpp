// A stable 64-bit fingerprint of a text (FNV-1a; Fowler, Noll & Vo), written as 16 hex digits.
// Used to tie output files to the resolved scenario that made them; not for security.
#pragma once

#include <string>
#include <string_view>

namespace ember {

std::string fingerprint(std::string_view text);

}  // namespace ember
