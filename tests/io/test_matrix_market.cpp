// Matrix Market coordinate files: exact round trips for both forms, the documented matrix
// semantics (general entries summed, symmetric entries mirrored), and bad input with lines.
#include <doctest/doctest.h>
#include <spinwright/io/matrix_market.hpp>
#include <spinwright/model.hpp>
#include <spinwright/rng/xoshiro.hpp>

#include <cstdint>
#include <string>
#include <vector>

#include "support/enumerate.hpp"
#include "support/io_support.hpp"

using namespace spinwright;
using test_support::check_error;

namespace {

template <Form F, class Value>
void round_trip(std::uint64_t seed, bool linear, bool offset) {
  test_support::IoTempDir dir;
  using Model = SparseModel<F, Value>;
  const auto m = test_support::random_model<F, Value>(seed, 30 + static_cast<std::uint32_t>(seed) * 7, 250, linear,
                                                      offset, 1000000);
  auto text = io::format_matrix_market(m);
  REQUIRE(text.ok());
  auto back = io::parse_matrix_market<Model>(text.value(), "mem.mtx");
  REQUIRE_MESSAGE(back.ok(), back.message());
  test_support::check_same_model(m, back.value());

  const std::string path = dir.file("m.mtx");
  REQUIRE(io::write_matrix_market(path, m).ok());
  auto from_file = io::read_matrix_market<Model>(path);
  REQUIRE_MESSAGE(from_file.ok(), from_file.message());
  test_support::check_same_model(m, from_file.value());
  Xoshiro256 rng(seed + 1000);
  for (int k = 0; k < 20; ++k) {
    const auto s = test_support::random_spins(rng, m);
    CHECK(from_file->energy(s.data()) == m.energy(s.data()));
  }
}

}  // namespace

TEST_CASE_TEMPLATE("Matrix Market round trip is exact (Ising and QUBO, fields and offset)", Value, std::int64_t,
                   std::int32_t, double, float) {
  for (std::uint64_t seed = 1; seed <= 4; ++seed) {
    round_trip<Form::ising, Value>(seed, true, true);
    round_trip<Form::qubo, Value>(seed, true, true);
    round_trip<Form::ising, Value>(seed + 10, seed % 2 == 0, false);
    round_trip<Form::qubo, Value>(seed + 10, false, seed % 2 == 0);
  }
}

TEST_CASE("Matrix Market writer output is the documented layout") {
  QuboBuilder<std::int64_t> b(3);
  b.add_unary(0, -1).add_pair(0, 2, 7).add_pair(1, 2, -3).add_offset(5);
  auto q = b.build();
  REQUIRE(q.ok());
  auto text = io::format_matrix_market(q.value());
  REQUIRE(text.ok());
  CHECK(text.value() ==
        "%%MatrixMarket matrix coordinate integer general\n"
        "% spinwright form qubo\n"
        "% spinwright offset 5\n"
        "3 3 3\n"
        "1 1 -1\n"
        "1 3 7\n"
        "2 3 -3\n");
  IsingBuilder<double> ib(2);
  ib.add_coupling(0, 1, 0.1).add_field(1, -2.5);
  auto im = ib.build();
  REQUIRE(im.ok());
  CHECK(io::format_matrix_market(im.value()).value() ==
        "%%MatrixMarket matrix coordinate real general\n"
        "% spinwright form ising\n"
        "% spinwright offset 0.0\n"
        "2 2 2\n"
        "1 2 0.1\n"
        "2 2 -2.5\n");
}

TEST_CASE("Matrix Market semantics: general entries add up, symmetric entries mirror") {
  // M = [[4, 2], [3, 0]] in general storage: E(x) = x^T M x, so Q_11 = 4 and Q_12 = 2 + 3.
  const std::string general =
      "%%MatrixMarket matrix coordinate integer general\n"
      "2 2 3\n"
      "1 1 4\n"
      "1 2 2\n"
      "2 1 3\n";
  auto g = io::parse_matrix_market<QuboModel<std::int64_t>>(general, "g.mtx");
  REQUIRE_MESSAGE(g.ok(), g.message());
  CHECK(g->unary(0) == 4);
  CHECK(g->unary(1) == 0);
  CHECK(g->pair(0, 1) == 5);
  // Every assignment: x^T M x computed directly from the matrix.
  const std::int64_t M[2][2] = {{4, 2}, {3, 0}};
  test_support::for_each_assignment(2, [&](const std::int8_t* s) {
    std::int64_t e = 0;
    for (int a = 0; a < 2; ++a) {
      for (int c = 0; c < 2; ++c) e += M[a][c] * (s[a] < 0 ? 1 : 0) * (s[c] < 0 ? 1 : 0);
    }
    CHECK(g->energy(s) == e);
  });

  // Symmetric storage, lower triangle: the entry (2,1) = 3 stands for M_12 = M_21 = 3.
  const std::string symmetric =
      "%%MatrixMarket matrix coordinate real symmetric\n"
      "% an ordinary comment\n"
      "% spinwright form qubo\n"
      "% spinwright offset -1.5\n"
      "2 2 2\n"
      "1 1 4\n"
      "2 1 3\n";
  auto s = io::parse_matrix_market<QuboModel<double>>(symmetric, "s.mtx");
  REQUIRE_MESSAGE(s.ok(), s.message());
  CHECK(s->unary(0) == 4.0);
  CHECK(s->pair(0, 1) == 6.0);
  CHECK(s->offset() == -1.5);

  // Ising: the diagonal holds fields, J_ij = M_ij + M_ji.
  const std::string ising =
      "%%MatrixMarket matrix coordinate integer symmetric\n"
      "%spinwright form ising\n"
      "% spinwright offset 10\n"
      "3 3 3\n"
      "2 2 -1\n"
      "3 1 2\n"
      "3 3 5\n";
  auto i = io::parse_matrix_market<IsingModel<std::int32_t>>(ising, "i.mtx");
  REQUIRE_MESSAGE(i.ok(), i.message());
  CHECK(i->field(0) == 0);
  CHECK(i->field(1) == -1);
  CHECK(i->field(2) == 5);
  CHECK(i->coupling(0, 2) == 4);
  CHECK(i->offset() == 10);

  // Banner words are case-insensitive (the NIST format description); CRLF and blank lines are fine.
  auto upper = io::parse_matrix_market<QuboModel<double>>(
      "%%MatrixMarket MATRIX Coordinate Real General\r\n\r\n2 2 1\r\n\r\n1 2 0.25\r\n", "u.mtx");
  REQUIRE_MESSAGE(upper.ok(), upper.message());
  CHECK(upper->pair(0, 1) == 0.25);
}

namespace {

template <class Model = QuboModel<std::int64_t>>
void expect_error(const std::string& text, StatusCode code, std::uint64_t line, const io::ReadOptions& opt = {}) {
  INFO("input: " << text);
  auto r = io::parse_matrix_market<Model>(text, "bad.mtx", opt);
  REQUIRE_FALSE(r.ok());
  check_error(r.status(), code, "bad.mtx", line);
}

const std::string banner = "%%MatrixMarket matrix coordinate integer general\n";

}  // namespace

TEST_CASE("Matrix Market: banner problems and unsupported variants") {
  expect_error("", StatusCode::parse_error, 1);
  expect_error("3 3 1\n1 2 1\n", StatusCode::parse_error, 1);
  expect_error("%%MatrixMarket matrix coordinate\n3 3 1\n1 2 1\n", StatusCode::parse_error, 1);
  expect_error("%%MatrixMarket matrix coordinate real general extra\n3 3 0\n", StatusCode::parse_error, 1);
  expect_error("%%MatrixMarketX matrix coordinate real general\n3 3 0\n", StatusCode::parse_error, 1);
  expect_error("%%MatrixMarket matrix array real general\n3 3\n", StatusCode::unsupported, 1);
  expect_error("%%MatrixMarket matrix coordinate complex general\n3 3 0\n", StatusCode::unsupported, 1);
  expect_error("%%MatrixMarket matrix coordinate pattern general\n3 3 0\n", StatusCode::unsupported, 1);
  expect_error("%%MatrixMarket matrix coordinate real hermitian\n3 3 0\n", StatusCode::unsupported, 1);
  expect_error("%%MatrixMarket matrix coordinate real skew-symmetric\n3 3 0\n", StatusCode::unsupported, 1);
  expect_error("%%MatrixMarket vector coordinate real general\n3 0\n", StatusCode::unsupported, 1);
  expect_error("%%MatrixMarket matrix sparse real general\n3 3 0\n", StatusCode::unsupported, 1);
  expect_error("%%MatrixMarket matrix coordinate double general\n3 3 0\n", StatusCode::unsupported, 1);
  expect_error("%%MatrixMarket matrix coordinate real upper\n3 3 0\n", StatusCode::unsupported, 1);
  expect_error(banner + "3 4 1\n1 2 1\n", StatusCode::unsupported, 2);
  expect_error(banner + "% c\n%%MatrixMarket matrix coordinate integer general\n3 3 0\n", StatusCode::parse_error, 3);
  expect_error(banner + "3 3 1\n%%MatrixMarket matrix coordinate integer general\n1 2 1\n", StatusCode::parse_error, 3);
}

TEST_CASE("Matrix Market: conflicting and malformed directives") {
  expect_error(banner + "% spinwright form qubo\n% spinwright form ising\n3 3 0\n", StatusCode::parse_error, 3);
  expect_error(banner + "% spinwright form qubo\n% spinwright form qubo\n3 3 0\n", StatusCode::parse_error, 3);
  expect_error(banner + "% spinwright offset 1\n% spinwright offset 2\n3 3 0\n", StatusCode::parse_error, 3);
  expect_error(banner + "% spinwright form potts\n3 3 0\n", StatusCode::parse_error, 2);
  expect_error(banner + "% spinwright scale 2\n3 3 0\n", StatusCode::parse_error, 2);
  expect_error(banner + "% spinwright form\n3 3 0\n", StatusCode::parse_error, 2);
  expect_error(banner + "% spinwright offset 1 2\n3 3 0\n", StatusCode::parse_error, 2);
  expect_error(banner + "% spinwright offset one\n3 3 0\n", StatusCode::parse_error, 2);
  expect_error(banner + "% spinwright offset 1.5\n3 3 0\n", StatusCode::parse_error, 2);  // integer file
  expect_error(banner + "3 3 0\n% spinwright offset 1\n", StatusCode::parse_error, 3);
  // The file's form must match the requested model.
  expect_error<IsingModel<std::int64_t>>(banner + "3 3 0\n", StatusCode::unsupported, 1);
  expect_error<QuboModel<std::int64_t>>(banner + "% c\n% spinwright form ising\n3 3 0\n", StatusCode::unsupported, 3);
}

TEST_CASE("Matrix Market: size line, truncation and extra entries") {
  expect_error(banner, StatusCode::parse_error, 2);
  expect_error(banner + "% only comments\n", StatusCode::parse_error, 3);
  expect_error(banner + "3 3\n", StatusCode::parse_error, 2);
  expect_error(banner + "3 3 1 1\n", StatusCode::parse_error, 2);
  expect_error(banner + "-3 -3 1\n", StatusCode::invalid_argument, 2);
  expect_error(banner + "3 3 -1\n", StatusCode::invalid_argument, 2);
  expect_error(banner + "3 3 x\n", StatusCode::parse_error, 2);
  expect_error(banner + "3 3 2\n1 2 1\n", StatusCode::parse_error, 4);
  expect_error(banner + "3 3 1\n1 2 1\n2 3 1\n", StatusCode::parse_error, 4);
  expect_error(banner + "1000000000000 1000000000000 1\n1 2 1\n", StatusCode::size_limit, 2);
  expect_error(banner + "3 3 1000000000000\n1 2 1\n", StatusCode::parse_error, 4);
  expect_error(banner + "3 3 99999999999999999999999\n", StatusCode::size_limit, 2);
  expect_error<QuboModel<std::int64_t, std::uint16_t>>(banner + "70000 70000 0\n", StatusCode::index_out_of_range, 2);
}

TEST_CASE("Matrix Market: bad entries") {
  expect_error(banner + "3 3 1\n0 2 1\n", StatusCode::index_out_of_range, 3);
  expect_error(banner + "3 3 1\n1 0 1\n", StatusCode::index_out_of_range, 3);
  expect_error(banner + "3 3 1\n4 2 1\n", StatusCode::index_out_of_range, 3);
  expect_error(banner + "3 3 1\n1 2\n", StatusCode::parse_error, 3);
  expect_error(banner + "3 3 1\n1 2 1 1\n", StatusCode::parse_error, 3);
  expect_error(banner + "3 3 1\n1 b 1\n", StatusCode::parse_error, 3);
  expect_error(banner + "3 3 1\n1 2 12abc\n", StatusCode::parse_error, 3);
  expect_error(banner + "3 3 1\n1 2 1.5\n", StatusCode::parse_error, 3);  // real value in an integer file
  expect_error(banner + "3 3 1\n1 2 99999999999999999999\n", StatusCode::value_out_of_range, 3);
  const std::string real = "%%MatrixMarket matrix coordinate real general\n";
  expect_error<QuboModel<double>>(real + "3 3 1\n1 2 NaN\n", StatusCode::non_finite_value, 3);
  expect_error<QuboModel<double>>(real + "3 3 1\n1 2 -inf\n", StatusCode::non_finite_value, 3);
  expect_error<QuboModel<double>>(real + "3 3 1\n1 2 2e308\n", StatusCode::value_out_of_range, 3);
  expect_error<QuboModel<float>>(real + "3 3 1\n1 2 3.5e38\n", StatusCode::value_out_of_range, 3);
  expect_error<QuboModel<std::int32_t>>(real + "3 3 1\n1 2 2147483648\n", StatusCode::value_out_of_range, 3);
  expect_error<QuboModel<std::int64_t>>(real + "3 3 1\n1 2 0.5\n", StatusCode::parse_error, 3);
  expect_error<QuboModel<double>>(real + "% spinwright offset inf\n3 3 0\n", StatusCode::non_finite_value, 2);
  // Non-finite values are refused on their own line, after symmetric entries too.
  const std::string sym = "%%MatrixMarket matrix coordinate real symmetric\n";
  expect_error<QuboModel<double>>(sym + "3 3 4\n2 1 1\n3 1 1\n3 2 NaN\n1 1 5\n", StatusCode::non_finite_value, 5);
  expect_error<QuboModel<double>>(sym + "3 3 3\n1 1 2\n3 1 1\n2 2 -inf\n", StatusCode::non_finite_value, 5);
  expect_error<QuboModel<double>>(sym + "% spinwright offset inf\n3 3 2\n2 1 1\n3 1 1\n", StatusCode::non_finite_value,
                                  2);
  // Symmetric doubling that leaves int32: reported at the entry's line.
  expect_error<QuboModel<std::int32_t>>(
      "%%MatrixMarket matrix coordinate integer symmetric\n3 3 2\n1 1 1\n2 1 1500000000\n",
      StatusCode::value_out_of_range, 4);
  // An energy range beyond what the 64-bit accumulator allows: the model as a whole is refused
  // (reported at the size line).
  expect_error(banner + "3 3 2\n1 2 4611686018427387904\n2 3 4611686018427387904\n", StatusCode::energy_overflow, 2);
}

TEST_CASE("Matrix Market files: missing and unreadable") {
  test_support::IoTempDir dir;
  const std::string missing = dir.file("nope.mtx");
  auto r = io::read_matrix_market<QuboModel<double>>(missing);
  REQUIRE_FALSE(r.ok());
  check_error(r.status(), StatusCode::io_error, missing, 0);
  const std::string path = dir.write("bad.mtx", banner + "2 2 1\n1 3 1\n");
  auto b = io::read_matrix_market<QuboModel<double>>(path);
  REQUIRE_FALSE(b.ok());
  check_error(b.status(), StatusCode::index_out_of_range, path, 3);
}

TEST_CASE("Matrix Market: a refusal of the builder is traced to its entry's line") {
  // build_terms gives the builder one term per entry, two for a symmetric entry off the
  // diagonal, and the offset last; term_line walks the list the same way. (Files cannot reach
  // the builder's term refusals today: the scanner refuses those values first.)
  io::detail::TermList list;
  list.diagonal_is_linear = true;
  const std::uint64_t lines[] = {3, 4, 7, 9};
  const bool mirrored[] = {false, true, false, true};
  const std::uint64_t ij[][2] = {{0, 0}, {2, 0}, {1, 1}, {2, 1}};
  for (int k = 0; k < 4; ++k) {
    io::detail::RawTerm t;
    t.i = ij[k][0];
    t.j = ij[k][1];
    t.line = lines[k];
    t.set_mirrored(mirrored[k]);
    list.terms.push_back(t);
  }
  list.has_offset = true;
  list.offset_line = 2;
  // Terms: 0 (line 3), 1 and 2 (line 4), 3 (line 7), 4 and 5 (line 9), 6 (the offset, line 2).
  const std::uint64_t expected[] = {3, 4, 4, 7, 9, 9, 2};
  for (std::uint64_t term = 0; term < 7; ++term) {
    std::uint64_t line = 0;
    CHECK(io::detail::term_line(list, term, line));
    CHECK(line == expected[term]);
  }
  std::uint64_t line = 0;
  CHECK_FALSE(io::detail::term_line(list, 7, line));
  list.has_offset = false;
  CHECK_FALSE(io::detail::term_line(list, 6, line));
}
