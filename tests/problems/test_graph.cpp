// Answer types shared by the encoders: two-sided splits and selections, spins and bits
// (spin +1 is bit 0, spin -1 is bit 1; project convention, DESIGN.md).
#include <doctest/doctest.h>
#include <spinwright/problems.hpp>

#include <cstdint>
#include <vector>

using namespace spinwright;

TEST_CASE("bipartition from sides lists both sides in order") {
  const auto b = Bipartition::from_sides({0, 1, 1, 0, 7});
  CHECK(b.side == std::vector<std::uint8_t>{0, 1, 1, 0, 1});
  CHECK(b.zero == std::vector<std::uint64_t>{0, 3});
  CHECK(b.one == std::vector<std::uint64_t>{1, 2, 4});
}

TEST_CASE("selection from spins and from bits agree") {
  const std::int8_t spins[6] = {1, -1, -1, 1, 1, -1};
  const std::uint8_t bits[6] = {0, 1, 1, 0, 0, 1};
  const auto a = Selection::from_spins(spins, 6);
  const auto b = Selection::from_bits(bits, 6);
  CHECK(a.items == std::vector<std::uint64_t>{1, 2, 5});
  CHECK(a.items == b.items);
  CHECK(a.universe == 6);
  CHECK(a.flags() == std::vector<std::uint8_t>{0, 1, 1, 0, 0, 1});
  // Only the first n entries are read (slack bits beyond are ignored).
  CHECK(Selection::from_bits(bits, 2).items == std::vector<std::uint64_t>{1});
}

TEST_CASE("edge validation names the offending edge") {
  const std::vector<Edge> edges{{0, 1}, {1, 2}, {2, 9}};
  const Status s = detail::check_edges(4, edges);
  CHECK(s.code == StatusCode::index_out_of_range);
  CHECK(s.term == 2);
  CHECK(s.j == 9);
  CHECK(detail::check_edges(10, edges).ok());
}
