// Checkpoints of the main job: every finished work item (a B(M) table, or a chunk of the scan) is written to a
// folder as it completes, atomically, so a killed run loses at most the items in flight. The
// folder also holds the identity of the job (the resolved scenario's hash, the job options and
// the numerics fingerprint); a folder written for another job is refused unless restarting.
#pragma once

#include <cstddef>
#include <filesystem>
#include <optional>
#include <string>

namespace ember::pipeline {

struct CheckpointOptions {
  std::filesystem::path directory;
  std::string identity;  // what must match for the checkpoint to be reused
  bool restart = false;  // discard a checkpoint of another job (or of this one) and start afresh
};

class Checkpoint {
 public:
  // Throws InputError when the folder holds another job's checkpoint and restart is off, and
  // InputError or OutputError (core/atomic_file.hpp) when the folder cannot be written at all.
  explicit Checkpoint(const CheckpointOptions& options);
  std::optional<std::string> load(std::size_t unit) const;  // none if absent or damaged
  // A unit that cannot be saved (the disk filled up during the run) does not stop the run: the
  // units saved so far still resume it. Saving stops, and failure() says why.
  void save(std::size_t unit, const std::string& text);
  const std::optional<std::string>& failure() const { return failure_; }
  // After the outputs are written the checkpoint has served its purpose. Best effort.
  static void remove_folder(const std::filesystem::path& directory);

 private:
  std::filesystem::path item_file(std::size_t unit) const;
  std::filesystem::path dir_;
  std::optional<std::string> failure_;
};

}  // namespace ember::pipeline
