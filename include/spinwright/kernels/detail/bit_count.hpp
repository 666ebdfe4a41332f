// spinwright — bitwise adders for the bit-sliced kernel: 64 independent counters side by side,
// one per bit of a word. count_bits<D> sums D one-bit words into the planes of a binary count
// (full adders over the inputs); at_most() compares such a count with a constant, bit by bit.
// Used by kernels/bit_sliced.hpp; the method is described in docs/kernels.md ("Bit-sliced").
#ifndef SPINWRIGHT_KERNELS_DETAIL_BIT_COUNT_HPP
#define SPINWRIGHT_KERNELS_DETAIL_BIT_COUNT_HPP

#include "../../config.hpp"

#include <cstdint>  // std::uint64_t

// The adders are a handful of instructions each and sit in the innermost loop: inlined always.
#if defined(__GNUC__) || defined(__clang__)
#define SPINWRIGHT_BIT_INLINE inline __attribute__((always_inline))
#else
#define SPINWRIGHT_BIT_INLINE inline
#endif

namespace spinwright {
namespace detail {

// Planes needed to count up to D (the bit width of D): 1 -> 1, 2..3 -> 2, 4..7 -> 3, 8..15 -> 4.
constexpr int count_planes(int d) noexcept { return d >= 8 ? 4 : d >= 4 ? 3 : d >= 2 ? 2 : 1; }

// Full adder on 64 bit positions at once: a + b + c = sum + 2 carry.
SPINWRIGHT_BIT_INLINE void full_add(std::uint64_t a, std::uint64_t b, std::uint64_t c, std::uint64_t& sum,
                                    std::uint64_t& carry) noexcept {
  const std::uint64_t ab = a ^ b;
  sum = ab ^ c;
  carry = (a & b) | (ab & c);
}

// Adds a one-bit word of weight 2^from into the planes (ripple of half adders).
template <int Planes>
SPINWRIGHT_BIT_INLINE void add_carry(std::uint64_t* planes, std::uint64_t carry, int from) noexcept {
  for (int p = from; p < Planes; ++p) {
    const std::uint64_t next = planes[p] & carry;
    planes[p] ^= carry;
    carry = next;
  }
}

// planes[0 .. count_planes(D) - 1] = bitwise count of the D words in `in`: bit b of the
// count is the number of inputs whose bit b is set. Inputs are taken three at a time by a
// full adder whose sum has weight 1 and whose carry has weight 2.
template <int D>
SPINWRIGHT_BIT_INLINE void count_bits(const std::uint64_t* in, std::uint64_t* planes) noexcept {
  constexpr int planes_used = count_planes(D);
  for (int p = 0; p < planes_used; ++p) planes[p] = 0;
  int k = 0;
  for (; k + 2 < D; k += 3) {
    std::uint64_t s = 0, c = 0;
    full_add(in[k], in[k + 1], in[k + 2], s, c);
    add_carry<planes_used>(planes, s, 0);
    add_carry<planes_used>(planes, c, 1);
  }
  for (; k < D; ++k) add_carry<planes_used>(planes, in[k], 0);
}

// Bit b set where the count in `planes` (Planes planes) at bit b is at most `limit`
// (comparison from the highest plane down: greater as soon as a plane is 1 where the limit
// has 0 and all higher planes were equal).
template <int Planes>
SPINWRIGHT_BIT_INLINE std::uint64_t at_most(const std::uint64_t* planes, unsigned limit) noexcept {
  std::uint64_t greater = 0;
  std::uint64_t equal = ~std::uint64_t{0};
  for (int p = Planes - 1; p >= 0; --p) {
    if ((limit >> p) & 1u) {
      equal &= planes[p];
    } else {
      greater |= equal & planes[p];
      equal &= ~planes[p];
    }
  }
  return ~greater;
}

}  // namespace detail
}  // namespace spinwright

#endif  // SPINWRIGHT_KERNELS_DETAIL_BIT_COUNT_HPP
