// A run's set of result files, which appears in its folder whole or not at all. Files are
// written into a staging folder inside the results folder (the same file system, so moving them
// is a rename); on commit the previous set's marker file (summary.json) is removed, every staged
// file is moved into place, and the new marker comes last. A reader who finds the marker
// therefore finds every file it describes; a run that fails before commit changes nothing there
// (a folder it created is removed again).
//
// The folder belongs to the run: each commit records the files it moved into place in a manifest
// (`.ember-files`, one name a line). The next commit removes the previous set's files that the new
// set does not have, and never touches a file no set recorded. A non-empty folder that no run of
// Ember wrote (no manifest, and no summary.json of an earlier Ember) is refused unless the caller
// adopts it (ForeignFolder::adopt); hidden entries (checkpoints, staging) do not count.
//
// Errors name the results folder, not an internal file: InputError when the folder cannot be a
// folder (a plain file is in the way), OutputError when the system refuses (disk full, read-only,
// no permission).
#pragma once

#include <filesystem>
#include <string>
#include <string_view>
#include <vector>

namespace ember {

inline constexpr const char* manifest_name = ".ember-files";
enum class ForeignFolder { refuse, adopt };

// Before a long computation: refuses a results folder that could never be written, with the
// same errors as OutputSet (a plain file in the way; an existing ancestor not writable).
void check_results_folder(const std::filesystem::path& folder, ForeignFolder foreign = ForeignFolder::refuse);

class OutputSet {
 public:
  OutputSet(std::filesystem::path folder, std::string marker, ForeignFolder foreign = ForeignFolder::refuse);
  OutputSet(const OutputSet&) = delete;
  OutputSet& operator=(const OutputSet&) = delete;
  ~OutputSet();  // not committed: the staging folder goes (and the results folder, if made here and empty)

  void add(const std::string& name, std::string_view text);
  // Where others (a plotting script) may write files that become part of the set.
  const std::filesystem::path& staging() const { return staging_; }
  // Moves the set into place; returns its files: those added, in order, then any others.
  std::vector<std::string> commit();

 private:
  std::filesystem::path folder_, staging_;
  std::string marker_;
  std::vector<std::string> added_;
  bool created_folder_ = false, committed_ = false;
  [[noreturn]] void fail(bool path_at_fault, const std::string& reason) const;
};

}  // namespace ember
