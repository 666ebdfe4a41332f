// Trading loop: a desk holds exactly K of N instruments, chosen by cardinality-constrained
// mean-variance selection (problems/selection.hpp). Every tick the expected returns drift; the
// unary coefficients are edited in place (edit_site_term keeps the held book's energy exact), and
// one Annealer, built once, warm-starts from the held answer for a small fixed sweep budget.
// The CountKeepingSwap move keeps exactly K chosen. Each answer is checked: feasible, energy equal to
// the model's energy recomputed, and equal to the optimum found by exact enumeration.
// All data are invented for this example (12 instruments in 3 sectors, drifts from a fixed seed).
#include <spinwright/kernels/anneal.hpp>
#include <spinwright/kernels/exact.hpp>
#include <spinwright/moves/count_keeping_swap.hpp>
#include <spinwright/problems/selection.hpp>

#include <cstdint>
#include <cstdio>
#include <vector>

int main() {
  using namespace spinwright;
  using Model = QuboModel<int>;
  const std::size_t n = 12, k = 4;
  std::vector<int> mu(n), cov(n * n);
  for (std::size_t i = 0; i < n; ++i) {
    mu[i] = 20 + static_cast<int>((i * 7) % 11) * 3;  // expected return, invented units
    for (std::size_t j = 0; j < n; ++j) {
      cov[i * n + j] = i == j ? 12 + static_cast<int>(i % 4) * 3 : (i % 3 == j % 3 ? 5 : 1);  // same sector: 5
    }
  }
  auto problem = SelectionProblem<int>::encode(mu, cov, /*risk_aversion*/ 1, k);
  if (!problem) {
    std::printf("encoding refused: %s\n", problem.status().message);
    return 1;
  }
  Model model = problem->model();  // our own copy, edited in place between ticks
  SpinState<Model> book(model);    // the position held between ticks
  std::vector<std::int8_t> start(n, 1);
  for (std::size_t i = 0; i < k; ++i) start[i] = -1;  // hold the first K (spin -1 = bit 1 = chosen)
  book.set_spins(start.data());

  // The beta span from the model would follow the penalty terms (hundreds), which CountKeepingSwap never
  // pays; exchange deltas are integers of a few tens, so the span is our own: uphill 40 accepted with
  // probability 1/2 at the hot end, uphill 1 with probability 1e-3 at the cold end. How hot each warm
  // start begins is warm_schedule's heat (docs/embedding.md, "Warm re-solve"): every tick moves every
  // return, a large edit, so heat 1 (the whole span). 40 sweeps of n exchanges.
  BetaSpan exchange;
  exchange.beta_start = 0.6931 / 40;
  exchange.beta_end = 6.9078 / 1;
  AnnealParams params;
  params.schedule = warm_schedule(exchange, 1.0);
  params.sweeps = 40;
  params.initial = book.spins();
  const std::uint64_t seed = 2026;
  // Every warm start re-reads the model's coefficients for the acceptance tables, so in-place
  // edits of any size are honoured; warm_start(book, ...) copies the held state (kept exact by
  // edit_site_term) instead of recomputing its fields.
  Annealer<Model, CountKeepingSwap<Model>> desk(model, params, seed);
  Xoshiro256 market = Xoshiro256::for_restart(seed, 99);
  int failures = 0;
  for (std::uint64_t tick = 0; tick < 8; ++tick) {
    if (tick > 0) {
      for (std::size_t i = 0; i < n; ++i) {  // returns drift by -6..+6: unary Q_ii = lambda C_ii - mu_i + penalty
        const int drift = static_cast<int>(market.below(13)) - 6;
        const auto ii = static_cast<Model::index_type>(i);
        if (!edit_site_term(model, book, ii, model.site_term(ii) - drift)) return 1;
      }
    }
    const auto held = book.energy();  // the held position marked to the new returns, kept exact
    desk.warm_start(book, seed, tick);
    desk.step(params.sweeps);
    const auto best = desk.best();
    const Selection chosen = problem->decode(best.spins);
    const auto exact = solve_exact(model);
    const bool feasible = problem->feasibility(best.spins).feasible && problem->check(chosen).valid;
    const bool energy_ok = best.energy == model.energy(best.spins) && book.check().exact;
    const bool optimal = exact && best.energy == exact->energy;
    std::printf("tick %llu  held %lld -> %lld  chosen", static_cast<unsigned long long>(tick),
                static_cast<long long>(held), static_cast<long long>(best.energy));
    for (const std::uint64_t i : chosen.items) std::printf(" %llu", static_cast<unsigned long long>(i));
    std::printf("%s\n", feasible && energy_ok && optimal ? "" : "  <- WRONG");
    if (!(feasible && energy_ok && optimal)) ++failures;
    book.set_spins(best.spins);  // trade into the new answer
  }
  std::printf("%s\n", failures == 0 ? "every tick: exactly K chosen, energy exact, optimal" : "some tick failed");
  return failures == 0 ? 0 : 1;
}
