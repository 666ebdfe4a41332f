// spinwright — periodic lattices as Ising models: the L x L x L simple-cubic torus with +-J
// couplings drawn from a seed (the three-dimensional Edwards-Anderson +-J spin glass, S. F.
// Edwards and P. W. Anderson, J. Phys. F 5, 965 (1975)), and the L x L square torus with one
// coupling everywhere. Our energy form E = sum J_ij s_i s_j: J = -1 is ferromagnetic.
#ifndef SPINWRIGHT_PROBLEMS_LATTICE_HPP
#define SPINWRIGHT_PROBLEMS_LATTICE_HPP

#include "../config.hpp"
#include "../model/builder.hpp"
#include "../model/sparse_model.hpp"
#include "../rng/xoshiro.hpp"
#include "../status.hpp"

#include <cstdint>  // std::uint32_t, std::uint64_t

namespace spinwright {

#if !SPINWRIGHT_NO_HEAP

/// The L x L x L periodic simple-cubic lattice (L >= 3; site (x, y, z) is x + L y + L^2 z),
/// each of its 3 L^3 bonds +J or -J with probability 1/2, no fields. The signs come from
/// Xoshiro256(seed), one coin per bond in site order and then x, y, z direction, so a seed
/// names one instance on every platform.
template <class Value>
Result<IsingModel<Value>> plus_minus_cubic_lattice(std::uint32_t L, std::uint64_t seed, Value J = Value{1}) {
  if (L < 3) return Status::error(StatusCode::invalid_argument, "cubic lattice side must be at least 3");
  if (static_cast<std::uint64_t>(L) * L * L >= (std::uint64_t{1} << 31)) {
    return Status::error(StatusCode::size_limit, "cubic lattice has more than 2^31 sites");
  }
  if (!(J > Value{0}) && !(J < Value{0}))
    return Status::error(StatusCode::invalid_argument, "coupling magnitude is zero");
  Xoshiro256 rng(seed);
  const std::uint64_t n = static_cast<std::uint64_t>(L) * L * L;
  IsingBuilder<Value> b(n);
  for (std::uint64_t z = 0; z < L; ++z) {
    for (std::uint64_t y = 0; y < L; ++y) {
      for (std::uint64_t x = 0; x < L; ++x) {
        const std::uint64_t i = x + L * (y + L * z);
        const std::uint64_t nb[3] = {(x + 1) % L + L * (y + L * z), x + L * ((y + 1) % L + L * z),
                                     x + L * (y + L * ((z + 1) % L))};
        for (const std::uint64_t j : nb) b.add_coupling(i, j, rng.coin() ? J : Value(-J));
      }
    }
  }
  return b.build();
}

/// The L x L periodic square lattice (L >= 3; site (x, y) is x + L y) with coupling J on every bond.
template <class Value>
Result<IsingModel<Value>> square_torus(std::uint32_t L, Value J) {
  if (L < 3) return Status::error(StatusCode::invalid_argument, "square lattice side must be at least 3");
  if (static_cast<std::uint64_t>(L) * L >= (std::uint64_t{1} << 31)) {
    return Status::error(StatusCode::size_limit, "square lattice has more than 2^31 sites");
  }
  const std::uint64_t n = static_cast<std::uint64_t>(L) * L;
  IsingBuilder<Value> b(n);
  for (std::uint64_t y = 0; y < L; ++y) {
    for (std::uint64_t x = 0; x < L; ++x) {
      const std::uint64_t i = x + L * y;
      b.add_coupling(i, (x + 1) % L + L * y, J);
      b.add_coupling(i, x + L * ((y + 1) % L), J);
    }
  }
  return b.build();
}

#endif  // !SPINWRIGHT_NO_HEAP

}  // namespace spinwright

#endif  // SPINWRIGHT_PROBLEMS_LATTICE_HPP
