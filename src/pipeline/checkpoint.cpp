#include "ember/pipeline/checkpoint.hpp"

#include <fmt/format.h>

#include "ember/core/atomic_file.hpp"
#include "ember/core/cache.hpp"
#include "ember/core/errors.hpp"

namespace ember::pipeline {

namespace {
constexpr const char* identity_file = "job.identity";

// A checkpoint that cannot be written is an error (unlike the cache: resuming would be lost),
// named by its folder.
void write_or_fail(const std::filesystem::path& dir, const std::string& name, const std::string& text) {
  if (const auto f = try_write_file_atomically(dir / name, text))
    throw_write_failure(*f, fmt::format("{}: cannot write the checkpoint: {}; expected a writable folder (choose "
                                        "another with --checkpoint)",
                                        dir.string(), f->reason));
}

}  // namespace

Checkpoint::Checkpoint(const CheckpointOptions& o) : dir_(o.directory) {
  const auto existing = cache_read(dir_, identity_file);
  if (existing && *existing != o.identity + "\n") {
    if (!o.restart)
      throw InputError(fmt::format(
          "{}: a checkpoint of a different job (the scenario, its hash or the job options changed); expected the "
          "same scenario to resume, or --restart to discard the checkpoint",
          (dir_ / identity_file).string()));
  }
  if (o.restart || (existing && *existing != o.identity + "\n")) std::filesystem::remove_all(dir_);
  if (!existing || o.restart) write_or_fail(dir_, identity_file, o.identity + "\n");
}

std::filesystem::path Checkpoint::item_file(std::size_t unit) const {
  return dir_ / fmt::format("item-{:06d}.txt", unit);
}

std::optional<std::string> Checkpoint::load(std::size_t unit) const {
  return cache_read_checked(dir_, item_file(unit).filename().string());
}

void Checkpoint::save(std::size_t unit, const std::string& text) {
  if (failure_) return;
  if (const auto f = try_write_file_atomically(item_file(unit), with_checksum(text)))
    failure_ = fmt::format(
        "the checkpoint in {} cannot be written ({}); the run goes on without it, and the "
        "work saved before still resumes it",
        dir_.string(), f->reason);
}

void Checkpoint::remove_folder(const std::filesystem::path& directory) {
  std::error_code ec;
  std::filesystem::remove_all(directory, ec);  // best effort: a leftover folder only costs disk
}

}  // namespace ember::pipeline
