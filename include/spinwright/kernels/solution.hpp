// spinwright — Solution: the result of one restart of any kernel.
#ifndef SPINWRIGHT_KERNELS_SOLUTION_HPP
#define SPINWRIGHT_KERNELS_SOLUTION_HPP

#include "../config.hpp"
#include "../control.hpp"

#include <cstddef>  // std::size_t
#include <cstdint>  // std::int8_t, std::uint64_t, std::uint8_t
#include <vector>   // std::vector

namespace spinwright {

// The best state a stepping kernel has found so far, without a copy: valid until the kernel
// is next stepped.
template <class Energy>
struct BestView {
  const std::int8_t* spins = nullptr;
  std::size_t size = 0;
  Energy energy{};
  std::uint64_t sweep = 0;  // sweeps done when it was found (0: the start state)
};

template <class Energy>
struct Solution {
  std::vector<std::int8_t> spins;  // best state found, +1/-1 (QUBO: x = (1 - s) / 2)
  Energy energy{};                 // its energy, offset included
  std::uint64_t sweeps = 0;        // sweeps done
  std::uint64_t attempted = 0;     // attempted moves
  std::uint64_t accepted = 0;      // accepted moves
  double seconds = 0;              // elapsed on the run's clock (0 without a clock)
  StopReason reason = StopReason::budget_exhausted;
  std::uint64_t restart = 0;  // restart index r of (seed, r)

  // The bits of the best state, x = (1 - s) / 2.
  std::vector<std::uint8_t> bits() const {
    std::vector<std::uint8_t> b(spins.size());
    for (std::size_t i = 0; i < spins.size(); ++i) b[i] = spins[i] < 0 ? 1 : 0;
    return b;
  }
};

}  // namespace spinwright

#endif  // SPINWRIGHT_KERNELS_SOLUTION_HPP
