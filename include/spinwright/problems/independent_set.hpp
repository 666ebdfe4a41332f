// spinwright — maximum (weighted) independent set and minimum (weighted) vertex cover as QUBOs.
// Bit x_v says vertex v is chosen; vertex weights w_v > 0 (all 1 when none are given).
//   independent set:  H = -sum_v w_v x_v + A sum_{(u,v)} x_u x_v        (pairwise_exclusion per edge)
//   vertex cover:     H =  sum_v w_v x_v + A sum_{(u,v)} (1 - x_u)(1 - x_v) (pair_cover per edge)
// With A > max_v w_v every ground state is feasible: in the first, dropping one endpoint of
// a violated edge changes H by w_u - A (#chosen neighbours) < 0; in the second, adding one
// endpoint of an uncovered edge changes H by w_u - A (#uncovered edges at u) < 0. Source:
// A. Lucas, "Ising formulations of many NP problems", Front. Phys. 2:5, 2014, sections 4.2
// (set packing / independent set) and 4.3 (vertex cover), A > B there [section numbers from
// memory]. The default weight is max w + 1 (integers) or 2 max w (floating).
#ifndef SPINWRIGHT_PROBLEMS_INDEPENDENT_SET_HPP
#define SPINWRIGHT_PROBLEMS_INDEPENDENT_SET_HPP

#include "../config.hpp"
#include "../model/detail/energy_range.hpp"
#include "../model/builder.hpp"
#include "../model/form.hpp"
#include "../model/sparse_model.hpp"
#include "../status.hpp"
#include "constraints.hpp"
#include "graph.hpp"
#include "penalty.hpp"

#include <cstddef>      // std::size_t
#include <cstdint>      // std::uint64_t, std::int8_t, std::uint8_t
#include <limits>       // std::numeric_limits
#include <type_traits>  // std::is_integral_v
#include <utility>      // std::move
#include <vector>       // std::vector

namespace spinwright {

/// Whether a vertex set is independent (or a cover), its size and weight.
template <class Energy>
struct VertexSetReport {
  bool valid = false;            // independent (resp. covering) and every index < n, no repeats
  std::uint64_t size = 0;        // number of chosen vertices
  Energy weight{0};              // sum of their weights
  std::uint64_t violations = 0;  // edges inside the set (resp. edges left uncovered)
};

enum class VertexSetGoal : std::uint8_t { independent_set, vertex_cover };

template <class Value, class Index = std::uint32_t>
class VertexSetProblem {
 public:
  using model_type = QuboModel<Value, Index>;
  using energy_type = energy_t<Value>;

  VertexSetProblem() = default;

  /// Encode. `vertex_weights` empty means all 1; otherwise one positive weight per vertex.
  /// `weight` 0 picks the default penalty weight; otherwise it must exceed max w.
  /// Errors: invalid_argument (bad weights, penalty <= max w, self-loop), index_out_of_range,
  /// value_out_of_range, builder errors.
  static Result<VertexSetProblem> encode(VertexSetGoal goal, std::uint64_t num_vertices, const std::vector<Edge>& edges,
                                         const std::vector<Value>& vertex_weights = {}, Value weight = Value{0}) {
    const Status st = detail::check_edges(num_vertices, edges);
    if (!st) return st;
    if (!vertex_weights.empty() && vertex_weights.size() != num_vertices) {
      return Status::error(StatusCode::invalid_argument, "one weight per vertex (or none)");
    }
    std::vector<Value> w =
        vertex_weights.empty() ? std::vector<Value>(static_cast<std::size_t>(num_vertices), Value{1}) : vertex_weights;
    Value wmax{0};
    for (std::size_t v = 0; v < w.size(); ++v) {
      if (!(w[v] > Value{0}) || !detail::is_finite(w[v])) {
        return Status::error(StatusCode::invalid_argument, "vertex weights must be positive and finite")
            .at_term(no_term, v, v);
      }
      if (w[v] > wmax) wmax = w[v];
    }
    if (weight == Value{0}) {
      if constexpr (std::is_integral_v<Value>) {
        if (wmax == std::numeric_limits<Value>::max())
          return Status::error(StatusCode::value_out_of_range, "penalty weight does not fit the value type");
        weight = static_cast<Value>(wmax + 1);
      } else {
        weight = static_cast<Value>(wmax == Value{0} ? Value{1} : 2 * wmax);
      }
    } else if (!(weight > wmax)) {
      return Status::error(StatusCode::invalid_argument, "penalty weight must exceed the largest vertex weight");
    }
    QuboBuilder<Value, Index> b(num_vertices);
    ConstraintSet set(num_vertices);
    const bool cover = goal == VertexSetGoal::vertex_cover;
    for (std::uint64_t v = 0; v < num_vertices; ++v) b.add_unary(v, cover ? w[v] : static_cast<Value>(-w[v]));
    for (std::size_t k = 0; k < edges.size(); ++k) {
      auto r = cover ? add_pair_cover(b, set, edges[k].u, edges[k].v, weight, {"edge left uncovered", k})
                     : add_pairwise_exclusion(b, set, {edges[k].u, edges[k].v}, weight, {"edge inside the set", k});
      if (!r) return r.status();
    }
    auto m = b.build();
    if (!m) return m.status();
    VertexSetProblem p;
    p.goal_ = goal;
    p.model_ = std::move(*m);
    p.constraints_ = std::move(set);
    p.n_ = num_vertices;
    p.edges_ = edges;
    p.vertex_weights_ = std::move(w);
    p.weight_ = weight;
    return p;
  }

  VertexSetGoal goal() const noexcept { return goal_; }
  const model_type& model() const noexcept { return model_; }
  const ConstraintSet& constraints() const noexcept { return constraints_; }
  Value penalty_weight() const noexcept { return weight_; }

  /// The chosen vertices (bit 1, spin -1).
  Selection decode(const std::int8_t* spins) const { return Selection::from_spins(spins, n_); }
  Selection decode_bits(const std::uint8_t* bits) const { return Selection::from_bits(bits, n_); }

  Feasibility feasibility(const std::int8_t* spins) const noexcept { return constraints_.check_spins(spins); }

  /// Independence (or cover) checked on the graph, with size and weight.
  VertexSetReport<energy_type> check(const Selection& chosen) const {
    VertexSetReport<energy_type> r;
    std::vector<std::uint8_t> in(static_cast<std::size_t>(n_), 0);
    bool well_formed = chosen.universe == n_;
    for (const std::uint64_t v : chosen.items) {
      if (v >= n_ || in[v] != 0) {
        well_formed = false;
        continue;
      }
      in[v] = 1;
      ++r.size;
      r.weight += static_cast<energy_type>(vertex_weights_[v]);
    }
    for (const auto& e : edges_) {
      const bool bad =
          goal_ == VertexSetGoal::vertex_cover ? (in[e.u] == 0 && in[e.v] == 0) : (in[e.u] != 0 && in[e.v] != 0);
      if (bad) ++r.violations;
    }
    r.valid = well_formed && r.violations == 0;
    return r;
  }

 private:
  VertexSetGoal goal_ = VertexSetGoal::independent_set;
  model_type model_{};
  ConstraintSet constraints_{};
  std::uint64_t n_ = 0;
  std::vector<Edge> edges_;
  std::vector<Value> vertex_weights_;
  Value weight_{0};
};

/// Maximum (weighted) independent set: see VertexSetProblem.
template <class Value, class Index = std::uint32_t>
Result<VertexSetProblem<Value, Index>> encode_independent_set(std::uint64_t num_vertices,
                                                              const std::vector<Edge>& edges,
                                                              const std::vector<Value>& vertex_weights = {},
                                                              Value weight = Value{0}) {
  return VertexSetProblem<Value, Index>::encode(VertexSetGoal::independent_set, num_vertices, edges, vertex_weights,
                                                weight);
}

/// Minimum (weighted) vertex cover: see VertexSetProblem.
template <class Value, class Index = std::uint32_t>
Result<VertexSetProblem<Value, Index>> encode_vertex_cover(std::uint64_t num_vertices, const std::vector<Edge>& edges,
                                                           const std::vector<Value>& vertex_weights = {},
                                                           Value weight = Value{0}) {
  return VertexSetProblem<Value, Index>::encode(VertexSetGoal::vertex_cover, num_vertices, edges, vertex_weights,
                                                weight);
}

}  // namespace spinwright

#endif  // SPINWRIGHT_PROBLEMS_INDEPENDENT_SET_HPP
