// spinwright — exact quadratic penalties added to a QuboBuilder (0 on every assignment that
// keeps the constraint, at least A on every other), the slack encoding of sum a x <= b, and
// the penalty weight that keeps every infeasible state above the best feasible one. The
// formulas, the slack bits and the bound are written once in docs/problems.md. Functions
// validate their input and return a Status (nothing added on an error); they allocate and
// never throw.
#ifndef SPINWRIGHT_PROBLEMS_PENALTY_HPP
#define SPINWRIGHT_PROBLEMS_PENALTY_HPP

#include "../config.hpp"
#include "../model/detail/energy_range.hpp"
#include "../model/builder.hpp"
#include "../model/form.hpp"
#include "../model/sparse_model.hpp"
#include "../status.hpp"
#include "constraints.hpp"

#include <cstddef>      // std::size_t
#include <cstdint>      // std::int64_t, std::uint64_t
#include <limits>       // std::numeric_limits
#include <type_traits>  // std::is_integral_v
#include <utility>      // std::move
#include <vector>       // std::vector

namespace spinwright {

/// Constraint data must satisfy sum |a_i| + |b| <= this (2^53): left-hand sides then fit
/// int64_t with room to spare and are exact in double precision.
inline constexpr std::int64_t constraint_data_limit = std::int64_t{1} << 53;

namespace detail {

// a * b into `out`; false on int64 overflow.
constexpr bool mul_checked(std::int64_t a, std::int64_t b, std::int64_t& out) noexcept {
  if (a == 0 || b == 0) {
    out = 0;
    return true;
  }
  const std::uint64_t ma = magnitude_u64(a);
  const std::uint64_t mb = magnitude_u64(b);
  const bool negative = (a < 0) != (b < 0);
  const std::uint64_t limit = negative ? std::uint64_t{1} << 63 : (std::uint64_t{1} << 63) - 1;
  if (ma > limit / mb) return false;
  const std::uint64_t m = ma * mb;
  out = negative ? static_cast<std::int64_t>(std::uint64_t{0} - m) : static_cast<std::int64_t>(m);
  return true;
}

// weight * c in the energy type; false if it overflows (integers) or is not finite.
template <class Value>
bool scale_checked(Value weight, std::int64_t c, energy_t<Value>& out) noexcept {
  if constexpr (std::is_integral_v<Value>) {
    return mul_checked(static_cast<std::int64_t>(weight), c, out);
  } else {
    out = static_cast<double>(weight) * static_cast<double>(c);
    return is_finite(out);
  }
}

template <class Value>
struct PenaltyTerms {
  struct Term {
    std::uint64_t i;
    std::uint64_t j;
    Value v;
  };
  std::vector<Term> unary;
  std::vector<Term> pairs;
  energy_t<Value> offset{0};
};

inline Status check_weight_and_vars(double weight, const std::vector<std::uint64_t>& vars,
                                    const ConstraintSet& set) noexcept {
  if (!(weight > 0) || !is_finite(weight)) {
    return Status::error(StatusCode::invalid_argument, "penalty weight must be positive and finite");
  }
  for (std::size_t k = 0; k < vars.size(); ++k) {
    if (vars[k] >= set.num_variables()) {
      return Status::error(StatusCode::index_out_of_range, "constraint variable beyond the constraint set's variables")
          .at_term(no_term, k, vars[k]);
    }
  }
  return Status::success();
}

inline Status check_data(const std::vector<std::int64_t>& coefs, std::int64_t bound) noexcept {
  std::uint64_t sum = 0;
  const auto limit = static_cast<std::uint64_t>(constraint_data_limit);
  bool fits = add_bounded(sum, magnitude_u64(bound), limit);
  for (const std::int64_t a : coefs) fits = fits && add_bounded(sum, magnitude_u64(a), limit);
  if (!fits) {
    return Status::error(StatusCode::value_out_of_range, "constraint data exceed sum |a| + |b| <= 2^53");
  }
  return Status::success();
}

// Terms of A (sum_k c_k x_{v_k} - rhs)^2 (x^2 = x), checked to fit Value.
template <class Value>
Status square_terms(const std::vector<std::uint64_t>& vars, const std::vector<std::int64_t>& coefs, std::int64_t rhs,
                    Value weight, PenaltyTerms<Value>& out) {
  using energy_type = energy_t<Value>;
  const Status too_large =
      Status::error(StatusCode::value_out_of_range, "penalty coefficient does not fit the value type");
  auto push = [&](std::vector<typename PenaltyTerms<Value>::Term>& list, std::uint64_t i, std::uint64_t j,
                  std::int64_t c) {
    energy_type v{};
    if (!scale_checked(weight, c, v) || !fits_value<Value>(v)) return false;
    if (static_cast<Value>(v) != Value{0}) list.push_back({i, j, static_cast<Value>(v)});
    return true;
  };
  // Every product is checked: a_i^2 - 2 b a_i, 2 a_i a_j, b^2 and the weight times each.
  for (std::size_t k = 0; k < vars.size(); ++k) {
    std::int64_t sq = 0;
    std::int64_t cross = 0;
    // sq >= 0, so sq - cross overflows only when cross < sq - max.
    if (!mul_checked(coefs[k], coefs[k], sq) || !mul_checked(2 * rhs, coefs[k], cross) ||
        (cross < 0 && sq > std::numeric_limits<std::int64_t>::max() + cross)) {
      return too_large;
    }
    if (!push(out.unary, vars[k], vars[k], sq - cross)) return too_large;
    for (std::size_t l = k + 1; l < vars.size(); ++l) {
      std::int64_t p = 0;
      if (!mul_checked(coefs[k], coefs[l], p) || !mul_checked(2, p, p)) return too_large;
      if (!push(out.pairs, vars[k], vars[l], p)) return too_large;
    }
  }
  std::int64_t rr = 0;
  energy_type off{};
  if (!mul_checked(rhs, rhs, rr) || !scale_checked(weight, rr, off)) return too_large;
  out.offset = off;
  return Status::success();
}

template <class Value, class Index>
Status emit(QuboBuilder<Value, Index>& builder, const PenaltyTerms<Value>& terms) {
  for (const auto& t : terms.unary) builder.add_unary(t.i, t.v);
  for (const auto& t : terms.pairs) builder.add_pair(t.i, t.j, t.v);
  if (terms.offset != 0) builder.add_offset(terms.offset);
  return builder.status();
}

template <class Value>
Constraint make_record(ConstraintKind kind, Relation rel, ConstraintLabel label, std::vector<std::uint64_t> vars,
                       std::vector<std::int64_t> coefs, std::int64_t bound, Value weight) {
  Constraint c;
  c.kind = kind;
  c.relation = rel;
  c.label = label;
  c.variables = std::move(vars);
  c.coefficients = std::move(coefs);
  c.bound = bound;
  c.weight = static_cast<double>(weight);
  return c;
}

}  // namespace detail

/// Number of slack bits the inequality sum a x <= b needs (see the header comment), or a
/// Status when the data are refused (b below the smallest left-hand side, data too large).
inline Result<std::uint64_t> slack_bit_count(const std::vector<std::int64_t>& coefficients, std::int64_t bound) {
  const Status data = detail::check_data(coefficients, bound);
  if (!data) return data;
  std::int64_t low = 0;
  for (const std::int64_t a : coefficients) low += a < 0 ? a : 0;
  if (bound < low) {
    return Status::error(StatusCode::invalid_argument,
                         "inequality can never hold: bound below the smallest left-hand side");
  }
  auto s = static_cast<std::uint64_t>(bound - low);
  std::uint64_t m = 0;
  while (s != 0) {
    ++m;
    s >>= 1;
  }
  return m;
}

/// The values of the slack bits for a slack range 0..max_slack: 1, 2, ..., 2^(m-2) and a last
/// bit of max_slack - (2^(m-1) - 1). Empty when max_slack is 0. Precondition: max_slack >= 0.
inline std::vector<std::int64_t> slack_weights(std::int64_t max_slack) {
  SPINWRIGHT_ASSERT(max_slack >= 0, "negative slack range");
  std::vector<std::int64_t> w;
  std::int64_t covered = 0;  // the bits so far represent exactly the integers 0..covered
  std::int64_t next = 1;     // the next power of two
  while (covered < max_slack) {
    // A bit of value <= covered + 1 keeps the represented set contiguous; the last one is
    // capped so that the range ends exactly at max_slack.
    const std::int64_t bit = max_slack - covered < next ? max_slack - covered : next;
    w.push_back(bit);
    covered += bit;
    next *= 2;
  }
  return w;
}

/// one-hot of a group: adds A (1 - sum x)^2 and registers {one_hot, sum x = 1}.
/// Returns the position of the record. Errors: invalid_argument (weight <= 0 or not finite,
/// empty group), index_out_of_range (a variable >= set.num_variables()), value_out_of_range.
template <class Value, class Index>
Result<std::size_t> add_one_hot(QuboBuilder<Value, Index>& builder, ConstraintSet& set,
                                const std::vector<std::uint64_t>& variables, Value weight, ConstraintLabel label = {}) {
  const Status st = detail::check_weight_and_vars(static_cast<double>(weight), variables, set);
  if (!st) return st;
  if (variables.empty()) return Status::error(StatusCode::invalid_argument, "one-hot of an empty group can never hold");
  std::vector<std::int64_t> ones(variables.size(), 1);
  detail::PenaltyTerms<Value> terms;
  const Status t = detail::square_terms(variables, ones, 1, weight, terms);
  if (!t) return t;
  const Status e = detail::emit(builder, terms);
  if (!e) return e;
  return set.add(
      detail::make_record(ConstraintKind::one_hot, Relation::equal, label, variables, std::move(ones), 1, weight));
}

/// k-hot of a group: adds A (k - sum x)^2 and registers {k_hot, sum x = k}.
/// Errors as add_one_hot, and invalid_argument when k > group size.
template <class Value, class Index>
Result<std::size_t> add_k_hot(QuboBuilder<Value, Index>& builder, ConstraintSet& set,
                              const std::vector<std::uint64_t>& variables, std::uint64_t k, Value weight,
                              ConstraintLabel label = {}) {
  const Status st = detail::check_weight_and_vars(static_cast<double>(weight), variables, set);
  if (!st) return st;
  if (k > variables.size())
    return Status::error(StatusCode::invalid_argument, "k-hot with k above the group size can never hold");
  std::vector<std::int64_t> ones(variables.size(), 1);
  const auto kk = static_cast<std::int64_t>(k);
  detail::PenaltyTerms<Value> terms;
  const Status t = detail::square_terms(variables, ones, kk, weight, terms);
  if (!t) return t;
  const Status e = detail::emit(builder, terms);
  if (!e) return e;
  return set.add(
      detail::make_record(ConstraintKind::k_hot, Relation::equal, label, variables, std::move(ones), kk, weight));
}

/// pairwise-exclusion of a group: adds A sum_{i<j} x_i x_j and registers {pairwise_exclusion, sum x <= 1}.
template <class Value, class Index>
Result<std::size_t> add_pairwise_exclusion(QuboBuilder<Value, Index>& builder, ConstraintSet& set,
                                           const std::vector<std::uint64_t>& variables, Value weight,
                                           ConstraintLabel label = {}) {
  const Status st = detail::check_weight_and_vars(static_cast<double>(weight), variables, set);
  if (!st) return st;
  for (std::size_t k = 0; k < variables.size(); ++k) {
    for (std::size_t l = k + 1; l < variables.size(); ++l) builder.add_pair(variables[k], variables[l], weight);
  }
  if (!builder.status()) return builder.status();
  return set.add(detail::make_record(ConstraintKind::pairwise_exclusion, Relation::at_most, label, variables,
                                     std::vector<std::int64_t>(variables.size(), 1), 1, weight));
}

/// pair-cover of two distinct bits u, v: adds A (1 - x_u)(1 - x_v) = A (1 - x_u - x_v + x_u x_v)
/// and registers {pair_cover, x_u + x_v >= 1}. Errors: invalid_argument also when u == v.
template <class Value, class Index>
Result<std::size_t> add_pair_cover(QuboBuilder<Value, Index>& builder, ConstraintSet& set, std::uint64_t u,
                                   std::uint64_t v, Value weight, ConstraintLabel label = {}) {
  std::vector<std::uint64_t> vars{u, v};
  const Status st = detail::check_weight_and_vars(static_cast<double>(weight), vars, set);
  if (!st) return st;
  if (u == v) return Status::error(StatusCode::invalid_argument, "pair-cover needs two distinct variables");
  builder.add_unary(u, static_cast<Value>(-weight)).add_unary(v, static_cast<Value>(-weight)).add_pair(u, v, weight);
  builder.add_offset(static_cast<energy_t<Value>>(weight));
  if (!builder.status()) return builder.status();
  return set.add(detail::make_record(ConstraintKind::pair_cover, Relation::at_least, label, std::move(vars),
                                     std::vector<std::int64_t>{1, 1}, 1, weight));
}

/// Linear equality sum a x = b (integer data): adds A (sum a x - b)^2 and registers it.
/// Errors: as above, invalid_argument when the two lists differ in length, value_out_of_range
/// when sum |a| + |b| > 2^53 or a penalty coefficient does not fit Value.
template <class Value, class Index>
Result<std::size_t> add_sum_equal(QuboBuilder<Value, Index>& builder, ConstraintSet& set,
                                  const std::vector<std::uint64_t>& variables,
                                  const std::vector<std::int64_t>& coefficients, std::int64_t bound, Value weight,
                                  ConstraintLabel label = {}) {
  const Status st = detail::check_weight_and_vars(static_cast<double>(weight), variables, set);
  if (!st) return st;
  if (coefficients.size() != variables.size())
    return Status::error(StatusCode::invalid_argument, "one coefficient per variable");
  const Status data = detail::check_data(coefficients, bound);
  if (!data) return data;
  detail::PenaltyTerms<Value> terms;
  const Status t = detail::square_terms(variables, coefficients, bound, weight, terms);
  if (!t) return t;
  const Status e = detail::emit(builder, terms);
  if (!e) return e;
  return set.add(
      detail::make_record(ConstraintKind::sum_equal, Relation::equal, label, variables, coefficients, bound, weight));
}

/// Linear inequality sum a x <= b (integer data) through slack bits: allocates
/// slack_bit_count(a, b) new variables from `set` (numbered from set.num_variables()), adds
/// A (sum a x + sum w_m y_m - b)^2 and registers it with its slack bits. The builder must
/// accept the new indices (grow on demand, or be declared with enough room).
/// Errors: as add_sum_equal, and invalid_argument when b < sum min(a_i, 0).
template <class Value, class Index>
Result<std::size_t> add_sum_at_most(QuboBuilder<Value, Index>& builder, ConstraintSet& set,
                                    const std::vector<std::uint64_t>& variables,
                                    const std::vector<std::int64_t>& coefficients, std::int64_t bound, Value weight,
                                    ConstraintLabel label = {}) {
  const Status st = detail::check_weight_and_vars(static_cast<double>(weight), variables, set);
  if (!st) return st;
  if (coefficients.size() != variables.size())
    return Status::error(StatusCode::invalid_argument, "one coefficient per variable");
  const auto bits = slack_bit_count(coefficients, bound);
  if (!bits) return bits.status();
  std::int64_t low = 0;
  for (const std::int64_t a : coefficients) low += a < 0 ? a : 0;
  std::vector<std::int64_t> weights = slack_weights(bound - low);
  SPINWRIGHT_ASSERT(weights.size() == *bits, "slack bit count mismatch");
  // The slack bits sum to b - L <= 2^54: the combined data stay exact in int64 and double.
  const std::uint64_t first = set.num_variables();
  std::vector<std::uint64_t> all_vars = variables;
  std::vector<std::int64_t> all_coefs = coefficients;
  for (std::size_t m = 0; m < weights.size(); ++m) {
    all_vars.push_back(first + m);
    all_coefs.push_back(weights[m]);
  }
  detail::PenaltyTerms<Value> terms;
  const Status t = detail::square_terms(all_vars, all_coefs, bound, weight, terms);
  if (!t) return t;
  const Status e = detail::emit(builder, terms);
  if (!e) return e;
  set.allocate_variables(weights.size());
  Constraint c = detail::make_record(ConstraintKind::sum_at_most, Relation::at_most, label, variables, coefficients,
                                     bound, weight);
  c.slack_begin = first;
  c.slack_weights = std::move(weights);
  return set.add(std::move(c));
}

/// span(f) for a QUBO objective: sum |unary| + sum_{i<j} |pair| (the offset does not count).
/// f(x) - f(x') <= span(f) for every pair of states. O(N + pairs).
template <class Value, class Index>
energy_t<Value> objective_span(const QuboModel<Value, Index>& objective) noexcept {
  using energy_type = energy_t<Value>;
  energy_type s{0};
  for (std::size_t i = 0; i < objective.num_spins(); ++i) {
    const auto ii = static_cast<Index>(i);
    const Value u = objective.site_term(ii);
    s += static_cast<energy_type>(u < 0 ? -u : u);
    objective.for_each_neighbour(ii, [&](Index j, Value v) {
      if (j > ii) s += static_cast<energy_type>(v < 0 ? -v : v);
    });
  }
  return s;
}

/// span(f) for an Ising objective: 2 (sum |h| + sum_{i<j} |J|), each term moving by at most
/// twice its magnitude between two states.
template <class Value, class Index>
energy_t<Value> objective_span(const IsingModel<Value, Index>& objective) noexcept {
  using energy_type = energy_t<Value>;
  energy_type s{0};
  for (std::size_t i = 0; i < objective.num_spins(); ++i) {
    const auto ii = static_cast<Index>(i);
    const Value h = objective.site_term(ii);
    s += static_cast<energy_type>(h < 0 ? -h : h);
    objective.for_each_neighbour(ii, [&](Index j, Value v) {
      if (j > ii) s += static_cast<energy_type>(v < 0 ? -v : v);
    });
  }
  return 2 * s;
}

/// A penalty weight strictly above a span: span + 1 for integer values; for floating values
/// span * (1 + 2^-10) (1 when span is 0), the margin absorbing rounding in energy sums.
/// Error value_out_of_range when it does not fit Value, invalid_argument for a negative or
/// non-finite span.
template <class Value>
Result<Value> penalty_weight_above(energy_t<Value> span) {
  if (!detail::is_finite(span) || span < 0)
    return Status::error(StatusCode::invalid_argument, "span must be finite and >= 0");
  if constexpr (std::is_integral_v<Value>) {
    if (span >= static_cast<energy_t<Value>>(std::numeric_limits<Value>::max())) {
      return Status::error(StatusCode::value_out_of_range, "penalty weight does not fit the value type");
    }
    return static_cast<Value>(span + 1);
  } else {
    const double a = span > 0 ? span * (1.0 + 1.0 / 1024.0) : 1.0;
    if (!detail::fits_value<Value>(a))
      return Status::error(StatusCode::value_out_of_range, "penalty weight does not fit the value type");
    return static_cast<Value>(a);
  }
}

/// The suggested penalty weight for an objective: penalty_weight_above(objective_span(f)).
/// With every penalty weight at least this, no infeasible state has lower energy than the
/// best feasible one (see the header comment for the argument).
template <class Model>
Result<typename Model::value_type> suggest_penalty_weight(const Model& objective) {
  return penalty_weight_above<typename Model::value_type>(objective_span(objective));
}

}  // namespace spinwright

#endif  // SPINWRIGHT_PROBLEMS_PENALTY_HPP
