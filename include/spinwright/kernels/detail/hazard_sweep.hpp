// spinwright — one sweep of the built-in single flip on an integer model (Metropolis or
// heat-bath) along the hazard path (kernels/acceptance.hpp, docs/moves.md): one exponential draw per random
// acceptance instead of one uniform per attempt whose outcome is uncertain. Shared by
// annealing and tempering, which take it on cold sweeps (take_hazard_path). No allocation.
#ifndef SPINWRIGHT_KERNELS_DETAIL_HAZARD_SWEEP_HPP
#define SPINWRIGHT_KERNELS_DETAIL_HAZARD_SWEEP_HPP

#include "../../config.hpp"
#include "../../moves/single_flip.hpp"
#include "../../rng/xoshiro.hpp"
#include "../../state/spin_state.hpp"
#include "../acceptance.hpp"
#include "flip_loop.hpp"

#include <cstddef>  // std::size_t
#include <cstdint>  // std::int8_t, std::uint32_t, std::uint64_t

namespace spinwright {
namespace detail {

// The choice of path for one sweep of `attempts` attempts: the previous sweep of this state
// accepted less than `hazard_below` of its attempts, and the hazard table is ready for this
// beta or cheap to fill (at most a quarter as many entries as attempts). hazard_below > 1
// forces the path (tests of each path alone).
template <class Energy>
bool take_hazard_path(const Acceptor<Energy>& acceptor, double last_rate, double hazard_below, std::size_t attempts) {
  if (!acceptor.has_hazard() || !(last_rate < hazard_below)) return false;
  if (hazard_below > 1) return true;
  return acceptor.hazard_ready() || 4 * acceptor.hazard_fill_entries() <= attempts;
}

// n attempts on `state` in the given site order; returns the number accepted. The acceptor
// must have been built with its hazard table (make_acceptor(..., hazard = true)); its table
// for the current beta is filled here when stale. `stream` is copied into a local for the
// sweep, so the generator stays in registers (through a reference its state would be stored
// and reloaded at every draw: flips write through int8_t pointers, which may alias anything).
template <class Model>
std::uint64_t hazard_sweep(SpinState<Model>& state, Acceptor<typename Model::energy_type>& acceptor, SiteOrder order,
                           Xoshiro256& stream) {
  using energy_type = typename Model::energy_type;
  using index_type = typename Model::index_type;
  Xoshiro256 rng = stream;
  acceptor.prepare_hazard();
  const auto hazard = acceptor.hazard();
  const std::int8_t* spins = state.spins();
  const energy_type* fields = state.local_fields();
  const auto n = static_cast<std::uint32_t>(state.size());
  std::uint64_t accepted = 0;
  FlipLoop<Model> flips(state);  // the flips with the arrays in registers
  std::uint64_t left = hazard.draw(rng);  // hazard left before the next uphill acceptance
  auto delta_at = [spins, fields](std::uint32_t i) -> energy_type {
    if constexpr (Model::form == Form::ising) {
      return -2 * spins[i] * fields[i];
    } else {
      return spins[i] * fields[i];
    }
  };
  if (acceptor.rule() == Acceptance::heat_bath) {
    // Every delta has a hazard (ln 2 at zero); an acceptance always spends E.
    if (order == SiteOrder::sequential) {
      std::uint32_t i = 0;
      for (;;) {
        energy_type d{};
        for (; i < n; ++i) {
          d = delta_at(i);
          const std::uint64_t h = hazard.of_heat_bath(d);
          if (h >= left) break;
          left -= h;
        }
        if (i >= n) break;
        flips.flip(static_cast<index_type>(i), d);
        ++accepted;
        ++i;
        left = hazard.draw(rng);
      }
    } else {
      for (std::uint32_t k = 0; k < n; ++k) {
        const std::uint32_t i = rng.below(n);
        const energy_type d = delta_at(i);
        const std::uint64_t h = hazard.of_heat_bath(d);
        if (h < left) {
          left -= h;
          continue;
        }
        flips.flip(static_cast<index_type>(i), d);
        ++accepted;
        left = hazard.draw(rng);
      }
    }
  } else if (order == SiteOrder::sequential) {
    // A tight scan that only evaluates and rejects, leaving it for each accepted flip.
    std::uint32_t i = 0;
    for (;;) {
      energy_type d{};
      bool spent = false;
      for (; i < n; ++i) {
        d = delta_at(i);
        if (d <= 0) break;
        const std::uint64_t h = hazard.of(d);
        if (h >= left) {
          spent = true;
          break;
        }
        left -= h;
      }
      if (i >= n) break;
      flips.flip(static_cast<index_type>(i), d);
      ++accepted;
      ++i;
      if (spent) left = hazard.draw(rng);
    }
  } else {
    for (std::uint32_t k = 0; k < n; ++k) {
      const std::uint32_t i = rng.below(n);
      const energy_type d = delta_at(i);
      if (d > 0) {
        const std::uint64_t h = hazard.of(d);
        if (h < left) {
          left -= h;
          continue;
        }
        left = hazard.draw(rng);
      }
      flips.flip(static_cast<index_type>(i), d);
      ++accepted;
    }
  }
  flips.finish();
  stream = rng;
  return accepted;
}

}  // namespace detail
}  // namespace spinwright

#endif  // SPINWRIGHT_KERNELS_DETAIL_HAZARD_SWEEP_HPP
