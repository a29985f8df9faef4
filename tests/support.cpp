#include "support.hpp"

namespace ember::testing {

std::filesystem::path source_root() {
  return EMBER_SOURCE_DIR;  // set by tests/CMakeLists.txt
}

}  // namespace ember::testing
