// spinwright — max-cut on a weighted graph as an Ising model: J_ij = w_ij, h = 0.
// Edge (i, j) is cut when s_i != s_j and cut(s) = (W - E(s)) / 2 with W the total weight,
// so the ground state is a maximum cut (common practice; e.g. F. Barahona, M. Groetschel,
// M. Juenger, G. Reinelt, Oper. Res. 36, 1988). Parallel edges add up; self-loops are refused.
#ifndef SPINWRIGHT_PROBLEMS_MAX_CUT_HPP
#define SPINWRIGHT_PROBLEMS_MAX_CUT_HPP

#include "../config.hpp"
#include "../model/builder.hpp"
#include "../model/form.hpp"
#include "../model/sparse_model.hpp"
#include "../status.hpp"
#include "graph.hpp"

#include <cstddef>  // std::size_t
#include <cstdint>  // std::uint64_t, std::int8_t, std::uint8_t
#include <utility>  // std::move
#include <vector>   // std::vector

namespace spinwright {

// Self-loops of a weighted graph (from files, or a builder given (i, i)) fold into the offset;
// total_weight counts them there, so cut_from_energy(total_weight(m), E) is the cut whatever the
// graph holds.
// W: the total weight of a max-cut model (offset plus every coupling once).
template <class Model>
typename Model::energy_type total_weight(const Model& m) noexcept {
  static_assert(Model::form == Form::ising, "max-cut models are Ising models");
  using energy_type = typename Model::energy_type;
  using index_type = typename Model::index_type;
  energy_type w = m.offset();
  for (std::size_t i = 0; i < m.num_spins(); ++i) {
    const auto ii = static_cast<index_type>(i);
    m.for_each_neighbour(ii, [&](index_type j, typename Model::value_type v) {
      if (j > ii) w += static_cast<energy_type>(v);
    });
  }
  return w;
}

// The weight of the edges cut by a spin assignment, counted edge by edge.
template <class Model>
typename Model::energy_type cut_value(const Model& m, const std::int8_t* spins) noexcept {
  using energy_type = typename Model::energy_type;
  using index_type = typename Model::index_type;
  energy_type cut = 0;
  for (std::size_t i = 0; i < m.num_spins(); ++i) {
    const auto ii = static_cast<index_type>(i);
    m.for_each_neighbour(ii, [&](index_type j, typename Model::value_type v) {
      if (j > ii && spins[i] != spins[j]) cut += static_cast<energy_type>(v);
    });
  }
  return cut;
}

template <class Energy>
constexpr Energy cut_from_energy(Energy total_weight, Energy energy) noexcept {
  return (total_weight - energy) / 2;
}

template <class Energy>
constexpr Energy energy_from_cut(Energy total_weight, Energy cut) noexcept {
  return total_weight - 2 * cut;
}

/// What a cut is worth in the graph's own terms.
template <class Energy>
struct CutReport {
  bool valid = false;           // one side (0/1) per vertex
  Energy cut_weight{0};         // total weight of the edges with endpoints on different sides
  std::uint64_t cut_edges = 0;  // how many edges are cut
};

template <class Value, class Index = std::uint32_t>
class MaxCutProblem {
 public:
  using model_type = IsingModel<Value, Index>;
  using energy_type = energy_t<Value>;

  MaxCutProblem() = default;

  /// Encode a graph of `num_vertices` vertices. Errors: index_out_of_range (endpoint >= n),
  /// invalid_argument (self-loop), and every builder error (non-finite weight, overflow).
  static Result<MaxCutProblem> encode(std::uint64_t num_vertices, const std::vector<WeightedEdge<Value>>& edges) {
    const Status st = detail::check_edges(num_vertices, edges);
    if (!st) return st;
    IsingBuilder<Value, Index> b(num_vertices);
    for (const auto& e : edges) b.add_coupling(e.u, e.v, e.weight);
    auto m = b.build();
    if (!m) return m.status();
    MaxCutProblem p;
    p.model_ = std::move(*m);
    p.n_ = num_vertices;
    p.edges_ = edges;
    p.total_ = 0;
    for (const auto& e : edges) p.total_ += static_cast<energy_type>(e.weight);
    return p;
  }

  const model_type& model() const noexcept { return model_; }
  std::uint64_t num_vertices() const noexcept { return n_; }
  const std::vector<WeightedEdge<Value>>& edges() const noexcept { return edges_; }
  /// W, the sum of all edge weights: cut(s) = (W - E(s)) / 2.
  energy_type total_weight() const noexcept { return total_; }

  /// The two sides of a spin state (spin +1 is side 0).
  Bipartition decode(const std::int8_t* spins) const {
    return Bipartition::from_sides(detail::bits_of_spins(spins, static_cast<std::size_t>(n_)));
  }
  Bipartition decode_bits(const std::uint8_t* bits) const {
    return Bipartition::from_sides(std::vector<std::uint8_t>(bits, bits + n_));
  }

  /// The cut weight, counted edge by edge on the graph (not through the model).
  CutReport<energy_type> check(const Bipartition& sides) const {
    CutReport<energy_type> r;
    r.valid = sides.side.size() == n_;
    if (!r.valid) return r;
    for (const auto& e : edges_) {
      if (sides.side[e.u] != sides.side[e.v]) {
        r.cut_weight += static_cast<energy_type>(e.weight);
        ++r.cut_edges;
      }
    }
    return r;
  }

 private:
  model_type model_{};
  std::uint64_t n_ = 0;
  std::vector<WeightedEdge<Value>> edges_;
  energy_type total_{0};
};

}  // namespace spinwright

#endif  // SPINWRIGHT_PROBLEMS_MAX_CUT_HPP
