// spinwright — the energy range |c| + sum |site terms| + sum |pairs| that every model keeps
// through builds and edits, the checks of single values it rests on, and the messages of its
// refusals. Internal to the model layer (and the states and kernels that read it).
#ifndef SPINWRIGHT_MODEL_DETAIL_ENERGY_RANGE_HPP
#define SPINWRIGHT_MODEL_DETAIL_ENERGY_RANGE_HPP

#include "../../config.hpp"
#include "../form.hpp"

#include <cstdint>      // std::uint64_t
#include <type_traits>  // std::is_integral_v, std::is_floating_point_v

namespace spinwright {
namespace detail {

// |v| as an unsigned 64-bit number, exact for every int64_t including the minimum.
template <class Value>
constexpr std::uint64_t magnitude_u64(Value v) noexcept {
  static_assert(std::is_integral_v<Value>, "integer values only");
  return v < 0 ? std::uint64_t{0} - static_cast<std::uint64_t>(v) : static_cast<std::uint64_t>(v);
}

// sum += add, false when the result passes `limit` (the sum is then left saturated).
constexpr bool add_bounded(std::uint64_t& sum, std::uint64_t add, std::uint64_t limit) noexcept {
  if (add > limit || sum > limit - add) {
    sum = limit;
    return false;
  }
  sum += add;
  return true;
}

template <class Value>
constexpr double abs_double(Value v) noexcept {
  const double d = static_cast<double>(v);
  return d < 0 ? -d : d;
}

// A running sum of magnitudes with Neumaier's compensation (Neumaier, ZAMM 54, 1974): the
// floating energy bound is kept through edits that add and remove terms, and removing a large
// term gives back the small ones that rounding had absorbed next to it.
class MagnitudeSum {
 public:
  constexpr void add(double x) noexcept {
    const double t = sum_ + x;
    const double a = sum_ < 0 ? -sum_ : sum_;
    const double b = x < 0 ? -x : x;
    comp_ += a >= b ? (sum_ - t) + x : (x - t) + sum_;
    sum_ = t;
  }
  constexpr double value() const noexcept {
    const double v = sum_ + comp_;
    return v < 0 ? 0 : v;
  }

 private:
  double sum_ = 0;
  double comp_ = 0;
};

template <class Value>
constexpr bool is_finite(Value v) noexcept;

// The energy range of a model, |c| + sum |linear| + sum |pair|, kept through builds and edits:
// exactly in 64 bits for integer models (limit integer_energy_limit), as a compensated sum for
// floating ones (limit float_energy_limit). Every model type holds one.
template <class Value>
class EnergyRange {
 public:
  using energy_type = energy_t<Value>;

  // Adds a term's magnitude; false once the range is beyond its limit.
  constexpr bool add(energy_type v) noexcept {
    if constexpr (std::is_integral_v<Value>) {
      const bool fits = add_bounded(abs_sum_, magnitude_u64(v), integer_energy_limit) && !saturated_;
      saturated_ = !fits;
      bound_ = static_cast<double>(abs_sum_);
      return fits;
    } else {
      magnitudes_.add(abs_double(v));
      bound_ = magnitudes_.value();
      return is_finite(bound_) && bound_ <= float_energy_limit;
    }
  }

  // Replaces a term of value old_value by new_value; when the range would pass its limit,
  // returns false and changes nothing.
  constexpr bool replace(energy_type old_value, energy_type new_value) noexcept {
    EnergyRange next = *this;
    if constexpr (std::is_integral_v<Value>) {
      next.abs_sum_ -= magnitude_u64(old_value);
    } else {
      next.magnitudes_.add(-abs_double(old_value));
    }
    if (!next.add(new_value)) return false;
    *this = next;
    return true;
  }

  constexpr double bound() const noexcept { return bound_; }

 private:
  std::uint64_t abs_sum_ = 0;
  bool saturated_ = false;
  MagnitudeSum magnitudes_{};
  double bound_ = 0;
};

// The refusal of an edit (or an offset change) that would pass the range limit.
template <class Value>
constexpr const char* range_message(bool offset) noexcept {
  if constexpr (std::is_integral_v<Value>) {
    return offset ? "offset would let the energy range (|offset| + sum of |coefficients|) pass 2^61 - 1 and overflow "
                    "the 64-bit accumulator"
                  : "edit would let the energy range (|offset| + sum of |coefficients|) pass 2^61 - 1 and overflow the "
                    "64-bit accumulator";
  } else {
    return offset ? "offset would let the energy range exceed DBL_MAX/4 (flip deltas could overflow)"
                  : "edit would let the energy range exceed DBL_MAX/4 (flip deltas could overflow)";
  }
}

// The refusal of a model (built, or viewed over caller arrays) whose range passes the limit.
template <class Value>
constexpr const char* build_range_message() noexcept {
  if constexpr (std::is_integral_v<Value>) {
    return "the energy range (|offset| + sum of |coefficients|) exceeds 2^61 - 1 and could overflow the 64-bit "
           "accumulator; scale the coefficients down or use a floating Value";
  } else {
    return "the energy range (|offset| + sum of |coefficients|) exceeds DBL_MAX/4, so flip deltas could overflow to "
           "infinity; scale the coefficients down";
  }
}

template <class Value>
constexpr bool is_finite(Value v) noexcept {
  if constexpr (std::is_floating_point_v<Value>) {
    // v - v is NaN for both NaN and infinity; no <cmath> needed.
    return (v - v) == (v - v);
  } else {
    return true;
  }
}

}  // namespace detail
}  // namespace spinwright

#endif  // SPINWRIGHT_MODEL_DETAIL_ENERGY_RANGE_HPP
