// spinwright — 0-1 knapsack as a QUBO with slack bits.
//   maximise sum_i v_i x_i  subject to  sum_i w_i x_i <= W   (integer w_i >= 0, W >= 0)
// becomes  H = -sum_i v_i x_i + A (sum_i w_i x_i + sum_m c_m y_m - W)^2, where the slack bits
// y_m with values c_m = 1, 2, 4, ..., capped last (problems/penalty.hpp) represent exactly
// 0..W. The default A is suggest_penalty_weight(-v . x) = sum |v_i| + 1 (integers), so every
// ground state is a feasible packing of maximum value (cf. A. Lucas, "Ising formulations of
// many NP problems", Front. Phys. 2:5, 2014, section 5.2 "Knapsack with integer weights",
// which also uses a logarithmic slack [section number from memory]).
#ifndef SPINWRIGHT_PROBLEMS_KNAPSACK_HPP
#define SPINWRIGHT_PROBLEMS_KNAPSACK_HPP

#include "../config.hpp"
#include "../model/detail/energy_range.hpp"
#include "../model/builder.hpp"
#include "../model/form.hpp"
#include "../model/sparse_model.hpp"
#include "../status.hpp"
#include "constraints.hpp"
#include "graph.hpp"
#include "penalty.hpp"

#include <cstddef>  // std::size_t
#include <cstdint>  // std::int64_t, std::uint64_t, std::int8_t, std::uint8_t
#include <utility>  // std::move
#include <vector>   // std::vector

namespace spinwright {

/// A packing judged in its own terms.
template <class Energy>
struct KnapsackReport {
  bool feasible = false;  // distinct items < N and total weight <= capacity
  std::int64_t total_weight = 0;
  Energy total_value{0};
};

template <class Value, class Index = std::uint32_t>
class KnapsackProblem {
 public:
  using model_type = QuboModel<Value, Index>;
  using energy_type = energy_t<Value>;

  KnapsackProblem() = default;

  /// Encode items with integer `weights` (>= 0) and `values`, and an integer `capacity` >= 0.
  /// `weight` 0 picks suggest_penalty_weight of the objective. Bits 0..N-1 are the items,
  /// the slack bits follow (constraints().num_variables() in all).
  /// Errors: invalid_argument (sizes, negative weights or capacity, penalty < 0),
  /// value_out_of_range (coefficients beyond the value type), builder errors.
  static Result<KnapsackProblem> encode(const std::vector<std::int64_t>& weights, const std::vector<Value>& values,
                                        std::int64_t capacity, Value weight = Value{0}) {
    const std::size_t n = weights.size();
    if (values.size() != n) return Status::error(StatusCode::invalid_argument, "one value per item");
    if (capacity < 0) return Status::error(StatusCode::invalid_argument, "capacity must be >= 0");
    for (std::size_t i = 0; i < n; ++i) {
      if (weights[i] < 0)
        return Status::error(StatusCode::invalid_argument, "item weights must be >= 0").at_term(no_term, i, i);
      if (!detail::is_finite(values[i]))
        return Status::error(StatusCode::non_finite_value, "item value is NaN or infinite").at_term(no_term, i, i);
    }
    if (weight < Value{0} || !detail::is_finite(weight))
      return Status::error(StatusCode::invalid_argument, "penalty weight must be >= 0");
    QuboBuilder<Value, Index> objective;
    for (std::size_t i = 0; i < n; ++i) {
      if (!detail::fits_value<Value>(-static_cast<energy_type>(values[i]))) {
        return Status::error(StatusCode::value_out_of_range, "negated item value does not fit the value type")
            .at_term(no_term, i, i);
      }
      objective.add_unary(i, static_cast<Value>(-values[i]));
    }
    auto f = objective.build();
    if (!f) return f.status();
    if (weight == Value{0}) {
      auto a = suggest_penalty_weight(*f);
      if (!a) return a.status();
      weight = *a;
    }
    QuboBuilder<Value, Index> full = objective;
    ConstraintSet set(n);
    std::vector<std::uint64_t> items(n);
    for (std::size_t i = 0; i < n; ++i) items[i] = i;
    auto r = add_sum_at_most(full, set, items, weights, capacity, weight, {"total weight within capacity", 0});
    if (!r) return r.status();
    auto m = full.build();
    if (!m) return m.status();
    KnapsackProblem p;
    p.model_ = std::move(*m);
    p.constraints_ = std::move(set);
    p.weights_ = weights;
    p.values_ = values;
    p.capacity_ = capacity;
    p.weight_ = weight;
    return p;
  }

  const model_type& model() const noexcept { return model_; }
  const ConstraintSet& constraints() const noexcept { return constraints_; }
  Value penalty_weight() const noexcept { return weight_; }
  std::int64_t capacity() const noexcept { return capacity_; }
  /// The slack bit values of the capacity constraint (see problems/penalty.hpp).
  const std::vector<std::int64_t>& slack_weights() const noexcept { return constraints_[0].slack_weights; }

  /// The packed items (bits 0..N-1; slack bits are ignored).
  Selection decode(const std::int8_t* spins) const { return Selection::from_spins(spins, weights_.size()); }
  Selection decode_bits(const std::uint8_t* bits) const { return Selection::from_bits(bits, weights_.size()); }
  Feasibility feasibility(const std::int8_t* spins) const noexcept { return constraints_.check_spins(spins); }

  /// Total weight, total value and feasibility, from the item data.
  KnapsackReport<energy_type> check(const Selection& chosen) const {
    KnapsackReport<energy_type> r;
    const std::size_t n = weights_.size();
    std::vector<std::uint8_t> in(n, 0);
    bool well_formed = chosen.universe == n;
    for (const std::uint64_t i : chosen.items) {
      if (i >= n || in[i] != 0) {
        well_formed = false;
        continue;
      }
      in[i] = 1;
      r.total_weight += weights_[i];
      r.total_value += static_cast<energy_type>(values_[i]);
    }
    r.feasible = well_formed && r.total_weight <= capacity_;
    return r;
  }

 private:
  model_type model_{};
  ConstraintSet constraints_{};
  std::vector<std::int64_t> weights_;
  std::vector<Value> values_;
  std::int64_t capacity_ = 0;
  Value weight_{0};
};

}  // namespace spinwright

#endif  // SPINWRIGHT_PROBLEMS_KNAPSACK_HPP
