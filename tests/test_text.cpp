#include <doctest/doctest.h>

#include <cmath>

#include "ember/core/errors.hpp"
#include "ember/core/record.hpp"
#include "ember/core/text.hpp"

using namespace ember;

TEST_CASE("edit distance and suggestions") {
  CHECK(edit_distance("kitten", "sitting") == 3);  // the textbook example (Levenshtein 1966)
  CHECK(edit_distance("", "abc") == 3);
  CHECK(closest_match("widht", {"width", "peak_mass"}) == "width");
  CHECK(closest_match("gev", {"g", "GeV", "TeV"}) == "GeV");
  CHECK(closest_match("zzzzzz", {"width", "peak_mass"}).empty());
}

TEST_CASE("numbers are parsed strictly and printed shortest") {
  CHECK(parse_real("1e-20") == 1e-20);
  CHECK(parse_real("+2.5") == 2.5);
  CHECK_FALSE(parse_real("2.5x"));
  CHECK_FALSE(parse_real("nan"));
  CHECK_FALSE(parse_real("inf"));
  CHECK_FALSE(parse_real(""));
  CHECK(parse_whole("61") == 61);
  CHECK_FALSE(parse_whole("2.5"));
  CHECK(format_real(1e12) == "1e12");
  CHECK(format_real(0.2) == "0.2");
  CHECK(format_real(172.57) == "172.57");
  CHECK(format_real(2.5e-5) == "2.5e-5");
  CHECK(format_real(150) == "150");
  CHECK(format_real(0) == "0");
  for (double x : {1.0 / 3.0, 6.02214076e23, -1.602176634e-19, 123456789.0, 5.0e-324, 1.7976931348623157e308})
    CHECK(parse_real(format_real(x)) == x);
}

TEST_CASE("alternatives read as a sentence") {
  CHECK(join_alternatives({"a"}) == "a");
  CHECK(join_alternatives({"a", "b", "c"}) == "a, b or c");
  CHECK(join_alternatives({"a", "b"}, "and") == "a and b");
  CHECK(trim("  x y \n") == "x y");
}

TEST_CASE("printable escapes control characters and invalid UTF-8, keeps valid UTF-8") {
  // Valid sequences per RFC 3629 (Yergeau 2003, section 4): "\xC3\xA9" is U+00E9.
  CHECK(printable("peak_mass") == "peak_mass");
  CHECK(printable("caf\xC3\xA9") == "caf\xC3\xA9");
  CHECK(printable("a\xFF\xFE") == "a\\xFF\\xFE");
  CHECK(printable("tab\there") == "tab\\x09here");
  CHECK(printable("\xC0\xAF") == "\\xC0\\xAF");  // an overlong '/' (RFC 3629 section 10)
  CHECK(printable("\xE2\x82") == "\\xE2\\x82");  // cut short
}

TEST_CASE("records read back bit for bit, and say what is wrong") {
  // Hex floats are exact by construction (C99 7.19.6.1, the %a conversion).
  RecordWriter w;
  w.word("unit").real(0.1).real(-1.0 / 3).real(5e-324).maybe_real(std::nullopt).maybe_real(1e300).whole(-7).flag(true);
  w.text_line("summary", "probe_field: 30 nodes\nand more");
  RecordReader r(w.str(), "test record");
  r.expect("unit");
  CHECK(r.real() == 0.1);
  CHECK(r.real() == -1.0 / 3);
  CHECK(r.real() == 5e-324);
  CHECK_FALSE(r.maybe_real());
  CHECK(r.maybe_real() == 1e300);
  CHECK(r.whole() == -7);
  CHECK(r.flag());
  CHECK(r.text_line("summary") == "probe_field: 30 nodes and more");
  CHECK(r.at_end());
  RecordReader bad("unit 0x1.8p+1 zz", "test record");
  bad.expect("unit");
  CHECK(bad.real() == 3.0);
  CHECK_THROWS_WITH_AS(bad.real(), doctest::Contains("test record: \"zz\" is not a hex float"), InputError);
  CHECK_THROWS_WITH_AS(bad.word(), doctest::Contains("ends early"), InputError);
}
