// spinwright — the lanes kernel's acceptance arithmetic: exp(-x) from a 4097-entry table of
// 2^(-k/4096) built at compile time, linear interpolation and a shift, all in 32-bit integers,
// so every lane decides with the same operations on every vector unit and architecture.
// The scheme and its accuracy: docs/kernels.md ("Lanes").
#ifndef SPINWRIGHT_KERNELS_DETAIL_LANE_ACCEPT_HPP
#define SPINWRIGHT_KERNELS_DETAIL_LANE_ACCEPT_HPP

#include "../../config.hpp"

#include <cmath>    // std::frexp, std::ldexp
#include <cstdint>  // std::int32_t, std::uint32_t, std::uint64_t

namespace spinwright {
namespace detail {

// 2^30 * 2^(-k/4096) rounded (e), and e[k] - e[k + 1] (d), for k = 0..4096.
struct LaneExpTable {
  std::int32_t e[4097];
  std::int32_t d[4097];
};

// sqrt by Newton's method from above; evaluated at compile time only (IEEE operations in a fixed
// order, so every compiler builds the same table).
constexpr double lane_sqrt(double x) noexcept {
  double r = x < 1 ? 1.0 : x;
  for (int k = 0; k < 200; ++k) {
    const double next = 0.5 * (r + x / r);
    if (!(next < r)) break;
    r = next;
  }
  return r;
}

constexpr LaneExpTable make_lane_exp_table() noexcept {
  LaneExpTable t{};
  double c[12]{};  // c[j] = 2^(-2^j / 4096)
  c[11] = lane_sqrt(0.5);
  for (int j = 10; j >= 0; --j) c[j] = lane_sqrt(c[j + 1]);
  for (int k = 0; k < 4096; ++k) {
    double v = 1073741824.0;  // 2^30
    for (int j = 0; j < 12; ++j) {
      if ((k >> j) & 1) v *= c[j];
    }
    t.e[k] = static_cast<std::int32_t>(v + 0.5);
  }
  t.e[4096] = 536870912;  // 2^29
  for (int k = 0; k < 4096; ++k) t.d[k] = t.e[k] - t.e[k + 1];
  t.d[4096] = 0;
  return t;
}

inline constexpr LaneExpTable lane_exp_table = make_lane_exp_table();

// |x| in units of 2^-24 / log2(e): y = |delta| * beta_scale, where beta_scale = beta * 2^24 / ln 2.
inline constexpr double lane_beta_unit = 24204406.323122971;  // 2^24 / ln 2
// The largest y: 32 * 2^24 - 1, so the shift below stays within 0..31.
inline constexpr double lane_y_max = 536870911.0;
inline constexpr std::uint64_t lane_y_max_int = 536870911;

// 2^30 * exp(-y ln 2 / 2^24) to within a few parts in 10^8 (relative), for 0 <= y <= lane_y_max.
inline std::int32_t lane_exp_q(std::int32_t y, const LaneExpTable& t) noexcept {
  const std::int32_t n = y >> 24;
  const std::int32_t idx = (y >> 12) & 4095;
  const std::int32_t frac = y & 4095;
  return (t.e[idx] - ((t.d[idx] * frac) >> 12)) >> n;
}

// y = |delta| * scale for integer deltas below 2^31 without a floating-point operation per lane:
// scale ~ factor * 2^-shift with factor in [2^31, 2^32) (exact truncation of the scale's
// mantissa), so y = (|delta| * factor) >> shift in 64-bit integers, then saturated.
struct LaneMultiplier {
  std::uint64_t factor = 0;
  unsigned shift = 0;
};

inline LaneMultiplier lane_multiplier(double scale) noexcept {
  LaneMultiplier m;
  if (!(scale > 0)) return m;
  if (scale >= 536870912.0) {  // every non-zero delta saturates
    m.factor = 0xFFFFFFFFULL;
    return m;
  }
  int exponent = 0;
  const double mantissa = std::frexp(scale, &exponent);  // scale = mantissa 2^exponent, mantissa in [0.5, 1)
  m.factor = static_cast<std::uint64_t>(std::ldexp(mantissa, 32));
  const int shift = 32 - exponent;  // >= 3 here
  m.shift = static_cast<unsigned>(shift > 63 ? 63 : shift);
  return m;
}

// y of an integer |delta| (below 2^31) with the multiplier of this sweep's beta.
inline std::int32_t lane_y(std::uint32_t magnitude, const LaneMultiplier& m) noexcept {
  const std::uint64_t y = (static_cast<std::uint64_t>(magnitude) * m.factor) >> m.shift;
  return static_cast<std::int32_t>(y < lane_y_max_int ? y : lane_y_max_int);
}

}  // namespace detail
}  // namespace spinwright

#endif  // SPINWRIGHT_KERNELS_DETAIL_LANE_ACCEPT_HPP
