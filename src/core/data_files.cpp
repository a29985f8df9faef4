#include "ember/core/data_files.hpp"

#include <cstdlib>

namespace ember {

std::filesystem::path data_directory() {
  if (const char* env = std::getenv("EMBER_DATA_DIR"); env && *env) return env;
  return EMBER_DEFAULT_DATA_DIR;  // set by CMake to <source>/data
}

std::filesystem::path data_file(std::string_view name) {
  return data_directory() / name;
}

}  // namespace ember
