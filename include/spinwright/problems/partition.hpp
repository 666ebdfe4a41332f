// spinwright — number partitioning as an Ising model.
// Numbers n_1..n_N are split in two by spins s_i; H = A (sum_i n_i s_i)^2 is A times the
// squared difference of the two subset sums. Expanded (s_i^2 = 1):
//   J_ij = 2 A n_i n_j,  h = 0,  c = A sum_i n_i^2,
// so H = 0 exactly for a perfect partition and H_min = A (min residue)^2 in general.
// Source: A. Lucas, "Ising formulations of many NP problems", Front. Phys. 2:5 (2014),
// doi:10.3389/fphy.2014.00005, section 2 "Partitioning problems".
#ifndef SPINWRIGHT_PROBLEMS_PARTITION_HPP
#define SPINWRIGHT_PROBLEMS_PARTITION_HPP

#include "../config.hpp"
#include "../model/detail/energy_range.hpp"
#include "../model/builder.hpp"
#include "../model/form.hpp"
#include "../model/sparse_model.hpp"
#include "../status.hpp"
#include "graph.hpp"

#include <cstddef>      // std::size_t
#include <cstdint>      // std::uint64_t, std::int8_t, std::uint8_t
#include <type_traits>  // std::is_integral_v
#include <utility>      // std::move
#include <vector>       // std::vector

namespace spinwright {

/// What a split of the numbers is worth: the two subset sums and their absolute difference.
template <class Energy>
struct PartitionReport {
  bool valid = false;    // one side (0/1) per number
  Energy sum_zero{0};    // sum of the numbers on side 0
  Energy sum_one{0};     // sum of the numbers on side 1
  Energy difference{0};  // |sum_zero - sum_one|, the residue
};

template <class Value, class Index = std::uint32_t>
class PartitionProblem {
 public:
  using model_type = IsingModel<Value, Index>;
  using energy_type = energy_t<Value>;

  PartitionProblem() = default;

  /// Encode `numbers` with scale A = `weight` > 0. Errors: invalid_argument (weight <= 0),
  /// value_out_of_range / energy_overflow when 2 A n_i n_j or the energy range does not fit.
  static Result<PartitionProblem> encode(const std::vector<Value>& numbers, Value weight = Value{1}) {
    if (!(weight > Value{0}) || !detail::is_finite(weight)) {
      return Status::error(StatusCode::invalid_argument, "partition scale A must be positive and finite");
    }
    IsingBuilder<Value, Index> b(numbers.size());
    energy_type offset{0};
    for (std::size_t i = 0; i < numbers.size(); ++i) {
      const auto ni = static_cast<energy_type>(numbers[i]);
      energy_type sq{};
      if (!mul_energy(ni, ni, sq) || !mul_energy(sq, static_cast<energy_type>(weight), sq) ||
          !detail::checked_add(offset, sq)) {
        return Status::error(StatusCode::energy_overflow, "A sum n_i^2 overflows the accumulator")
            .at_term(no_term, i, i);
      }
      for (std::size_t j = i + 1; j < numbers.size(); ++j) {
        energy_type c{};
        if (!mul_energy(ni, static_cast<energy_type>(numbers[j]), c) ||
            !mul_energy(c, 2 * static_cast<energy_type>(weight), c) || !detail::fits_value<Value>(c)) {
          return Status::error(StatusCode::value_out_of_range, "coupling 2 A n_i n_j does not fit the value type")
              .at_term(no_term, i, j);
        }
        b.add_coupling(i, j, static_cast<Value>(c));
      }
    }
    b.add_offset(offset);
    auto m = b.build();
    if (!m) return m.status();
    PartitionProblem p;
    p.model_ = std::move(*m);
    p.numbers_ = numbers;
    p.weight_ = weight;
    return p;
  }

  const model_type& model() const noexcept { return model_; }
  const std::vector<Value>& numbers() const noexcept { return numbers_; }
  Value weight() const noexcept { return weight_; }

  /// The two subsets of a spin state (spin +1 is side 0).
  Bipartition decode(const std::int8_t* spins) const {
    return Bipartition::from_sides(detail::bits_of_spins(spins, numbers_.size()));
  }
  Bipartition decode_bits(const std::uint8_t* bits) const {
    return Bipartition::from_sides(std::vector<std::uint8_t>(bits, bits + numbers_.size()));
  }

  /// Subset sums and their difference, computed from the numbers.
  PartitionReport<energy_type> check(const Bipartition& sides) const {
    PartitionReport<energy_type> r;
    r.valid = sides.side.size() == numbers_.size();
    if (!r.valid) return r;
    for (std::size_t i = 0; i < numbers_.size(); ++i) {
      (sides.side[i] != 0 ? r.sum_one : r.sum_zero) += static_cast<energy_type>(numbers_[i]);
    }
    r.difference = r.sum_zero >= r.sum_one ? r.sum_zero - r.sum_one : r.sum_one - r.sum_zero;
    return r;
  }

 private:
  static bool mul_energy(energy_type a, energy_type b, energy_type& out) noexcept {
    if constexpr (std::is_integral_v<Value>) {
      if (a != 0 && b != 0) {
        const std::uint64_t ma = detail::magnitude_u64(a);
        const std::uint64_t mb = detail::magnitude_u64(b);
        if (ma > integer_energy_limit / mb) return false;
      }
      out = a * b;
      return true;
    } else {
      out = a * b;
      return detail::is_finite(out);
    }
  }

  model_type model_{};
  std::vector<Value> numbers_;
  Value weight_{1};
};

}  // namespace spinwright

#endif  // SPINWRIGHT_PROBLEMS_PARTITION_HPP
