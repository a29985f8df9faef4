#include "ember/core/cache.hpp"

#include <fmt/format.h>

#include <cstdlib>
#include <fstream>
#include <sstream>

#include "ember/core/atomic_file.hpp"
#include "ember/core/errors.hpp"
#include "ember/core/hash.hpp"

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

std::optional<std::string> cache_write(const std::filesystem::path& directory, const std::string& key,
                                       const std::string& text) {
  const auto f = try_write_file_atomically(directory / key, text);
  if (!f) return std::nullopt;
  return fmt::format("the cache in {} cannot be written ({})", directory.string(), f->reason);
}

namespace {
constexpr std::string_view checksum_tag = "checksum ";
}

std::string with_checksum(const std::string& text) {
  return text + std::string(checksum_tag) + fingerprint(text) + "\n";
}

std::optional<std::string> without_checksum(const std::string& entry) {
  const std::size_t at = entry.rfind(checksum_tag);
  if (at == std::string::npos) return std::nullopt;
  std::string body = entry.substr(0, at);
  if (entry.substr(at + checksum_tag.size()) != fingerprint(body) + "\n") return std::nullopt;
  return body;
}

std::optional<std::string> cache_read_checked(const std::filesystem::path& directory, const std::string& key) {
  const auto entry = cache_read(directory, key);
  return entry ? without_checksum(*entry) : std::nullopt;
}

std::optional<std::string> cache_write_checked(const std::filesystem::path& directory, const std::string& key,
                                               const std::string& text) {
  return cache_write(directory, key, with_checksum(text));
}

}  // namespace ember
