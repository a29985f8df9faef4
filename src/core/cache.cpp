#include "ember/core/cache.hpp"

#include <cstdlib>
#include <fstream>
#include <sstream>

#include "ember/core/atomic_file.hpp"
#include "ember/core/errors.hpp"

namespace ember {

std::optional<std::filesystem::path> default_cache_directory() {
  if (const char* e = std::getenv("EMBER_CACHE_DIR"); e && *e) return std::filesystem::path(e);
  if (const char* x = std::getenv("XDG_CACHE_HOME"); x && *x) return std::filesystem::path(x) / "ember";
  if (const char* h = std::getenv("HOME"); h && *h) return std::filesystem::path(h) / ".cache" / "ember";
  return std::nullopt;
}

std::optional<std::string> cache_read(const std::filesystem::path& directory, const std::string& key) {
  std::ifstream in(directory / key);
  if (!in) return std::nullopt;
  std::ostringstream s;
  s << in.rdbuf();
  return s.str();
}

bool cache_write(const std::filesystem::path& directory, const std::string& key, const std::string& text) {
  try {
    write_file_atomically(directory / key, text);
    return true;
  } catch (const InputError&) {
    return false;
  }
}

}  // namespace ember
