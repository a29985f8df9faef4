// A folder of results keyed by a fingerprint of everything they depend on, shared safely by
// several processes: entries are written atomically (temporary file and rename), so a reader sees
// a whole entry or none; two writers of one key write the same bytes.
#pragma once

#include <filesystem>
#include <optional>
#include <string>

namespace ember {

// EMBER_CACHE_DIR, else $XDG_CACHE_HOME/ember, else $HOME/.cache/ember; none if none is set.
std::optional<std::filesystem::path> default_cache_directory();

std::optional<std::string> cache_read(const std::filesystem::path& directory, const std::string& key);
// A failure to write is not an error (the cache is an optimisation): it returns the reason,
// naming the folder, for the caller to warn about once; none when the entry was stored.
std::optional<std::string> cache_write(const std::filesystem::path& directory, const std::string& key,
                                       const std::string& text);

// A text with a checksum line appended, and the text back if its checksum holds.
std::string with_checksum(const std::string& text);
std::optional<std::string> without_checksum(const std::string& entry);

// cache_read and cache_write with a checksum line appended on writing and verified on reading, so a damaged entry
// reads as absent even where it would still parse.
std::optional<std::string> cache_read_checked(const std::filesystem::path& directory, const std::string& key);
std::optional<std::string> cache_write_checked(const std::filesystem::path& directory, const std::string& key,
                                               const std::string& text);

}  // namespace ember
