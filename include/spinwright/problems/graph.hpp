// spinwright — small graph and answer types shared by the problem encoders: edges, a
// two-sided split of items (cut sides, partition subsets), a chosen subset of items.
#ifndef SPINWRIGHT_PROBLEMS_GRAPH_HPP
#define SPINWRIGHT_PROBLEMS_GRAPH_HPP

#include "../config.hpp"
#include "../status.hpp"

#include <cstddef>  // std::size_t
#include <cstdint>  // std::uint64_t, std::uint8_t, std::int8_t
#include <utility>  // std::move
#include <vector>   // std::vector

namespace spinwright {

/// An undirected edge between vertices u and v (0-based).
struct Edge {
  std::uint64_t u = 0;
  std::uint64_t v = 0;
};

/// An undirected edge with a weight.
template <class Value>
struct WeightedEdge {
  std::uint64_t u = 0;
  std::uint64_t v = 0;
  Value weight{};
};

/// Items split in two: side[i] is 0 or 1 (spin +1 is side 0, spin -1 is side 1, i.e. the
/// bit), and the two sides listed in increasing order.
struct Bipartition {
  std::vector<std::uint8_t> side;
  std::vector<std::uint64_t> zero;  // items with side 0
  std::vector<std::uint64_t> one;   // items with side 1

  /// Build from a side vector (any non-zero entry is side 1).
  static Bipartition from_sides(std::vector<std::uint8_t> sides) {
    Bipartition b;
    b.side = std::move(sides);
    for (std::size_t i = 0; i < b.side.size(); ++i) {
      b.side[i] = b.side[i] != 0 ? 1 : 0;
      (b.side[i] != 0 ? b.one : b.zero).push_back(i);
    }
    return b;
  }
};

/// A chosen subset of items (increasing indices) out of `universe` items.
struct Selection {
  std::uint64_t universe = 0;
  std::vector<std::uint64_t> items;

  /// The subset whose bits are set among the first n bits.
  static Selection from_bits(const std::uint8_t* bits, std::uint64_t n) {
    Selection s;
    s.universe = n;
    for (std::uint64_t i = 0; i < n; ++i) {
      if (bits[i] != 0) s.items.push_back(i);
    }
    return s;
  }
  /// The subset whose spins are -1 (bit 1) among the first n spins.
  static Selection from_spins(const std::int8_t* spins, std::uint64_t n) {
    Selection s;
    s.universe = n;
    for (std::uint64_t i = 0; i < n; ++i) {
      if (spins[i] < 0) s.items.push_back(i);
    }
    return s;
  }
  /// Membership flags (0/1) of the `universe` items; entries out of range are ignored.
  std::vector<std::uint8_t> flags() const {
    std::vector<std::uint8_t> f(universe, 0);
    for (const std::uint64_t i : items) {
      if (i < universe) f[i] = 1;
    }
    return f;
  }
};

namespace detail {

// Every edge joins two distinct vertices below n.
template <class EdgeList>
Status check_edges(std::uint64_t n, const EdgeList& edges) noexcept {
  for (std::size_t k = 0; k < edges.size(); ++k) {
    if (edges[k].u >= n || edges[k].v >= n) {
      return Status::error(StatusCode::index_out_of_range, "edge endpoint beyond the number of vertices")
          .at_term(k, edges[k].u, edges[k].v);
    }
    if (edges[k].u == edges[k].v) {
      return Status::error(StatusCode::invalid_argument, "self-loop edges are not accepted")
          .at_term(k, edges[k].u, edges[k].v);
    }
  }
  return Status::success();
}

inline std::vector<std::uint8_t> bits_of_spins(const std::int8_t* spins, std::size_t n) {
  std::vector<std::uint8_t> b(n);
  for (std::size_t i = 0; i < n; ++i) b[i] = spins[i] < 0 ? 1 : 0;
  return b;
}

inline std::vector<std::int8_t> spins_of_bits(const std::uint8_t* bits, std::size_t n) {
  std::vector<std::int8_t> s(n);
  for (std::size_t i = 0; i < n; ++i) s[i] = bits[i] != 0 ? -1 : 1;
  return s;
}

}  // namespace detail
}  // namespace spinwright

#endif  // SPINWRIGHT_PROBLEMS_GRAPH_HPP
