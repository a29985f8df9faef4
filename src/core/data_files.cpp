#include "ember/core/data_files.hpp"

#include <dlfcn.h>
#include <fmt/format.h>

#include <cstdlib>

#include "ember/core/errors.hpp"

namespace ember {

namespace {

// The file this code was loaded from: libember.so, or the executable when linked statically.
std::optional<std::filesystem::path> own_file() {
  Dl_info info{};
  if (dladdr(reinterpret_cast<void*>(&installation_root), &info) == 0 || !info.dli_fname || !*info.dli_fname)
    return std::nullopt;
  std::error_code ec;
  // Symbolic links resolved: libember.so.0.1 -> libember.so.0.1.0, a linked prefix -> its target.
  std::filesystem::path p = std::filesystem::canonical(info.dli_fname, ec);
  if (ec) return std::nullopt;
  return p;
}

constexpr std::string_view data_below_root = "share/ember/data";
// P/lib/libember.so, P/lib/x86_64-linux-gnu/libember.so (Debian's multiarch folder), build/lib.
constexpr int levels_searched = 3;

}  // namespace

std::optional<std::filesystem::path> installation_root() {
  const auto file = own_file();
  if (!file) return std::nullopt;
  std::filesystem::path dir = file->parent_path();
  for (int i = 0; i < levels_searched && dir.has_relative_path(); ++i) {
    dir = dir.parent_path();
    std::error_code ec;
    if (std::filesystem::is_directory(dir / data_below_root, ec)) return dir;
  }
  return std::nullopt;
}

std::filesystem::path data_directory() {
  if (const char* env = std::getenv("EMBER_DATA_DIR"); env && *env) return env;
  if (const auto root = installation_root()) return *root / data_below_root;
  const auto file = own_file();
  throw InputError(fmt::format(
      "Ember's data folder was not found: no {} in the folders above {}; expected an installed Ember (its prefix "
      "kept whole) or EMBER_DATA_DIR naming a folder with greybody.tsv, particles.yaml and relativistic_dof.tsv",
      data_below_root, file ? file->string() : std::string("the Ember library")));
}

std::filesystem::path data_file(std::string_view name) {
  return data_directory() / name;
}

}  // namespace ember
