// Helpers shared by the doctest suites.
#pragma once

#include <cmath>
#include <filesystem>

namespace ember::testing {

inline const std::filesystem::path source_dir = EMBER_SOURCE_DIR;

// |a - b| <= rel |b|
inline bool close(double a, double b, double rel = 1e-14) {
  return std::abs(a - b) <= rel * std::abs(b);
}

}  // namespace ember::testing
