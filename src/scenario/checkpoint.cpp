#include "ember/scenario/checkpoint.hpp"

#include <fmt/format.h>

#include <fstream>
#include <sstream>

#include "ember/core/atomic_file.hpp"
#include "ember/core/errors.hpp"
#include "ember/core/hash.hpp"

namespace ember::scenario {

namespace {
constexpr const char* identity_file = "job.identity";

std::optional<std::string> read_all(const std::filesystem::path& p) {
  std::ifstream in(p);
  if (!in) return std::nullopt;
  std::ostringstream s;
  s << in.rdbuf();
  return s.str();
}

// A unit file ends with a fingerprint of its text: a damaged file is recomputed, not trusted.
constexpr std::string_view sum_tag = "checksum ";
}  // namespace

Checkpoint::Checkpoint(const CheckpointOptions& o) : dir_(o.directory) {
  const auto existing = read_all(dir_ / identity_file);
  if (existing && *existing != o.identity + "\n") {
    if (!o.restart)
      throw InputError(fmt::format(
          "{}: a checkpoint of a different job (the scenario, its hash or the job options changed); expected the "
          "same scenario to resume, or --restart to discard the checkpoint",
          (dir_ / identity_file).string()));
  }
  if (o.restart || (existing && *existing != o.identity + "\n")) std::filesystem::remove_all(dir_);
  if (!existing || o.restart) write_file_atomically(dir_ / identity_file, o.identity + "\n");
}

std::filesystem::path Checkpoint::unit_file(std::size_t unit) const {
  return dir_ / fmt::format("unit-{:06d}.txt", unit);
}

std::optional<std::string> Checkpoint::load(std::size_t unit) const {
  const auto text = read_all(unit_file(unit));
  if (!text) return std::nullopt;
  const std::size_t at = text->rfind(sum_tag);
  if (at == std::string::npos) return std::nullopt;
  const std::string body = text->substr(0, at);
  if (text->substr(at + sum_tag.size()) != fingerprint(body) + "\n") return std::nullopt;
  return body;
}

void Checkpoint::save(std::size_t unit, const std::string& text) const {
  write_file_atomically(unit_file(unit), text + std::string(sum_tag) + fingerprint(text) + "\n");
}

void Checkpoint::remove_folder(const std::filesystem::path& directory) {
  std::error_code ec;
  std::filesystem::remove_all(directory, ec);  // best effort: a leftover folder only costs disk
}

}  // namespace ember::scenario
