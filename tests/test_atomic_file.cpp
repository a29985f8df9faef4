#include <doctest/doctest.h>
#include <unistd.h>

#include <filesystem>
#include <fstream>
#include <sstream>

#include "ember/core/atomic_file.hpp"
#include "ember/core/errors.hpp"

namespace fs = std::filesystem;

namespace {
fs::path fresh_folder(const std::string& name) {
  const fs::path p = fs::temp_directory_path() / ("ember-test-" + name + "-" + std::to_string(::getpid()));
  fs::remove_all(p);
  return p;
}
std::string slurp(const fs::path& p) {
  std::ifstream in(p);
  std::ostringstream s;
  s << in.rdbuf();
  return s.str();
}
}  // namespace

TEST_CASE("atomic writes create folders, replace files and leave no temporaries") {
  const fs::path dir = fresh_folder("atomic");
  const fs::path target = dir / "sub" / "result.txt";
  ember::write_file_atomically(target, "first\n");
  CHECK(slurp(target) == "first\n");
  ember::write_file_atomically(target, "second\n");
  CHECK(slurp(target) == "second\n");
  int entries = 0;
  for ([[maybe_unused]] const auto& e : fs::directory_iterator(dir / "sub")) ++entries;
  CHECK(entries == 1);
  fs::remove_all(dir);
}

TEST_CASE("unwritable targets are input errors naming the file") {
  const fs::path dir = fresh_folder("atomic-bad");
  fs::create_directories(dir / "a-folder");
  std::ofstream(dir / "plain-file") << "x";
  CHECK_THROWS_WITH_AS(ember::write_file_atomically(dir / "a-folder", "x"),
                       doctest::Contains("a-folder: cannot write: it is a directory"), ember::InputError);
  // A folder path that runs through a regular file cannot be created, even by root.
  CHECK_THROWS_WITH_AS(ember::write_file_atomically(dir / "plain-file" / "out.txt", "x"),
                       doctest::Contains("cannot create folder"), ember::InputError);
  fs::remove_all(dir);
}
