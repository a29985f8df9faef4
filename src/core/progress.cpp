#include "ember/core/progress.hpp"

#include <fmt/format.h>
#include <unistd.h>

#include <algorithm>
#include <cstdio>

namespace ember {

Progress::Progress(std::string label, double total, bool quiet)
    : label_(std::move(label)),
      total_(total > 0 ? total : 1),
      quiet_(quiet),
      terminal_(::isatty(STDERR_FILENO) != 0),
      start_(std::chrono::steady_clock::now()),
      last_(start_) {}

void Progress::advance(double done, const std::string& detail) {
  if (quiet_) return;
  const auto now = std::chrono::steady_clock::now();
  const double since_last = std::chrono::duration<double>(now - last_).count();
  if (terminal_ ? since_last < 0.1 : since_last < 3.0) return;
  last_ = now;
  shown_ = true;
  const double elapsed = std::chrono::duration<double>(now - start_).count();
  const double fraction = std::clamp(done / total_, 0.0, 1.0);
  const double left = fraction > 0 ? elapsed * (1 - fraction) / fraction : 0;
  if (terminal_) {
    const int width = 30, filled = static_cast<int>(fraction * width);
    fmt::print(stderr, "\r{} [{}{}] {:3.0f}%  {:.0f} s left  {:<36}", label_, std::string(filled, '#'),
               std::string(width - filled, '-'), 100 * fraction, left, detail);
  } else {
    fmt::print(stderr, "{}: {:.0f}%, {:.0f} s left {}\n", label_, 100 * fraction, left, detail);
  }
  std::fflush(stderr);
}

void Progress::finish() {
  if (quiet_ || finished_ || !shown_) return;
  finished_ = true;
  const double elapsed = std::chrono::duration<double>(std::chrono::steady_clock::now() - start_).count();
  if (terminal_) fmt::print(stderr, "\r{}\r", std::string(100, ' '));
  fmt::print(stderr, "{}: done in {:.1f} s\n", label_, elapsed);
}

}  // namespace ember
