// Exact text records of numbers, for the on-disk cache, checkpoints and messages between MPI
// ranks: doubles are written as hex floats (C99 %a), so they read back bit for bit. Tokens are
// separated by spaces; a text field takes the rest of its line.
#pragma once

#include <optional>
#include <sstream>
#include <string>
#include <string_view>

namespace ember {

std::string hex_float(double x);
// Throws InputError naming `what` when the text is not a hex float (inf and nan are accepted).
double parse_hex_float(std::string_view text, std::string_view what);

class RecordWriter {
 public:
  RecordWriter& word(std::string_view w);
  RecordWriter& real(double x);
  RecordWriter& maybe_real(const std::optional<double>& x);  // "-" for none
  RecordWriter& whole(long long n);
  RecordWriter& flag(bool b);
  RecordWriter& text_line(std::string_view tag, std::string_view text);  // "tag text\n"; no newlines in text
  RecordWriter& end_line();
  const std::string& str() const { return out_; }

 private:
  void separate();
  std::string out_;
};

// Every read throws InputError naming `what` on a missing or malformed token.
class RecordReader {
 public:
  RecordReader(const std::string& text, std::string what);
  std::string word();
  void expect(std::string_view w);
  double real();
  std::optional<double> maybe_real();
  long long whole();
  bool flag();
  std::string text_line(std::string_view tag);
  bool at_end();

 private:
  [[noreturn]] void fail(const std::string& problem) const;
  std::istringstream in_;
  std::string what_;
};

}  // namespace ember
