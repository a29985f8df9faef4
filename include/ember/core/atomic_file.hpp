// Writing result files so an interrupted run never leaves a half-written one: the text goes to a
// temporary file in the target's folder, is flushed to disk, and is renamed over the target.
#pragma once

#include <filesystem>
#include <string_view>

namespace ember {

// Creates missing parent folders. Throws InputError naming the file and the reason when the
// target cannot be written (a directory in the way, no permission, a full disk).
void write_file_atomically(const std::filesystem::path& target, std::string_view content);

}  // namespace ember
