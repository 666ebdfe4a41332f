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

/// One value read from a file: 0-based indices, the number, the token and its line.
struct RawTerm {
  std::uint64_t i = 0;
  std::uint64_t j = 0;
  Number value;
  std::string_view token;  // points into the scanned text
  std::uint64_t line = 0;
  bool mirrored = false;  // Matrix Market symmetric storage: stands for (i, j) and (j, i)
};

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
  std::vector<std::uint64_t> term_lines;  // builder term position -> source line
  term_lines.reserve(list.terms.size() + 1);
  StatusCode code = StatusCode::ok;
  for (const RawTerm& t : list.terms) {
    Value v{};
    const std::string why = number_to_value<Value>(t.value, t.token, v, code);
    if (!why.empty()) return IoStatus::error(code, name, t.line, why);
    if (t.i == t.j && list.diagonal_is_linear) {
      if constexpr (F == Form::ising) {
        b.add_field(t.i, v);
      } else {
        b.add_unary(t.i, v);
      }
      term_lines.push_back(t.line);
      continue;
    }
    const int copies = t.mirrored ? 2 : 1;
    for (int c = 0; c < copies; ++c) {
      if constexpr (F == Form::ising) {
        b.add_coupling(t.i, t.j, v);
      } else {
        b.add_pair(t.i, t.j, v);
      }
      term_lines.push_back(t.line);
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
    term_lines.push_back(list.offset_line);
  }
  auto built = b.build();
  if (built.ok()) return std::move(built).value();
  const Status& st = built.status();
  std::uint64_t line = list.header_line;
  std::string why = st.message;
  if (st.term != no_term && st.term < term_lines.size()) {
    line = term_lines[static_cast<std::size_t>(st.term)];
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
