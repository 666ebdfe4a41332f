// spinwright — the beta span a default schedule or ladder takes from the model: a hot end and a
// cold end read off the model's coefficients. The rule and its measurements: docs/moves.md
// ("Schedules and the beta span from the model").
#ifndef SPINWRIGHT_KERNELS_BETA_SPAN_HPP
#define SPINWRIGHT_KERNELS_BETA_SPAN_HPP

#include "../config.hpp"
#include "../model/form.hpp"

#include <cmath>    // std::sqrt
#include <cstddef>  // std::size_t

namespace spinwright {

// The automatic range and the two delta scales it came from.
struct BetaSpan {
  double beta_start = 0;
  double beta_end = 0;
  double hot_delta = 0;   // typical |delta| of a flip at a random state
  double cold_delta = 0;  // smallest non-zero |delta| scale
};

// Rule (see docs/moves.md, "beta span from the model"):
//  hot_delta  = root mean square, over spins, of the RMS flip delta at a uniformly random
//               state: Ising 2 sqrt(h_i^2 + sum_j J_ij^2); QUBO sqrt((Q_ii + sum_j Q_ij/2)^2 +
//               sum_j Q_ij^2 / 4);
//  cold_delta = the smallest non-zero coefficient magnitude, times 2 for Ising;
//  beta_start = ln 2 / hot_delta      (a typical uphill flip is accepted with probability 1/2),
//  beta_end   = ln 1000 / cold_delta  (the smallest uphill step is accepted with probability 1e-3).
// A model with no non-zero coefficient gets beta 1 .. 1.
template <class Model>
BetaSpan estimate_beta_span(const Model& model) {
  using index_type = typename Model::index_type;
  using value_type = typename Model::value_type;
  const std::size_t n = model.num_spins();
  double sum_sq = 0;
  double smallest = 0;
  auto see = [&smallest](double a) {
    if (a > 0 && (smallest == 0 || a < smallest)) smallest = a;
  };
  for (std::size_t i = 0; i < n; ++i) {
    const auto ii = static_cast<index_type>(i);
    const double lin = static_cast<double>(model.site_term(ii));
    see(lin < 0 ? -lin : lin);
    double pair_sq = 0;
    double pair_sum = 0;
    model.for_each_neighbour(ii, [&](index_type j, value_type v) {
      if (j == ii) return;
      const double d = static_cast<double>(v);
      pair_sq += d * d;
      pair_sum += d;
      see(d < 0 ? -d : d);
    });
    if constexpr (Model::form == Form::ising) {
      sum_sq += 4 * (lin * lin + pair_sq);
    } else {
      const double mean = lin + pair_sum / 2;
      sum_sq += mean * mean + pair_sq / 4;
    }
  }
  BetaSpan r;
  if (n == 0 || smallest == 0 || sum_sq == 0) {
    r.beta_start = r.beta_end = 1;
    return r;
  }
  r.hot_delta = std::sqrt(sum_sq / static_cast<double>(n));
  r.cold_delta = (Model::form == Form::ising ? 2 : 1) * smallest;
  r.beta_start = 0.69314718055994531 / r.hot_delta;
  r.beta_end = 6.9077552789821371 / r.cold_delta;
  if (r.beta_end < r.beta_start) r.beta_end = r.beta_start;
  return r;
}

}  // namespace spinwright

#endif  // SPINWRIGHT_KERNELS_BETA_SPAN_HPP
