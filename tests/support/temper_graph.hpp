// Test helper for the tempering / tabu / exact tests: small graph families, the benchmark
// max-cut instances (read with the io layer's edge-list reader) and reference.csv, and model
// builders for every value type.
#ifndef SPINWRIGHT_TEST_SUPPORT_TEMPER_GRAPH_HPP
#define SPINWRIGHT_TEST_SUPPORT_TEMPER_GRAPH_HPP

#include <doctest/doctest.h>
#include <spinwright/io/edge_list.hpp>
#include <spinwright/spinwright.hpp>

#include <cstdint>
#include <fstream>
#include <sstream>
#include <string>
#include <utility>
#include <vector>

namespace test_support {

struct Edge {
  std::uint32_t i;
  std::uint32_t j;
  std::int64_t w;
};

struct Graph {
  std::uint32_t n = 0;
  std::vector<Edge> edges;
  bool ok = false;
};

// L x L square lattice with periodic boundaries, every bond of weight w.
inline Graph torus(std::uint32_t L, std::int64_t w) {
  Graph g;
  g.n = L * L;
  for (std::uint32_t r = 0; r < L; ++r) {
    for (std::uint32_t c = 0; c < L; ++c) {
      const std::uint32_t i = r * L + c;
      g.edges.push_back({i, r * L + (c + 1) % L, w});
      g.edges.push_back({i, ((r + 1) % L) * L + c, w});
    }
  }
  g.ok = true;
  return g;
}

inline Graph complete(std::uint32_t n) {
  Graph g;
  g.n = n;
  for (std::uint32_t i = 0; i < n; ++i)
    for (std::uint32_t j = i + 1; j < n; ++j) g.edges.push_back({i, j, 1});
  g.ok = true;
  return g;
}

inline Graph cycle(std::uint32_t n) {
  Graph g;
  g.n = n;
  for (std::uint32_t i = 0; i < n; ++i) g.edges.push_back({i, (i + 1) % n, 1});
  g.ok = true;
  return g;
}

// Petersen graph: outer 5-cycle 0..4, spokes i -- i+5, inner pentagram 5..9.
inline Graph petersen() {
  Graph g;
  g.n = 10;
  for (std::uint32_t i = 0; i < 5; ++i) {
    g.edges.push_back({i, (i + 1) % 5, 1});
    g.edges.push_back({i, i + 5, 1});
    g.edges.push_back({5 + i, 5 + (i + 2) % 5, 1});
  }
  g.ok = true;
  return g;
}

// The reference cut of an instance in reference.csv (second-to-last numeric column "cut"),
// or -1 when the instance is not listed.
inline std::int64_t reference_cut(const std::string& csv_path, const std::string& instance) {
  std::ifstream in(csv_path);
  std::string line;
  while (std::getline(in, line)) {
    std::vector<std::string> cols;
    std::string cell;
    std::istringstream ls(line);
    for (int k = 0; k < 5 && std::getline(ls, cell, ','); ++k) cols.push_back(cell);
    if (cols.size() == 5 && cols[0] == instance) return std::stoll(cols[4]);
  }
  return -1;
}

inline std::string maxcut_path(const std::string& name) { return std::string(SPINWRIGHT_DATA_DIR) + "/maxcut/" + name; }

// A benchmark instance as the max-cut Ising model J = w, h = 0 (io/edge_list.hpp).
// The read status is asserted (a reader bug fails the test with the reader's message instead
// of ending it in value()), and the vertex count against the file's own first line "n m".
template <class Value = std::int32_t>
spinwright::IsingModel<Value> load_maxcut(const std::string& instance) {
  const std::string path = maxcut_path(instance + ".txt");
  auto read = spinwright::io::read_edge_list<Value>(path);
  REQUIRE_MESSAGE(read.ok(), read.message());
  std::ifstream head(path);
  std::uint64_t n = 0, m = 0;
  REQUIRE_MESSAGE(static_cast<bool>(head >> n >> m), (path + ": no \"n m\" first line"));
  REQUIRE(read.value().num_spins() == n);
  REQUIRE(read.value().num_pairs() <= m);
  return std::move(read).value();
}

// Max-cut Ising model J_ij = scale * w_ij, h = 0.
template <class Value, class Index = std::uint32_t>
spinwright::IsingModel<Value, Index> ising_of(const Graph& g, Value scale = Value{1}) {
  spinwright::IsingBuilder<Value, Index> b(g.n);
  for (const auto& e : g.edges) b.add_coupling(e.i, e.j, static_cast<Value>(static_cast<Value>(e.w) * scale));
  auto built = b.build();
  REQUIRE_MESSAGE(built.ok(), built.status().message);
  return std::move(built).value();
}

}  // namespace test_support

#endif
