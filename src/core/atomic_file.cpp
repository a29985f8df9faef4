#include "ember/core/atomic_file.hpp"

#include <fcntl.h>
#include <fmt/format.h>
#include <sys/stat.h>
#include <unistd.h>

#include <cerrno>
#include <cstdio>
#include <cstring>
#include <string>
#include <system_error>

#include "ember/core/errors.hpp"

namespace ember {

namespace {
[[noreturn]] void fail(const std::filesystem::path& target, const std::string& reason) {
  throw InputError(fmt::format("{}: cannot write: {}; expected a writable file path", target.string(), reason));
}
}  // namespace

void write_file_atomically(const std::filesystem::path& target, std::string_view content) {
  std::error_code ec;
  if (std::filesystem::is_directory(target, ec)) fail(target, "it is a directory");
  std::filesystem::path folder = target.parent_path();
  if (folder.empty()) folder = ".";
  std::filesystem::create_directories(folder, ec);
  if (ec) fail(target, fmt::format("cannot create folder {}: {}", folder.string(), ec.message()));

  std::string temp = (folder / ("." + target.filename().string() + ".tmp.XXXXXX")).string();
  const int fd = ::mkstemp(temp.data());
  if (fd < 0) fail(target, std::strerror(errno));

  const char* data = content.data();
  std::size_t left = content.size();
  while (left > 0) {
    const ssize_t n = ::write(fd, data, left);
    if (n < 0 && errno == EINTR) continue;
    if (n <= 0) {
      const std::string reason = std::strerror(errno);
      ::close(fd);
      ::unlink(temp.c_str());
      fail(target, reason);
    }
    data += n;
    left -= static_cast<std::size_t>(n);
  }
  // mkstemp creates 0600; results are ordinary files, readable as the umask allows.
  const mode_t mask = ::umask(0);
  ::umask(mask);
  ::fchmod(fd, 0666 & ~mask);
  if (::fsync(fd) != 0 || ::close(fd) != 0) {
    const std::string reason = std::strerror(errno);
    ::unlink(temp.c_str());
    fail(target, reason);
  }
  if (std::rename(temp.c_str(), target.c_str()) != 0) {
    const std::string reason = std::strerror(errno);
    ::unlink(temp.c_str());
    fail(target, reason);
  }
}

}  // namespace ember
