// spinwright — small, fast, seedable generators with identical streams on every platform.
// splitmix64 (Steele, Lea, Flood, "Fast splittable pseudorandom number generators",
// OOPSLA 2014) seeds xoshiro256++ (Blackman & Vigna, "Scrambled linear pseudorandom number
// generators", ACM TOMS 47(4), 2021). Only 64-bit integer arithmetic is used, so the same
// seed gives the same stream on x86-64, aarch64 and 32-bit microcontrollers. No standard
// library distribution is used anywhere in the kernels: their output differs between
// library implementations.
#ifndef SPINWRIGHT_RNG_XOSHIRO_HPP
#define SPINWRIGHT_RNG_XOSHIRO_HPP

#include "../config.hpp"

#include <cstdint>  // std::uint32_t, std::uint64_t

namespace spinwright {

// One step of splitmix64: advances `state` and returns the next output.
constexpr std::uint64_t splitmix64(std::uint64_t& state) noexcept {
  std::uint64_t z = (state += 0x9E3779B97F4A7C15ULL);
  z = (z ^ (z >> 30)) * 0xBF58476D1CE4E5B9ULL;
  z = (z ^ (z >> 27)) * 0x94D049BB133111EBULL;
  return z ^ (z >> 31);
}

class Xoshiro256 {
 public:
  using result_type = std::uint64_t;

  constexpr Xoshiro256() noexcept : Xoshiro256(0) {}
  constexpr explicit Xoshiro256(std::uint64_t seed) noexcept { reseed(seed); }

  // The generator for restart `r` of a run seeded with `seed`: depends on (seed, r) only,
  // so restarts give the same answers whatever the number of threads.
  static constexpr Xoshiro256 for_restart(std::uint64_t seed, std::uint64_t r) noexcept {
    std::uint64_t a = seed;
    std::uint64_t b = r ^ 0xD1B54A32D192ED03ULL;
    const std::uint64_t mixed = splitmix64(a) ^ (splitmix64(b) * 0xA24BAED4963EE407ULL);
    return Xoshiro256(mixed);
  }

  constexpr void reseed(std::uint64_t seed) noexcept {
    std::uint64_t sm = seed;
    for (auto& word : s_) word = splitmix64(sm);
  }

  static constexpr std::uint64_t min() noexcept { return 0; }
  static constexpr std::uint64_t max() noexcept { return ~std::uint64_t{0}; }

  constexpr std::uint64_t operator()() noexcept { return next(); }

  constexpr std::uint64_t next() noexcept {
    const std::uint64_t result = rotl(s_[0] + s_[3], 23) + s_[0];
    const std::uint64_t t = s_[1] << 17;
    s_[2] ^= s_[0];
    s_[3] ^= s_[1];
    s_[1] ^= s_[2];
    s_[0] ^= s_[3];
    s_[2] ^= t;
    s_[3] = rotl(s_[3], 45);
    return result;
  }

  // Uniform double in [0, 1) with 53 random bits.
  constexpr double uniform() noexcept { return static_cast<double>(next() >> 11) * 0x1.0p-53; }

  // Uniform double in (0, 1]: safe to take the logarithm of.
  constexpr double uniform_open_zero() noexcept { return static_cast<double>((next() >> 11) + 1) * 0x1.0p-53; }

  // Uniform 32-bit integer.
  constexpr std::uint32_t next32() noexcept { return static_cast<std::uint32_t>(next() >> 32); }

  // Uniform integer in [0, n), n >= 1, without bias (Lemire, "Fast random integer
  // generation in an interval", ACM TOMACS 29(1), 2019), in 64-bit arithmetic only.
  constexpr std::uint32_t below(std::uint32_t n) noexcept {
    SPINWRIGHT_ASSERT(n > 0, "below(0)");
    std::uint64_t m = static_cast<std::uint64_t>(next32()) * n;
    auto low = static_cast<std::uint32_t>(m);
    if (low < n) {
      const std::uint32_t threshold = static_cast<std::uint32_t>(-n) % n;
      while (low < threshold) {
        m = static_cast<std::uint64_t>(next32()) * n;
        low = static_cast<std::uint32_t>(m);
      }
    }
    return static_cast<std::uint32_t>(m >> 32);
  }

  // Fair coin.
  constexpr bool coin() noexcept { return (next() >> 63) != 0; }

 private:
  static constexpr std::uint64_t rotl(std::uint64_t x, int k) noexcept { return (x << k) | (x >> (64 - k)); }
  std::uint64_t s_[4]{};
};

}  // namespace spinwright

#endif  // SPINWRIGHT_RNG_XOSHIRO_HPP
