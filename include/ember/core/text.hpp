// Small text helpers shared by the input parsers: suggestions for misspelt names, joining lists.
#pragma once

#include <optional>
#include <string>
#include <string_view>
#include <vector>

namespace ember {

// Levenshtein edit distance; case-sensitive.
std::size_t edit_distance(std::string_view a, std::string_view b);

// The candidate closest to `word` when it is plausibly a misspelling (a few edits, or a case
// difference), else an empty string.
std::string closest_match(std::string_view word, const std::vector<std::string>& candidates);

// "a, b or c"
std::string join_alternatives(const std::vector<std::string>& items, std::string_view last = "or");

std::string trim(std::string_view text);

// The text with control characters and bytes that are not valid UTF-8 written as \xNN, so a
// message quoting user input never puts raw bytes on the terminal.
std::string printable(std::string_view text);

// The length of the UTF-8 sequence starting at text[i] (1 for ASCII), or 0 when the bytes there
// are not valid UTF-8 (RFC 3629).
std::size_t utf8_length_at(std::string_view text, std::size_t i);

// Strict, locale-independent number parsing of the whole text: a finite double, or a whole
// number. A leading '+' is accepted. Anything else gives nullopt.
std::optional<double> parse_real(std::string_view text);
std::optional<long long> parse_whole(std::string_view text);

// The shortest %g-style text that reads back to exactly x: "0.2", "1e+12", "172.57".
std::string format_real(double x);

}  // namespace ember
