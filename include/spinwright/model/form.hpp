// spinwright — the two forms of a model (Ising, QUBO), the value and index types a model may
// have, the accumulator type for each value type, and the limits every model is held to.
#ifndef SPINWRIGHT_MODEL_FORM_HPP
#define SPINWRIGHT_MODEL_FORM_HPP

#include "../config.hpp"

#include <cstddef>      // std::size_t
#include <cstdint>      // std::int64_t, std::uint16_t, std::uint32_t
#include <limits>       // std::numeric_limits
#include <type_traits>  // std::is_integral_v, std::conditional_t

namespace spinwright {

// Ising:  E(s) = c + sum_i h_i s_i + sum_{i<j} J_ij s_i s_j,  s_i in {-1,+1}
// QUBO:   E(x) = c + sum_i Q_ii x_i + sum_{i<j} Q_ij x_i x_j,  x_i in {0,1}
// Spin +1 is bit 0 and spin -1 is bit 1: x = (1 - s) / 2.
enum class Form : std::uint8_t { ising, qubo };

template <class Value>
inline constexpr bool is_value_type_v = std::is_same_v<Value, double> || std::is_same_v<Value, float> ||
                                        std::is_same_v<Value, std::int32_t> || std::is_same_v<Value, std::int64_t>;

template <class Index>
inline constexpr bool is_index_type_v = std::is_same_v<Index, std::uint16_t> || std::is_same_v<Index, std::uint32_t>;

// Energies, local fields and offsets accumulate in a wide type: int64_t for integer models,
// double for floating ones.
template <class Value>
using energy_t = std::conditional_t<std::is_integral_v<Value>, std::int64_t, double>;

// Integer models are refused when c + sum |h| + sum |J| (the bound on |E| and on every
// local field) exceeds this limit; the margin of 4 keeps every flip delta
// (at most 2 * |local field| + ...) and every edit representable.
inline constexpr std::uint64_t integer_energy_limit =
    static_cast<std::uint64_t>(std::numeric_limits<std::int64_t>::max()) / 4;

// Floating models are refused when the same bound exceeds this limit: an Ising flip delta is
// 2 * |local field|, so a bound up to DBL_MAX would let a delta or an energy reach infinity.
inline constexpr double float_energy_limit = std::numeric_limits<double>::max() / 4;

// The largest number of spins an index type can address: index values 0 .. max-1, so that
// max() itself stays free as a sentinel.
template <class Index>
inline constexpr std::uint64_t max_spins_v = std::numeric_limits<Index>::max();

}  // namespace spinwright

#endif  // SPINWRIGHT_MODEL_FORM_HPP
