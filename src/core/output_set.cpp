#include "ember/core/output_set.hpp"

#include <fcntl.h>
#include <fmt/format.h>
#include <stdlib.h>
#include <unistd.h>

#include <algorithm>
#include <cerrno>
#include <cstdio>
#include <fstream>
#include <system_error>

#include "ember/core/atomic_file.hpp"
#include "ember/core/errors.hpp"

namespace ember {

namespace {
[[noreturn]] void refuse(const std::filesystem::path& folder, bool path_at_fault, const std::string& reason) {
  throw_write_failure({path_at_fault, reason},
                      fmt::format("{}: cannot write the results: {}; no result file was written or changed there{}",
                                  folder.string(), reason,
                                  path_at_fault ? " (expected a folder for the results)"
                                                : " (free some space, or choose another folder with -o)"));
}
// The files the previous set recorded (none without a manifest).
std::vector<std::string> previous_set(const std::filesystem::path& folder) {
  std::vector<std::string> names;
  std::ifstream in(folder / manifest_name);
  for (std::string line; std::getline(in, line);)
    if (!line.empty() && line.front() != '#' && line.find('/') == std::string::npos) names.push_back(line);
  return names;
}

// Whether a run of Ember wrote this folder, or it is empty apart from hidden entries.
bool ours_or_empty(const std::filesystem::path& folder) {
  std::error_code ec;
  if (!std::filesystem::is_directory(folder, ec) || std::filesystem::exists(folder / manifest_name, ec)) return true;
  // An earlier Ember wrote summary.json with its version first; before manifests, that marked the set.
  if (std::ifstream old(folder / "summary.json"); old) {
    std::string head(200, '\0');
    old.read(head.data(), static_cast<std::streamsize>(head.size()));
    if (head.find("\"ember_version\"") != std::string::npos) return true;
  }
  for (const auto& entry : std::filesystem::directory_iterator(folder, ec))
    if (entry.path().filename().string().front() != '.') return false;
  return true;
}

void refuse_foreign(const std::filesystem::path& folder, ForeignFolder foreign) {
  if (foreign == ForeignFolder::refuse && !ours_or_empty(folder))
    throw InputError(
        fmt::format("{}: holds files no run of Ember wrote; expected an empty folder or one of Ember's "
                    "results (pass --adopt-folder to write there anyway: files Ember did not write are "
                    "never touched)",
                    folder.string()));
}

}  // namespace

void check_results_folder(const std::filesystem::path& folder, ForeignFolder foreign) {
  std::error_code ec;
  std::filesystem::path p = folder.empty() ? std::filesystem::path(".") : folder;
  if (std::filesystem::exists(p, ec) && !std::filesystem::is_directory(p, ec))
    refuse(folder, true, "it exists and is not a folder");
  // The nearest folder that exists must be a folder we may write into.
  std::filesystem::path existing = std::filesystem::absolute(p, ec);
  while (!existing.empty() && !std::filesystem::exists(existing, ec)) existing = existing.parent_path();
  if (!std::filesystem::is_directory(existing, ec))
    refuse(folder, true, fmt::format("{} is not a folder", existing.string()));
  if (::access(existing.c_str(), W_OK | X_OK) != 0) refuse(folder, false, write_failure_from_errno(errno).reason);
  refuse_foreign(p, foreign);
}

void OutputSet::fail(bool path_at_fault, const std::string& reason) const {
  refuse(folder_, path_at_fault, reason);
}

OutputSet::OutputSet(std::filesystem::path folder, std::string marker, ForeignFolder foreign)
    : folder_(std::move(folder)), marker_(std::move(marker)) {
  if (folder_.empty()) folder_ = ".";
  std::error_code ec;
  if (std::filesystem::exists(folder_, ec) && !std::filesystem::is_directory(folder_, ec))
    fail(true, "it exists and is not a folder");
  refuse_foreign(folder_, foreign);
  created_folder_ = !std::filesystem::exists(folder_, ec);
  std::filesystem::create_directories(folder_, ec);
  if (ec) {
    const WriteFailure f = write_failure_from_errno(ec.value());
    created_folder_ = false;
    fail(f.path_at_fault, ec.message());
  }
  std::string temp = (folder_ / ".ember-staging-XXXXXX").string();
  if (!::mkdtemp(temp.data())) {
    const WriteFailure f = write_failure_from_errno(errno);
    if (created_folder_) std::filesystem::remove(folder_, ec);
    fail(f.path_at_fault, f.reason);
  }
  staging_ = temp;
}

OutputSet::~OutputSet() {
  if (committed_) return;
  std::error_code ec;
  if (!staging_.empty()) std::filesystem::remove_all(staging_, ec);
  if (created_folder_ && std::filesystem::is_empty(folder_, ec)) std::filesystem::remove(folder_, ec);
}

void OutputSet::add(const std::string& name, std::string_view text) {
  if (const auto f = try_write_file_atomically(staging_ / name, text)) fail(f->path_at_fault, f->reason);
  added_.push_back(name);
}

std::vector<std::string> OutputSet::commit() {
  // The files added, in order, then any others written into the staging folder, sorted.
  std::vector<std::string> names = added_, others;
  std::error_code ec;
  for (const auto& entry : std::filesystem::directory_iterator(staging_, ec)) {
    const std::string name = entry.path().filename().string();
    // A hidden name is a half-written temporary, not part of the set.
    if (name.front() != '.' && std::find(names.begin(), names.end(), name) == names.end()) others.push_back(name);
  }
  if (ec) fail(false, ec.message());
  std::sort(others.begin(), others.end());
  names.insert(names.end(), others.begin(), others.end());
  // The old marker goes first and the new one last, so no marker ever stands beside another
  // set's files.
  std::vector<std::string> order = names;
  std::stable_partition(order.begin(), order.end(), [&](const std::string& n) { return n != marker_; });
  std::filesystem::remove(folder_ / marker_, ec);
  // The previous set's files this set does not replace go too; nothing else is touched.
  for (const auto& old : previous_set(folder_))
    if (std::find(names.begin(), names.end(), old) == names.end() &&
        std::filesystem::is_regular_file(folder_ / old, ec))
      std::filesystem::remove(folder_ / old, ec);
  std::string manifest = "# the files the last run of Ember wrote here; the next run replaces exactly these\n";
  for (const auto& name : names) manifest += name + "\n";
  if (const auto f = try_write_file_atomically(staging_ / manifest_name, manifest)) fail(f->path_at_fault, f->reason);
  order.insert(order.end() - (order.empty() || order.back() != marker_ ? 0 : 1), manifest_name);
  for (const auto& name : order)
    if (std::rename((staging_ / name).c_str(), (folder_ / name).c_str()) != 0) {
      const WriteFailure f = write_failure_from_errno(errno);
      fail(f.path_at_fault, fmt::format("moving {} into place: {}", name, f.reason));
    }
  // Durable once the folder's entries are on disk (best effort: not every file system syncs folders).
  if (const int fd = ::open(folder_.c_str(), O_RDONLY | O_DIRECTORY); fd >= 0) {
    ::fsync(fd);
    ::close(fd);
  }
  committed_ = true;
  std::filesystem::remove_all(staging_, ec);
  return names;
}

}  // namespace ember
