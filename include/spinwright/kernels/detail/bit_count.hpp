// spinwright — bitwise adders for the bit-sliced kernel: 64 independent counters side by side,
// one per bit of a word. count_bits<D> sums D one-bit words into the planes of a binary count
// (full adders over the inputs; hand-built trees for exactly 4 and 6); at_most() compares such
// a count with a constant, bit by bit.
// Used by kernels/bit_sliced.hpp; the method is described in docs/kernels.md ("Bit-sliced").
#ifndef SPINWRIGHT_KERNELS_DETAIL_BIT_COUNT_HPP
#define SPINWRIGHT_KERNELS_DETAIL_BIT_COUNT_HPP

#include "../../config.hpp"

#include <cstddef>  // std::size_t
#include <cstdint>  // std::uint64_t

// The adders are a handful of instructions each and sit in the innermost loop: inlined always.
#if defined(__GNUC__) || defined(__clang__)
#define SPINWRIGHT_BIT_INLINE inline __attribute__((always_inline))
#else
#define SPINWRIGHT_BIT_INLINE inline
#endif

// Run-time choice of the vector unit for the checkerboard sweep: GCC and Clang on x86-64
// compile it three times (plain, AVX2, AVX-512) and pick the widest the CPU has; everything
// else gets the plain path. Every unit gives the same answer (the same word operations).
#if (defined(__GNUC__) || defined(__clang__)) && defined(__x86_64__)
#define SPINWRIGHT_BIT_DISPATCH 1
#else
#define SPINWRIGHT_BIT_DISPATCH 0
#endif

// Loops over eight sites stay loops until the loop vectoriser has seen them (GCC otherwise
// unrolls them first and vectorises the straight-line result far less well); restrict for
// the board's rows, which never overlap within one step.
#if defined(__GNUC__) || defined(__clang__)
#define SPINWRIGHT_BIT_LOOP _Pragma("GCC unroll 1")
#define SPINWRIGHT_BIT_RESTRICT __restrict
#else
#define SPINWRIGHT_BIT_LOOP
#define SPINWRIGHT_BIT_RESTRICT
#endif

namespace spinwright {
namespace detail {

// Planes needed to count up to D (the bit width of D): 1 -> 1, 2..3 -> 2, 4..7 -> 3, 8..15 -> 4.
constexpr int count_planes(int d) noexcept { return d >= 8 ? 4 : d >= 4 ? 3 : d >= 2 ? 2 : 1; }

// Words 64-bit words used as one wide word: every operator is a plain loop over a compile-time
// length, which GCC and Clang turn into vector instructions. The adders below take either a
// std::uint64_t or a Lanes<Words> (64 Words counters side by side).
template <std::size_t Words>
struct Lanes {
  std::uint64_t v[Words];

  static SPINWRIGHT_BIT_INLINE Lanes all(std::uint64_t x) noexcept {
    Lanes r;
    for (std::size_t w = 0; w < Words; ++w) r.v[w] = x;
    return r;
  }
  friend SPINWRIGHT_BIT_INLINE Lanes operator&(const Lanes& a, const Lanes& b) noexcept {
    Lanes r;
    for (std::size_t w = 0; w < Words; ++w) r.v[w] = a.v[w] & b.v[w];
    return r;
  }
  friend SPINWRIGHT_BIT_INLINE Lanes operator|(const Lanes& a, const Lanes& b) noexcept {
    Lanes r;
    for (std::size_t w = 0; w < Words; ++w) r.v[w] = a.v[w] | b.v[w];
    return r;
  }
  friend SPINWRIGHT_BIT_INLINE Lanes operator^(const Lanes& a, const Lanes& b) noexcept {
    Lanes r;
    for (std::size_t w = 0; w < Words; ++w) r.v[w] = a.v[w] ^ b.v[w];
    return r;
  }
  friend SPINWRIGHT_BIT_INLINE Lanes operator~(const Lanes& a) noexcept {
    Lanes r;
    for (std::size_t w = 0; w < Words; ++w) r.v[w] = ~a.v[w];
    return r;
  }
  SPINWRIGHT_BIT_INLINE Lanes& operator^=(const Lanes& b) noexcept { return *this = *this ^ b; }
  SPINWRIGHT_BIT_INLINE Lanes& operator|=(const Lanes& b) noexcept { return *this = *this | b; }
  SPINWRIGHT_BIT_INLINE Lanes& operator&=(const Lanes& b) noexcept { return *this = *this & b; }
};

// All ones / all zeros of a word type.
template <class T>
SPINWRIGHT_BIT_INLINE T zeros() noexcept {
  return T{};
}
template <class T>
SPINWRIGHT_BIT_INLINE T ones() noexcept {
  return ~T{};
}

// Full adder on 64 bit positions at once: a + b + c = sum + 2 carry.
template <class T>
SPINWRIGHT_BIT_INLINE void full_add(T a, T b, T c, T& sum, T& carry) noexcept {
  const T ab = a ^ b;
  sum = ab ^ c;
  carry = (a & b) | (ab & c);
}

// Adds a one-bit word of weight 2^from into the planes (ripple of half adders).
template <int Planes, class T>
SPINWRIGHT_BIT_INLINE void add_carry(T* planes, T carry, int from) noexcept {
  for (int p = from; p < Planes; ++p) {
    const T next = planes[p] & carry;
    planes[p] ^= carry;
    carry = next;
  }
}

// planes[0 .. count_planes(D) - 1] = bitwise count of the D words in `in`: bit b of the
// count is the number of inputs whose bit b is set. Inputs are taken three at a time by a
// full adder whose sum has weight 1 and whose carry has weight 2.
template <int D, class T>
SPINWRIGHT_BIT_INLINE void count_bits(const T* in, T* planes) noexcept {
  constexpr int planes_used = count_planes(D);
  if constexpr (D == 4) {
    // One full adder, then the fourth input and the carries by hand (9 operations).
    T s, c;
    full_add(in[0], in[1], in[2], s, c);
    const T t = s & in[3];
    planes[0] = s ^ in[3];
    planes[1] = c ^ t;
    planes[2] = c & t;
  } else if constexpr (D == 6) {
    // Two full adders for the units, a third for the three carries of weight 2 (17 operations).
    T s1, c1, s2, c2;
    full_add(in[0], in[1], in[2], s1, c1);
    full_add(in[3], in[4], in[5], s2, c2);
    planes[0] = s1 ^ s2;
    full_add(c1, c2, s1 & s2, planes[1], planes[2]);
  } else {
    for (int p = 0; p < planes_used; ++p) planes[p] = zeros<T>();
    int k = 0;
    for (; k + 2 < D; k += 3) {
      T s, c;
      full_add(in[k], in[k + 1], in[k + 2], s, c);
      add_carry<planes_used>(planes, s, 0);
      add_carry<planes_used>(planes, c, 1);
    }
    for (; k < D; ++k) add_carry<planes_used>(planes, in[k], 0);
  }
}

// Bit b set where the count in `planes` (Planes planes) at bit b is at most `limit`
// (comparison from the highest plane down: greater as soon as a plane is 1 where the limit
// has 0 and all higher planes were equal).
template <int Planes, class T>
SPINWRIGHT_BIT_INLINE T at_most(const T* planes, unsigned limit) noexcept {
  T greater = zeros<T>();
  T equal = ones<T>();
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

// Bit b set where the count in `planes` at bit b is below a limit that may differ per bit:
// limit_planes[p] holds bit p of each bit's limit (the limit in the same plane form). No
// branch on the limit, so the comparison runs over Lanes words at once.
template <int Planes, class T>
SPINWRIGHT_BIT_INLINE T below(const T* planes, const T* limit_planes) noexcept {
  T less = zeros<T>();
  T equal = ones<T>();
  for (int p = Planes - 1; p >= 0; --p) {
    less |= equal & ~planes[p] & limit_planes[p];
    equal &= ~(planes[p] ^ limit_planes[p]);
  }
  return less;
}

}  // namespace detail
}  // namespace spinwright

#endif  // SPINWRIGHT_KERNELS_DETAIL_BIT_COUNT_HPP
