// Fuzz entry points shared by the libFuzzer targets (tests/fuzz/fuzz_*.cpp) and by the replay
// of saved inputs in the ordinary suite (tests/hardening/test_fuzz_regressions.cpp).
//
// Each entry takes arbitrary bytes, drives a public entry point of the toolkit with them and
// checks what came out against an independent oracle. It returns nullptr when every invariant
// held, or a short text naming the broken one (the fuzz target then aborts, the doctest replay
// fails the check). Undefined behaviour is left to the sanitizers of the `fuzz` and `sanitize`
// presets.
#ifndef SPINWRIGHT_TESTS_FUZZ_FUZZ_ENTRIES_HPP
#define SPINWRIGHT_TESTS_FUZZ_FUZZ_ENTRIES_HPP

#include <spinwright/model/builder.hpp>
#include <spinwright/model/convert.hpp>
#include <spinwright/model/dense_model.hpp>
#include <spinwright/model/sparse_view.hpp>
#include <spinwright/rng/xoshiro.hpp>
#include <spinwright/state/spin_state.hpp>
#include <spinwright/io/edge_list.hpp>
#include <spinwright/io/matrix_market.hpp>
#include <spinwright/io/model_file.hpp>
#include <spinwright/io/state_file.hpp>

#include <cstddef>      // std::size_t
#include <cstdint>      // std::uint8_t, std::int64_t
#include <cstdio>       // std::fprintf
#include <cstdlib>      // std::abort
#include <cstring>      // std::memcpy
#include <limits>       // std::numeric_limits
#include <map>          // std::map (reference pair sums)
#include <string>       // std::string, std::to_string
#include <string_view>  // std::string_view
#include <type_traits>  // std::is_integral_v
#include <utility>      // std::pair
#include <vector>       // std::vector

namespace fuzz_entries {

using Failure = const char*;  // nullptr: every invariant held

__extension__ typedef __int128 Wide;  // exact oracle for integer models (GCC and Clang)

// Reads the input front to back; past the end every read yields zeros.
class ByteReader {
 public:
  ByteReader(const std::uint8_t* data, std::size_t size) : data_(data), size_(size) {}
  bool empty() const noexcept { return pos_ >= size_; }
  std::uint8_t byte() noexcept { return pos_ < size_ ? data_[pos_++] : 0; }
  std::uint32_t u32() noexcept {
    std::uint32_t v = 0;
    for (int b = 0; b < 4; ++b) v |= static_cast<std::uint32_t>(byte()) << (8 * b);
    return v;
  }
  std::uint64_t u64() noexcept {
    std::uint64_t v = 0;
    for (int b = 0; b < 8; ++b) v |= static_cast<std::uint64_t>(byte()) << (8 * b);
    return v;
  }

 private:
  const std::uint8_t* data_;
  std::size_t size_;
  std::size_t pos_ = 0;
};

inline std::uint64_t hash_bytes(const std::uint8_t* data, std::size_t size) {
  std::uint64_t h = 1469598103934665603ull;  // FNV-1a 64 (common practice)
  for (std::size_t k = 0; k < size; ++k) h = (h ^ data[k]) * 1099511628211ull;
  return h;
}

// Values: mostly small integers (so that terms merge and cancel), often the edges of the type
// (NaN, infinities, extremes, the energy limits), sometimes raw bit patterns.
template <class Value>
Value decode_value(ByteReader& r) {
  using lim = std::numeric_limits<Value>;
  const std::uint8_t tag = r.byte();
  const int small = static_cast<int>(r.byte() % 17) - 8;
  switch (tag % 8) {
    case 0:
    case 1:
    case 2:
      return static_cast<Value>(small);
    case 3: {
      if constexpr (std::is_floating_point_v<Value>) {
        const Value table[] = {lim::quiet_NaN(), -lim::quiet_NaN(), lim::infinity(), -lim::infinity(),
                               Value(0),         -Value(0),         lim::max(),      -lim::max(),
                               lim::min(),       lim::denorm_min(), Value(0.5),      Value(-0.25),
                               lim::max() / 4,   lim::max() / 8,    lim::epsilon(),  Value(1) / Value(3)};
        Value v = table[r.byte() % 16];
        if constexpr (std::is_same_v<Value, double>) {
          const double more[] = {spinwright::float_energy_limit,
                                 -spinwright::float_energy_limit,
                                 spinwright::float_energy_limit / 2,
                                 3.4028234663852886e38,
                                 1e300,
                                 -1e300};
          const std::uint8_t k = r.byte();
          if (k < 6) v = more[k];
        }
        return v;
      } else {
        const auto L = static_cast<std::int64_t>(spinwright::integer_energy_limit);
        const std::int64_t table[] = {std::numeric_limits<std::int64_t>::min(),
                                      std::numeric_limits<std::int64_t>::max(),
                                      L,
                                      L + 1,
                                      -L,
                                      -L - 1,
                                      L / 2,
                                      L / 2 + 1,
                                      L / 3,
                                      -(L / 2),
                                      (std::int64_t{1} << 53) + 1,
                                      std::numeric_limits<std::int64_t>::min() + 1,
                                      std::numeric_limits<std::int32_t>::min(),
                                      std::numeric_limits<std::int32_t>::max(),
                                      std::numeric_limits<std::int32_t>::max() / 2 + 1,
                                      L - 255};
        const std::int64_t v = table[r.byte() % 16];
        if constexpr (std::is_same_v<Value, std::int32_t>) {
          if (v < lim::min() || v > lim::max()) return static_cast<Value>(v % 100000 + small);
        }
        return static_cast<Value>(v);
      }
    }
    case 4: {
      if constexpr (std::is_same_v<Value, double>) {
        const std::uint64_t bits = r.u64();
        double d;
        std::memcpy(&d, &bits, sizeof d);
        return d;
      } else if constexpr (std::is_same_v<Value, float>) {
        const std::uint32_t bits = r.u32();
        float f;
        std::memcpy(&f, &bits, sizeof f);
        return f;
      } else if constexpr (std::is_same_v<Value, std::int32_t>) {
        return static_cast<std::int32_t>(r.u32());
      } else {
        return static_cast<std::int64_t>(r.u64());
      }
    }
    default:
      return static_cast<Value>((static_cast<int>(r.byte()) - 128) * (tag % 2 ? 1 : 1000));
  }
}

// Indices: mostly small (so that pairs repeat), sometimes the edges of the index type or of a
// declared size. A growing builder with 32-bit indices never gets the largest valid index
// (it would ask for 2^32 spins of memory, which is the caller's choice, not a defect).
template <class Index>
std::uint64_t decode_index(ByteReader& r, bool grows, std::uint64_t declared) {
  const std::uint8_t tag = r.byte();
  if (tag < 232) return tag % 12;
  const std::uint64_t top = spinwright::max_spins_v<Index>;
  switch (tag % 8) {
    case 0:
      return ((grows && top > 65535) || r.byte() != 0x5a) ? top : top - 1;
    case 1:
      return top;
    case 2:
      return top + 1;
    case 3:
      return ~std::uint64_t{0};
    case 4:
      return std::uint64_t{1} << 32;
    case 5:
      return declared;
    case 6:
      return declared == 0 ? 0 : declared - 1;
    default:
      return 12 + r.byte() % 64;
  }
}

// One term as offered to the builder, kept for the oracle.
template <class Value>
struct RawTerm {
  enum Kind : std::uint8_t { linear, pair, offset } kind;
  std::uint64_t i, j;
  Value v;                        // linear and pair
  spinwright::energy_t<Value> c;  // offset
};

template <class Value>
bool finite_value(Value v) {
  return spinwright::detail::is_finite(v);
}

// Energy contribution of one raw term for a spin assignment, in long double or Wide.
template <spinwright::Form F, class Acc, class Value>
Acc raw_contribution(const RawTerm<Value>& t, const std::int8_t* s) {
  using spinwright::Form;
  if (t.kind == RawTerm<Value>::offset) return static_cast<Acc>(t.c);
  const Acc v = static_cast<Acc>(t.v);
  if constexpr (F == Form::ising) {
    if (t.kind == RawTerm<Value>::linear) return v * s[t.i];
    return t.i == t.j ? v : v * s[t.i] * s[t.j];
  } else {
    const bool xi = s[t.i] < 0;
    const bool xj = s[t.j] < 0;
    if (t.kind == RawTerm<Value>::linear || t.i == t.j) return xi ? v : Acc(0);
    return (xi && xj) ? v : Acc(0);
  }
}

// Energy of a model recomputed from its coefficients without using model.energy().
template <class Acc, class Model>
Acc naive_energy(const Model& m, const std::int8_t* s) {
  using spinwright::Form;
  Acc e = static_cast<Acc>(m.offset());
  const std::size_t n = m.num_spins();
  for (std::size_t i = 0; i < n; ++i) {
    const auto ii = static_cast<typename Model::index_type>(i);
    const Acc h = static_cast<Acc>(m.site_term(ii));
    if constexpr (Model::form == Form::ising) {
      e += h * s[i];
    } else if (s[i] < 0) {
      e += h;
    }
    m.for_each_neighbour(ii, [&](typename Model::index_type j, typename Model::value_type v) {
      if (j <= ii) return;
      if constexpr (Model::form == Form::ising) {
        e += static_cast<Acc>(v) * s[i] * s[j];
      } else if (s[i] < 0 && s[j] < 0) {
        e += static_cast<Acc>(v);
      }
    });
  }
  return e;
}

// Sum of |c| + |linear| + |pair| recomputed from a model's coefficients.
template <class Acc, class Model>
Acc abs_sum(const Model& m) {
  auto mag = [](Acc a) { return a < 0 ? -a : a; };
  Acc sum = mag(static_cast<Acc>(m.offset()));
  const std::size_t n = m.num_spins();
  for (std::size_t i = 0; i < n; ++i) {
    const auto ii = static_cast<typename Model::index_type>(i);
    sum += mag(static_cast<Acc>(m.site_term(ii)));
    m.for_each_neighbour(ii, [&](typename Model::index_type j, typename Model::value_type v) {
      if (j > ii) sum += mag(static_cast<Acc>(v));
    });
  }
  return sum;
}

// Structure of a sparse model: rows sorted, no self pair, both directions stored with equal
// values, no zero or non-finite coefficient, bound consistent with the coefficients.
// After in-place edits a stored pair may hold 0: edits keep the pattern fixed at build
// (SparseModel::set_pair), so `edited` allows zeros.
template <class Model>
Failure check_structure(const Model& m, bool edited = false) {
  using Value = typename Model::value_type;
  using Index = typename Model::index_type;
  const std::size_t n = m.num_spins();
  const auto& row = m.row_starts();
  if (row.size() != n + 1 || row[0] != 0) return "row starts do not have num_spins + 1 entries from 0";
  if (row[n] != m.neighbour_array().size() || m.neighbour_array().size() != m.value_array().size() ||
      m.value_array().size() != 2 * m.num_pairs()) {
    return "row starts, neighbour and value arrays disagree in size";
  }
  for (std::size_t i = 0; i < n; ++i) {
    if (row[i + 1] < row[i]) return "row starts decrease";
    if (!finite_value(m.site_term(static_cast<Index>(i)))) return "non-finite site term in a built model";
    const auto ii = static_cast<Index>(i);
    bool first = true;
    Index last = 0;
    Failure f = nullptr;
    m.for_each_neighbour(ii, [&](Index j, Value v) {
      if (f) return;
      if (j >= n)
        f = "neighbour index beyond the model";
      else if (j == ii)
        f = "self pair stored in a row";
      else if (!first && j <= last)
        f = "row not strictly sorted";
      else if (v == Value{0} && !edited)
        f = "zero pair stored";
      else if (!finite_value(v))
        f = "non-finite pair stored";
      else if (m.pair(j, ii) != v)
        f = "pair storage not symmetric";
      first = false;
      last = j;
    });
    if (f) return f;
  }
  if (!finite_value(m.offset())) return "non-finite offset in a built model";
  if constexpr (std::is_integral_v<Value>) {
    const Wide sum = abs_sum<Wide>(m);
    if (sum > static_cast<Wide>(spinwright::integer_energy_limit)) return "integer model beyond integer_energy_limit";
    if (m.energy_bound() != static_cast<double>(static_cast<std::uint64_t>(sum)))
      return "energy_bound differs from the sum of magnitudes";
  } else {
    const double b = m.energy_bound();
    if (!finite_value(b) || b > spinwright::float_energy_limit) return "floating model beyond float_energy_limit";
    const long double sum = abs_sum<long double>(m);
    if (static_cast<long double>(b) < sum * (1 - 1e-9L) - 1e-300L) return "energy_bound below the sum of magnitudes";
  }
  return nullptr;
}

// Tracked state (fields and energy) against the model: exact for integers, finite and close
// for floating models.
template <class Model>
Failure check_state(const spinwright::SpinState<Model>& st) {
  using Value = typename Model::value_type;
  const auto c = st.check();
  if constexpr (std::is_integral_v<Value>) {
    if (!c.exact) return "integer state drifted from the model";
    if (static_cast<Wide>(st.energy()) != naive_energy<Wide>(st.model(), st.spins())) {
      return "integer state energy differs from the exact recomputation";
    }
    const double b = st.model().energy_bound();
    for (std::size_t i = 0; i < st.size(); ++i) {
      const auto f = st.local_field(static_cast<typename Model::index_type>(i));
      if (static_cast<double>(f < 0 ? -f : f) > b) return "local field beyond the energy bound";
    }
  } else {
    if (!finite_value(st.energy())) return "non-finite energy in a state";
    for (std::size_t i = 0; i < st.size(); ++i) {
      const auto idx = static_cast<typename Model::index_type>(i);
      if (!finite_value(st.local_field(idx)) || !finite_value(st.delta(idx)))
        return "non-finite field or delta in a state";
    }
    const double scale = st.model().energy_bound() + 1e-300;
    if (c.max_field_error > 1e-6 * scale || c.energy_error > 1e-6 * scale)
      return "floating state drifted far from the model";
  }
  return nullptr;
}

template <class Acc>
Acc magnitude(Acc a) {
  return a < 0 ? -a : a;
}

// Builders fed an arbitrary term stream, then edits and flips on the built model.
template <spinwright::Form F, class Value, class Index>
Failure builder_case(ByteReader& r, bool fixed, std::uint64_t declared, std::uint64_t seed) {
  using namespace spinwright;
  using Energy = energy_t<Value>;
  using Builder = std::conditional_t<F == Form::ising, IsingBuilder<Value, Index>, QuboBuilder<Value, Index>>;
  using Model = SparseModel<F, Value, Index>;
  using Term = RawTerm<Value>;
  constexpr bool integral = std::is_integral_v<Value>;

  // Keep sizes small (fast runs) except the edges of the index type itself.
  // (a declared 2^32 - 1 spins would be a legitimate 32 GiB request, not a defect).
  if (fixed && declared > 64 && declared <= max_spins_v<Index> && !(sizeof(Index) == 2 && declared >= 65534)) {
    declared %= 64;
  }
  Builder b = fixed ? Builder(declared) : Builder();
  std::vector<Term> terms;

  // Oracle of the add-time checks: the first refused term and its code.
  std::uint64_t bad_term = no_term;
  StatusCode bad_code = StatusCode::ok;
  if (fixed && declared > max_spins_v<Index>) {
    bad_code = StatusCode::index_out_of_range;  // the declared size itself
  }
  std::uint64_t n = fixed ? declared : 0;
  Wide offset_wide = 0;  // integer running offset
  Energy offset_run{0};  // floating running offset (same order as the builder)

  const std::size_t max_terms = 48;
  for (std::size_t t = 0; t < max_terms && !r.empty(); ++t) {
    const std::uint8_t op = r.byte();
    if (op % 16 == 15) break;  // end of the term stream, the rest drives edits and flips
    Term term{};
    const bool add_ok = bad_code == StatusCode::ok;
    auto index_ok = [&](std::uint64_t i) {
      if (i >= max_spins_v<Index> || (fixed && i >= declared)) return false;
      if (!fixed && i + 1 > n) n = i + 1;
      return true;
    };
    if (op % 16 < 6) {
      term.kind = Term::linear;
      term.i = term.j = decode_index<Index>(r, !fixed, declared);
      term.v = decode_value<Value>(r);
      if constexpr (F == Form::ising) {
        b.add_field(term.i, term.v);
      } else {
        b.add_unary(term.i, term.v);
      }
      if (add_ok) {
        if (!index_ok(term.i)) {
          bad_code = StatusCode::index_out_of_range;
        } else if (!finite_value(term.v)) {
          bad_code = StatusCode::non_finite_value;
        }
      }
    } else if (op % 16 < 13) {
      term.kind = Term::pair;
      term.i = decode_index<Index>(r, !fixed, declared);
      term.j = (op & 0x80) ? term.i : decode_index<Index>(r, !fixed, declared);
      term.v = decode_value<Value>(r);
      if constexpr (F == Form::ising) {
        b.add_coupling(term.i, term.j, term.v);
      } else {
        b.add_pair(term.i, term.j, term.v);
      }
      if (add_ok) {
        if (!index_ok(term.i) || !index_ok(term.j)) {
          bad_code = StatusCode::index_out_of_range;
        } else if (!finite_value(term.v)) {
          bad_code = StatusCode::non_finite_value;
        } else if (F == Form::ising && term.i == term.j && term.v != Value{0}) {
          // Ising self-pair: J s_i s_i = J goes to the offset.
          if constexpr (integral) {
            offset_wide += term.v;
            if (offset_wide > std::numeric_limits<std::int64_t>::max() ||
                offset_wide < std::numeric_limits<std::int64_t>::min()) {
              bad_code = StatusCode::energy_overflow;  // refused when added: the offset sum is checked per term
            }
          } else {
            offset_run += static_cast<Energy>(term.v);
            if (!finite_value(offset_run)) bad_code = StatusCode::energy_overflow;
          }
        }
      }
    } else {
      term.kind = Term::offset;
      term.c = decode_value<Energy>(r);
      b.add_offset(term.c);
      if (add_ok) {
        if (!finite_value(term.c)) {
          bad_code = StatusCode::non_finite_value;
        } else if constexpr (integral) {
          offset_wide += term.c;
          if (offset_wide > std::numeric_limits<std::int64_t>::max() ||
              offset_wide < std::numeric_limits<std::int64_t>::min()) {
            bad_code = StatusCode::energy_overflow;  // refused when added: the offset sum is checked per term
          }
        } else {
          offset_run += term.c;
          if (!finite_value(offset_run)) bad_code = StatusCode::energy_overflow;
        }
      }
    }
    if (add_ok && bad_code != StatusCode::ok) bad_term = t;
    terms.push_back(term);
  }
  if (b.num_terms() != terms.size()) return "builder counted a different number of terms";

  auto built = b.build();
  if (bad_code != StatusCode::ok) {
    if (built.ok()) return "builder accepted a stream with a bad term";
    if (built.status().code != bad_code) return "builder refused a bad term with an unexpected code";
    if (built.status().term != bad_term) return "builder reported the wrong term position";
    if (built.status().message == nullptr || built.status().message[0] == '\0') return "refusal without a message";
    return nullptr;
  }

  // Oracle of build(): merged coefficients, exactly (integers in Wide; floats summed in double
  // in the order the terms were given, which is the documented merge).
  bool maybe = false;  // integer prefix overflow of a merge: refusing is allowed
  bool must_refuse = false;
  std::vector<Wide> lin_w(n, 0);
  std::vector<Energy> lin_f(n, Energy{0});
  std::map<std::pair<std::uint64_t, std::uint64_t>, Wide> pair_w;
  std::map<std::pair<std::uint64_t, std::uint64_t>, Energy> pair_f;
  for (const Term& t : terms) {
    if (t.kind == Term::offset) continue;
    const bool linear_like = t.kind == Term::linear || (F == Form::qubo && t.i == t.j);
    if (t.kind == Term::pair && t.i == t.j && F == Form::ising) continue;  // already in the offset
    if (linear_like) {
      if constexpr (integral) {
        lin_w[t.i] += t.v;
        if (lin_w[t.i] > std::numeric_limits<std::int64_t>::max() ||
            lin_w[t.i] < std::numeric_limits<std::int64_t>::min())
          maybe = true;
      } else {
        lin_f[t.i] += static_cast<Energy>(t.v);
        if (!finite_value(lin_f[t.i])) must_refuse = true;
      }
    } else {
      const auto key = std::make_pair(t.i < t.j ? t.i : t.j, t.i < t.j ? t.j : t.i);
      if constexpr (integral) {
        Wide& s = pair_w[key];
        s += t.v;
        if (s > std::numeric_limits<std::int64_t>::max() || s < std::numeric_limits<std::int64_t>::min()) maybe = true;
      } else {
        Energy& s = pair_f[key];
        s += static_cast<Energy>(t.v);
        if (!finite_value(s)) must_refuse = true;
      }
    }
  }
  auto fits = [](auto v) {
    if constexpr (integral) {
      return v >= std::numeric_limits<Value>::min() && v <= std::numeric_limits<Value>::max();
    } else {
      return v >= -static_cast<double>(std::numeric_limits<Value>::max()) &&
             v <= static_cast<double>(std::numeric_limits<Value>::max());
    }
  };
  Wide bound_w = 0;
  long double bound_f = 0;
  if constexpr (integral) {
    bound_w = magnitude(offset_wide);
    for (const Wide v : lin_w) {
      if (!fits(v)) must_refuse = true;
      bound_w += magnitude(v);
    }
    for (const auto& kv : pair_w) {
      if (!fits(kv.second)) must_refuse = true;
      bound_w += magnitude(kv.second);
    }
    if (bound_w > static_cast<Wide>(integer_energy_limit)) must_refuse = true;
  } else {
    bound_f = magnitude(static_cast<long double>(offset_run));
    for (const Energy v : lin_f) {
      if (!fits(v)) must_refuse = true;
      bound_f += magnitude(static_cast<long double>(static_cast<Value>(fits(v) ? v : 0)));
    }
    for (const auto& kv : pair_f) {
      if (!fits(kv.second)) must_refuse = true;
      bound_f += magnitude(static_cast<long double>(static_cast<Value>(fits(kv.second) ? kv.second : 0)));
    }
    const long double lim = float_energy_limit;
    if (bound_f > lim * (1 + 1e-9L)) must_refuse = true;
    if (bound_f > lim * (1 - 1e-9L) && !must_refuse) maybe = true;
  }

  if (!built.ok()) {
    if (must_refuse || maybe) {
      const StatusCode code = built.status().code;
      if (code != StatusCode::value_out_of_range && code != StatusCode::energy_overflow) {
        return "builder refused a merge or range with an unexpected code";
      }
      if (built.status().message == nullptr || built.status().message[0] == '\0') return "refusal without a message";
      return nullptr;
    }
    return "builder refused a valid model";
  }
  if (must_refuse) return "builder accepted a model it must refuse (merged value or energy range)";

  Model& m = built.value();
  if (m.num_spins() != n) return "model size differs from the largest index plus one (or the declared size)";
  if (Failure f = check_structure(m)) return f;

  // Coefficients equal the oracle's merged sums.
  if constexpr (integral) {
    if (static_cast<Wide>(m.offset()) != offset_wide) return "offset differs from the exact sum";
  } else {
    if (!(m.offset() == offset_run)) return "offset differs from the ordered sum";
  }
  std::size_t expected_pairs = 0;
  for (std::size_t i = 0; i < n; ++i) {
    const Value got = m.site_term(static_cast<Index>(i));
    if constexpr (integral) {
      if (static_cast<Wide>(got) != lin_w[i]) return "site term differs from the exact sum";
    } else {
      if (!(got == static_cast<Value>(lin_f[i]))) return "site term differs from the ordered sum";
    }
  }
  if constexpr (integral) {
    for (const auto& kv : pair_w) {
      const Value got = m.pair(static_cast<Index>(kv.first.first), static_cast<Index>(kv.first.second));
      if (static_cast<Wide>(got) != kv.second) return "pair differs from the exact sum";
      expected_pairs += kv.second != 0;
    }
  } else {
    for (const auto& kv : pair_f) {
      const Value want = static_cast<Value>(kv.second);
      const Value got = m.pair(static_cast<Index>(kv.first.first), static_cast<Index>(kv.first.second));
      if (!(got == want)) return "pair differs from the ordered sum";
      expected_pairs += want != Value{0};
    }
  }
  if (m.num_pairs() != expected_pairs) return "model holds pairs that were never added";
  if (n == 0) return nullptr;

  // Energy of random spins against the raw terms (exact for integers).
  Xoshiro256 rng(seed);
  std::vector<std::int8_t> spins(n);
  long double raw_scale = 0;
  for (const Term& t : terms) {
    raw_scale += magnitude(t.kind == Term::offset ? static_cast<long double>(t.c) : static_cast<long double>(t.v));
  }
  for (int rep = 0; rep < 3; ++rep) {
    for (auto& s : spins) s = rng.coin() ? 1 : -1;
    if constexpr (integral) {
      Wide want = 0;
      for (const Term& t : terms) want += raw_contribution<F, Wide>(t, spins.data());
      if (static_cast<Wide>(m.energy(spins.data())) != want)
        return "integer energy differs from the raw-term recomputation";
      if (magnitude(want) > bound_w) return "integer energy beyond its bound";
    } else {
      long double want = 0;
      for (const Term& t : terms) want += raw_contribution<F, long double>(t, spins.data());
      const long double got = m.energy(spins.data());
      const long double eps = std::numeric_limits<Value>::epsilon();
      const long double tol = (terms.size() + n + 8) * eps * raw_scale + 1e-300L;
      if (!finite_value(m.energy(spins.data())) || magnitude(got - want) > tol) {
        return "floating energy differs from the raw-term recomputation";
      }
    }
  }

  // Conversions and the dense copy keep the energy of every tried assignment.
  if (n <= 64) {
    if constexpr (F == Form::ising) {
      auto q = qubo_from(m);
      if (q.ok()) {
        if (Failure f = check_structure(q.value())) return f;
        for (int rep = 0; rep < 2; ++rep) {
          for (auto& s : spins) s = rng.coin() ? 1 : -1;
          if constexpr (integral) {
            if (q->energy(spins.data()) != m.energy(spins.data())) return "qubo_from changed an integer energy";
          } else {
            const long double d = magnitude(static_cast<long double>(q->energy(spins.data())) - m.energy(spins.data()));
            if (d > 1e-6L * (m.energy_bound() + q->energy_bound()) + 1e-300L)
              return "qubo_from changed a floating energy";
          }
        }
      } else if constexpr (integral) {
        // Refusal is allowed only when an exact QUBO coefficient, offset or range does not fit.
        bool need = false;
        Wide c = m.offset(), total = 0;
        for (std::size_t i = 0; i < n && !need; ++i) {
          const auto ii = static_cast<Index>(i);
          Wide qii = -2 * static_cast<Wide>(m.site_term(ii));
          c += m.site_term(ii);
          m.for_each_neighbour(ii, [&](Index j, Value v) {
            qii -= 2 * static_cast<Wide>(v);
            if (j > ii) {
              c += v;
              const Wide qij = 4 * static_cast<Wide>(v);
              if (!fits(qij)) need = true;
              total += magnitude(qij);
            }
          });
          if (!fits(qii)) need = true;
          total += magnitude(qii);
        }
        total += magnitude(c);
        if (total > static_cast<Wide>(integer_energy_limit)) need = true;
        if (!need) return "qubo_from refused an integer model whose QUBO form fits";
      }
    } else {
      auto is = ising_from(m);
      if (is.ok()) {
        if (Failure f = check_structure(is.value())) return f;
        for (int rep = 0; rep < 2; ++rep) {
          for (auto& s : spins) s = rng.coin() ? 1 : -1;
          if constexpr (integral) {
            if (static_cast<long double>(is->energy(spins.data())) !=
                static_cast<long double>(m.energy(spins.data()))) {
              return "ising_from changed an integer energy (must be exact below 2^50)";
            }
          } else {
            const long double d =
                magnitude(static_cast<long double>(is->energy(spins.data())) - m.energy(spins.data()));
            if (d > 1e-6L * (m.energy_bound() + is->energy_bound()) + 1e-300L)
              return "ising_from changed a floating energy";
          }
        }
      } else if (integral && m.energy_bound() < 0x1.0p49) {
        return "ising_from refused a small integer QUBO";
      }
    }
    auto d = DenseModel<F, Value>::from(m);
    if (!d.ok()) return "dense copy of a small model refused";
    for (auto& s : spins) s = rng.coin() ? 1 : -1;
    if constexpr (integral) {
      if (d->energy(spins.data()) != m.energy(spins.data())) return "dense copy changed an integer energy";
      // A no-op edit of the largest term must be accepted (the copy's range is exact).
      if (!d->set_site_term(0, m.site_term(0)) || !d->set_offset(m.offset())) return "dense copy refused a no-op edit";
    } else {
      const long double diff = magnitude(static_cast<long double>(d->energy(spins.data())) - m.energy(spins.data()));
      if (diff > 1e-9L * m.energy_bound() + 1e-300L) return "dense copy changed a floating energy";
    }
  }

  // Flips and in-place edits through the state.
  SpinState<Model> st(m);
  st.set_spins(spins.data());
  if (Failure f = check_state(st)) return f;
  for (int step = 0; step < 64 && !r.empty(); ++step) {
    const std::uint8_t op = r.byte();
    const auto i = static_cast<Index>(r.byte() % n);
    switch (op % 6) {
      case 0:
      case 1: {
        const Energy before = st.energy();
        const Energy d = st.delta(i);
        st.flip(i);
        if constexpr (integral) {
          if (st.energy() != before + d) return "flip moved the energy by something else than its delta";
        }
        break;
      }
      case 2: {
        const Value v = decode_value<Value>(r);
        const bool big = (op & 0x40) != 0;
        const Index target = big ? static_cast<Index>(n + (op >> 7)) : i;
        const Value old = target < n ? m.site_term(target) : Value{0};
        const double old_bound = m.energy_bound();
        bool expect = target < n && finite_value(v);
        if constexpr (integral) {
          if (expect) {
            const Wide proposed = abs_sum<Wide>(m) - magnitude<Wide>(old) + magnitude<Wide>(v);
            expect = proposed <= static_cast<Wide>(integer_energy_limit);
          }
        }
        const Status s = edit_site_term(m, st, target, v);
        if (integral && s.ok() != expect) return "edit_site_term accepted or refused against the exact range";
        if (!integral && s.ok() && !expect) return "edit_site_term accepted a bad index or value";
        if (!s.ok()) {
          if (target < n && !(m.site_term(target) == old)) return "refused edit_site_term changed the model";
          if (m.energy_bound() != old_bound) return "refused edit_site_term changed the bound";
        } else if (!(m.site_term(target) == v)) {
          return "edit_site_term did not store the value";
        }
        break;
      }
      case 3: {
        const Value v = decode_value<Value>(r);
        Index j = static_cast<Index>(r.byte() % n);
        if ((op & 0x40) == 0 && m.degree(i) > 0) j = m.neighbours(i)[r.byte() % m.degree(i)];
        const bool present = i != j && m.find(i, j) != Model::npos;
        const Value old = m.pair(i, j);
        const double old_bound = m.energy_bound();
        Wide proposed = 0;
        if constexpr (integral) proposed = abs_sum<Wide>(m) - magnitude<Wide>(old) + magnitude<Wide>(v);
        const Status s = edit_pair(m, st, i, j, v);
        if (!present && s.ok()) return "edit_pair created a pair outside the pattern";
        if (!present && s.code != StatusCode::missing_term && s.code != StatusCode::index_out_of_range) {
          return "edit_pair of a missing pair with an unexpected code";
        }
        if (present && !finite_value(v) && s.ok()) return "edit_pair accepted a non-finite value";
        if (integral && present && s.ok() != (proposed <= static_cast<Wide>(integer_energy_limit))) {
          return "edit_pair accepted or refused against the exact range";
        }
        if (!s.ok()) {
          if (!(m.pair(i, j) == old) || m.energy_bound() != old_bound) return "refused edit_pair changed the model";
        } else if (!(m.pair(i, j) == v) || !(m.pair(j, i) == v)) {
          return "edit_pair did not store the value in both directions";
        }
        break;
      }
      case 4: {
        const Energy c = decode_value<Energy>(r);
        const Energy old = m.offset();
        const double old_bound = m.energy_bound();
        Wide proposed = 0;
        if constexpr (integral) proposed = abs_sum<Wide>(m) - magnitude<Wide>(old) + magnitude<Wide>(c);
        const Status s = edit_offset(m, st, c);
        if (!finite_value(c) && s.ok()) return "edit_offset accepted a non-finite offset";
        if (integral && s.ok() != (proposed <= static_cast<Wide>(integer_energy_limit))) {
          return "edit_offset accepted or refused against the exact range";
        }
        if (!s.ok() && (!(m.offset() == old) || m.energy_bound() != old_bound))
          return "refused edit_offset changed the model";
        break;
      }
      default:
        st.randomize(rng);
        break;
    }
    if (Failure f = check_structure(m, /*edited=*/true)) return f;
    if (Failure f = check_state(st)) return f;
  }
  return nullptr;
}

// Entry: the first byte picks form, value type, index type and fixed/growing size.
inline Failure builder_entry(const std::uint8_t* data, std::size_t size) {
  using spinwright::Form;
  ByteReader r(data, size);
  const std::uint8_t config = r.byte();
  const bool fixed = (config & 0x10) != 0;
  std::uint64_t declared = r.byte() % 24;
  if (fixed && (config & 0x20) != 0) declared = r.u64();  // any declared size, even absurd ones
  const std::uint64_t seed = hash_bytes(data, size);
  const bool ising = (config & 1) == 0;
  const bool wide_index = (config & 8) != 0;
  switch ((config >> 1) & 3) {
    case 0:
      if (ising)
        return wide_index ? builder_case<Form::ising, double, std::uint32_t>(r, fixed, declared, seed)
                          : builder_case<Form::ising, double, std::uint16_t>(r, fixed, declared, seed);
      return wide_index ? builder_case<Form::qubo, double, std::uint32_t>(r, fixed, declared, seed)
                        : builder_case<Form::qubo, double, std::uint16_t>(r, fixed, declared, seed);
    case 1:
      if (ising)
        return wide_index ? builder_case<Form::ising, float, std::uint32_t>(r, fixed, declared, seed)
                          : builder_case<Form::ising, float, std::uint16_t>(r, fixed, declared, seed);
      return wide_index ? builder_case<Form::qubo, float, std::uint32_t>(r, fixed, declared, seed)
                        : builder_case<Form::qubo, float, std::uint16_t>(r, fixed, declared, seed);
    case 2:
      if (ising)
        return wide_index ? builder_case<Form::ising, std::int32_t, std::uint32_t>(r, fixed, declared, seed)
                          : builder_case<Form::ising, std::int32_t, std::uint16_t>(r, fixed, declared, seed);
      return wide_index ? builder_case<Form::qubo, std::int32_t, std::uint32_t>(r, fixed, declared, seed)
                        : builder_case<Form::qubo, std::int32_t, std::uint16_t>(r, fixed, declared, seed);
    default:
      if (ising)
        return wide_index ? builder_case<Form::ising, std::int64_t, std::uint32_t>(r, fixed, declared, seed)
                          : builder_case<Form::ising, std::int64_t, std::uint16_t>(r, fixed, declared, seed);
      return wide_index ? builder_case<Form::qubo, std::int64_t, std::uint32_t>(r, fixed, declared, seed)
                        : builder_case<Form::qubo, std::int64_t, std::uint16_t>(r, fixed, declared, seed);
  }
}

// ---------------------------------------------------------------------------------------------
// File readers: the buffer entry points of io/ fed arbitrary text.

inline constexpr std::string_view fuzz_file_name = "fuzz-input.txt";

// Every refusal names the file and a line inside the text (0 only for whole-input errors) and
// says why: message == file + ":" + line + ": " + reason.
inline Failure check_io_refusal(const spinwright::io::IoStatus& st, std::string_view text) {
  if (st.ok()) return "reader refusal with an ok code";
  if (st.file != fuzz_file_name) return "reader refusal does not name the file";
  if (st.reason.empty()) return "reader refusal without a reason";
  if (st.message != st.file + ":" + std::to_string(st.line) + ": " + st.reason)
    return "reader message not FILE:LINE: reason";
  // The readers report "file ends ..." at the line after the last one.
  std::uint64_t lines = (!text.empty() && text.back() != '\n') ? 1 : 0;
  for (const char c : text) lines += c == '\n';
  if (st.line > lines + 1) return "reader refusal points beyond the line after the last";
  return nullptr;
}

template <class Model>
Failure same_model(const Model& a, const Model& b) {
  using Index = typename Model::index_type;
  if (a.num_spins() != b.num_spins() || a.num_pairs() != b.num_pairs()) return "round trip changed the size";
  if (!(a.offset() == b.offset())) return "round trip changed the offset";
  for (std::size_t i = 0; i < a.num_spins(); ++i) {
    if (!(a.site_term(static_cast<Index>(i)) == b.site_term(static_cast<Index>(i))))
      return "round trip changed a site term";
  }
  if (a.row_starts() != b.row_starts() || a.neighbour_array() != b.neighbour_array())
    return "round trip changed the pattern";
  for (std::size_t k = 0; k < a.value_array().size(); ++k) {
    if (!(a.value_array()[k] == b.value_array()[k])) return "round trip changed a pair";
  }
  return nullptr;
}

// A model that came out of a reader: valid structure, and a state over it stays finite/exact.
template <class Model>
Failure check_read_model(const Model& m, std::uint64_t max_spins, std::uint64_t seed) {
  if (m.num_spins() > max_spins) return "reader built more spins than ReadOptions::max_spins";
  if (Failure f = check_structure(m)) return f;
  if (m.num_spins() == 0) return nullptr;
  spinwright::SpinState<Model> st(m);
  spinwright::Xoshiro256 rng(seed);
  st.randomize(rng);
  if (Failure f = check_state(st)) return f;
  for (int k = 0; k < 16; ++k)
    st.flip(static_cast<typename Model::index_type>(rng.below(static_cast<std::uint32_t>(m.num_spins()))));
  return check_state(st);
}

template <class Value, class Index>
Failure edge_list_case(std::string_view text, const spinwright::io::ReadOptions& opt, std::uint64_t seed) {
  using namespace spinwright;
  auto read = io::parse_edge_list<Value, Index>(text, fuzz_file_name, opt);
  if (!read.ok()) return check_io_refusal(read.status(), text);
  const auto& m = read.value();
  if (Failure f = check_read_model(m, opt.max_spins, seed)) return f;
  for (std::size_t i = 0; i < m.num_spins(); ++i) {
    if (m.site_term(static_cast<Index>(i)) != Value{0}) return "edge list produced a field";
  }
  if (m.offset() != energy_t<Value>{0}) return nullptr;  // self-loops: the format cannot write it back
  auto text2 = io::format_edge_list(m);
  if (!text2.ok()) return "format_edge_list refused a model without fields or offset";
  auto again = io::parse_edge_list<Value, Index>(text2.value(), fuzz_file_name, opt);
  if (!again.ok()) return "an edge list written by format_edge_list does not read back";
  return same_model(m, again.value());
}

// Edge-list reader: the first byte picks the value and index types (or the combined reader).
inline Failure edge_list_entry(const std::uint8_t* data, std::size_t size) {
  if (size == 0) return nullptr;
  const std::string_view text(reinterpret_cast<const char*>(data + 1), size - 1);
  spinwright::io::ReadOptions opt;
  opt.max_spins = 4096;  // a documented knob; keeps every run small
  const std::uint64_t seed = hash_bytes(data, size);
  const bool wide = (data[0] & 4) != 0;
  switch (data[0] % 4) {
    case 0:
      return wide ? edge_list_case<double, std::uint32_t>(text, opt, seed)
                  : edge_list_case<double, std::uint16_t>(text, opt, seed);
    case 1:
      return wide ? edge_list_case<float, std::uint32_t>(text, opt, seed)
                  : edge_list_case<float, std::uint16_t>(text, opt, seed);
    case 2:
      return wide ? edge_list_case<std::int32_t, std::uint32_t>(text, opt, seed)
                  : edge_list_case<std::int32_t, std::uint16_t>(text, opt, seed);
    default:
      return wide ? edge_list_case<std::int64_t, std::uint32_t>(text, opt, seed)
                  : edge_list_case<std::int64_t, std::uint16_t>(text, opt, seed);
  }
}

template <class Model>
Failure matrix_market_case(std::string_view text, const spinwright::io::ReadOptions& opt, std::uint64_t seed) {
  using namespace spinwright;
  auto read = io::parse_matrix_market<Model>(text, fuzz_file_name, opt);
  if (!read.ok()) return check_io_refusal(read.status(), text);
  const Model& m = read.value();
  if (Failure f = check_read_model(m, opt.max_spins, seed)) return f;
  auto text2 = io::format_matrix_market(m);
  if (!text2.ok()) return "format_matrix_market refused a valid model";
  auto again = io::parse_matrix_market<Model>(text2.value(), fuzz_file_name, opt);
  if (!again.ok()) return "a Matrix Market file written by format_matrix_market does not read back";
  return same_model(m, again.value());
}

inline Failure model_text_case(std::string_view text, const spinwright::io::ReadOptions& opt, std::uint64_t seed) {
  using namespace spinwright;
  auto read = io::parse_model_text(text, fuzz_file_name, opt);
  if (!read.ok()) return check_io_refusal(read.status(), text);
  const io::LoadedModel& lm = read.value();
  return lm.visit([&](const auto& m) -> Failure {
    if (Failure f = check_read_model(m, opt.max_spins, seed)) return f;
    auto text2 = io::format_model(lm, io::FileFormat::matrix_market);
    if (!text2.ok()) return "format_model refused a model it read";
    auto again = io::parse_model_text(text2.value(), fuzz_file_name, opt);
    if (!again.ok()) return "a model written as Matrix Market does not read back";
    if (again->form != lm.form || again->integer != lm.integer) return "round trip changed the form or value type";
    using M = std::decay_t<decltype(m)>;
    const M* other = nullptr;
    again->visit([&](const auto& m2) {
      if constexpr (std::is_same_v<std::decay_t<decltype(m2)>, M>) other = &m2;
    });
    if (other == nullptr) return "round trip changed the model type";
    return same_model(m, *other);
  });
}

// Matrix Market reader: the first byte picks the model type, or the combined reader.
inline Failure matrix_market_entry(const std::uint8_t* data, std::size_t size) {
  using namespace spinwright;
  if (size == 0) return nullptr;
  const std::string_view text(reinterpret_cast<const char*>(data + 1), size - 1);
  io::ReadOptions opt;
  opt.max_spins = 4096;
  const std::uint64_t seed = hash_bytes(data, size);
  const std::uint8_t c = data[0];
  if (c & 0x80) {
    opt.value_kind = static_cast<io::ValueKind>((c >> 4) % 3);
    return model_text_case(text, opt, seed);
  }
  const bool wide = (c & 8) != 0;
  switch (c % 8) {
    case 0:
      return wide ? matrix_market_case<IsingModel<double, std::uint32_t>>(text, opt, seed)
                  : matrix_market_case<IsingModel<double, std::uint16_t>>(text, opt, seed);
    case 1:
      return wide ? matrix_market_case<QuboModel<double, std::uint32_t>>(text, opt, seed)
                  : matrix_market_case<QuboModel<double, std::uint16_t>>(text, opt, seed);
    case 2:
      return wide ? matrix_market_case<IsingModel<float, std::uint32_t>>(text, opt, seed)
                  : matrix_market_case<IsingModel<float, std::uint16_t>>(text, opt, seed);
    case 3:
      return wide ? matrix_market_case<QuboModel<float, std::uint32_t>>(text, opt, seed)
                  : matrix_market_case<QuboModel<float, std::uint16_t>>(text, opt, seed);
    case 4:
      return wide ? matrix_market_case<IsingModel<std::int32_t, std::uint32_t>>(text, opt, seed)
                  : matrix_market_case<IsingModel<std::int32_t, std::uint16_t>>(text, opt, seed);
    case 5:
      return wide ? matrix_market_case<QuboModel<std::int32_t, std::uint32_t>>(text, opt, seed)
                  : matrix_market_case<QuboModel<std::int32_t, std::uint16_t>>(text, opt, seed);
    case 6:
      return wide ? matrix_market_case<IsingModel<std::int64_t, std::uint32_t>>(text, opt, seed)
                  : matrix_market_case<IsingModel<std::int64_t, std::uint16_t>>(text, opt, seed);
    default:
      return wide ? matrix_market_case<QuboModel<std::int64_t, std::uint32_t>>(text, opt, seed)
                  : matrix_market_case<QuboModel<std::int64_t, std::uint16_t>>(text, opt, seed);
  }
}

// State-file reader: the first byte gives the expected size (or none).
inline Failure state_entry(const std::uint8_t* data, std::size_t size) {
  using namespace spinwright;
  if (size == 0) return nullptr;
  const std::string_view text(reinterpret_cast<const char*>(data + 1), size - 1);
  io::ReadOptions opt;
  opt.max_spins = 4096;
  const std::uint64_t expected = (data[0] & 0x80) ? io::any_size : (data[0] == 0x7f ? opt.max_spins + 1 : data[0] % 64);
  auto read = io::parse_state(text, fuzz_file_name, expected, opt);
  if (!read.ok()) return check_io_refusal(read.status(), text);
  const std::vector<std::int8_t>& spins = read.value();
  if (expected != io::any_size && spins.size() != expected) return "state size differs from the expected size";
  if (spins.empty() && expected == io::any_size) return "empty state accepted without an expected size";
  if (spins.size() > opt.max_spins) return "state longer than ReadOptions::max_spins";
  for (const std::int8_t s : spins) {
    if (s != 1 && s != -1) return "state value other than +1/-1";
  }
  for (const auto style : {io::StateStyle::spins, io::StateStyle::bits}) {
    auto text2 = io::format_state(spins, style, "written by the state fuzzer\nsecond line");
    if (!text2.ok()) return "format_state refused spins it read";
    auto again = io::parse_state(text2.value(), fuzz_file_name, spins.size(), opt);
    if (!again.ok() || again.value() != spins) return "a state written by format_state does not read back";
  }
  return nullptr;
}

// ---------------------------------------------------------------------------------------------
// SparseModelView::over(): caller arrays (no heap) checked before use.

template <spinwright::Form F, class Value, class Index>
Failure view_case(ByteReader& r, std::uint64_t seed) {
  using namespace spinwright;
  using Energy = energy_t<Value>;
  using View = SparseModelView<F, Value, Index>;
  constexpr bool integral = std::is_integral_v<Value>;
  const std::size_t n = r.byte() % 12;
  std::vector<std::size_t> row(n + 1, 0);
  if (r.byte() == 0xa5) row[0] = 1;  // a bad first entry
  std::size_t top = row[0];
  for (std::size_t i = 0; i < n; ++i) {
    const std::uint8_t b = r.byte();
    row[i + 1] = (b & 0x80) && row[i] > 0 ? row[i] - 1 : row[i] + b % 6;
    if (row[i + 1] > top) top = row[i + 1];
  }
  std::vector<Index> nbr(top + 1);
  std::vector<Value> val(top + 1);
  std::vector<Value> lin(n + 1);
  // Mostly a consistent symmetric pattern: entry k of row i mirrors a random earlier choice.
  for (std::size_t k = 0; k <= top; ++k) {
    nbr[k] = static_cast<Index>(r.byte() % (n + 2));
    val[k] = decode_value<Value>(r);
  }
  for (std::size_t i = 0; i < n; ++i) lin[i] = decode_value<Value>(r);
  const Energy offset = decode_value<Energy>(r);
  auto made = View::over(n, lin.data(), row.data(), nbr.data(), val.data(), offset);

  // Independent validity of the arrays.
  bool valid = row[0] == 0 && finite_value(offset);
  for (std::size_t i = 0; i < n && valid; ++i) {
    if (row[i + 1] < row[i] || !finite_value(lin[i])) valid = false;
  }
  auto lookup = [&](std::size_t i, std::size_t j, Value& out) {
    for (std::size_t k = row[i]; k < row[i + 1]; ++k) {
      if (nbr[k] == j) {
        out = val[k];
        return true;
      }
    }
    return false;
  };
  for (std::size_t i = 0; i < n && valid; ++i) {
    for (std::size_t k = row[i]; k < row[i + 1] && valid; ++k) {
      const std::size_t j = nbr[k];
      Value back{};
      if (j >= n || j == i || (k > row[i] && nbr[k - 1] >= nbr[k]) || !finite_value(val[k]) || val[k] == Value{0} ||
          !lookup(j, i, back) || !(back == val[k])) {
        valid = false;
      }
    }
  }
  bool maybe = false;
  if (valid) {
    if constexpr (integral) {
      Wide sum = magnitude<Wide>(offset);
      for (std::size_t i = 0; i < n; ++i) {
        sum += magnitude<Wide>(lin[i]);
        for (std::size_t k = row[i]; k < row[i + 1]; ++k) {
          if (nbr[k] > i) sum += magnitude<Wide>(val[k]);
        }
      }
      if (sum > static_cast<Wide>(integer_energy_limit)) valid = false;
    } else {
      long double sum = magnitude<long double>(offset);
      for (std::size_t i = 0; i < n; ++i) {
        sum += magnitude<long double>(lin[i]);
        for (std::size_t k = row[i]; k < row[i + 1]; ++k) {
          if (nbr[k] > i) sum += magnitude<long double>(val[k]);
        }
      }
      const long double lim = float_energy_limit;
      if (sum > lim * (1 + 1e-9L))
        valid = false;
      else if (sum > lim * (1 - 1e-9L))
        maybe = true;
    }
  }
  if (!made.ok()) {
    if (valid && !maybe) return "SparseModelView::over refused valid arrays";
    if (made.status().message == nullptr || made.status().message[0] == '\0') return "view refusal without a message";
    return nullptr;
  }
  if (!valid) return "SparseModelView::over accepted invalid arrays";
  const View& v = made.value();
  if (v.num_spins() != n || v.num_pairs() * 2 != row[n]) return "view size differs from the arrays";
  if (n == 0) return nullptr;

  // The same terms through a builder: same energies, same bound.
  std::conditional_t<F == Form::ising, IsingBuilder<Value, Index>, QuboBuilder<Value, Index>> b(n);
  for (std::size_t i = 0; i < n; ++i) {
    if constexpr (F == Form::ising)
      b.add_field(i, lin[i]);
    else
      b.add_unary(i, lin[i]);
    for (std::size_t k = row[i]; k < row[i + 1]; ++k) {
      if (nbr[k] <= i) continue;
      if constexpr (F == Form::ising)
        b.add_coupling(i, nbr[k], val[k]);
      else
        b.add_pair(i, nbr[k], val[k]);
    }
  }
  b.add_offset(offset);
  auto m = b.build();
  if (!m.ok()) return maybe ? nullptr : "builder refused terms a view accepted";
  if constexpr (integral) {
    if (v.energy_bound() != m->energy_bound()) return "view and builder disagree on the energy bound";
  }
  Xoshiro256 rng(seed);
  SpinState<View> st(v);
  for (int k = 0; k < 24; ++k) {
    st.randomize(rng);
    for (int f = 0; f < 4; ++f) st.flip(static_cast<Index>(rng.below(static_cast<std::uint32_t>(n))));
    if constexpr (integral) {
      if (st.energy() != m->energy(st.spins())) return "view state energy differs from the built model";
      if (!st.check().exact) return "view state drifted";
    } else {
      if (!finite_value(st.energy())) return "non-finite energy in a view state";
      for (std::size_t i = 0; i < n; ++i) {
        if (!finite_value(st.delta(static_cast<Index>(i)))) return "non-finite delta in a view state";
      }
      const long double d = magnitude(static_cast<long double>(st.energy()) - m->energy(st.spins()));
      if (d > 1e-9L * (v.energy_bound() + 1e-300)) return "view state energy far from the built model";
    }
  }
  return nullptr;
}

inline Failure view_entry(const std::uint8_t* data, std::size_t size) {
  using spinwright::Form;
  ByteReader r(data, size);
  const std::uint8_t c = r.byte();
  const std::uint64_t seed = hash_bytes(data, size);
  const bool ising = (c & 1) == 0;
  const bool wide = (c & 8) != 0;
#define SPINWRIGHT_FUZZ_VIEW(V)                                             \
  return ising ? (wide ? view_case<Form::ising, V, std::uint32_t>(r, seed)  \
                       : view_case<Form::ising, V, std::uint16_t>(r, seed)) \
               : (wide ? view_case<Form::qubo, V, std::uint32_t>(r, seed)   \
                       : view_case<Form::qubo, V, std::uint16_t>(r, seed))
  switch ((c >> 1) & 3) {
    case 0:
      SPINWRIGHT_FUZZ_VIEW(double);
    case 1:
      SPINWRIGHT_FUZZ_VIEW(float);
    case 2:
      SPINWRIGHT_FUZZ_VIEW(std::int32_t);
    default:
      SPINWRIGHT_FUZZ_VIEW(std::int64_t);
  }
#undef SPINWRIGHT_FUZZ_VIEW
}

// Ends a fuzz run when an entry reports a broken invariant; libFuzzer then keeps the input.
inline void require_invariants(const char* failure) {
  if (failure != nullptr) {
    std::fprintf(stderr, "invariant broken: %s\n", failure);
    std::abort();
  }
}

}  // namespace fuzz_entries

// The assertion of every libFuzzer target: SPINWRIGHT_FUZZ_REQUIRE(fuzz_entries::X_entry(data, size)).
#define SPINWRIGHT_FUZZ_REQUIRE(entry_call) fuzz_entries::require_invariants(entry_call)

#endif  // SPINWRIGHT_TESTS_FUZZ_FUZZ_ENTRIES_HPP
