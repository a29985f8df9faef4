#include "ember/core/record.hpp"

#include <fmt/format.h>

#include <charconv>
#include <cmath>

#include "ember/core/errors.hpp"

namespace ember {

std::string hex_float(double x) {
  return fmt::format("{:a}", x);
}

double parse_hex_float(std::string_view text, std::string_view what) {
  const bool negative = !text.empty() && text[0] == '-';
  std::string_view body = text.substr(negative ? 1 : 0);
  if (body.size() > 2 && body[0] == '0' && (body[1] == 'x' || body[1] == 'X')) body.remove_prefix(2);
  double x = 0;
  const auto [end, ec] = std::from_chars(body.data(), body.data() + body.size(), x, std::chars_format::hex);
  if (body.empty() || ec != std::errc{} || end != body.data() + body.size())
    throw InputError(fmt::format("{}: \"{}\" is not a hex float; expected the format Ember writes", what, text));
  return negative ? -x : x;
}

void RecordWriter::separate() {
  if (!out_.empty() && out_.back() != '\n') out_ += ' ';
}
RecordWriter& RecordWriter::word(std::string_view w) {
  separate();
  out_ += w;
  return *this;
}
RecordWriter& RecordWriter::real(double x) {
  return word(hex_float(x));
}
RecordWriter& RecordWriter::maybe_real(const std::optional<double>& x) {
  return x ? real(*x) : word("-");
}
RecordWriter& RecordWriter::whole(long long n) {
  return word(std::to_string(n));
}
RecordWriter& RecordWriter::flag(bool b) {
  return word(b ? "1" : "0");
}
RecordWriter& RecordWriter::text_line(std::string_view tag, std::string_view text) {
  if (!out_.empty() && out_.back() != '\n') out_ += '\n';
  out_ += tag;
  out_ += ' ';
  for (char c : text) out_ += c == '\n' ? ' ' : c;
  out_ += '\n';
  return *this;
}
RecordWriter& RecordWriter::end_line() {
  out_ += '\n';
  return *this;
}

RecordReader::RecordReader(const std::string& text, std::string what) : in_(text), what_(std::move(what)) {}

void RecordReader::fail(const std::string& problem) const {
  throw InputError(fmt::format("{}: {}; expected the format Ember writes", what_, problem));
}
std::string RecordReader::word() {
  std::string w;
  if (!(in_ >> w)) fail("ends early");
  return w;
}
void RecordReader::expect(std::string_view w) {
  const std::string got = word();
  if (got != w) fail(fmt::format("\"{}\" where \"{}\" belongs", got, w));
}
double RecordReader::real() {
  return parse_hex_float(word(), what_);
}
std::optional<double> RecordReader::maybe_real() {
  const std::string w = word();
  if (w == "-") return std::nullopt;
  return parse_hex_float(w, what_);
}
long long RecordReader::whole() {
  const std::string w = word();
  long long n = 0;
  const auto [end, ec] = std::from_chars(w.data(), w.data() + w.size(), n);
  if (ec != std::errc{} || end != w.data() + w.size()) fail(fmt::format("\"{}\" is not a whole number", w));
  return n;
}
bool RecordReader::flag() {
  const long long n = whole();
  if (n != 0 && n != 1) fail(fmt::format("flag {} is not 0 or 1", n));
  return n == 1;
}
std::string RecordReader::text_line(std::string_view tag) {
  expect(tag);
  std::string rest;
  std::getline(in_, rest);
  if (!rest.empty() && rest.front() == ' ') rest.erase(0, 1);
  return rest;
}
bool RecordReader::at_end() {
  in_ >> std::ws;
  return in_.eof();
}

}  // namespace ember
