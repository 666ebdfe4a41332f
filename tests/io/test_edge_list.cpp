// Weighted edge lists: exact round trips, the max-cut reading (J = w, h = 0, self-loops to the
// offset, duplicates summed), and every kind of bad input with its line number.
#include <doctest/doctest.h>
#include <spinwright/io/edge_list.hpp>
#include <spinwright/model.hpp>
#include <spinwright/rng/xoshiro.hpp>

#include <cstdint>
#include <string>
#include <vector>

#include "support/io_support.hpp"

using namespace spinwright;
using spinwright::io::parse_edge_list;
using test_support::check_error;

TEST_CASE_TEMPLATE("edge list round trip is exact on random max-cut models", Value, std::int64_t, std::int32_t, double,
                   float) {
  test_support::IoTempDir dir;
  for (std::uint64_t seed = 1; seed <= 6; ++seed) {
    const auto m = test_support::random_model<Form::ising, Value>(seed, 40 + 10 * static_cast<std::uint32_t>(seed), 300,
                                                                  false, false, 1000000);
    auto text = io::format_edge_list(m);
    REQUIRE(text.ok());
    auto back = parse_edge_list<Value>(text.value(), "mem");
    REQUIRE_MESSAGE(back.ok(), back.message());
    test_support::check_same_model(m, back.value());

    const std::string path = dir.file("g" + std::to_string(seed) + ".txt");
    REQUIRE(io::write_edge_list(path, m).ok());
    auto from_file = io::read_edge_list<Value>(path);
    REQUIRE_MESSAGE(from_file.ok(), from_file.message());
    test_support::check_same_model(m, from_file.value());

    Xoshiro256 rng(seed * 77);
    for (int k = 0; k < 20; ++k) {
      const auto s = test_support::random_spins(rng, m);
      CHECK(from_file->energy(s.data()) == m.energy(s.data()));
    }
  }
}

TEST_CASE("edge list reading follows the max-cut convention") {
  // Hand-made example (invented): comments, blank lines, CRLF, header text, a self-loop, an
  // edge given twice in both orders, a zero weight, and a '+' sign.
  const std::string text =
      "# a comment before the header\r\n"
      "\n"
      "4 6 some text after the counts\r\n"
      "1 2 3\n"
      "% another comment\n"
      "2 1 -1\n"
      "2 3 +5\n"
      "3 3 7\n"
      "   3\t4   -2  \n"
      "1 4 0\n";
  auto r = parse_edge_list<std::int64_t>(text, "hand.txt");
  REQUIRE_MESSAGE(r.ok(), r.message());
  const auto& m = r.value();
  CHECK(m.num_spins() == 4);
  CHECK(m.num_pairs() == 3);  // (1,2) merged to 2, (2,3) = 5, (3,4) = -2; (1,4) = 0 dropped
  CHECK(m.coupling(0, 1) == 2);
  CHECK(m.coupling(1, 2) == 5);
  CHECK(m.coupling(2, 3) == -2);
  CHECK(m.coupling(0, 3) == 0);
  CHECK(m.offset() == 7);  // the self-loop 3-3 folds into the offset
  for (std::uint32_t i = 0; i < 4; ++i) CHECK(m.field(i) == 0);

  auto real = parse_edge_list<double>("3 2\n1 2 0.5\n2 3 -1.25e-3\n", "real.txt");
  REQUIRE(real.ok());
  CHECK(real->coupling(0, 1) == 0.5);
  CHECK(real->coupling(1, 2) == -1.25e-3);

  // An empty graph is fine.
  auto empty = parse_edge_list<std::int64_t>("5 0\n", "empty-graph.txt");
  REQUIRE(empty.ok());
  CHECK(empty->num_spins() == 5);
  CHECK(empty->num_pairs() == 0);
}

TEST_CASE("edge list writer refuses what the format cannot hold") {
  IsingBuilder<std::int64_t> b(3);
  b.add_coupling(0, 1, 4).add_field(2, 1);
  auto with_field = b.build();
  REQUIRE(with_field.ok());
  auto r = io::format_edge_list(with_field.value(), "out.txt");
  REQUIRE_FALSE(r.ok());
  check_error(r.status(), StatusCode::invalid_argument, "out.txt", 0);

  IsingBuilder<double> c(3);
  c.add_coupling(0, 1, 4).add_offset(2.5);
  auto with_offset = c.build();
  REQUIRE(with_offset.ok());
  test_support::IoTempDir dir;
  const std::string path = dir.file("offset.txt");
  const auto st = io::write_edge_list(path, with_offset.value());
  check_error(st, StatusCode::invalid_argument, path, 0);
  CHECK_FALSE(std::filesystem::exists(path));  // nothing half-written
}

namespace {

template <class Value = std::int64_t, class Index = std::uint32_t>
void expect_error(const std::string& text, StatusCode code, std::uint64_t line, const io::ReadOptions& opt = {}) {
  INFO("input: " << text);
  auto r = parse_edge_list<Value, Index>(text, "bad.txt", opt);
  REQUIRE_FALSE(r.ok());
  check_error(r.status(), code, "bad.txt", line);
}

}  // namespace

TEST_CASE("edge list: missing or broken header") {
  expect_error("", StatusCode::parse_error, 1);
  expect_error("# only a comment\n\n", StatusCode::parse_error, 3);
  expect_error("graph\n1 2 1\n", StatusCode::parse_error, 1);
  expect_error("5\n1 2 1\n", StatusCode::parse_error, 1);
  expect_error("5 x\n", StatusCode::parse_error, 1);
  expect_error("5.5 1\n1 2 1\n", StatusCode::parse_error, 1);
  expect_error("-3 1\n1 2 1\n", StatusCode::invalid_argument, 1);
  expect_error("3 -1\n", StatusCode::invalid_argument, 1);
  // A repeated header is not an edge line.
  expect_error("3 2\n3 2\n1 2 1\n2 3 1\n", StatusCode::parse_error, 2);
  expect_error("%%MatrixMarket matrix coordinate real general\n3 3 1\n1 2 1\n", StatusCode::parse_error, 1);
  expect_error("\n%%MatrixMarket matrix coordinate real general\n3 3 1\n1 2 1\n", StatusCode::parse_error, 2);
}

TEST_CASE("edge list: truncated files and extra lines") {
  expect_error("3 3\n1 2 1\n2 3 1\n", StatusCode::parse_error, 4);
  expect_error("3 3\n1 2 1\n2 3 1", StatusCode::parse_error, 4);  // no final newline: still the line after the last
  expect_error("3 1\n1 2 1\n2 3 1\n", StatusCode::parse_error, 3);
  expect_error("3 1\n1 2 1\n# fine\n\n1 3 1\n", StatusCode::parse_error, 5);
}

TEST_CASE("edge list: bad node numbers and fields") {
  expect_error("3 1\n0 2 1\n", StatusCode::index_out_of_range, 2);
  expect_error("3 1\n1 4 1\n", StatusCode::index_out_of_range, 2);
  expect_error("3 1\n1 -2 1\n", StatusCode::invalid_argument, 2);
  expect_error("3 1\n1 two 1\n", StatusCode::parse_error, 2);
  expect_error("3 1\n1\n", StatusCode::parse_error, 2);
  // Weighted and unweighted edge lines do not mix (the first edge line sets the columns).
  expect_error("3 2\n1 2 1\n2 3\n", StatusCode::parse_error, 3);
  expect_error("3 2\n1 2\n2 3 5\n", StatusCode::parse_error, 2);  // the line without a weight
  expect_error("3 1\n1 2 1 7\n", StatusCode::parse_error, 2);
  expect_error("3 1\n1 2 12abc\n", StatusCode::parse_error, 2);
  expect_error("3 1\n1 2 0x10\n", StatusCode::parse_error, 2);
  expect_error("3 1\n1 2 1,5\n", StatusCode::parse_error, 2);
  expect_error("3 1\n1 2 --1\n", StatusCode::parse_error, 2);
  expect_error("3 1\n1 2 +\n", StatusCode::parse_error, 2);
  expect_error("3 1\n1.0 2 1\n", StatusCode::parse_error, 2);
  expect_error<double>("3 1\n1 2 1e5x\n", StatusCode::parse_error, 2);
}

TEST_CASE("edge list: NaN, infinity and values beyond the value type") {
  expect_error<double>("3 1\n1 2 nan\n", StatusCode::non_finite_value, 2);
  expect_error<double>("3 1\n1 2 inf\n", StatusCode::non_finite_value, 2);
  expect_error<double>("3 1\n1 2 -Infinity\n", StatusCode::non_finite_value, 2);
  expect_error<double>("3 1\n1 2 1e400\n", StatusCode::value_out_of_range, 2);
  expect_error<float>("3 1\n1 2 1e39\n", StatusCode::value_out_of_range, 2);
  expect_error<std::int32_t>("3 1\n1 2 3000000000\n", StatusCode::value_out_of_range, 2);
  expect_error<std::int32_t>("3 1\n1 2 -2147483649\n", StatusCode::value_out_of_range, 2);
  expect_error<std::int64_t>("3 1\n1 2 9223372036854775808\n", StatusCode::value_out_of_range, 2);
  expect_error<std::int64_t>("3 1\n1 2 1.5\n", StatusCode::parse_error, 2);
  // Self-loops fold into the offset; a sum beyond int64 is reported at the loop that overflows.
  expect_error<std::int64_t>("3 3\n1 2 1\n1 1 5000000000000000000\n2 2 5000000000000000000\n",
                             StatusCode::energy_overflow, 4);
  // Merged duplicates that leave the value type: reported at the last line of that pair.
  expect_error<std::int32_t>("3 3\n1 2 2000000000\n2 3 1\n2 1 2000000000\n", StatusCode::value_out_of_range, 4);

  // The limits themselves are accepted.
  auto lim = parse_edge_list<std::int32_t>("3 2\n1 2 2147483647\n2 3 -2147483648\n", "lim.txt");
  REQUIRE(lim.ok());
  CHECK(lim->coupling(0, 1) == 2147483647);
  CHECK(lim->coupling(1, 2) == -2147483648LL);
  // A huge integer literal is fine for a real-valued model (rounded to double).
  auto big = parse_edge_list<double>("3 1\n1 2 100000000000000000000\n", "big.txt");
  REQUIRE(big.ok());
  CHECK(big->coupling(0, 1) == 1e20);
  // Underflow rounds to zero (correct rounding), and the zero weight is dropped.
  auto tiny = parse_edge_list<double>("3 1\n1 2 1e-400\n", "tiny.txt");
  REQUIRE(tiny.ok());
  CHECK(tiny->num_pairs() == 0);
}

TEST_CASE("edge list: absurd headers are refused before any large allocation") {
  expect_error("1000000000000 1\n1 2 1\n", StatusCode::size_limit, 1);
  expect_error("99999999999999999999999 1\n", StatusCode::size_limit, 1);
  expect_error("3 99999999999999999999999\n", StatusCode::size_limit, 1);
  io::ReadOptions small;
  small.max_spins = 100;
  expect_error("101 1\n1 2 1\n", StatusCode::size_limit, 1, small);
  // Beyond the index type: uint16_t addresses 0 .. 65534.
  expect_error<std::int64_t, std::uint16_t>("65536 1\n1 2 1\n", StatusCode::index_out_of_range, 1);
  // A huge edge count is never reserved: the reader reaches the end and reports truncation.
  expect_error("3 1000000000000\n1 2 1\n", StatusCode::parse_error, 3);
}

TEST_CASE("edge list files: missing, directory, too long") {
  test_support::IoTempDir dir;
  const std::string missing = dir.file("missing.txt");
  auto r = io::read_edge_list<std::int64_t>(missing);
  REQUIRE_FALSE(r.ok());
  check_error(r.status(), StatusCode::io_error, missing, 0);

  const std::string folder = dir.path().string();
  auto d = io::read_edge_list<std::int64_t>(folder);
  REQUIRE_FALSE(d.ok());
  check_error(d.status(), StatusCode::io_error, folder, 0);

  const std::string path = dir.write("long.txt", "3 1\n1 2 1\n");
  io::ReadOptions opt;
  opt.max_file_bytes = 5;
  auto l = io::read_edge_list<std::int64_t>(path, opt);
  REQUIRE_FALSE(l.ok());
  check_error(l.status(), StatusCode::size_limit, path, 0);

  const std::string empty = dir.write("empty.txt", "");
  auto e = io::read_edge_list<std::int64_t>(empty);
  REQUIRE_FALSE(e.ok());
  check_error(e.status(), StatusCode::parse_error, empty, 1);

  const std::string bad = dir.write("bad.txt", "3 2\n1 2 1\n2 3 x\n");
  auto b = io::read_edge_list<std::int64_t>(bad);
  REQUIRE_FALSE(b.ok());
  check_error(b.status(), StatusCode::parse_error, bad, 3);

  const std::string unwritable = dir.file("no/such/folder/out.txt");
  IsingBuilder<std::int64_t> g(2);
  g.add_coupling(0, 1, 1);
  auto gm = g.build();
  REQUIRE(gm.ok());
  check_error(io::write_edge_list(unwritable, gm.value()), StatusCode::io_error, unwritable, 0);
}

TEST_CASE("edge list: an unweighted list (every edge line 'i j') reads each edge with weight 1") {
  // The documented rule (docs/file-formats.md): two fields on every edge line mean weight 1.
  // Hand-made example: the 4-cycle; max-cut convention J = w = 1 on each edge (common practice).
  auto r = parse_edge_list<std::int64_t>("4 4\n1 2\n2 3\n3 4\n4 1\n", "ring.txt");
  REQUIRE_MESSAGE(r.ok(), r.message());
  const auto& m = r.value();
  CHECK(m.num_spins() == 4);
  CHECK(m.num_pairs() == 4);
  CHECK(m.coupling(0, 1) == 1);
  CHECK(m.coupling(3, 0) == 1);
  CHECK(m.coupling(0, 2) == 0);
  const std::int8_t alternating[4] = {1, -1, 1, -1};
  CHECK(m.energy(alternating) == -4);  // every edge cut: E = -sum w
  // The same with integer weights read as int64: the automatic type stays integer.
  auto d = parse_edge_list<double>("3 2\n1 2\n2 3\n", "path.txt");
  REQUIRE(d.ok());
  CHECK(d.value().coupling(1, 2) == 1.0);
}

TEST_CASE("edge list: a file without its header line is told so") {
  // "1 2 1" read as the header N = 1, M = 2: the next edge names node 2 > N.
  auto r = parse_edge_list<std::int64_t>("1 2 1\n2 3 1\n", "nohead.txt");
  REQUIRE_FALSE(r.ok());
  check_error(r.status(), StatusCode::index_out_of_range, "nohead.txt", 2);
  CHECK(r.status().reason.find("header line missing") != std::string::npos);
  // A genuine header with a wrong N keeps the plain message.
  auto plain = parse_edge_list<std::int64_t>("5 2\n1 2 1\n2 9 1\n", "wrong_n.txt");
  REQUIRE_FALSE(plain.ok());
  CHECK(plain.status().reason.find("header line missing") == std::string::npos);
  CHECK(plain.status().reason.find("beyond N = 5") != std::string::npos);
}
