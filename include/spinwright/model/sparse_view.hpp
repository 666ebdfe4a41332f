// spinwright — SparseModelView: compressed rows of a sparse Ising or QUBO model over arrays the
// caller owns (static storage, flash, any buffer), and the read interface every sparse model
// shares: SparseModel (sparse_model.hpp) is this view over arrays of its own. Never allocates
// (but energy_of_bits); coefficients cannot be edited through a view. Layout: docs/file-formats.md.
#ifndef SPINWRIGHT_MODEL_SPARSE_VIEW_HPP
#define SPINWRIGHT_MODEL_SPARSE_VIEW_HPP

#include "../config.hpp"
#include "../status.hpp"
#include "detail/energy_range.hpp"
#include "form.hpp"
#include "span.hpp"

#include <cstddef>      // std::size_t
#include <cstdint>      // std::int8_t, std::uint64_t
#include <type_traits>  // std::enable_if_t

#if !SPINWRIGHT_NO_HEAP
#include <vector>  // std::vector (energy_of_bits only)
#endif

namespace spinwright {

// Figures a user looks at before choosing a kernel.
struct ModelSummary {
  std::size_t num_spins = 0;
  std::size_t num_pairs = 0;
  std::size_t num_site_terms = 0;  // non-zero fields (Ising) or unary terms (QUBO)
  std::size_t min_degree = 0;
  std::size_t max_degree = 0;
  double largest_magnitude = 0;   // over non-zero linear and pair coefficients
  double smallest_magnitude = 0;  // over non-zero linear and pair coefficients (0 if none)
};

// The arrays are the compressed rows: `row_starts` (N + 1 entries), `neighbours` and `values`
// (row_starts[N] entries; both directions of every pair, each row sorted by neighbour), the N
// site terms (fields or unary terms) and the offset. over() checks all of it -- sorted rows,
// symmetric storage, no self-pairs, finite values, the energy bound -- and refuses with a
// Status naming the first bad entry.
template <Form F, class Value, class Index = std::uint32_t>
class SparseModelView {
  static_assert(is_value_type_v<Value>, "Value must be double, float, int32_t or int64_t");
  static_assert(is_index_type_v<Index>, "Index must be uint16_t or uint32_t");

 public:
  using value_type = Value;
  using index_type = Index;
  using energy_type = energy_t<Value>;
  static constexpr Form form = F;
  static constexpr bool is_dense = false;
  static constexpr std::size_t npos = ~std::size_t{0};

  SparseModelView() = default;

  static Result<SparseModelView> over(std::size_t n, const Value* linear, const std::size_t* row_starts,
                                      const Index* neighbours, const Value* values, energy_type offset = 0) noexcept {
    if (n > max_spins_v<Index>)  // the builders' limit too: uint16_t 65535 spins, uint32_t 4294967295
      return Status::error(StatusCode::index_out_of_range,
                           "more spins than the index type can address (uint16_t: 65535, uint32_t: 4294967295)");
    if (row_starts == nullptr || (n > 0 && linear == nullptr)) {
      return Status::error(StatusCode::invalid_argument, "missing array (site terms or row starts)");
    }
    if (row_starts[0] != 0) return Status::error(StatusCode::invalid_argument, "row_starts[0] must be 0");
    if (!detail::is_finite(offset)) return Status::error(StatusCode::non_finite_value, "offset is NaN or infinite");
    SparseModelView v;
    v.n_ = n;
    v.linear_ = linear;
    v.row_ = row_starts;
    v.neighbours_ = neighbours;
    v.values_ = values;
    v.offset_ = offset;
    detail::EnergyRange<Value> range;
    bool fits = range.add(offset);
    for (std::size_t i = 0; i < n; ++i) {
      if (row_starts[i + 1] < row_starts[i]) {
        return Status::error(StatusCode::invalid_argument, "row_starts must not decrease").at_term(no_term, i, i);
      }
      if (!detail::is_finite(linear[i])) {
        return Status::error(StatusCode::non_finite_value, "site term is NaN or infinite").at_term(no_term, i, i);
      }
      fits = range.add(linear[i]) && fits;
      for (std::size_t k = row_starts[i]; k < row_starts[i + 1]; ++k) {
        const Index j = neighbours[k];
        if (j >= n)
          return Status::error(StatusCode::index_out_of_range, "neighbour beyond the model").at_term(no_term, i, j);
        if (j == i)
          return Status::error(StatusCode::invalid_argument,
                               "self-pair in a row (fold it into the site term or offset)")
              .at_term(no_term, i, j);
        if (k > row_starts[i] && neighbours[k - 1] >= j) {
          return Status::error(StatusCode::invalid_argument, "row not sorted by neighbour, or a neighbour repeated")
              .at_term(no_term, i, j);
        }
        if (!detail::is_finite(values[k])) {
          return Status::error(StatusCode::non_finite_value, "pair value is NaN or infinite").at_term(no_term, i, j);
        }
        if (values[k] == Value{0})
          return Status::error(StatusCode::invalid_argument, "stored pair value is zero").at_term(no_term, i, j);
        const std::size_t back = v.find(j, static_cast<Index>(i));
        if (back == npos || values[back] != values[k]) {
          return Status::error(StatusCode::invalid_argument, "pair not stored symmetrically (j, i) with the same value")
              .at_term(no_term, i, j);
        }
        if (j > i) fits = range.add(values[k]) && fits;
      }
    }
    if (!fits) return Status::error(StatusCode::energy_overflow, detail::build_range_message<Value>());
    v.bound_ = range.bound();
    return v;
  }

  std::size_t num_spins() const noexcept { return n_; }
  std::size_t size() const noexcept { return n_; }
  std::size_t num_pairs() const noexcept { return row_ == nullptr ? 0 : row_[n_] / 2; }
  energy_type offset() const noexcept { return offset_; }

  // h_i for an Ising model, Q_ii for a QUBO model.
  Value site_term(Index i) const noexcept {
    SPINWRIGHT_ASSERT(i < num_spins(), "spin index out of range");
    return linear_[i];
  }
  template <Form G = F, std::enable_if_t<G == Form::ising, int> = 0>
  Value field(Index i) const noexcept {
    return site_term(i);
  }
  template <Form G = F, std::enable_if_t<G == Form::qubo, int> = 0>
  Value unary(Index i) const noexcept {
    return site_term(i);
  }

  std::size_t degree(Index i) const noexcept {
    SPINWRIGHT_ASSERT(i < n_, "spin index beyond the model (degree)");
    return row_[i + 1] - row_[i];
  }
  Span<Index> neighbours(Index i) const noexcept { return {neighbours_ + row_[i], degree(i)}; }
  Span<Value> row_values(Index i) const noexcept { return {values_ + row_[i], degree(i)}; }

  // The arrays the view reads (row starts: N + 1 entries; neighbours and values: the last row start),
  // for loops that keep them in registers (a kernel's flip, whose int8_t spin writes would
  // otherwise make the compiler reload every pointer of the view after each write).
  const std::size_t* row_start_data() const noexcept { return row_; }
  const Index* neighbour_data() const noexcept { return neighbours_; }
  const Value* value_data() const noexcept { return values_; }

  // Calls f(j, value) for every neighbour j of i, in increasing j.
  template <class Fn>
  SPINWRIGHT_HOT_INLINE void for_each_neighbour(Index i, Fn&& f) const {
    SPINWRIGHT_ASSERT(i < n_, "spin index beyond the model (for_each_neighbour)");
    const std::size_t end = row_[i + 1];
    for (std::size_t k = row_[i]; k < end; ++k) f(neighbours_[k], values_[k]);
  }

  // Position of pair (i, j) in row i, or npos when the model has no such pair. O(log degree).
  std::size_t find(Index i, Index j) const noexcept {
    SPINWRIGHT_ASSERT(i < n_ && j < n_, "spin index beyond the model (find / pair)");
    std::size_t lo = row_[i];
    std::size_t hi = row_[i + 1];
    while (lo < hi) {
      const std::size_t mid = lo + (hi - lo) / 2;
      if (neighbours_[mid] < j) {
        lo = mid + 1;
      } else {
        hi = mid;
      }
    }
    return (lo < row_[i + 1] && neighbours_[lo] == j) ? lo : npos;
  }

  // J_ij (Ising) or Q_ij (QUBO); 0 when the pair is absent.
  Value pair(Index i, Index j) const noexcept {
    const std::size_t k = find(i, j);
    return k == npos ? Value{0} : values_[k];
  }
  template <Form G = F, std::enable_if_t<G == Form::ising, int> = 0>
  Value coupling(Index i, Index j) const noexcept {
    return pair(i, j);
  }

  // Energy of a spin assignment (+1/-1 per spin; for QUBO, x = (1 - s) / 2), offset included.
  energy_type energy(const std::int8_t* spins) const noexcept {
    energy_type e = offset_;
    const std::size_t n = num_spins();
    for (std::size_t i = 0; i < n; ++i) {
      const auto ii = static_cast<Index>(i);
      if constexpr (F == Form::ising) {
        energy_type local = 0;
        const std::size_t end = row_[i + 1];
        for (std::size_t k = row_[i]; k < end; ++k) {
          if (neighbours_[k] > ii) local += static_cast<energy_type>(values_[k]) * spins[neighbours_[k]];
        }
        e += spins[i] * (static_cast<energy_type>(linear_[i]) + local);
      } else {
        if (spins[i] > 0) continue;  // x_i = 0
        energy_type local = static_cast<energy_type>(linear_[i]);
        const std::size_t end = row_[i + 1];
        for (std::size_t k = row_[i]; k < end; ++k) {
          if (neighbours_[k] > ii && spins[neighbours_[k]] < 0) local += static_cast<energy_type>(values_[k]);
        }
        e += local;
      }
    }
    return e;
  }

  // Energy of a bit assignment (0/1 per variable), for QUBO users who think in bits.
#if !SPINWRIGHT_NO_HEAP
  template <Form G = F, std::enable_if_t<G == Form::qubo, int> = 0>
  energy_type energy_of_bits(const std::uint8_t* bits) const {
    std::vector<std::int8_t> spins(num_spins());
    for (std::size_t i = 0; i < spins.size(); ++i) spins[i] = bits[i] ? -1 : 1;
    return energy(spins.data());
  }
#endif

  ModelSummary summary() const noexcept {
    ModelSummary s;
    s.num_spins = num_spins();
    s.num_pairs = num_pairs();
    bool first = true;
    auto see = [&](Value v) {
      if (v == Value{0}) return;
      const double a = detail::abs_double(v);
      if (first || a > s.largest_magnitude) s.largest_magnitude = a;
      if (first || a < s.smallest_magnitude) s.smallest_magnitude = a;
      first = false;
    };
    for (std::size_t i = 0; i < num_spins(); ++i) {
      if (linear_[i] != Value{0}) ++s.num_site_terms;
      see(linear_[i]);
      const std::size_t d = degree(static_cast<Index>(i));
      if (i == 0 || d < s.min_degree) s.min_degree = d;
      if (d > s.max_degree) s.max_degree = d;
    }
    for (std::size_t k = 0; k < row_[n_]; ++k) see(values_[k]);
    return s;
  }

  // Bound on |E| and on every local field: |c| + sum |site terms| + sum_{i<j} |pair|.
  // For integer models this never exceeds integer_energy_limit (enforced by build and edits).
  double energy_bound() const noexcept { return bound_; }

 protected:
  // The arrays of a model that owns them (SparseModel).
  void point_at(std::size_t n, const Value* linear, const std::size_t* row_starts, const Index* neighbours,
                const Value* values) noexcept {
    n_ = n;
    linear_ = linear;
    row_ = row_starts;
    neighbours_ = neighbours;
    values_ = values;
  }

  std::size_t n_ = 0;
  const Value* linear_ = nullptr;
  const std::size_t* row_ = nullptr;
  const Index* neighbours_ = nullptr;
  const Value* values_ = nullptr;
  energy_type offset_{0};
  double bound_ = 0;
};

template <class Value, class Index = std::uint32_t>
using IsingModelView = SparseModelView<Form::ising, Value, Index>;
template <class Value, class Index = std::uint32_t>
using QuboModelView = SparseModelView<Form::qubo, Value, Index>;

}  // namespace spinwright

#endif  // SPINWRIGHT_MODEL_SPARSE_VIEW_HPP
