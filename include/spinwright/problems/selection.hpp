// spinwright — cardinality-constrained mean-variance selection as a QUBO: pick exactly K of N
// items trading expected return against pairwise covariance,
//   minimise  f(x) = lambda x^T C x - mu^T x   subject to  sum_i x_i = K,
// with x^T C x = sum_i C_ii x_i + 2 sum_{i<j} C_ij x_i x_j (C symmetric, x_i^2 = x_i), so
//   unary Q_ii = lambda C_ii - mu_i,  pair Q_ij = 2 lambda C_ij,
// plus the k-hot penalty A (K - sum x)^2 (problems/penalty.hpp). The default A is
// suggest_penalty_weight(f), which makes every ground state select exactly K items and
// minimise f among such selections (common practice for QUBO portfolio models, e.g.
// Glover, Kochenberger, Du, 4OR 17, 2019, section on portfolio-type problems [from memory]).
#ifndef SPINWRIGHT_PROBLEMS_SELECTION_HPP
#define SPINWRIGHT_PROBLEMS_SELECTION_HPP

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
#include <type_traits>  // std::is_integral_v
#include <utility>      // std::move
#include <vector>       // std::vector

namespace spinwright {

/// A selection judged in its own terms.
template <class Energy>
struct SelectionReport {
  bool valid = false;         // exactly K distinct items, all < N
  std::uint64_t count = 0;    // distinct items chosen
  Energy expected_return{0};  // sum of mu over the chosen items
  Energy variance{0};         // x^T C x
  Energy objective{0};        // lambda * variance - expected_return
};

template <class Value, class Index = std::uint32_t>
class SelectionProblem {
 public:
  using model_type = QuboModel<Value, Index>;
  using energy_type = energy_t<Value>;

  SelectionProblem() = default;

  /// Encode N = mu.size() items; `covariance` is N x N row-major and symmetric; choose
  /// exactly `count` items; `risk_aversion` is lambda >= 0; `weight` 0 picks the suggested
  /// penalty weight. Errors: invalid_argument (sizes, asymmetry, K > N, lambda < 0, weight
  /// < 0), value_out_of_range / energy_overflow (coefficients beyond the value type).
  static Result<SelectionProblem> encode(const std::vector<Value>& mu, const std::vector<Value>& covariance,
                                         Value risk_aversion, std::uint64_t count, Value weight = Value{0}) {
    const std::size_t n = mu.size();
    if (covariance.size() != n * n) return Status::error(StatusCode::invalid_argument, "covariance must be N x N");
    if (count > n) return Status::error(StatusCode::invalid_argument, "cannot choose more items than there are");
    if (risk_aversion < Value{0} || !detail::is_finite(risk_aversion)) {
      return Status::error(StatusCode::invalid_argument, "risk aversion must be finite and >= 0");
    }
    if (weight < Value{0} || !detail::is_finite(weight))
      return Status::error(StatusCode::invalid_argument, "penalty weight must be >= 0");
    const Status too_large =
        Status::error(StatusCode::value_out_of_range, "objective coefficient does not fit the value type");
    QuboBuilder<Value, Index> objective(n);
    for (std::size_t i = 0; i < n; ++i) {
      for (std::size_t j = i + 1; j < n; ++j) {
        if (covariance[i * n + j] != covariance[j * n + i]) {
          return Status::error(StatusCode::invalid_argument, "covariance must be symmetric").at_term(no_term, i, j);
        }
      }
    }
    // Products in the accumulator type, overflow-checked for integer data.
    auto product = [](energy_type a, energy_type b, energy_type& out) {
      if constexpr (std::is_integral_v<Value>) {
        return detail::mul_checked(a, b, out);
      } else {
        out = a * b;
        return detail::is_finite(out);
      }
    };
    const auto lambda = static_cast<energy_type>(risk_aversion);
    for (std::size_t i = 0; i < n; ++i) {
      energy_type u{};
      if (!product(lambda, static_cast<energy_type>(covariance[i * n + i]), u) ||
          !detail::checked_add(u, -static_cast<energy_type>(mu[i])) || !detail::fits_value<Value>(u)) {
        return Status(too_large).at_term(no_term, i, i);
      }
      objective.add_unary(i, static_cast<Value>(u));
      for (std::size_t j = i + 1; j < n; ++j) {
        energy_type q{};
        if (!product(lambda, static_cast<energy_type>(covariance[i * n + j]), q) || !product(2, q, q) ||
            !detail::fits_value<Value>(q)) {
          return Status(too_large).at_term(no_term, i, j);
        }
        objective.add_pair(i, j, static_cast<Value>(q));
      }
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
    std::vector<std::uint64_t> all(n);
    for (std::size_t i = 0; i < n; ++i) all[i] = i;
    auto r = add_k_hot(full, set, all, count, weight, {"choose exactly K items", count});
    if (!r) return r.status();
    auto m = full.build();
    if (!m) return m.status();
    SelectionProblem p;
    p.model_ = std::move(*m);
    p.constraints_ = std::move(set);
    p.mu_ = mu;
    p.cov_ = covariance;
    p.lambda_ = risk_aversion;
    p.k_ = count;
    p.weight_ = weight;
    return p;
  }

  const model_type& model() const noexcept { return model_; }
  const ConstraintSet& constraints() const noexcept { return constraints_; }
  Value penalty_weight() const noexcept { return weight_; }
  std::uint64_t count() const noexcept { return k_; }

  Selection decode(const std::int8_t* spins) const { return Selection::from_spins(spins, mu_.size()); }
  Selection decode_bits(const std::uint8_t* bits) const { return Selection::from_bits(bits, mu_.size()); }
  Feasibility feasibility(const std::int8_t* spins) const noexcept { return constraints_.check_spins(spins); }

  /// Count, expected return, variance x^T C x and objective, from mu and C.
  SelectionReport<energy_type> check(const Selection& chosen) const {
    SelectionReport<energy_type> r;
    const std::size_t n = mu_.size();
    std::vector<std::uint8_t> in(n, 0);
    bool well_formed = chosen.universe == n;
    for (const std::uint64_t i : chosen.items) {
      if (i >= n || in[i] != 0) {
        well_formed = false;
        continue;
      }
      in[i] = 1;
      ++r.count;
      r.expected_return += static_cast<energy_type>(mu_[i]);
    }
    for (std::size_t i = 0; i < n; ++i) {
      if (in[i] == 0) continue;
      for (std::size_t j = 0; j < n; ++j) {
        if (in[j] != 0) r.variance += static_cast<energy_type>(cov_[i * n + j]);
      }
    }
    r.objective = static_cast<energy_type>(lambda_) * r.variance - r.expected_return;
    r.valid = well_formed && r.count == k_;
    return r;
  }

 private:
  model_type model_{};
  ConstraintSet constraints_{};
  std::vector<Value> mu_;
  std::vector<Value> cov_;
  Value lambda_{0};
  std::uint64_t k_ = 0;
  Value weight_{0};
};

}  // namespace spinwright

#endif  // SPINWRIGHT_PROBLEMS_SELECTION_HPP
