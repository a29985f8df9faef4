// Reading a user's input file whole, with the checks every reader needs: the path exists, is
// not a directory, can be read, and is not larger than the reader will take. The read itself is
// bounded, so a device or a growing file (/dev/zero) ends with an error instead of exhausting
// memory.
#pragma once

#include <cstdint>
#include <filesystem>
#include <string>
#include <string_view>

namespace ember {

// The file's bytes. Throws InputError "FILE: <problem>; expected <expected>" when the path is
// missing, a directory, unreadable, or longer than max_bytes.
std::string read_input_file(const std::filesystem::path& file, std::string_view expected, std::uintmax_t max_bytes);

}  // namespace ember
