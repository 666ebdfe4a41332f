// The sampled beta span (kernels/beta_span.hpp, sample_beta_span) on models whose flip deltas
// at a uniformly random state are known by hand, so the initial acceptance the rule aims at
// can be computed without the library.
#include <doctest/doctest.h>

#include <spinwright/kernels/anneal.hpp>
#include <spinwright/model/builder.hpp>

#include "support/anneal_graph.hpp"

#include <cmath>
#include <cstdint>

using namespace spinwright;

namespace {

// n free spins, each with field h: every flip at every state changes the energy by +-2h.
IsingModel<double> free_spins(std::uint32_t n, double h) {
  IsingBuilder<double> b(n);
  for (std::uint32_t i = 0; i < n; ++i) b.add_field(i, h);
  return b.build().value();
}

// |a - b| <= tol |b| (doctest's Approx adds an absolute allowance of tol, too loose here).
bool near(double a, double b, double tol) { return std::fabs(a - b) <= tol * std::fabs(b); }

}  // namespace

TEST_CASE("sampled span: one delta magnitude gives the closed form of both ends") {
  // Every uphill flip costs 2h = 3, so the mean acceptance exp(-3 beta) = 1/2 at
  // beta = ln 2 / 3, and the smallest uphill flip is accepted with 1e-3 at ln 1000 / 3
  // (Metropolis acceptance min(1, exp(-beta delta)): Metropolis et al., J. Chem. Phys. 21, 1087 (1953)).
  const auto model = free_spins(50, 1.5);
  const BetaSpan r = sample_beta_span(model);
  CHECK(near(r.beta_start, std::log(2.0) / 3, 1e-9));
  CHECK(near(r.beta_end, std::log(1000.0) / 3, 1e-12));
  CHECK(r.cold_delta == doctest::Approx(3.0));
  CHECK(near(r.hot_delta, 3.0, 1e-9));

  // Other targets follow the same closed form.
  const BetaSpan t = sample_beta_span(model, BetaSpanTargets{0.8, 1e-4});
  CHECK(near(t.beta_start, std::log(1 / 0.8) / 3, 1e-9));
  CHECK(near(t.beta_end, std::log(1e4) / 3, 1e-12));

  // QUBO form: a lone variable with Q_ii = q changes the energy by +-q.
  QuboBuilder<double> qb(20);
  for (std::uint32_t i = 0; i < 20; ++i) qb.add_unary(i, -2.5);
  const auto qubo = qb.build().value();
  const BetaSpan q = sample_beta_span(qubo);
  CHECK(near(q.beta_start, std::log(2.0) / 2.5, 1e-9));
  CHECK(near(q.beta_end, std::log(1000.0) / 2.5, 1e-12));
}

TEST_CASE("sampled span: a ring in a field, two magnitudes in known proportions") {
  // Ring with J = 1 and h = 1 (our form E = sum J s s + sum h s): the flip of s_i changes the
  // energy by -2 s_i (h + s_{i-1} + s_{i+1}). At a uniformly random state the neighbour sum is
  // -2, 0, 2 with probabilities 1/4, 1/2, 1/4, so |delta| = 2 with probability 3/4 and 6
  // with 1/4. The rule's target, mean acceptance 1/2 of these uphill magnitudes, is met at
  // the root of 3/4 e^{-2b} + 1/4 e^{-6b} = 1/2 (by hand: x = e^{-2b} solves
  // x^3 + 3x - 2 = 0, x = 0.596072..., b = 0.258762...). The rule samples 1024 states, so
  // its proportions differ from 3/4 by about 0.014 (one standard deviation): 3% on beta.
  const auto ring = anneal_support::ring<double>(500, 1.0, 1.0);
  const BetaSpan r = sample_beta_span(ring);
  const double x = 0.5960716379833215;  // real root of x^3 + 3x - 2
  CHECK(std::fabs(x * x * x + 3 * x - 2) < 1e-12);
  const double b = -std::log(x) / 2;
  CHECK(near(r.beta_start, b, 0.03));
  CHECK(r.cold_delta == doctest::Approx(2.0));
  CHECK(near(r.beta_end, std::log(1000.0) / 2, 1e-12));

  // The acceptance an annealer sees in its first sweep from a random start at beta_start:
  // counted directly over many random states, the mean acceptance of the uphill flips
  // is the target (within sampling error).
  Xoshiro256 rng = Xoshiro256::for_restart(3, 0);
  SpinState<IsingModel<double>> s(ring);
  double sum = 0;
  double count = 0;
  for (int k = 0; k < 200; ++k) {
    s.randomize(rng);
    for (std::uint32_t i = 0; i < ring.num_spins(); ++i) {
      const double d = s.delta(i);
      if (d == 0) continue;
      sum += std::exp(-r.beta_start * (d < 0 ? -d : d));
      count += 1;
    }
  }
  CHECK(near(sum / count, 0.5, 0.03));
}

TEST_CASE("sampled span: the cold end never above what one coefficient can change") {
  // Ring with J = 1 and no field: |delta| is 0 or 4 at every state (neighbour sum -2, 0, 2),
  // so the sample's smallest uphill move is 4; one coupling alone changes the energy by 2 |J|
  // = 2, the bound the cold end takes. The hot end: exp(-4 b) = 1/2.
  const auto ring = anneal_support::ring<double>(300, 1.0);
  const BetaSpan r = sample_beta_span(ring);
  CHECK(r.cold_delta == doctest::Approx(2.0));
  CHECK(near(r.beta_end, std::log(1000.0) / 2, 1e-12));
  CHECK(near(r.beta_start, std::log(2.0) / 4, 1e-9));
}

TEST_CASE("sampled span: deterministic, degenerate models, and the annealer's default") {
  const auto model = anneal_support::maxcut_model<std::int32_t>(anneal_support::random_cubic(200, 4));
  const BetaSpan a = sample_beta_span(model);
  const BetaSpan b = sample_beta_span(model);
  CHECK(a.beta_start == b.beta_start);
  CHECK(a.beta_end == b.beta_end);
  CHECK(a.beta_start > 0);
  CHECK(a.beta_end > a.beta_start);

  // No coefficient at all: the same 1 .. 1 as the coefficient rule.
  const auto empty = free_spins(5, 0.0);
  const BetaSpan e = sample_beta_span(empty);
  CHECK(e.beta_start == 1);
  CHECK(e.beta_end == 1);

  // Targets outside (0, 1) are refused in favour of the coefficient rule.
  const BetaSpan bad = sample_beta_span(model, BetaSpanTargets{1.5, 1e-3});
  CHECK(bad.beta_start == estimate_beta_span(model).beta_start);

  // A default Schedule{} takes the sampled span.
  AnnealParams p;
  Annealer<IsingModel<std::int32_t>> ann(model, p, 1);
  CHECK(ann.beta_span().beta_start == a.beta_start);
  CHECK(ann.beta_span().beta_end == a.beta_end);
  CHECK(ann.beta() == doctest::Approx(a.beta_start));
}
