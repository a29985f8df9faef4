#include "ember/core/text.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cctype>
#include <charconv>
#include <cmath>

namespace ember {

std::size_t edit_distance(std::string_view a, std::string_view b) {
  std::vector<std::size_t> row(b.size() + 1);
  for (std::size_t j = 0; j <= b.size(); ++j) row[j] = j;
  for (std::size_t i = 1; i <= a.size(); ++i) {
    std::size_t diagonal = row[0];
    row[0] = i;
    for (std::size_t j = 1; j <= b.size(); ++j) {
      const std::size_t above = row[j];
      const std::size_t substitute = diagonal + (a[i - 1] == b[j - 1] ? 0 : 1);
      row[j] = std::min({above + 1, row[j - 1] + 1, substitute});
      diagonal = above;
    }
  }
  return row[b.size()];
}

namespace {
std::string lower(std::string_view s) {
  std::string out(s);
  std::transform(out.begin(), out.end(), out.begin(),
                 [](unsigned char ch) { return static_cast<char>(std::tolower(ch)); });
  return out;
}
}  // namespace

std::string closest_match(std::string_view word, const std::vector<std::string>& candidates) {
  const std::string word_lower = lower(word);
  std::string best;
  std::size_t best_distance = std::string::npos;
  for (const auto& candidate : candidates) {
    // A case-only difference is the likeliest slip ("gev" for "GeV"); rank it first.
    const std::size_t d = lower(candidate) == word_lower ? 0 : 1 + edit_distance(word_lower, lower(candidate));
    if (d < best_distance) {
      best_distance = d;
      best = candidate;
    }
  }
  // Allow roughly one edit per three characters, at least two.
  const std::size_t allowed = 1 + std::max<std::size_t>(2, word.size() / 3);
  return best_distance <= allowed ? best : std::string{};
}

std::string join_alternatives(const std::vector<std::string>& items, std::string_view last) {
  std::string out;
  for (std::size_t i = 0; i < items.size(); ++i) {
    if (i > 0 && i + 1 == items.size()) {
      out.append(" ").append(last).append(" ");
    } else if (i > 0) {
      out.append(", ");
    }
    out.append(items[i]);
  }
  return out;
}

std::string trim(std::string_view text) {
  const auto is_space = [](unsigned char ch) { return std::isspace(ch) != 0; };
  std::size_t begin = 0, end = text.size();
  while (begin < end && is_space(static_cast<unsigned char>(text[begin]))) ++begin;
  while (end > begin && is_space(static_cast<unsigned char>(text[end - 1]))) --end;
  return std::string(text.substr(begin, end - begin));
}

std::optional<double> parse_real(std::string_view s) {
  if (!s.empty() && s.front() == '+') s.remove_prefix(1);
  double x = 0;
  const auto [end, ec] = std::from_chars(s.data(), s.data() + s.size(), x);
  if (s.empty() || ec != std::errc{} || end != s.data() + s.size() || !std::isfinite(x)) return std::nullopt;
  return x;
}

std::optional<long long> parse_whole(std::string_view s) {
  if (!s.empty() && s.front() == '+') s.remove_prefix(1);
  long long n = 0;
  const auto [end, ec] = std::from_chars(s.data(), s.data() + s.size(), n);
  if (s.empty() || ec != std::errc{} || end != s.data() + s.size()) return std::nullopt;
  return n;
}

namespace {
// "1e+09" -> "1e9", "2.5e-05" -> "2.5e-5": the way people write exponents.
std::string tidy_exponent(std::string text) {
  const auto e = text.find('e');
  if (e == std::string::npos) return text;
  std::string mantissa = text.substr(0, e), exponent = text.substr(e + 1);
  const bool negative = !exponent.empty() && exponent.front() == '-';
  if (!exponent.empty() && (exponent.front() == '+' || exponent.front() == '-')) exponent.erase(0, 1);
  exponent.erase(0, std::min(exponent.find_first_not_of('0'), exponent.size() - 1));
  return mantissa + "e" + (negative ? "-" : "") + exponent;
}
}  // namespace

std::string format_real(double x) {
  // Moderate magnitudes read best in fixed notation, which fmt's shortest form already uses.
  const double magnitude = std::fabs(x);
  if (x == 0 || (magnitude >= 1e-4 && magnitude < 1e6)) return fmt::format("{}", x);
  for (int precision = 1; precision < 17; ++precision) {
    std::string text = tidy_exponent(fmt::format("{:.{}g}", x, precision));
    if (parse_real(text) == x) return text;
  }
  return tidy_exponent(fmt::format("{:.17g}", x));
}

std::size_t utf8_length_at(std::string_view t, std::size_t i) {
  const auto c = static_cast<unsigned char>(t[i]);
  if (c < 0x80) return 1;
  // A UTF-8 lead byte and its continuation bytes (RFC 3629: no overlong forms, <= U+10FFFF).
  const std::size_t n = c >= 0xC2 && c <= 0xDF ? 2 : c >= 0xE0 && c <= 0xEF ? 3 : c >= 0xF0 && c <= 0xF4 ? 4 : 0;
  bool ok = n > 0 && i + n <= t.size();
  for (std::size_t k = 1; ok && k < n; ++k) ok = (static_cast<unsigned char>(t[i + k]) & 0xC0) == 0x80;
  if (ok && n == 3) {
    const auto c1 = static_cast<unsigned char>(t[i + 1]);
    ok = !(c == 0xE0 && c1 < 0xA0) && !(c == 0xED && c1 >= 0xA0);
  }
  if (ok && n == 4) {
    const auto c1 = static_cast<unsigned char>(t[i + 1]);
    ok = !(c == 0xF0 && c1 < 0x90) && !(c == 0xF4 && c1 >= 0x90);
  }
  return ok ? n : 0;
}

std::string printable(std::string_view t) {
  std::string out;
  const auto escape = [&](unsigned char c) { out += fmt::format("\\x{:02X}", c); };
  for (std::size_t i = 0; i < t.size();) {
    const auto c = static_cast<unsigned char>(t[i]);
    if (c < 0x80) {
      if (c < 0x20 || c == 0x7F)
        escape(c);
      else
        out += static_cast<char>(c);
      ++i;
      continue;
    }
    const std::size_t n = utf8_length_at(t, i);
    if (n > 0) {
      out.append(t.substr(i, n));
      i += n;
    } else {
      escape(c);
      ++i;
    }
  }
  return out;
}

}  // namespace ember
