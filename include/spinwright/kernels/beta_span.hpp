// spinwright — the beta span a default schedule or ladder takes from the model: a hot end and a
// cold end. Two rules: sample_beta_span (the annealer's default) reads them off sampled flip
// deltas, estimate_beta_span (the tempering ladder's) off the coefficients. The rules and
// their measurements: docs/moves.md ("Schedules and the beta span from the model").
#ifndef SPINWRIGHT_KERNELS_BETA_SPAN_HPP
#define SPINWRIGHT_KERNELS_BETA_SPAN_HPP

#include "../config.hpp"
#include "../model/form.hpp"

#include <algorithm>  // std::sort, std::unique, std::lower_bound
#include <cmath>      // std::sqrt, std::exp, std::log
#include <cstddef>    // std::size_t
#include <cstdint>    // std::uint64_t

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

// What sample_beta_span aims at: the acceptance of a typical uphill flip at the hot end and
// of the smallest uphill flip at the cold end.
struct BetaSpanTargets {
  double start_acceptance = 0.5;  // mean Metropolis acceptance of the sampled uphill flips
  double end_acceptance = 1e-3;   // acceptance of the smallest sampled uphill flip
};

namespace detail {

// A fixed pseudo-random spin for (sample k, site j): the sampled states cost no storage.
inline int sampled_spin(std::uint64_t k, std::uint64_t j) noexcept {
  std::uint64_t z = (k << 32) ^ j ^ 0x9e3779b97f4a7c15ull;
  z = (z ^ (z >> 30)) * 0xbf58476d1ce4e5b9ull;  // splitmix64's finaliser (Steele, Lea & Flood 2014)
  z = (z ^ (z >> 27)) * 0x94d049bb133111ebull;
  z ^= z >> 31;
  return (z >> 63) != 0 ? 1 : -1;
}

// |delta| of flipping a random site of a uniformly random state, sample k (0 when the flip
// changes nothing). The site is drawn from the same finaliser, so the sample depends on the
// model only. O(degree).
template <class Model>
double sampled_flip_magnitude(const Model& model, std::uint64_t k) {
  using index_type = typename Model::index_type;
  using value_type = typename Model::value_type;
  const std::uint64_t n = model.num_spins();
  std::uint64_t z = (k + 1) * 0xd1b54a32d192ed03ull;
  z = (z ^ (z >> 29)) * 0xbf58476d1ce4e5b9ull;
  z ^= z >> 32;
  const auto i = static_cast<index_type>(((z & 0xffffffffull) * n) >> 32);
  const double si = sampled_spin(k, i);
  double f = static_cast<double>(model.site_term(i));
  model.for_each_neighbour(i, [&](index_type j, value_type v) {
    if (j == i) return;
    const int sj = sampled_spin(k, j);
    if constexpr (Model::form == Form::ising) {
      f += static_cast<double>(v) * sj;
    } else if (sj < 0) {
      f += static_cast<double>(v);  // x_j = (1 - s_j) / 2 = 1
    }
  });
  const double d = Model::form == Form::ising ? -2 * si * f : si * f;
  return d < 0 ? -d : d;
}

// sample_beta_span with `cold_bound` = estimate_beta_span(model).cold_delta supplied by the
// caller (a kernel that scans the coefficients once for several purposes).
template <class Model>
BetaSpan sample_beta_span_bounded(const Model& model, const BetaSpanTargets& targets, double cold_bound) {
  // Held on the stack: 18 KiB, or 2.25 KiB where firmware stacks are small.
  constexpr std::size_t samples = SPINWRIGHT_NO_HEAP ? 128 : 1024;
  double d[samples];
  std::size_t m = 0;
  double lo_d = 0;
  double hi_d = 0;
  if (model.num_spins() != 0) {
    for (std::size_t k = 0; k < samples; ++k) {
      const double a = detail::sampled_flip_magnitude(model, k);
      if (!(a > 0)) continue;
      d[m++] = a;
      if (lo_d == 0 || a < lo_d) lo_d = a;
      if (a > hi_d) hi_d = a;
    }
  }
  const double p0 = targets.start_acceptance;
  const double p1 = targets.end_acceptance;
  if (m == 0 || !(p0 > 0 && p0 < 1) || !(p1 > 0 && p1 < 1)) {
    BetaSpan r = estimate_beta_span(model);
    return r;
  }
  const double ln0 = std::log(1 / p0);
  // mean exp(-beta d) is 1 at beta 0 and falls monotonically: at ln0 / hi_d it is >= p0, at
  // ln0 / lo_d it is <= p0.
  double lo = ln0 / hi_d;
  double hi = ln0 / lo_d;
  // Integer models show few distinct magnitudes: each bisection step takes one exp() per
  // distinct value and sums the samples in their own order, the same sum bit for bit as one
  // exp() per sample.
  double u[samples];             // the distinct magnitudes, ascending
  std::uint16_t which[samples];  // sample k's magnitude is u[which[k]]
  for (std::size_t k = 0; k < m; ++k) u[k] = d[k];
  std::sort(u, u + m);
  const std::size_t distinct = static_cast<std::size_t>(std::unique(u, u + m) - u);
  for (std::size_t k = 0; k < m; ++k) {
    which[k] = static_cast<std::uint16_t>(std::lower_bound(u, u + distinct, d[k]) - u);
  }
  double* term = d;  // the magnitudes are no longer needed: term[q] = exp(-beta u[q])
  auto mean_acceptance = [&](double beta) {
    for (std::size_t q = 0; q < distinct; ++q) term[q] = std::exp(-beta * u[q]);
    double sum = 0;
    for (std::size_t k = 0; k < m; ++k) sum += term[which[k]];
    return sum / static_cast<double>(m);
  };
  for (int it = 0; it < 60 && hi - lo > 1e-12 * hi; ++it) {
    const double mid = 0.5 * (lo + hi);
    if (mean_acceptance(mid) > p0) {
      lo = mid;
    } else {
      hi = mid;
    }
  }
  BetaSpan r;
  r.beta_start = 0.5 * (lo + hi);
  r.hot_delta = ln0 / r.beta_start;
  // A random state need not show the smallest move a low-energy state makes: the smallest
  // change one coefficient can make bounds it from below.
  const double bound = cold_bound;
  r.cold_delta = bound > 0 && bound < lo_d ? bound : lo_d;
  r.beta_end = std::log(1 / p1) / r.cold_delta;
  if (r.beta_end < r.beta_start) r.beta_end = r.beta_start;
  return r;
}

}  // namespace detail

// Rule (see docs/moves.md, "beta span from the model"): the model's own flip deltas, sampled
// at uniformly random states (the start of an anneal), set both ends.
//  - 1024 samples, 128 with SPINWRIGHT_NO_HEAP (site and state from a fixed hash of the
//    sample's number, so the span depends on the model and that setting only); the magnitudes |delta| of the non-zero
//    ones stand for the uphill flips (a downhill flip's reverse is uphill by as much).
//  - beta_start solves mean_k exp(-beta d_k) = start_acceptance (bisection; the mean
//    acceptance of the sampled uphill flips, the initial acceptance ratio of Kirkpatrick,
//    Gelatt & Vecchi 1983 and Johnson, Aragon, McGeoch & Schevon 1989, estimated from
//    sampled transitions as Ben-Ameur 2004 does, without his Boltzmann weights).
//  - beta_end = ln(1 / end_acceptance) / d_min, d_min the smallest uphill move: the smallest
//    sampled magnitude, or the smallest change one coefficient makes (2 |J| or 2 |h| for
//    Ising, |Q| for QUBO) when that is smaller, since a random state need not show the
//    small moves of low-energy states.
// hot_delta reports the delta whose acceptance is start_acceptance at beta_start
// (ln(1 / start_acceptance) / beta_start) and cold_delta is d_min. A model with no non-zero
// coefficient gets beta 1 .. 1; one whose samples all flip for free falls back to
// estimate_beta_span. No allocation.
template <class Model>
BetaSpan sample_beta_span(const Model& model, const BetaSpanTargets& targets = BetaSpanTargets{}) {
  // The bound is read only when some sample flips at a cost; reading it first keeps one code
  // path (the result is the same).
  return detail::sample_beta_span_bounded(model, targets, estimate_beta_span(model).cold_delta);
}

}  // namespace spinwright

#endif  // SPINWRIGHT_KERNELS_BETA_SPAN_HPP
