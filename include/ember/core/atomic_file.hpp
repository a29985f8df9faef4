// Writing result files so an interrupted run never leaves a half-written one: the text goes to a
// temporary file in the target's folder, is flushed to disk, and is renamed over the target.
#pragma once

#include <filesystem>
#include <optional>
#include <string>
#include <string_view>

namespace ember {

// Creates missing parent folders. Throws, naming the file and the reason:
//  - InputError when the path cannot be what it is asked to be (a directory where the file
//    goes, a plain file where a folder must be): the user named the wrong thing;
//  - OutputError when the system refuses (disk full, read-only, no permission, I/O error).
void write_file_atomically(const std::filesystem::path& target, std::string_view content);

// Before a long computation: refuses a target that could never be written, with the errors
// write_file_atomically would give (a directory in the way; no writable folder to put it in).
void check_writable_file(const std::filesystem::path& target);

// A failed write, classified as above: whether the path is at fault, and the system's reason.
struct WriteFailure {
  bool path_at_fault = false;
  std::string reason;
};
// The same write, reporting a failure instead of throwing.
std::optional<WriteFailure> try_write_file_atomically(const std::filesystem::path& target, std::string_view content);
// The failure as an exception: InputError or OutputError, with `message` as its text.
[[noreturn]] void throw_write_failure(const WriteFailure& failure, const std::string& message);
// errno after a failed call on a path, classified.
WriteFailure write_failure_from_errno(int code);

}  // namespace ember
