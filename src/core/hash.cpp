#include "ember/core/hash.hpp"

#include <fmt/format.h>

#include <cstdint>

namespace ember {

std::string fingerprint(std::string_view text) {
  std::uint64_t h = 14695981039346656037ull;  // FNV-1a 64-bit offset basis
  for (const unsigned char c : text) {
    h ^= c;
    h *= 1099511628211ull;  // FNV-1a 64-bit prime
  }
  return fmt::format("{:016x}", h);
}

}  // namespace ember
