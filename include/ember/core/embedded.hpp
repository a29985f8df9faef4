// Data files compiled into the binary (see CMakeLists.txt): their text, as shipped in data/.
#pragma once

#include <string_view>

namespace ember::embedded {

std::string_view standard_model_yaml();  // data/standard_model.yaml
std::string_view cosmology_yaml();       // data/cosmology.yaml
// 16 hex digits over the sources and data a cached B(M) table depends on (see CMakeLists.txt).
std::string_view numerics_fingerprint();
// 16 hex digits over the sources a greybody table is built from (core, units, greybody).
std::string_view greybody_fingerprint();

}  // namespace ember::embedded
