// spinwright — random graphs of the three families the G-set max-cut instances come from
// (random, planar-type, toroidal; weights 1 or +-1), for measurements beyond the published
// instances (docs/quality.md). Our own generator and seeds; the same graph for the same arguments
// on every platform (Xoshiro256 streams, no standard-library distributions).
#ifndef SPINWRIGHT_PROBLEMS_GRAPH_FAMILIES_HPP
#define SPINWRIGHT_PROBLEMS_GRAPH_FAMILIES_HPP

#include "../config.hpp"
#include "../rng/xoshiro.hpp"
#include "graph.hpp"

#if !SPINWRIGHT_NO_HEAP
#include <algorithm>      // std::sort, std::partial_sort
#include <cmath>          // std::sqrt
#include <cstddef>        // std::size_t
#include <cstdint>        // std::uint32_t, std::uint64_t, std::int32_t
#include <unordered_set>  // std::unordered_set
#include <utility>        // std::pair, std::move
#include <vector>         // std::vector

namespace spinwright {

enum class EdgeWeights : std::uint8_t { ones, plus_minus_one };

namespace detail {

inline std::int32_t family_weight(EdgeWeights w, Xoshiro256& rng) noexcept {
  return w == EdgeWeights::ones ? 1 : (rng.coin() ? 1 : -1);
}

inline std::uint64_t edge_key(std::uint32_t a, std::uint32_t b) noexcept {
  return a < b ? (std::uint64_t{a} << 32) | b : (std::uint64_t{b} << 32) | a;
}

struct Point {
  double x;
  double y;
};

inline double cross(const Point& o, const Point& a, const Point& b) noexcept {
  return (a.x - o.x) * (b.y - o.y) - (a.y - o.y) * (b.x - o.x);
}

// Segments pq and rs cross at a point inside both (shared end points do not count).
inline bool segments_cross(const Point& p, const Point& q, const Point& r, const Point& s) noexcept {
  const double d1 = cross(p, q, r);
  const double d2 = cross(p, q, s);
  const double d3 = cross(r, s, p);
  const double d4 = cross(r, s, q);
  return ((d1 > 0 && d2 < 0) || (d1 < 0 && d2 > 0)) && ((d3 > 0 && d4 < 0) || (d3 < 0 && d4 > 0));
}

// A planar graph on n random points of the unit square: candidate edges to each point's
// `near` nearest points, taken shortest first when they cross no edge taken before (a greedy
// triangulation of the candidates; near-maximal planar, about 3 n edges).
inline void add_planar(std::uint32_t n, std::uint32_t near, Xoshiro256& rng, std::vector<std::uint64_t>& keys) {
  std::vector<Point> pt(n);
  for (auto& p : pt) p = {rng.uniform(), rng.uniform()};
  struct Candidate {
    double length;
    std::uint32_t a;
    std::uint32_t b;
  };
  std::vector<Candidate> cand;
  std::vector<std::pair<double, std::uint32_t>> dist(n);
  for (std::uint32_t i = 0; i < n; ++i) {
    for (std::uint32_t j = 0; j < n; ++j) {
      const double dx = pt[i].x - pt[j].x;
      const double dy = pt[i].y - pt[j].y;
      dist[j] = {j == i ? 1e300 : dx * dx + dy * dy, j};
    }
    const std::uint32_t k = near < n - 1 ? near : n - 1;
    std::partial_sort(dist.begin(), dist.begin() + k, dist.end());
    for (std::uint32_t t = 0; t < k; ++t) cand.push_back({dist[t].first, i, dist[t].second});
  }
  std::sort(cand.begin(), cand.end(), [](const Candidate& u, const Candidate& v) {
    return u.length != v.length ? u.length < v.length : edge_key(u.a, u.b) < edge_key(v.a, v.b);
  });
  // Accepted edges in a grid of cells (by midpoint) so that a crossing test looks only nearby.
  const std::uint32_t cells = 1 + static_cast<std::uint32_t>(std::sqrt(static_cast<double>(n) / 4.0));
  std::vector<std::vector<std::pair<std::uint32_t, std::uint32_t>>> grid(static_cast<std::size_t>(cells) * cells);
  double longest = 0;
  std::unordered_set<std::uint64_t> taken;
  auto cell_of = [cells](double v) {
    const auto c = static_cast<std::int64_t>(v * cells);
    return c < 0 ? std::int64_t{0} : (c >= cells ? std::int64_t{cells} - 1 : c);
  };
  for (const auto& c : cand) {
    const std::uint64_t key = edge_key(c.a, c.b);
    if (taken.count(key) != 0) continue;
    const Point& p = pt[c.a];
    const Point& q = pt[c.b];
    const double len = std::sqrt(c.length);
    const double reach = 0.5 * (len + longest);
    const double mx = 0.5 * (p.x + q.x);
    const double my = 0.5 * (p.y + q.y);
    bool crosses = false;
    for (std::int64_t cx = cell_of(mx - reach); cx <= cell_of(mx + reach) && !crosses; ++cx)
      for (std::int64_t cy = cell_of(my - reach); cy <= cell_of(my + reach) && !crosses; ++cy)
        for (const auto& e : grid[static_cast<std::size_t>(cx * cells + cy)])
          if (segments_cross(p, q, pt[e.first], pt[e.second])) {
            crosses = true;
            break;
          }
    if (crosses) continue;
    taken.insert(key);
    if (len > longest) longest = len;
    grid[static_cast<std::size_t>(cell_of(mx) * cells + cell_of(my))].push_back({c.a, c.b});
    keys.push_back(key);
  }
}

inline std::vector<WeightedEdge<std::int32_t>> weigh(std::vector<std::uint64_t> keys, EdgeWeights w, Xoshiro256& rng) {
  std::sort(keys.begin(), keys.end());
  std::vector<WeightedEdge<std::int32_t>> edges;
  edges.reserve(keys.size());
  for (std::size_t k = 0; k < keys.size(); ++k) {
    if (k > 0 && keys[k] == keys[k - 1]) continue;  // parallel edges of a union are merged
    edges.push_back({static_cast<std::uint32_t>(keys[k] >> 32), static_cast<std::uint32_t>(keys[k] & 0xffffffffu),
                     family_weight(w, rng)});
  }
  return edges;
}

}  // namespace detail

/// A random graph: round(density * n (n - 1) / 2) distinct edges drawn uniformly.
inline std::vector<WeightedEdge<std::int32_t>> random_graph(std::uint32_t n, double density, EdgeWeights w,
                                                            std::uint64_t seed) {
  Xoshiro256 rng = Xoshiro256::for_restart(seed, 0);
  const double pairs = 0.5 * static_cast<double>(n) * (static_cast<double>(n) - 1.0);
  const auto m = static_cast<std::uint64_t>(density * pairs + 0.5);
  std::unordered_set<std::uint64_t> seen;
  std::vector<std::uint64_t> keys;
  while (n > 1 && keys.size() < m && static_cast<double>(keys.size()) < pairs) {
    const std::uint32_t a = rng.below(n);
    const std::uint32_t b = rng.below(n);
    if (a == b) continue;
    const std::uint64_t key = detail::edge_key(a, b);
    if (seen.insert(key).second) keys.push_back(key);
  }
  return detail::weigh(std::move(keys), w, rng);
}

/// A planar-type graph: the union of two independent near-maximal planar graphs on the same n
/// vertices (random points, greedy triangulation of near neighbours), about 6 n edges.
inline std::vector<WeightedEdge<std::int32_t>> planar_type_graph(std::uint32_t n, EdgeWeights w, std::uint64_t seed) {
  Xoshiro256 rng = Xoshiro256::for_restart(seed, 0);
  std::vector<std::uint64_t> keys;
  if (n > 1) {
    detail::add_planar(n, 8, rng, keys);
    detail::add_planar(n, 8, rng, keys);
  }
  return detail::weigh(std::move(keys), w, rng);
}

/// A toroidal grid: rows x cols vertices, each joined to its right and lower neighbour with
/// wrap-around (2 rows cols edges for rows, cols >= 3).
inline std::vector<WeightedEdge<std::int32_t>> toroidal_graph(std::uint32_t rows, std::uint32_t cols, EdgeWeights w,
                                                              std::uint64_t seed) {
  Xoshiro256 rng = Xoshiro256::for_restart(seed, 0);
  std::vector<std::uint64_t> keys;
  for (std::uint32_t r = 0; r < rows; ++r)
    for (std::uint32_t c = 0; c < cols; ++c) {
      const std::uint32_t v = r * cols + c;
      const std::uint32_t right = r * cols + (c + 1) % cols;
      const std::uint32_t down = ((r + 1) % rows) * cols + c;
      if (right != v) keys.push_back(detail::edge_key(v, right));
      if (down != v) keys.push_back(detail::edge_key(v, down));
    }
  return detail::weigh(std::move(keys), w, rng);
}

}  // namespace spinwright

#endif  // !SPINWRIGHT_NO_HEAP
#endif  // SPINWRIGHT_PROBLEMS_GRAPH_FAMILIES_HPP
