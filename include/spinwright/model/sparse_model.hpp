// spinwright — immutable-structure sparse models: IsingModel and QuboModel, a SparseModelView
// over compressed rows of their own (both directions of every pair stored, rows sorted).
// Coefficients of existing terms can be edited in place (set_site_term / set_pair / set_offset);
// the sparsity pattern cannot change after build().
#ifndef SPINWRIGHT_MODEL_SPARSE_MODEL_HPP
#define SPINWRIGHT_MODEL_SPARSE_MODEL_HPP

#include "../config.hpp"
#include "../status.hpp"
#include "detail/energy_range.hpp"
#include "form.hpp"
#include "sparse_view.hpp"

#include <cstddef>  // std::size_t
#include <utility>  // std::move
#include <vector>   // std::vector (models own their storage)

namespace spinwright {

namespace detail {
struct ModelAccess;
}

template <Form F, class Value, class Index = std::uint32_t>
class SparseModel : public SparseModelView<F, Value, Index> {
  using view_type = SparseModelView<F, Value, Index>;
  using view_type::bound_;
  using view_type::offset_;

 public:
  using typename view_type::energy_type;
  using view_type::find;
  using view_type::npos;
  using view_type::num_spins;

  SparseModel() { repoint(); }
  SparseModel(const SparseModel& o)
      : view_type(o),
        linear_vec_(o.linear_vec_),
        row_vec_(o.row_vec_),
        neighbours_vec_(o.neighbours_vec_),
        values_vec_(o.values_vec_),
        range_(o.range_) {
    repoint();
  }
  SparseModel(SparseModel&& o) noexcept
      : view_type(o),
        linear_vec_(std::move(o.linear_vec_)),
        row_vec_(std::move(o.row_vec_)),
        neighbours_vec_(std::move(o.neighbours_vec_)),
        values_vec_(std::move(o.values_vec_)),
        range_(o.range_) {
    repoint();
    o.row_vec_.assign(1, 0);
    o.repoint();
  }
  SparseModel& operator=(const SparseModel& o) {
    if (this != &o) {
      SparseModel copy(o);
      *this = std::move(copy);
    }
    return *this;
  }
  SparseModel& operator=(SparseModel&& o) noexcept {
    if (this != &o) {
      static_cast<view_type&>(*this) = o;
      linear_vec_ = std::move(o.linear_vec_);
      row_vec_ = std::move(o.row_vec_);
      neighbours_vec_ = std::move(o.neighbours_vec_);
      values_vec_ = std::move(o.values_vec_);
      range_ = o.range_;
      repoint();
      o.row_vec_.assign(1, 0);
      o.repoint();
    }
    return *this;
  }
  ~SparseModel() = default;

  // In-place edits of existing terms; the pattern never changes (a pair set to 0 stays stored,
  // and can be given a value again). Use the free functions in
  // state/spin_state.hpp to keep a state's local fields exact through an edit.
  Status set_site_term(Index i, Value v) noexcept {
    if (i >= num_spins()) {
      return Status::error(StatusCode::index_out_of_range,
                           "edit of a site term at an index >= num_spins() (valid: 0 .. num_spins() - 1)")
          .at_term(no_term, i, i);
    }
    if (!detail::is_finite(v)) {
      return Status::error(StatusCode::non_finite_value,
                           "edited value is NaN or infinite; only finite values are allowed")
          .at_term(no_term, i, i);
    }
    const Status st = rebound(linear_vec_[i], v);
    if (!st) return Status(st).at_term(no_term, i, i);
    linear_vec_[i] = v;
    bound_ = range_.bound();
    return Status::success();
  }

  Status set_pair(Index i, Index j, Value v) noexcept {
    if (i >= num_spins() || j >= num_spins()) {
      return Status::error(StatusCode::index_out_of_range,
                           "edit of a pair with an index >= num_spins() (valid: 0 .. num_spins() - 1)")
          .at_term(no_term, i, j);
    }
    const std::size_t kij = find(i, j);
    if (kij == npos) {
      return Status::error(StatusCode::missing_term,
                           "edit of a pair the model does not have (the pattern is fixed at build)")
          .at_term(no_term, i, j);
    }
    if (!detail::is_finite(v)) {
      return Status::error(StatusCode::non_finite_value,
                           "edited value is NaN or infinite; only finite values are allowed")
          .at_term(no_term, i, j);
    }
    const Status st = rebound(values_vec_[kij], v);
    if (!st) return Status(st).at_term(no_term, i, j);
    values_vec_[kij] = v;
    values_vec_[find(j, i)] = v;
    bound_ = range_.bound();
    return Status::success();
  }

  Status set_offset(energy_type c) noexcept {
    if (!detail::is_finite(c))
      return Status::error(StatusCode::non_finite_value, "offset is NaN or infinite; only finite values are allowed");
    if (!range_.replace(offset_, c))
      return Status::error(StatusCode::energy_overflow, detail::range_message<Value>(true));
    offset_ = c;
    bound_ = range_.bound();
    return Status::success();
  }

  // Raw access for kernels and file writers.
  const std::vector<std::size_t>& row_starts() const noexcept { return row_vec_; }
  const std::vector<Index>& neighbour_array() const noexcept { return neighbours_vec_; }
  const std::vector<Value>& value_array() const noexcept { return values_vec_; }
  const std::vector<Value>& site_term_array() const noexcept { return linear_vec_; }

 private:
  friend struct detail::ModelAccess;

  Status rebound(Value old_value, Value new_value) noexcept {
    if (!range_.replace(static_cast<energy_type>(old_value), static_cast<energy_type>(new_value))) {
      return Status::error(StatusCode::energy_overflow, detail::range_message<Value>(false));
    }
    return Status::success();
  }

  // The view's pointers follow the vectors through copies and moves.
  void repoint() noexcept {
    this->point_at(linear_vec_.size(), linear_vec_.data(), row_vec_.data(), neighbours_vec_.data(), values_vec_.data());
  }

  std::vector<Value> linear_vec_;
  std::vector<std::size_t> row_vec_{0};
  std::vector<Index> neighbours_vec_;
  std::vector<Value> values_vec_;
  detail::EnergyRange<Value> range_{};  // |c| + sum |site terms| + sum |pair|
};

template <class Value, class Index = std::uint32_t>
using IsingModel = SparseModel<Form::ising, Value, Index>;
template <class Value, class Index = std::uint32_t>
using QuboModel = SparseModel<Form::qubo, Value, Index>;

namespace detail {
struct ModelAccess {
  template <Form F, class Value, class Index>
  static SparseModel<F, Value, Index> make(std::vector<Value> linear, std::vector<std::size_t> row,
                                           std::vector<Index> neighbours, std::vector<Value> values,
                                           energy_t<Value> offset, EnergyRange<Value> range) {
    SparseModel<F, Value, Index> m;
    m.linear_vec_ = std::move(linear);
    m.row_vec_ = std::move(row);
    m.neighbours_vec_ = std::move(neighbours);
    m.values_vec_ = std::move(values);
    m.offset_ = offset;
    m.range_ = range;
    m.bound_ = range.bound();
    m.repoint();
    return m;
  }
};
}  // namespace detail

/// A view of an existing model's arrays (valid while the model lives; edits show through).
template <Form F, class Value, class Index>
SparseModelView<F, Value, Index> view_of(const SparseModel<F, Value, Index>& m) noexcept {
  return m;
}

}  // namespace spinwright

#endif  // SPINWRIGHT_MODEL_SPARSE_MODEL_HPP
