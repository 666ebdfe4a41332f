// The shared text pieces of the readers: strict whole-token numbers, line splitting, quoting,
// exact value printing, and the exact wording of a few messages users will see.
#include <doctest/doctest.h>
#include <spinwright/io.hpp>

#include <charconv>
#include <cstdint>
#include <limits>
#include <string>
#include <vector>

#include "support/io_support.hpp"

using namespace spinwright;
using io::detail::Number;

namespace {
bool parses(const std::string& t, Number& n) {
  StatusCode code = StatusCode::ok;
  return io::detail::parse_number(t, n, code).empty();
}
StatusCode refusal(const std::string& t) {
  Number n;
  StatusCode code = StatusCode::ok;
  const std::string why = io::detail::parse_number(t, n, code);
  REQUIRE_FALSE(why.empty());
  return code;
}
}  // namespace

TEST_CASE("numbers: whole tokens only") {
  Number n;
  REQUIRE(parses("42", n));
  CHECK(n.integer);
  CHECK(n.i == 42);
  REQUIRE(parses("+7", n));
  CHECK(n.i == 7);
  REQUIRE(parses("-9223372036854775808", n));
  CHECK(n.i == std::numeric_limits<std::int64_t>::min());
  REQUIRE(parses("9223372036854775808", n));
  CHECK(n.integer);
  CHECK(n.int_overflow);
  CHECK(n.d == 9223372036854775808.0);
  REQUIRE(parses("1.", n));
  CHECK_FALSE(n.integer);
  CHECK(n.d == 1.0);
  REQUIRE(parses(".5", n));
  CHECK(n.d == 0.5);
  REQUIRE(parses("-2.5E-3", n));
  CHECK(n.d == -2.5e-3);
  REQUIRE(parses("1e-320", n));  // subnormal, kept
  CHECK(n.d > 0);
  REQUIRE(parses("1e-400", n));  // underflow rounds to zero
  CHECK(n.d == 0.0);
  REQUIRE(
      parses("0.000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000"
             "0000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000"
             "0000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000"
             "00000000000000000000000000000000000000000000000000000001",
             n));
  CHECK(n.d == 0.0);

  for (const char* bad : {"", "+", "-", "+-1", "++1", "1-", "12abc", "0x10", "1,5", "1e", "e5", "abc", "1 2", "--1",
                          "1..2", "1e5.5", "\x01"}) {
    INFO("token " << bad);
    CHECK(refusal(bad) == StatusCode::parse_error);
  }
  for (const char* bad : {"nan", "NaN", "inf", "-inf", "Infinity", "+inf"}) {
    INFO("token " << bad);
    CHECK(refusal(bad) == StatusCode::non_finite_value);
  }
  for (const char* bad : {"1e309", "-1e400", "1000e306", "0.001e312"}) {
    INFO("token " << bad);
    CHECK(refusal(bad) == StatusCode::value_out_of_range);
  }
}

TEST_CASE("counts") {
  std::uint64_t v = 0;
  StatusCode code = StatusCode::ok;
  CHECK(io::detail::parse_count("18446744073709551615", v, code, "n").empty());
  CHECK(v == std::numeric_limits<std::uint64_t>::max());
  CHECK_FALSE(io::detail::parse_count("18446744073709551616", v, code, "n").empty());
  CHECK(code == StatusCode::size_limit);
  CHECK_FALSE(io::detail::parse_count("-1", v, code, "n").empty());
  CHECK(code == StatusCode::invalid_argument);
  CHECK_FALSE(io::detail::parse_count("1e3", v, code, "n").empty());
  CHECK(code == StatusCode::parse_error);
}

// The short-integer paths of parse_number and parse_count read digits directly; on every
// integer token (any length up to 21 digits, leading zeros, either sign) they must agree with
// std::from_chars, the standard library's reference conversion (C++17, [charconv]).
TEST_CASE("integer tokens read as std::from_chars reads them") {
  std::uint64_t z = 12345;
  auto next = [&z]() {  // splitmix64 (Steele, Lea & Flood, OOPSLA 2014)
    z += 0x9e3779b97f4a7c15ull;
    std::uint64_t x = z;
    x = (x ^ (x >> 30)) * 0xbf58476d1ce4e5b9ull;
    x = (x ^ (x >> 27)) * 0x94d049bb133111ebull;
    return x ^ (x >> 31);
  };
  for (int trial = 0; trial < 20000; ++trial) {
    const std::size_t digits = 1 + next() % 21;
    std::string t = next() % 3 == 0 ? "-" : "";
    for (std::size_t k = 0; k < digits; ++k) t += static_cast<char>('0' + (k == 0 && next() % 4 == 0 ? 0 : next() % 10));
    CAPTURE(t);
    std::int64_t want = 0;
    const auto r = std::from_chars(t.data(), t.data() + t.size(), want);
    Number n;
    StatusCode code = StatusCode::ok;
    const std::string why = io::detail::parse_number(t, n, code);
    REQUIRE(why.empty());
    CHECK(n.integer);
    CHECK(n.int_overflow == (r.ec == std::errc::result_out_of_range));
    if (r.ec == std::errc()) {
      CHECK(n.i == want);
      CHECK(n.d == static_cast<double>(want));
    }
    std::uint64_t count = 0, want_count = 0;
    const std::string count_why = io::detail::parse_count(t, count, code, "n");
    const std::string_view body = t;
    const auto rc = std::from_chars(body.data(), body.data() + body.size(), want_count);
    const bool whole = rc.ec == std::errc() && rc.ptr == body.data() + body.size() && t.front() != '-';
    CHECK(count_why.empty() == whole);
    if (whole) CHECK(count == want_count);
  }
}

TEST_CASE("lines, tokens, quoting") {
  io::detail::LineReader r("a\r\n\nb c\n  d");
  io::detail::Line l;
  std::vector<std::string> seen;
  while (r.next(l)) seen.push_back(std::to_string(l.number) + ":" + std::string(l.text));
  CHECK(seen == std::vector<std::string>{"1:a", "2:", "3:b c", "4:  d"});
  CHECK(r.last_line() == 4);

  // A UTF-8 byte order mark before the first line is skipped.
  auto bom =
      io::parse_model_text("\xEF\xBB\xBF%%MatrixMarket matrix coordinate integer general\n1 1 1\n1 1 3\n", "bom.mtx");
  REQUIRE_MESSAGE(bom.ok(), bom.message());
  CHECK(bom->format == io::FileFormat::matrix_market);
  CHECK(bom->qubo_integer.unary(0) == 3);

  std::string_view tok[2];
  CHECK(io::detail::split_tokens(" x\ty  z ", tok, 2) == 3);
  CHECK(tok[0] == "x");
  CHECK(tok[1] == "y");

  CHECK(io::detail::quote("ab") == "'ab'");
  CHECK(io::detail::quote(std::string("a\0b\\", 4)) == "'a\\x00b\\x5c'");
  CHECK(io::detail::quote(std::string(50, 'x')) == "'" + std::string(40, 'x') + "...'");
}

TEST_CASE("values print exactly and reals stay recognisably real") {
  std::string s;
  io::detail::append_value(s, std::int64_t{-9223372036854775807 - 1});
  CHECK(s == "-9223372036854775808");
  s.clear();
  io::detail::append_value(s, 0.1);
  CHECK(s == "0.1");
  s.clear();
  io::detail::append_value(s, 3.0);
  CHECK(s == "3.0");
  s.clear();
  io::detail::append_value(s, 0.1f);  // widened: the float's exact double value
  CHECK(s == "0.10000000149011612");
  s.clear();
  io::detail::append_value(s, std::numeric_limits<double>::denorm_min());
  CHECK(s == "5e-324");
}

TEST_CASE("messages a user reads") {
  auto a = io::parse_edge_list<std::int64_t>("3 1\n0 2 1\n", "g.txt");
  CHECK(a.message() == "g.txt:2: node number 0: nodes are numbered from 1 to N");
  auto b = io::parse_edge_list<std::int64_t>("3 2\n1 2 1\n", "g.txt");
  CHECK(b.message() == "g.txt:3: file ends after 1 of the 2 edges declared on line 1 (truncated file?)");
  auto c = io::parse_edge_list<std::int32_t>("3 1\n1 2 5000000000\n", "g.txt");
  CHECK(c.message() == "g.txt:2: integer '5000000000' does not fit the 32-bit integer value type");
  auto d = io::parse_matrix_market<QuboModel<double>>("%%MatrixMarket matrix array real general\n2 2\n", "m.mtx");
  CHECK(d.message() == "m.mtx:1: dense 'array' storage is not supported; write the matrix in 'coordinate' format");
  auto e = io::parse_edge_list<double>("3 1\n1 2 12abc\n", "g.txt");
  CHECK(e.message() == "g.txt:2: weight: trailing characters after a number in '12abc'");
  auto f = io::parse_edge_list<std::int64_t>("1000000000000 5\n", "g.txt");
  CHECK(f.message() ==
        "g.txt:1: header declares 1000000000000 nodes, more than the limit of 67108864 (ReadOptions::max_spins)");
}
