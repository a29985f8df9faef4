// Data files compiled into the binary (see CMakeLists.txt): their text, as shipped in data/.
#pragma once

#include <string_view>

namespace ember::embedded {

std::string_view standard_model_yaml();  // data/standard_model.yaml
std::string_view cosmology_yaml();       // data/cosmology.yaml

}  // namespace ember::embedded
