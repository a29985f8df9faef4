// Progress of long work on stderr: a redrawn bar with rate and time left on a terminal, a plain
// line every few seconds otherwise, nothing when quiet. Work done before the first update is due
// prints nothing at all.
//
// Work is measured in whatever units the caller chooses; where its pieces cost unequal amounts
// (a B(M) table against a chunk of formation masses), the caller passes each piece's expected
// cost, so the fraction done and the time left follow the cost rather than the count.
#pragma once

#include <chrono>
#include <string>

namespace ember {

class Progress {
 public:
  Progress(std::string label, double total, bool quiet = false);
  void advance(double done, const std::string& detail = "");
  void finish();

 private:
  std::string label_;
  double total_;
  bool quiet_, terminal_, finished_ = false, shown_ = false;
  std::chrono::steady_clock::time_point start_, last_;
};

}  // namespace ember
