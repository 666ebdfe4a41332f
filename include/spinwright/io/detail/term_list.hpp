// spinwright — the form-independent result of scanning a model file (a list of terms, each
// with its source line and token) and the step that turns it into a model through the
// builders, so that every refusal can still name the line it came from. Internal to io/.
#ifndef SPINWRIGHT_IO_DETAIL_TERM_LIST_HPP
#define SPINWRIGHT_IO_DETAIL_TERM_LIST_HPP

#include "../../config.hpp"
#include "../../model/builder.hpp"
#include "../../model/form.hpp"
#include "../../model/sparse_model.hpp"
#include "../../status.hpp"
#include "../io_status.hpp"
#include "../text_input.hpp"

#include <cstddef>      // std::size_t
#include <cstdint>      // std::uint64_t, std::uint16_t
#include <string>       // std::string
#include <string_view>  // std::string_view
#include <type_traits>  // std::is_integral_v, std::conditional_t
#include <utility>      // std::move
#include <vector>       // std::vector

namespace spinwright::io::detail {

/// One value read from a file: 0-based indices, the number, its token and line, in 48 bytes
/// (a file of a million terms holds a million of these while it is read).
struct RawTerm {
  std::uint64_t i = 0;
  std::uint64_t j = 0;
  std::uint64_t line = 0;

  /// The number as parse_number gave it (for a whole number in range, d is i as a double, as
  /// parse_number sets it).
  Number value() const noexcept {
    Number n;
    n.integer = (flags_ & integer_flag) != 0;
    n.int_overflow = (flags_ & overflow_flag) != 0;
    if ((flags_ & (integer_flag | overflow_flag)) == integer_flag) {
      n.i = whole_;
      n.d = static_cast<double>(whole_);
    } else {
      n.d = real_;
    }
    return n;
  }
  void set_value(const Number& n) noexcept {
    flags_ = static_cast<std::uint8_t>((flags_ & mirrored_flag) | (n.integer ? integer_flag : 0) |
                                       (n.int_overflow ? overflow_flag : 0));
    if (n.integer && !n.int_overflow) {
      whole_ = n.i;
    } else {
      real_ = n.d;
    }
  }
  /// The token the number was read from; points into the scanned text (or at a literal). Only
  /// messages quote it, which show its first 40 characters.
  std::string_view token() const noexcept { return {token_, token_size_}; }
  void set_token(std::string_view t) noexcept {
    token_ = t.data();
    token_size_ = static_cast<std::uint32_t>(t.size() < 0xFFFFFFFFu ? t.size() : 0xFFFFFFFFu);
  }
  /// Matrix Market symmetric storage: stands for (i, j) and (j, i).
  bool mirrored() const noexcept { return (flags_ & mirrored_flag) != 0; }
  void set_mirrored(bool m) noexcept {
    flags_ = static_cast<std::uint8_t>((flags_ & ~mirrored_flag) | (m ? mirrored_flag : 0));
  }

 private:
  static constexpr std::uint8_t integer_flag = 1, overflow_flag = 2, mirrored_flag = 4;
  const char* token_ = nullptr;
  union {
    std::int64_t whole_ = 0;
    double real_;
  };
  std::uint32_t token_size_ = 0;
  std::uint8_t flags_ = 0;
};
static_assert(sizeof(void*) != 8 || sizeof(RawTerm) == 48, "RawTerm: 48 bytes on 64-bit targets");

/// What a scanner found, before any value type is chosen.
struct TermList {
  Form form = Form::ising;
  std::uint64_t num_spins = 0;
  std::uint64_t header_line = 0;    // line of the size header (for whole-model errors)
  std::uint64_t form_line = 0;      // line that fixed the form (0 if defaulted)
  bool diagonal_is_linear = false;  // Matrix Market: (i, i) is a field / unary term
  bool all_integer = true;          // automatic value type is int64_t (see model_file.hpp)
  bool has_offset = false;
  Number offset;
  std::string_view offset_token;
  std::uint64_t offset_line = 0;
  std::vector<RawTerm> terms;
};

inline std::string index_type_name(std::size_t bytes) { return bytes == 2 ? "uint16_t" : "uint32_t"; }

/// The source line of builder term `term` of build_terms below, which adds one term per entry
/// (two for a mirrored pair) and the offset last. False past the last term.
inline bool term_line(const TermList& list, std::uint64_t term, std::uint64_t& line) {
  std::uint64_t at = 0;
  for (const RawTerm& t : list.terms) {
    at += (t.mirrored() && !(t.i == t.j && list.diagonal_is_linear)) ? std::uint64_t{2} : std::uint64_t{1};
    if (term < at) {
      line = t.line;
      return true;
    }
  }
  if (list.has_offset && term == at) {
    line = list.offset_line;
    return true;
  }
  return false;
}

/// Builds a model of form F from a scanned term list; every error names a line.
template <Form F, class Value, class Index>
IoResult<SparseModel<F, Value, Index>> build_terms(const TermList& list, std::string_view name) {
  using Energy = energy_t<Value>;
  if (list.num_spins > max_spins_v<Index>) {
    return IoStatus::error(StatusCode::index_out_of_range, name, list.header_line,
                           std::to_string(list.num_spins) + " spins exceed what the index type " +
                               index_type_name(sizeof(Index)) + " can address (" + std::to_string(max_spins_v<Index>) +
                               ")");
  }
  using Builder = std::conditional_t<F == Form::ising, IsingBuilder<Value, Index>, QuboBuilder<Value, Index>>;
  Builder b(list.num_spins);
  b.reserve(list.terms.size());
  StatusCode code = StatusCode::ok;
  for (const RawTerm& t : list.terms) {
    Value v{};
    const std::string why = number_to_value<Value>(t.value(), t.token(), v, code);
    if (!why.empty()) return IoStatus::error(code, name, t.line, why);
    if (t.i == t.j && list.diagonal_is_linear) {
      if constexpr (F == Form::ising) {
        b.add_field(t.i, v);
      } else {
        b.add_unary(t.i, v);
      }
      continue;
    }
    const int copies = t.mirrored() ? 2 : 1;
    for (int c = 0; c < copies; ++c) {
      if constexpr (F == Form::ising) {
        b.add_coupling(t.i, t.j, v);
      } else {
        b.add_pair(t.i, t.j, v);
      }
    }
  }
  if (list.has_offset) {
    Energy c{};
    if constexpr (std::is_integral_v<Value>) {
      if (!list.offset.integer) {
        return IoStatus::error(StatusCode::parse_error, name, list.offset_line,
                               "real offset " + quote(list.offset_token) + " for an integer model");
      }
      if (list.offset.int_overflow) {
        return IoStatus::error(StatusCode::value_out_of_range, name, list.offset_line,
                               "offset " + quote(list.offset_token) + " does not fit a 64-bit integer");
      }
      c = list.offset.i;
    } else {
      c = list.offset.d;
    }
    b.add_offset(c);
  }
  auto built = b.build();
  if (built.ok()) return std::move(built).value();
  const Status& st = built.status();
  std::uint64_t line = list.header_line;
  std::string why = st.message;
  if (st.term != no_term && term_line(list, st.term, line)) {
    // `line` is the term's (the builder counts a mirrored entry as two terms, the offset last).
  } else if (st.code == StatusCode::value_out_of_range) {
    // A merged coefficient: point at the last line that contributed to it.
    for (const RawTerm& t : list.terms) {
      const bool same = (t.i == st.i && t.j == st.j) || (t.i == st.j && t.j == st.i);
      if (same) line = t.line;
    }
    why += " (terms " + std::to_string(st.i + 1) + " " + std::to_string(st.j + 1) + ", 1-based)";
  }
  return IoStatus::error(st.code, name, line, why);
}

}  // namespace spinwright::io::detail

#endif  // SPINWRIGHT_IO_DETAIL_TERM_LIST_HPP
