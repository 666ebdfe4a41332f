// State files: spins or bits, one per line; round trips, comments, and bad input with lines.
#include <doctest/doctest.h>
#include <spinwright/io/state_file.hpp>
#include <spinwright/rng/xoshiro.hpp>

#include <cstdint>
#include <string>
#include <vector>

#include "support/io_support.hpp"

using namespace spinwright;
using test_support::check_error;

TEST_CASE("state files round trip in both styles") {
  test_support::IoTempDir dir;
  Xoshiro256 rng(2024);
  for (std::size_t n : {1u, 2u, 17u, 1000u}) {
    std::vector<std::int8_t> s(n);
    for (auto& x : s) x = rng.coin() ? std::int8_t{1} : std::int8_t{-1};
    for (auto style : {io::StateStyle::spins, io::StateStyle::bits}) {
      const std::string path = dir.file("s.txt");
      REQUIRE(io::write_state(path, s, style, "best of 8 restarts\nenergy -42").ok());
      auto back = io::read_state(path, n);
      REQUIRE_MESSAGE(back.ok(), back.message());
      CHECK(back.value() == s);
      auto unsized = io::read_state(path);
      REQUIRE(unsized.ok());
      CHECK(unsized.value() == s);
    }
  }
}

TEST_CASE("state file text: spins, bits, comments") {
  auto text = io::format_state(std::vector<std::int8_t>{1, -1, -1}, io::StateStyle::bits, "note");
  REQUIRE(text.ok());
  CHECK(text.value() == "# note\n0\n1\n1\n");
  CHECK(io::format_state(std::vector<std::int8_t>{-1, 1}).value() == "-\n+\n");

  // Bit 1 is spin -1 (x = (1 - s) / 2).
  auto bits = io::parse_state("# header\n0\r\n1\n\n% c\n  1  \n", "b.txt", 3);
  REQUIRE_MESSAGE(bits.ok(), bits.message());
  CHECK(bits.value() == std::vector<std::int8_t>{1, -1, -1});
  auto spins = io::parse_state("+\n-\n+\n", "s.txt");
  REQUIRE(spins.ok());
  CHECK(spins.value() == std::vector<std::int8_t>{1, -1, 1});
  auto none = io::parse_state("# nothing\n", "z.txt", 0);
  REQUIRE(none.ok());
  CHECK(none->empty());

  std::int8_t bad[2] = {1, 0};
  auto refused = io::format_state(bad, 2, io::StateStyle::spins, {}, "out.txt");
  REQUIRE_FALSE(refused.ok());
  check_error(refused.status(), StatusCode::invalid_argument, "out.txt", 0);
}

namespace {
void expect_error(const std::string& text, std::uint64_t expected, StatusCode code, std::uint64_t line,
                  const io::ReadOptions& opt = {}) {
  INFO("input: " << text);
  auto r = io::parse_state(text, "st.txt", expected, opt);
  REQUIRE_FALSE(r.ok());
  check_error(r.status(), code, "st.txt", line);
}
}  // namespace

TEST_CASE("state files: bad input") {
  expect_error("", io::any_size, StatusCode::parse_error, 1);
  expect_error("# only\n", io::any_size, StatusCode::parse_error, 2);
  expect_error("", 3, StatusCode::parse_error, 1);
  expect_error("+\n-\n", 3, StatusCode::parse_error, 3);
  expect_error("+\n-\n+\n-\n", 3, StatusCode::parse_error, 4);
  expect_error("+\n1\n", io::any_size, StatusCode::parse_error, 2);
  expect_error("0\n\n-\n", io::any_size, StatusCode::parse_error, 3);
  expect_error("+\nx\n", io::any_size, StatusCode::parse_error, 2);
  expect_error("+1\n", io::any_size, StatusCode::parse_error, 1);
  expect_error("+ -\n", io::any_size, StatusCode::parse_error, 1);
  expect_error("2\n", io::any_size, StatusCode::parse_error, 1);
  io::ReadOptions small;
  small.max_spins = 2;
  expect_error("+\n+\n+\n", io::any_size, StatusCode::size_limit, 3, small);
  expect_error("+\n", 1000, StatusCode::size_limit, 0, small);

  test_support::IoTempDir dir;
  const std::string missing = dir.file("missing.txt");
  auto r = io::read_state(missing, 2);
  REQUIRE_FALSE(r.ok());
  check_error(r.status(), StatusCode::io_error, missing, 0);
}
