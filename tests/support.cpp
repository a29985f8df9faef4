#include "support.hpp"

namespace ember::testing {

const cosmology::Background& planck_background() {
  static const cosmology::Background b(cosmology::planck2018(),
                                       cosmology::DegreesOfFreedom::load(source_dir / "data/relativistic_dof.tsv"));
  return b;
}

std::filesystem::path source_root() {
  return EMBER_SOURCE_DIR;  // set by tests/CMakeLists.txt
}

}  // namespace ember::testing
