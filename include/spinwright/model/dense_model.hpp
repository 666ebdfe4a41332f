// spinwright — dense models for fully connected problems: DenseIsingModel, DenseQuboModel.
// A full symmetric N x N matrix with a zero diagonal, stored row-major, plus the site terms
// and the offset. Every pair exists, so set_pair() can write any i != j.
#ifndef SPINWRIGHT_MODEL_DENSE_MODEL_HPP
#define SPINWRIGHT_MODEL_DENSE_MODEL_HPP

#include "../config.hpp"
#include "detail/energy_range.hpp"
#include "../status.hpp"
#include "form.hpp"
#include "sparse_model.hpp"

#include <cstddef>      // std::size_t
#include <cstdint>      // std::uint32_t
#include <type_traits>  // std::enable_if_t
#include <vector>       // std::vector

namespace spinwright {

// Dense models are limited to this many spins (a 16384 x 16384 double matrix is 2 GiB).
inline constexpr std::size_t dense_max_spins = 16384;

template <Form F, class Value>
class DenseModel {
  static_assert(is_value_type_v<Value>, "Value must be double, float, int32_t or int64_t");

 public:
  using value_type = Value;
  using index_type = std::uint32_t;
  using energy_type = energy_t<Value>;
  static constexpr Form form = F;
  static constexpr bool is_dense = true;

  DenseModel() = default;

  // An all-zero model of n spins, or size_limit beyond dense_max_spins.
  static Result<DenseModel> zeros(std::size_t n) {
    if (n > dense_max_spins) {
      return Status::error(StatusCode::size_limit, "dense models are limited to 16384 spins");
    }
    DenseModel m;
    m.n_ = n;
    m.linear_.assign(n, Value{0});
    m.matrix_.assign(n * n, Value{0});
    return m;
  }

  // The dense copy of a sparse model of the same form.
  template <class Index>
  static Result<DenseModel> from(const SparseModel<F, Value, Index>& sparse) {
    auto made = zeros(sparse.num_spins());
    if (!made) return made.status();
    DenseModel& m = made.value();
    for (std::size_t i = 0; i < m.n_; ++i) {
      m.linear_[i] = sparse.site_term(static_cast<Index>(i));
      sparse.for_each_neighbour(static_cast<Index>(i), [&](Index j, Value v) { m.matrix_[i * m.n_ + j] = v; });
    }
    m.offset_ = sparse.offset();
    // The same range, summed anew (a sparse model's range is within its limit, so this fits).
    m.range_.add(m.offset_);
    for (std::size_t i = 0; i < m.n_; ++i) {
      m.range_.add(m.linear_[i]);
      for (std::size_t j = i + 1; j < m.n_; ++j) m.range_.add(m.matrix_[i * m.n_ + j]);
    }
    return made;
  }

  std::size_t num_spins() const noexcept { return n_; }
  std::size_t size() const noexcept { return n_; }
  std::size_t num_pairs() const noexcept {
    std::size_t count = 0;
    for (std::size_t i = 0; i < n_; ++i)
      for (std::size_t j = i + 1; j < n_; ++j) count += matrix_[i * n_ + j] != Value{0};
    return count;
  }
  energy_type offset() const noexcept { return offset_; }
  Value site_term(index_type i) const noexcept { return linear_[i]; }
  template <Form G = F, std::enable_if_t<G == Form::ising, int> = 0>
  Value field(index_type i) const noexcept {
    return linear_[i];
  }
  template <Form G = F, std::enable_if_t<G == Form::qubo, int> = 0>
  Value unary(index_type i) const noexcept {
    return linear_[i];
  }
  Value pair(index_type i, index_type j) const noexcept { return matrix_[static_cast<std::size_t>(i) * n_ + j]; }
  template <Form G = F, std::enable_if_t<G == Form::ising, int> = 0>
  Value coupling(index_type i, index_type j) const noexcept {
    return pair(i, j);
  }
  std::size_t degree(index_type) const noexcept { return n_ == 0 ? 0 : n_ - 1; }

  // Row i of the matrix (entry i is the zero diagonal).
  const Value* row(index_type i) const noexcept { return matrix_.data() + static_cast<std::size_t>(i) * n_; }

  // Calls f(j, value) for every j, including j == i whose value is the zero diagonal.
  template <class Fn>
  void for_each_neighbour(index_type i, Fn&& f) const {
    const Value* r = row(i);
    for (std::size_t j = 0; j < n_; ++j) f(static_cast<index_type>(j), r[j]);
  }

  energy_type energy(const std::int8_t* spins) const noexcept {
    energy_type e = offset_;
    for (std::size_t i = 0; i < n_; ++i) {
      const Value* r = row(static_cast<index_type>(i));
      if constexpr (F == Form::ising) {
        energy_type local = 0;
        for (std::size_t j = i + 1; j < n_; ++j) local += static_cast<energy_type>(r[j]) * spins[j];
        e += spins[i] * (static_cast<energy_type>(linear_[i]) + local);
      } else {
        if (spins[i] > 0) continue;
        energy_type local = static_cast<energy_type>(linear_[i]);
        for (std::size_t j = i + 1; j < n_; ++j)
          if (spins[j] < 0) local += static_cast<energy_type>(r[j]);
        e += local;
      }
    }
    return e;
  }

  ModelSummary summary() const noexcept {
    ModelSummary s;
    s.num_spins = n_;
    bool first = true;
    auto see = [&](Value v) {
      if (v == Value{0}) return;
      const double a = detail::abs_double(v);
      if (first || a > s.largest_magnitude) s.largest_magnitude = a;
      if (first || a < s.smallest_magnitude) s.smallest_magnitude = a;
      first = false;
    };
    s.min_degree = n_;
    for (std::size_t i = 0; i < n_; ++i) {
      if (linear_[i] != Value{0}) ++s.num_site_terms;
      see(linear_[i]);
      std::size_t d = 0;
      for (std::size_t j = 0; j < n_; ++j) {
        if (j == i || matrix_[i * n_ + j] == Value{0}) continue;
        ++d;
        if (j > i) {
          ++s.num_pairs;
          see(matrix_[i * n_ + j]);
        }
      }
      if (d < s.min_degree) s.min_degree = d;
      if (d > s.max_degree) s.max_degree = d;
    }
    if (n_ == 0) s.min_degree = 0;
    return s;
  }

  double energy_bound() const noexcept { return range_.bound(); }

  Status set_site_term(index_type i, Value v) noexcept {
    if (i >= n_)
      return Status::error(StatusCode::index_out_of_range,
                           "edit of a site term at an index >= num_spins() (valid: 0 .. num_spins() - 1)")
          .at_term(no_term, i, i);
    if (!detail::is_finite(v))
      return Status::error(StatusCode::non_finite_value,
                           "edited value is NaN or infinite; only finite values are allowed")
          .at_term(no_term, i, i);
    const Status st = rebound(linear_[i], v);
    if (!st) return Status(st).at_term(no_term, i, i);
    linear_[i] = v;
    return Status::success();
  }

  Status set_pair(index_type i, index_type j, Value v) noexcept {
    if (i >= n_ || j >= n_)
      return Status::error(StatusCode::index_out_of_range,
                           "edit of a pair with an index >= num_spins() (valid: 0 .. num_spins() - 1)")
          .at_term(no_term, i, j);
    if (i == j)
      return Status::error(StatusCode::invalid_argument, "a pair needs two different indices").at_term(no_term, i, j);
    if (!detail::is_finite(v))
      return Status::error(StatusCode::non_finite_value,
                           "edited value is NaN or infinite; only finite values are allowed")
          .at_term(no_term, i, j);
    const Status st = rebound(matrix_[static_cast<std::size_t>(i) * n_ + j], v);
    if (!st) return Status(st).at_term(no_term, i, j);
    matrix_[static_cast<std::size_t>(i) * n_ + j] = v;
    matrix_[static_cast<std::size_t>(j) * n_ + i] = v;
    return Status::success();
  }

  Status set_offset(energy_type c) noexcept {
    if (!detail::is_finite(c))
      return Status::error(StatusCode::non_finite_value, "offset is NaN or infinite; only finite values are allowed");
    if (!range_.replace(offset_, c))
      return Status::error(StatusCode::energy_overflow, detail::range_message<Value>(true));
    offset_ = c;
    return Status::success();
  }

 private:
  Status rebound(Value old_value, Value new_value) noexcept {
    if (!range_.replace(static_cast<energy_type>(old_value), static_cast<energy_type>(new_value))) {
      return Status::error(StatusCode::energy_overflow, detail::range_message<Value>(false));
    }
    return Status::success();
  }

  std::size_t n_ = 0;
  std::vector<Value> linear_;
  std::vector<Value> matrix_;
  energy_type offset_{0};
  detail::EnergyRange<Value> range_{};  // |c| + sum |linear| + sum |pair|
};

template <class Value>
using DenseIsingModel = DenseModel<Form::ising, Value>;
template <class Value>
using DenseQuboModel = DenseModel<Form::qubo, Value>;

}  // namespace spinwright

#endif  // SPINWRIGHT_MODEL_DENSE_MODEL_HPP
