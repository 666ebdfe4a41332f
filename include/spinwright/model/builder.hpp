// spinwright — IsingBuilder and QuboBuilder: accumulate terms, merge duplicates, fold
// self-pairs exactly, drop exact zeros, and validate, then build an immutable-structure model.
// What is refused and how errors name the term: docs/models.md ("Builders").
#ifndef SPINWRIGHT_MODEL_BUILDER_HPP
#define SPINWRIGHT_MODEL_BUILDER_HPP

#include "../config.hpp"
#include "detail/energy_range.hpp"
#include "../status.hpp"
#include "form.hpp"
#include "sparse_model.hpp"

#include <algorithm>    // std::stable_sort
#include <cstddef>      // std::size_t, std::ptrdiff_t
#include <cstdint>      // std::uint64_t
#include <limits>       // std::numeric_limits
#include <type_traits>  // std::is_integral_v
#include <vector>       // std::vector

namespace spinwright {
namespace detail {

template <class Energy>
constexpr bool checked_add(Energy& acc, Energy add) noexcept {
  if constexpr (std::is_integral_v<Energy>) {
    if ((add > 0 && acc > std::numeric_limits<Energy>::max() - add) ||
        (add < 0 && acc < std::numeric_limits<Energy>::min() - add)) {
      return false;
    }
    acc += add;
    return true;
  } else {
    acc += add;
    return is_finite(acc);
  }
}

template <class Value, class Energy>
constexpr bool fits_value(Energy v) noexcept {
  if constexpr (std::is_integral_v<Value>) {
    return v >= static_cast<Energy>(std::numeric_limits<Value>::min()) &&
           v <= static_cast<Energy>(std::numeric_limits<Value>::max());
  } else {
    return v >= -static_cast<double>(std::numeric_limits<Value>::max()) &&
           v <= static_cast<double>(std::numeric_limits<Value>::max());
  }
}

// A coefficient offered as any arithmetic type, converted to Value exactly (integer Value) or to
// the nearest (floating Value); `why` is set when it cannot be.
template <class Value, class Arg>
constexpr bool convert_coefficient(Arg a, Value& out, Status& why) noexcept {
  static_assert(std::is_arithmetic_v<Arg>, "a coefficient must be a number (an integer or floating type)");
  if constexpr (std::is_floating_point_v<Arg>) {
    if (!(a - a == 0)) {
      why =
          Status::error(StatusCode::non_finite_value, "coefficient is NaN or infinite; only finite values are allowed");
      return false;
    }
  }
  if constexpr (std::is_integral_v<Value>) {
    const char* range =
        "coefficient lies outside the integer value type (int32_t: -2147483648 .. 2147483647); use a "
        "wider Value (int64_t, double)";
    if constexpr (std::is_floating_point_v<Arg>) {
      // Value's range as doubles: min is minus a power of two (exact), and so is -(max + 1).
      const double lo = static_cast<double>(std::numeric_limits<Value>::min());
      const double d = static_cast<double>(a);
      if (!(d >= lo && d < -lo)) {
        why = Status::error(StatusCode::value_out_of_range, range);
        return false;
      }
      const Value v = static_cast<Value>(d);
      if (static_cast<double>(v) != d) {
        why = Status::error(StatusCode::value_out_of_range,
                            "coefficient has a fractional part, which an integer value type cannot hold; round it "
                            "yourself or use a floating Value (double)");
        return false;
      }
      out = v;
      return true;
    } else {
      bool fits = false;
      if constexpr (std::is_signed_v<Arg>) {
        fits = static_cast<std::int64_t>(a) >= static_cast<std::int64_t>(std::numeric_limits<Value>::min()) &&
               static_cast<std::int64_t>(a) <= static_cast<std::int64_t>(std::numeric_limits<Value>::max());
      } else {
        fits = static_cast<std::uint64_t>(a) <= static_cast<std::uint64_t>(std::numeric_limits<Value>::max());
      }
      if (!fits) {
        why = Status::error(StatusCode::value_out_of_range, range);
        return false;
      }
      out = static_cast<Value>(a);
      return true;
    }
  } else {
    if constexpr (std::is_floating_point_v<Arg> && sizeof(Arg) > sizeof(Value)) {
      const Arg m = static_cast<Arg>(std::numeric_limits<Value>::max());
      if (a > m || a < -m) {
        why = Status::error(StatusCode::value_out_of_range,
                            "coefficient lies beyond the floating value type's range; use a wider Value (double)");
        return false;
      }
    }
    out = static_cast<Value>(a);
    return true;
  }
}

// A spin index offered as any integer type: a negative one is kept apart (its two's complement
// in `value`) so that a refusal can say "negative".
struct IndexArg {
  std::uint64_t value = 0;
  bool negative = false;
};
template <class Arg>
constexpr IndexArg index_arg(Arg i) noexcept {
  static_assert(std::is_integral_v<Arg> && !std::is_same_v<Arg, bool>, "a spin index must be an integer");
  if constexpr (std::is_signed_v<Arg>) {
    if (i < 0) return {static_cast<std::uint64_t>(static_cast<std::int64_t>(i)), true};
  }
  return {static_cast<std::uint64_t>(i), false};
}

template <Form F, class Value, class Index>
class TermBuilder {
 public:
  using model_type = SparseModel<F, Value, Index>;
  using energy_type = energy_t<Value>;

  // Size grows to the largest index seen plus one.
  TermBuilder() = default;
  // Fixed size: indices >= num_spins are refused.
  explicit TermBuilder(std::uint64_t num_spins) : fixed_(true), n_(num_spins) {
    if (num_spins > max_spins_v<Index>) {
      fail(Status::error(StatusCode::index_out_of_range,
                         "declared size exceeds what the index type can address (uint16_t: 65535 spins, uint32_t: "
                         "4294967295); use a wider Index"));
    }
  }

  void reserve(std::size_t pair_terms) { pairs_.reserve(pair_terms); }

  // The first refusal so far (ok if none).
  const Status& status() const noexcept { return status_; }
  std::uint64_t num_terms() const noexcept { return terms_; }
  std::uint64_t num_spins() const noexcept { return n_; }

 protected:
  template <class Arg>
  void add_linear_term(IndexArg ia, Arg a) {
    const std::uint64_t t = terms_++;
    if (!status_.ok()) return;
    const std::uint64_t i = ia.value;
    Value v{};
    if (!check_index(t, ia, i, i) || !check_value(t, i, i, a, v)) return;
    if (v == Value{0}) return;
    linears_.push_back({static_cast<Index>(i), static_cast<Index>(i), v});
  }

  template <class Arg>
  void add_pair_term(IndexArg ia, IndexArg ja, Arg a) {
    const std::uint64_t t = terms_++;
    if (!status_.ok()) return;
    std::uint64_t i = ia.value;
    std::uint64_t j = ja.value;
    Value v{};
    if (!check_index(t, ia, i, j) || !check_index(t, ja, i, j) || !check_value(t, i, j, a, v)) return;
    if (v == Value{0}) return;
    if (i == j) {
      if constexpr (F == Form::ising) {
        if (!checked_add(offset_, static_cast<energy_type>(v))) {
          fail(Status::error(StatusCode::energy_overflow,
                             "the offsets summed so far overflow the accumulator (int64_t for integer values, double "
                             "otherwise); use smaller offsets")
                   .at_term(t, i, j));
        }
      } else {
        linears_.push_back({static_cast<Index>(i), static_cast<Index>(i), v});
      }
      return;
    }
    if (i > j) std::swap(i, j);
    pairs_.push_back({static_cast<Index>(i), static_cast<Index>(j), v});
  }

  template <class Arg>
  void add_offset_term(Arg a) {
    const std::uint64_t t = terms_++;
    if (!status_.ok()) return;
    energy_type c{};
    Status why;
    if (!convert_coefficient<energy_type>(a, c, why)) {
      fail(why.at_term(t, 0, 0));
      return;
    }
    if (!checked_add(offset_, c)) {
      fail(Status::error(StatusCode::energy_overflow,
                         "the offsets summed so far overflow the accumulator (int64_t for integer values, double "
                         "otherwise); use smaller offsets")
               .at_term(t, 0, 0));
    }
  }

  Result<model_type> build_model() const {
    if (!status_.ok()) return status_;
    const std::size_t n = static_cast<std::size_t>(n_);

    // Linear terms, merged in the wide type, then checked against the value type.
    std::vector<energy_type> lin(n, energy_type{0});
    for (const auto& term : linears_) {
      if (!checked_add(lin[term.i], static_cast<energy_type>(term.v))) {
        return Status::error(StatusCode::value_out_of_range,
                             "the site terms given for this spin sum beyond the accumulator (int64_t or double); use "
                             "smaller terms")
            .at_term(no_term, term.i, term.i);
      }
    }
    std::vector<Value> linear(n);
    for (std::size_t i = 0; i < n; ++i) {
      if (!fits_value<Value>(lin[i])) {
        return Status::error(StatusCode::value_out_of_range,
                             "the site terms given for this spin sum to a value outside the value type; use a wider "
                             "Value (int64_t, double) or smaller terms")
            .at_term(no_term, i, i);
      }
      linear[i] = static_cast<Value>(lin[i]);
    }

    // Pairs: sort by (i, j), merge duplicates in the wide type, drop exact zeros. In place: the
    // merged pair of group [k, e) goes to position kept <= k, already read.
    std::vector<Triple> merged = sorted_pairs(n);
    const std::vector<Triple>& sorted = merged;
    std::size_t kept = 0;
    for (std::size_t k = 0; k < sorted.size();) {
      std::size_t e = k;
      energy_type sum{0};
      while (e < sorted.size() && sorted[e].i == sorted[k].i && sorted[e].j == sorted[k].j) {
        if (!checked_add(sum, static_cast<energy_type>(sorted[e].v))) {
          return Status::error(
                     StatusCode::value_out_of_range,
                     "the terms given for this pair sum beyond the accumulator (int64_t or double); use smaller terms")
              .at_term(no_term, sorted[k].i, sorted[k].j);
        }
        ++e;
      }
      if (!fits_value<Value>(sum)) {
        return Status::error(StatusCode::value_out_of_range,
                             "the terms given for this pair sum to a value outside the value type; use a wider Value "
                             "(int64_t, double) or smaller terms")
            .at_term(no_term, sorted[k].i, sorted[k].j);
      }
      if (static_cast<Value>(sum) != Value{0}) merged[kept++] = {sorted[k].i, sorted[k].j, static_cast<Value>(sum)};
      k = e;
    }
    merged.resize(kept);

    // Energy range: |c| + sum |linear| + sum |pair|.
    EnergyRange<Value> range;
    bool fits = range.add(offset_);
    for (const Value v : linear) fits = range.add(v) && fits;
    for (const auto& p : merged) fits = range.add(p.v) && fits;
    if (!fits) return Status::error(StatusCode::energy_overflow, build_range_message<Value>());

    // Compressed rows, both directions; rows come out sorted because `merged` is sorted.
    std::vector<std::size_t> row(n + 1, 0);
    for (const auto& p : merged) {
      ++row[p.i + 1];
      ++row[p.j + 1];
    }
    for (std::size_t i = 0; i < n; ++i) row[i + 1] += row[i];
    std::vector<std::size_t> fill(row.begin(), row.end() - 1);
    std::vector<Index> nbr(merged.size() * 2);
    std::vector<Value> val(merged.size() * 2);
    // Row i receives, in order, first the pairs (k, i) with k < i, then (i, j) with j > i.
    // Pass 1: entries (p.j <- p.i), visiting pairs sorted by i, fill row p.j with p.i ascending.
    for (const auto& p : merged) {
      nbr[fill[p.j]] = p.i;
      val[fill[p.j]++] = p.v;
    }
    // Pass 2: entries (p.i <- p.j); in row i these all exceed every k < i of pass 1.
    for (const auto& p : merged) {
      nbr[fill[p.i]] = p.j;
      val[fill[p.i]++] = p.v;
    }
    return ModelAccess::make<F, Value, Index>(std::move(linear), std::move(row), std::move(nbr), std::move(val),
                                              offset_, range);
  }

 private:
  struct Triple {
    Index i;
    Index j;
    Value v;
  };

  // The pairs ordered by (i, j), equal pairs in the order given (so that their sum is taken
  // in that order: bit for bit for floating values), as a stable sort would: a counting sort
  // by i, then each row by j (insertion for short rows, which are usually in order already).
  // O(pairs + N) plus the rows' own sorts.
  std::vector<Triple> sorted_pairs(std::size_t n) const {
    std::vector<std::size_t> start(n + 1, 0);
    for (const Triple& p : pairs_) ++start[static_cast<std::size_t>(p.i) + 1];
    for (std::size_t i = 0; i < n; ++i) start[i + 1] += start[i];
    std::vector<Triple> sorted(pairs_.size());
    {
      std::vector<std::size_t> at(start.begin(), start.end() - 1);
      for (const Triple& p : pairs_) sorted[at[static_cast<std::size_t>(p.i)]++] = p;
    }
    const auto by_j = [](const Triple& a, const Triple& b) { return a.j < b.j; };
    for (std::size_t i = 0; i < n; ++i) {
      const auto first = sorted.begin() + static_cast<std::ptrdiff_t>(start[i]);
      const auto last = sorted.begin() + static_cast<std::ptrdiff_t>(start[i + 1]);
      if (last - first > 32) {
        std::stable_sort(first, last, by_j);
        continue;
      }
      for (auto k = first; k != last; ++k) {  // insertion, stable: moves past strictly larger j only
        const Triple t = *k;
        auto h = k;
        for (; h != first && t.j < (h - 1)->j; --h) *h = *(h - 1);
        *h = t;
      }
    }
    return sorted;
  }

  void fail(Status s) {
    if (status_.ok()) status_ = s;
  }

  // `index` is one of the term's indices; (i, j) are the term's, in the caller's order.
  bool check_index(std::uint64_t t, IndexArg index, std::uint64_t i, std::uint64_t j) {
    if (index.negative) {
      fail(Status::error(StatusCode::index_out_of_range, "spin index is negative (valid: 0 .. size - 1)")
               .at_term(t, i, j));
      return false;
    }
    if (index.value >= max_spins_v<Index>) {
      fail(Status::error(StatusCode::index_out_of_range,
                         "spin index too large for the index type (uint16_t allows 0 .. 65534, uint32_t 0 .. "
                         "4294967294); use a wider Index")
               .at_term(t, i, j));
      return false;
    }
    if (fixed_ && index.value >= n_) {
      fail(Status::error(StatusCode::index_out_of_range,
                         "spin index not below the size declared to the builder (valid: 0 .. size - 1); declare a "
                         "larger size or let the builder grow")
               .at_term(t, i, j));
      return false;
    }
    if (!fixed_ && index.value + 1 > n_) n_ = index.value + 1;
    return true;
  }

  template <class Arg>
  bool check_value(std::uint64_t t, std::uint64_t i, std::uint64_t j, Arg a, Value& v) {
    Status why;
    if (!convert_coefficient<Value>(a, v, why)) {
      fail(why.at_term(t, i, j));
      return false;
    }
    if (!is_finite(v)) {
      fail(Status::error(StatusCode::non_finite_value, "coefficient is NaN or infinite; only finite values are allowed")
               .at_term(t, i, j));
      return false;
    }
    return true;
  }

  bool fixed_ = false;
  std::uint64_t n_ = 0;
  std::uint64_t terms_ = 0;
  energy_type offset_{0};
  std::vector<Triple> linears_;
  std::vector<Triple> pairs_;
  Status status_{};
};

}  // namespace detail

template <class Value, class Index = std::uint32_t>
class IsingBuilder : public detail::TermBuilder<Form::ising, Value, Index> {
  using base = detail::TermBuilder<Form::ising, Value, Index>;

 public:
  using base::base;
  // Any integer index type and any arithmetic coefficient type (see the conversion rule above).
  template <class I, class V>
  IsingBuilder& add_field(I i, V h) {
    this->add_linear_term(detail::index_arg(i), h);
    return *this;
  }
  template <class I, class J, class V>
  IsingBuilder& add_coupling(I i, J j, V coupling) {
    this->add_pair_term(detail::index_arg(i), detail::index_arg(j), coupling);
    return *this;
  }
  template <class V>
  IsingBuilder& add_offset(V c) {
    this->add_offset_term(c);
    return *this;
  }
  Result<IsingModel<Value, Index>> build() const { return this->build_model(); }
};

template <class Value, class Index = std::uint32_t>
class QuboBuilder : public detail::TermBuilder<Form::qubo, Value, Index> {
  using base = detail::TermBuilder<Form::qubo, Value, Index>;

 public:
  using base::base;
  // Any integer index type and any arithmetic coefficient type (see the conversion rule above).
  template <class I, class V>
  QuboBuilder& add_unary(I i, V q) {
    this->add_linear_term(detail::index_arg(i), q);
    return *this;
  }
  template <class I, class J, class V>
  QuboBuilder& add_pair(I i, J j, V q) {
    this->add_pair_term(detail::index_arg(i), detail::index_arg(j), q);
    return *this;
  }
  template <class V>
  QuboBuilder& add_offset(V c) {
    this->add_offset_term(c);
    return *this;
  }
  Result<QuboModel<Value, Index>> build() const { return this->build_model(); }
};

}  // namespace spinwright

#endif  // SPINWRIGHT_MODEL_BUILDER_HPP
