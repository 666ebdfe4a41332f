// spinwright — the `auto` choice: a kernel and its parameters picked from the model's size
// and density, so that a user who does not tune still gets strong results.
//
// The rule (choose_kernel):
//   * N <= 20                                  -> exact enumeration (at most 2^20 states: milliseconds);
//   * dense models, or pair density >= 0.10    -> tabu search, sweeps = 2000
//     (density = pairs / (N (N - 1) / 2); one-flip tabu with best-move selection is strongest
//     where every spin interacts with many others, e.g. dense QUBO);
//   * otherwise (sparse graphs, lattices)      -> annealing, sweeps = 4000 for N <= 10^4,
//     2000 up to 10^5, 1000 beyond, geometric schedule over the automatic beta range, random
//     site order, then steepest descent to polish the result.
// A Budget's sweeps, deadline, stop token and target are honoured by whichever kernel runs
// (exact enumeration has no stop: its size limit bounds its time).
#ifndef SPINWRIGHT_KERNELS_AUTO_HPP
#define SPINWRIGHT_KERNELS_AUTO_HPP

#include "../config.hpp"
#include "../control/control.hpp"
#include "anneal.hpp"
#include "descent.hpp"
#include "exact.hpp"
#include "solution.hpp"
#include "tabu.hpp"

#include <cstddef>  // std::size_t
#include <cstdint>  // std::uint64_t, std::uint8_t
#include <utility>  // std::move

namespace spinwright {

enum class KernelKind : std::uint8_t { anneal, temper, tabu, descent, exact };

inline constexpr const char* to_string(KernelKind k) noexcept {
  switch (k) {
    case KernelKind::anneal: return "anneal";
    case KernelKind::temper: return "temper";
    case KernelKind::tabu: return "tabu";
    case KernelKind::descent: return "descent";
    case KernelKind::exact: return "exact";
  }
  return "unknown";
}

struct AutoChoice {
  KernelKind kernel = KernelKind::anneal;
  std::uint64_t sweeps = 0;  // 0 for exact enumeration
  const char* reason = "";
};

inline constexpr std::size_t auto_exact_max_spins = 20;
inline constexpr double auto_dense_threshold = 0.10;

template <class Model>
AutoChoice choose_kernel(const Model& model) noexcept {
  const std::size_t n = model.num_spins();
  if (n <= auto_exact_max_spins) return {KernelKind::exact, 0, "at most 20 spins: exact enumeration"};
  const double all_pairs = 0.5 * static_cast<double>(n) * static_cast<double>(n - 1);
  const double density = static_cast<double>(model.num_pairs()) / all_pairs;
  if (Model::is_dense || density >= auto_dense_threshold) {
    return {KernelKind::tabu, 2000, "dense model (pair density >= 0.10): tabu search"};
  }
  const std::uint64_t sweeps = n <= 10000 ? 4000 : (n <= 100000 ? 2000 : 1000);
  return {KernelKind::anneal, sweeps, "sparse model: annealing, then descent"};
}

// One restart of the automatically chosen kernel. Restart r depends on (seed, r) only.
template <class Model>
Solution<typename Model::energy_type> solve_auto(const Model& model, std::uint64_t seed, std::uint64_t restart = 0,
                                                 const Budget& budget = Budget{}) {
  using energy_type = typename Model::energy_type;
  const AutoChoice choice = choose_kernel(model);
  switch (choice.kernel) {
    case KernelKind::exact: {
      ExactParams params;
      params.max_spins = auto_exact_max_spins;
      auto exact = solve_exact(model, params);
      SPINWRIGHT_ASSERT(exact.ok(), "exact enumeration within its limit cannot fail");
      Solution<energy_type> s;
      s.spins = std::move(exact.value().spins);
      s.energy = exact.value().energy;
      s.attempted = exact.value().states;
      s.restart = restart;
      s.reason = StopReason::budget_exhausted;
      return s;
    }
    case KernelKind::tabu: {
      TabuParams params;
      params.sweeps = choice.sweeps;
      return tabu_search(model, params, seed, restart, budget);
    }
    default: {
      AnnealParams params;
      params.sweeps = choice.sweeps;
      Solution<energy_type> annealed = anneal(model, params, seed, restart, budget);
      if (annealed.reason == StopReason::stopped || annealed.reason == StopReason::deadline) return annealed;
      // polish() adds its own counters to the annealer's and keeps its stop reason.
      return polish(model, annealed, DescentRule::steepest);
    }
  }
}

}  // namespace spinwright

#endif  // SPINWRIGHT_KERNELS_AUTO_HPP
