// spinwright — graph colouring with k colours as a QUBO.
// Bit x_{v,c} (index v * k + c) says vertex v has colour c. Penalties, all with weight A:
//   exactly one colour per vertex:  A (1 - sum_c x_{v,c})^2          (ConstraintKind::one_hot)
//   no monochromatic edge:          A x_{u,c} x_{v,c} per edge, colour (ConstraintKind::pairwise_exclusion)
// H = 0 exactly for a proper k-colouring, and H >= A otherwise (A. Lucas, "Ising formulations
// of many NP problems", Front. Phys. 2:5, 2014, section 6.1 [section number from memory]). With no
// objective, any A > 0 keeps infeasible states above feasible ones; the ground energy is A
// times the fewest violated terms, 0 exactly when the graph is k-colourable.
#ifndef SPINWRIGHT_PROBLEMS_COLOURING_HPP
#define SPINWRIGHT_PROBLEMS_COLOURING_HPP

#include "../config.hpp"
#include "../model/builder.hpp"
#include "../model/form.hpp"
#include "../model/sparse_model.hpp"
#include "../status.hpp"
#include "constraints.hpp"
#include "graph.hpp"
#include "penalty.hpp"

#include <cstddef>  // std::size_t
#include <cstdint>  // std::uint32_t, std::uint64_t, std::int8_t, std::uint8_t
#include <limits>   // std::numeric_limits
#include <utility>  // std::move
#include <vector>   // std::vector

namespace spinwright {

/// A colour per vertex; no_colour marks a vertex with no colour bit set.
struct Colouring {
  static constexpr std::uint32_t no_colour = std::numeric_limits<std::uint32_t>::max();
  std::vector<std::uint32_t> colour;
};

/// Whether a colouring is proper, and how far from it.
struct ColouringReport {
  bool valid = false;              // every vertex coloured with a colour < k and no conflict
  std::uint64_t conflicts = 0;     // edges whose endpoints share a colour
  std::uint64_t uncoloured = 0;    // vertices with no colour (or a colour >= k)
  std::uint32_t colours_used = 0;  // distinct colours among the coloured vertices
};

template <class Value, class Index = std::uint32_t>
class ColouringProblem {
 public:
  using model_type = QuboModel<Value, Index>;
  using energy_type = energy_t<Value>;

  ColouringProblem() = default;

  /// Encode colouring of a graph with `colours` colours and penalty weight A = `weight`.
  /// Errors: invalid_argument (colours == 0, weight <= 0, self-loop), index_out_of_range
  /// (endpoint >= n), size_limit (n * colours beyond the index type), builder errors.
  static Result<ColouringProblem> encode(std::uint64_t num_vertices, const std::vector<Edge>& edges,
                                         std::uint32_t colours, Value weight = Value{1}) {
    const Status st = detail::check_edges(num_vertices, edges);
    if (!st) return st;
    if (colours == 0) return Status::error(StatusCode::invalid_argument, "at least one colour is needed");
    if (num_vertices > max_spins_v<Index> / colours) {
      return Status::error(StatusCode::size_limit, "vertices times colours exceed what the index type can address");
    }
    const std::uint64_t nbits = num_vertices * colours;
    QuboBuilder<Value, Index> b(nbits);
    ConstraintSet set(nbits);
    std::vector<std::uint64_t> group(colours);
    for (std::uint64_t v = 0; v < num_vertices; ++v) {
      for (std::uint32_t c = 0; c < colours; ++c) group[c] = v * colours + c;
      auto r = add_one_hot(b, set, group, weight, {"one colour per vertex", v});
      if (!r) return r.status();
    }
    for (std::size_t k = 0; k < edges.size(); ++k) {
      for (std::uint32_t c = 0; c < colours; ++c) {
        auto r = add_pairwise_exclusion(b, set, {edges[k].u * colours + c, edges[k].v * colours + c}, weight,
                                        {"edge endpoints share a colour", k});
        if (!r) return r.status();
      }
    }
    auto m = b.build();
    if (!m) return m.status();
    ColouringProblem p;
    p.model_ = std::move(*m);
    p.constraints_ = std::move(set);
    p.n_ = num_vertices;
    p.k_ = colours;
    p.edges_ = edges;
    return p;
  }

  const model_type& model() const noexcept { return model_; }
  const ConstraintSet& constraints() const noexcept { return constraints_; }
  std::uint64_t num_vertices() const noexcept { return n_; }
  std::uint32_t num_colours() const noexcept { return k_; }
  /// Index of bit x_{v,c}.
  std::uint64_t variable(std::uint64_t v, std::uint32_t c) const noexcept { return v * k_ + c; }

  /// Colour of each vertex: the lowest colour whose bit is set, no_colour if none. A state
  /// with several bits per vertex decodes, but feasibility() reports it.
  Colouring decode_bits(const std::uint8_t* bits) const {
    Colouring col;
    col.colour.assign(static_cast<std::size_t>(n_), Colouring::no_colour);
    for (std::uint64_t v = 0; v < n_; ++v) {
      for (std::uint32_t c = 0; c < k_; ++c) {
        if (bits[v * k_ + c] != 0) {
          col.colour[v] = c;
          break;
        }
      }
    }
    return col;
  }
  Colouring decode(const std::int8_t* spins) const {
    return decode_bits(detail::bits_of_spins(spins, static_cast<std::size_t>(n_ * k_)).data());
  }

  /// The bits of a colouring (vertices with no_colour get no bit), e.g. to evaluate its energy.
  std::vector<std::uint8_t> encode_answer(const Colouring& col) const {
    std::vector<std::uint8_t> bits(static_cast<std::size_t>(n_ * k_), 0);
    for (std::uint64_t v = 0; v < n_ && v < col.colour.size(); ++v) {
      if (col.colour[v] < k_) bits[v * k_ + col.colour[v]] = 1;
    }
    return bits;
  }

  /// Constraint check of a raw state (names the first violated constraint).
  Feasibility feasibility(const std::int8_t* spins) const noexcept { return constraints_.check_spins(spins); }

  /// Checks a colouring on the graph: conflicts, uncoloured vertices, colours used.
  ColouringReport check(const Colouring& col) const {
    ColouringReport r;
    if (col.colour.size() != n_) {
      r.uncoloured = n_;
      return r;
    }
    std::vector<std::uint8_t> used(k_, 0);
    for (const std::uint32_t c : col.colour) {
      if (c >= k_) {
        ++r.uncoloured;
      } else if (used[c] == 0) {
        used[c] = 1;
        ++r.colours_used;
      }
    }
    for (const auto& e : edges_) {
      const std::uint32_t cu = col.colour[e.u];
      if (cu < k_ && cu == col.colour[e.v]) ++r.conflicts;
    }
    r.valid = r.conflicts == 0 && r.uncoloured == 0;
    return r;
  }

 private:
  model_type model_{};
  ConstraintSet constraints_{};
  std::uint64_t n_ = 0;
  std::uint32_t k_ = 0;
  std::vector<Edge> edges_;
};

}  // namespace spinwright

#endif  // SPINWRIGHT_PROBLEMS_COLOURING_HPP
