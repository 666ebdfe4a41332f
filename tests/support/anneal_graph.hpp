// Test and benchmark helper (annealing area): small graph builders and a tiny reader for
// the weighted edge lists of shared/data/maxcut ("N M" then M lines "i j w", 1-based).
#ifndef SPINWRIGHT_TEST_SUPPORT_ANNEAL_GRAPH_HPP
#define SPINWRIGHT_TEST_SUPPORT_ANNEAL_GRAPH_HPP

#include <spinwright/model/builder.hpp>

#include <cmath>    // std::exp
#include <cstddef>  // std::size_t
#include <cstdint>  // std::int8_t, std::uint64_t
#include <cstdio>   // std::FILE, std::fopen, std::fscanf
#include <string>   // std::string
#include <utility>  // std::swap
#include <vector>   // std::vector

namespace anneal_support {

struct Edge {
  std::uint32_t i;
  std::uint32_t j;
  long long w;
};

struct Graph {
  std::uint32_t n = 0;
  std::vector<Edge> edges;
  bool ok = false;
};

// Reads "N M" (anything after the two numbers on that line is ignored), then M edges.
inline Graph read_edge_list(const std::string& path) {
  Graph g;
  std::FILE* f = std::fopen(path.c_str(), "r");
  if (f == nullptr) return g;
  unsigned long n = 0, m = 0;
  if (std::fscanf(f, "%lu %lu", &n, &m) != 2) {
    std::fclose(f);
    return g;
  }
  int c = 0;
  while ((c = std::fgetc(f)) != EOF && c != '\n') {
  }
  g.n = static_cast<std::uint32_t>(n);
  g.edges.reserve(m);
  for (unsigned long k = 0; k < m; ++k) {
    unsigned long i = 0, j = 0;
    long long w = 0;
    if (std::fscanf(f, "%lu %lu %lld", &i, &j, &w) != 3 || i < 1 || j < 1 || i > n || j > n) {
      std::fclose(f);
      return g;
    }
    g.edges.push_back({static_cast<std::uint32_t>(i - 1), static_cast<std::uint32_t>(j - 1), w});
  }
  std::fclose(f);
  g.ok = true;
  return g;
}

// Max-cut model: J_ij = w_ij (our form, minimised), h = 0.
template <class Value>
spinwright::IsingModel<Value> maxcut_model(const Graph& g) {
  spinwright::IsingBuilder<Value> b(g.n);
  for (const Edge& e : g.edges) b.add_coupling(e.i, e.j, static_cast<Value>(e.w));
  return b.build().value();
}

// L x L periodic square lattice with every coupling J (our form: J = -1 is the ferromagnet).
template <class Value>
spinwright::IsingModel<Value> square_lattice(std::uint32_t L, Value J, Value h = Value{0}) {
  spinwright::IsingBuilder<Value> b(static_cast<std::uint64_t>(L) * L);
  for (std::uint32_t y = 0; y < L; ++y) {
    for (std::uint32_t x = 0; x < L; ++x) {
      const std::uint32_t i = y * L + x;
      b.add_coupling(i, y * L + (x + 1) % L, J);
      b.add_coupling(i, ((y + 1) % L) * L + x, J);
      if (h != Value{0}) b.add_field(i, h);
    }
  }
  return b.build().value();
}

// Ring of n spins, coupling J between neighbours and field h on every spin.
template <class Value>
spinwright::IsingModel<Value> ring(std::uint32_t n, Value J, Value h = Value{0}) {
  spinwright::IsingBuilder<Value> b(n);
  for (std::uint32_t i = 0; i < n; ++i) {
    b.add_coupling(i, (i + 1) % n, J);
    if (h != Value{0}) b.add_field(i, h);
  }
  return b.build().value();
}

// Complete graph K_n with unit weights.
inline Graph complete_graph(std::uint32_t n) {
  Graph g;
  g.n = n;
  for (std::uint32_t i = 0; i < n; ++i)
    for (std::uint32_t j = i + 1; j < n; ++j) g.edges.push_back({i, j, 1});
  g.ok = true;
  return g;
}

inline Graph cycle_graph(std::uint32_t n) {
  Graph g;
  g.n = n;
  for (std::uint32_t i = 0; i < n; ++i) g.edges.push_back({i, (i + 1) % n, 1});
  g.ok = true;
  return g;
}

// Petersen graph: outer 5-cycle 0..4, spokes i -- i+5, inner pentagram 5..9 (i -- i+2).
inline Graph petersen_graph() {
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

// Random 3-regular-like graph on n (even) nodes: the union of three random perfect
// matchings drawn with splitmix64; a pair drawn twice or a self-loop is simply dropped
// (rare), so a few nodes have degree 2. Weights are +1 or -1 by a fair coin.
inline Graph random_cubic(std::uint32_t n, std::uint64_t seed) {
  Graph g;
  g.n = n;
  std::uint64_t s = seed;
  auto next = [&s]() {
    std::uint64_t z = (s += 0x9E3779B97F4A7C15ULL);
    z = (z ^ (z >> 30)) * 0xBF58476D1CE4E5B9ULL;
    z = (z ^ (z >> 27)) * 0x94D049BB133111EBULL;
    return z ^ (z >> 31);
  };
  std::vector<std::uint32_t> perm(n);
  std::vector<std::vector<std::uint32_t>> adj(n);
  for (int round = 0; round < 3; ++round) {
    for (std::uint32_t k = 0; k < n; ++k) perm[k] = k;
    for (std::uint32_t k = n; k > 1; --k) {
      const auto r = static_cast<std::uint32_t>(next() % k);
      std::swap(perm[k - 1], perm[r]);
    }
    for (std::uint32_t k = 0; k + 1 < n; k += 2) {
      const std::uint32_t a = perm[k], b = perm[k + 1];
      bool seen = a == b;
      for (const auto x : adj[a]) seen = seen || x == b;
      if (seen) continue;
      adj[a].push_back(b);
      adj[b].push_back(a);
      g.edges.push_back({a, b, (next() >> 63) ? 1 : -1});
    }
  }
  g.ok = true;
  return g;
}

// Boltzmann average <E> at inverse temperature beta by enumerating all 2^n states (n <= 20):
// the exact value that fixed-temperature sampling must reproduce. Weights are shifted by the
// ground energy, so no exponential overflows.
template <class Model>
double exact_mean_energy(const Model& model, double beta) {
  const std::size_t n = model.num_spins();
  std::vector<std::int8_t> s(n);
  std::vector<double> energies(std::size_t{1} << n);
  double ground = 0;
  for (std::uint64_t code = 0; code < energies.size(); ++code) {
    for (std::size_t k = 0; k < n; ++k) s[k] = ((code >> k) & 1) ? -1 : 1;
    energies[code] = static_cast<double>(model.energy(s.data()));
    if (code == 0 || energies[code] < ground) ground = energies[code];
  }
  double z = 0, ez = 0;
  for (double e : energies) {
    const double w = std::exp(-beta * (e - ground));
    z += w;
    ez += e * w;
  }
  return ez / z;
}

}  // namespace anneal_support

#endif  // SPINWRIGHT_TEST_SUPPORT_ANNEAL_GRAPH_HPP
