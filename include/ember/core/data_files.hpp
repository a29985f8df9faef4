// Where Ember finds its data tables (greybody.tsv, particles.yaml, ...) and the helper programs
// of the command line (scripts/plot), in an installed copy and in a build tree alike.
//
// The installation root is the nearest folder above the shared library holding this code
// (libember.so) that has share/ember/data: P for an install to P (P/lib/libember.so), the build
// folder in a build tree (build/lib/libember.so, where CMake links build/share/ember/data to the
// source tree's data/ and build/libexec/ember/plot to scripts/plot). Nothing is baked in, so an
// installed copy keeps working when its prefix is moved.
#pragma once

#include <filesystem>
#include <optional>
#include <string_view>

namespace ember {

// None when no such folder is found (a library copied out of its tree).
std::optional<std::filesystem::path> installation_root();

// The folder named by the EMBER_DATA_DIR environment variable, else ROOT/share/ember/data; throws
// InputError when neither is there.
std::filesystem::path data_directory();
std::filesystem::path data_file(std::string_view name);

}  // namespace ember
