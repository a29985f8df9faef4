// Progress of long work on stderr: a redrawn bar with rate and time left on a terminal, a plain
// line every few seconds otherwise, nothing when quiet. Work done before the first update is due
// prints nothing at all.
#pragma once

#include <chrono>
#include <string>

namespace ember {

class Progress {
 public:
  Progress(std::string label, long total, bool quiet = false);
  void advance(long done, const std::string& detail = "");
  void finish();

 private:
  std::string label_;
  long total_;
  bool quiet_, terminal_, finished_ = false, shown_ = false;
  std::chrono::steady_clock::time_point start_, last_;
};

}  // namespace ember
