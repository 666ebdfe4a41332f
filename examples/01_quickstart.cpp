// Quick start (the README's usage example): a small max-cut written as an Ising model, solved
// with the automatic kernel over 8 restarts on 2 threads, then checked.
// The graph is invented for this example: five meeting rooms to split between two floors,
// weights = how much two rooms' groups want to be apart.
#include <spinwright/kernels/auto.hpp>
#include <spinwright/parallel/restarts.hpp>
#include <spinwright/spinwright.hpp>

#include <cstdio>

int main() {
  using namespace spinwright;
  IsingBuilder<int> b;  // max-cut: J_ij = w_ij, h = 0
  b.add_coupling(0, 1, 3).add_coupling(1, 2, 1).add_coupling(2, 3, 4);
  b.add_coupling(3, 0, 2).add_coupling(0, 2, 5).add_coupling(3, 4, 2);
  auto model = b.build();
  if (!model) {
    std::printf("refused: %s (term %llu)\n", model.status().message,
                static_cast<unsigned long long>(model.status().term));
    return 1;
  }
  const std::uint64_t seed = 42;
  auto tally = run_restarts<std::int64_t>(8, 2, [&](std::uint64_t r) { return solve_auto(*model, seed, r); });
  const auto& best = tally.best();
  const auto w = total_weight(*model);
  std::printf("energy %lld, cut %lld of %lld\n", static_cast<long long>(best.energy),
              static_cast<long long>(cut_value(*model, best.spins.data())), static_cast<long long>(w));
  for (std::size_t i = 0; i < best.spins.size(); ++i) std::printf("room %zu: floor %d\n", i, best.spins[i] > 0 ? 1 : 2);
  return cut_from_energy(w, best.energy) == 14 ? 0 : 1;  // 14 is this graph's max cut (by enumeration)
}
