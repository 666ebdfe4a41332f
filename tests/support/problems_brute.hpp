// Test helper for the problems layer: visit every assignment of a small model and collect
// its ground states; small graphs used by the problem tests.
#ifndef SPINWRIGHT_TEST_SUPPORT_PROBLEMS_BRUTE_HPP
#define SPINWRIGHT_TEST_SUPPORT_PROBLEMS_BRUTE_HPP

#include <spinwright/problems/graph.hpp>

#include <cstdint>
#include <vector>

namespace problems_test {

// Every bit vector of length n (n <= 26), in binary order; fn(const std::uint8_t* bits).
template <class Fn>
void for_each_bits(std::uint32_t n, Fn&& fn) {
  std::vector<std::uint8_t> b(n);
  for (std::uint64_t code = 0; code < (std::uint64_t{1} << n); ++code) {
    for (std::uint32_t k = 0; k < n; ++k) b[k] = static_cast<std::uint8_t>((code >> k) & 1);
    fn(static_cast<const std::uint8_t*>(b.data()));
  }
}

// Every spin state of a model with its energy from model.energy(); fn(spins, bits, energy).
template <class Model, class Fn>
void for_each_state(const Model& m, Fn&& fn) {
  const auto n = static_cast<std::uint32_t>(m.num_spins());
  std::vector<std::int8_t> s(n);
  for_each_bits(n, [&](const std::uint8_t* bits) {
    for (std::uint32_t k = 0; k < n; ++k) s[k] = bits[k] ? -1 : 1;
    fn(static_cast<const std::int8_t*>(s.data()), bits, m.energy(s.data()));
  });
}

template <class Energy>
struct Ground {
  Energy energy{};
  std::vector<std::vector<std::int8_t>> states;  // every ground state (within `tolerance`)
};

// All ground states of a model by enumeration; floating energies within `tolerance` of the
// minimum count as ground states.
template <class Model>
Ground<typename Model::energy_type> ground_states(const Model& m, double tolerance = 0) {
  using E = typename Model::energy_type;
  Ground<E> g;
  bool first = true;
  for_each_state(m, [&](const std::int8_t* s, const std::uint8_t*, E e) {
    const std::vector<std::int8_t> v(s, s + m.num_spins());
    if (first || static_cast<double>(e) < static_cast<double>(g.energy) - tolerance) {
      first = false;
      g.energy = e;
      g.states.assign(1, v);
    } else if (static_cast<double>(e) <= static_cast<double>(g.energy) + tolerance) {
      if (e < g.energy) g.energy = e;
      g.states.push_back(v);
    }
  });
  return g;
}

// Cycle C_n: edges (i, i+1 mod n).
inline std::vector<spinwright::Edge> cycle_graph(std::uint64_t n) {
  std::vector<spinwright::Edge> e;
  for (std::uint64_t i = 0; i < n; ++i) e.push_back({i, (i + 1) % n});
  return e;
}

// Complete graph K_n.
inline std::vector<spinwright::Edge> complete_graph(std::uint64_t n) {
  std::vector<spinwright::Edge> e;
  for (std::uint64_t i = 0; i < n; ++i) {
    for (std::uint64_t j = i + 1; j < n; ++j) e.push_back({i, j});
  }
  return e;
}

// Petersen graph (10 vertices, 15 edges): outer 5-cycle 0..4, inner pentagram 5..9
// (5+i -- 5+(i+2) mod 5), spokes i -- 5+i (common practice).
inline std::vector<spinwright::Edge> petersen_graph() {
  std::vector<spinwright::Edge> e;
  for (std::uint64_t i = 0; i < 5; ++i) {
    e.push_back({i, (i + 1) % 5});
    e.push_back({5 + i, 5 + (i + 2) % 5});
    e.push_back({i, 5 + i});
  }
  return e;
}

}  // namespace problems_test

#endif
