// spinwright — one entry point for model files of either format. The format is detected from
// the content (a first line starting with '%%MatrixMarket' means Matrix Market, anything else
// is an edge list); an edge list is always an Ising max-cut model, a Matrix Market file is
// Ising or QUBO by its '% spinwright form' directive. The value type (unless
// ReadOptions::value_kind fixes it): for Matrix Market, the banner's field ('integer' ->
// int64_t, 'real' -> double); for an edge list, int64_t when every weight is an integer literal
// that fits int64_t, double otherwise. The index type is uint32_t.
#ifndef SPINWRIGHT_IO_MODEL_FILE_HPP
#define SPINWRIGHT_IO_MODEL_FILE_HPP

#include "../config.hpp"
#include "../model/form.hpp"
#include "../model/sparse_model.hpp"
#include "../status.hpp"
#include "edge_list.hpp"
#include "io_status.hpp"
#include "matrix_market.hpp"
#include "detail/term_list.hpp"
#include "text_input.hpp"

#include <cstddef>      // std::size_t
#include <cstdint>      // std::int64_t, std::uint8_t
#include <string>       // std::string
#include <string_view>  // std::string_view
#include <utility>      // std::move, std::forward

namespace spinwright::io {

enum class FileFormat : std::uint8_t { edge_list, matrix_market };

inline constexpr const char* to_string(FileFormat f) noexcept {
  return f == FileFormat::edge_list ? "edge list" : "Matrix Market";
}

/// Detects the format of a model file from its text: Matrix Market when the first line starts
/// with '%%MatrixMarket' (case-insensitive, leading blanks allowed), an edge list otherwise.
inline FileFormat detect_format(std::string_view text) noexcept {
  detail::LineReader reader(text);
  detail::Line line;
  if (reader.next(line) && detail::starts_with_banner(detail::trim(line.text))) return FileFormat::matrix_market;
  return FileFormat::edge_list;
}

/// A model read from a file of either format. Exactly one of the four models is the one that
/// was read: the one selected by `form` and `integer`; the other three are empty.
struct LoadedModel {
  FileFormat format = FileFormat::edge_list;
  Form form = Form::ising;
  bool integer = true;  // value type int64_t (true) or double (false)
  IsingModel<std::int64_t> ising_integer;
  IsingModel<double> ising_real;
  QuboModel<std::int64_t> qubo_integer;
  QuboModel<double> qubo_real;

  /// Calls f(model) with the model that was read; every call must return the same type.
  template <class Fn>
  decltype(auto) visit(Fn&& f) const {
    if (form == Form::ising) {
      if (integer) return std::forward<Fn>(f)(ising_integer);
      return std::forward<Fn>(f)(ising_real);
    }
    if (integer) return std::forward<Fn>(f)(qubo_integer);
    return std::forward<Fn>(f)(qubo_real);
  }

  std::size_t num_spins() const noexcept {
    return visit([](const auto& m) { return m.num_spins(); });
  }
  std::size_t num_pairs() const noexcept {
    return visit([](const auto& m) { return m.num_pairs(); });
  }
};

namespace detail {

template <Form F, class Value>
IoStatus build_into(const TermList& list, std::string_view name, SparseModel<F, Value, std::uint32_t>& out) {
  auto built = build_terms<F, Value, std::uint32_t>(list, name);
  if (!built.ok()) return built.status();
  out = std::move(built).value();
  return IoStatus::success();
}

}  // namespace detail

/// Parses a model of either format held in memory; `name` is used in messages. The fuzzing
/// entry point for the combined reader.
inline IoResult<LoadedModel> parse_model_text(std::string_view text, std::string_view name,
                                              const ReadOptions& options = {}) {
  LoadedModel loaded;
  loaded.format = detect_format(text);
  auto scanned = loaded.format == FileFormat::matrix_market ? detail::scan_matrix_market(text, name, options)
                                                            : detail::scan_edge_list(text, name, options);
  if (!scanned.ok()) return scanned.status();
  const detail::TermList& list = scanned.value();
  loaded.form = list.form;
  loaded.integer =
      options.value_kind == ValueKind::integer || (options.value_kind == ValueKind::automatic && list.all_integer);
  IoStatus st;
  if (loaded.form == Form::ising) {
    st = loaded.integer ? detail::build_into(list, name, loaded.ising_integer)
                        : detail::build_into(list, name, loaded.ising_real);
  } else {
    st = loaded.integer ? detail::build_into(list, name, loaded.qubo_integer)
                        : detail::build_into(list, name, loaded.qubo_real);
  }
  if (!st.ok()) return st;
  return loaded;
}

/// Reads a model file of either format (see parse_model_text).
inline IoResult<LoadedModel> read_model_file(const std::string& path, const ReadOptions& options = {}) {
  auto text = read_file_text(path, options);
  if (!text.ok()) return text.status();
  return parse_model_text(text.value(), path, options);
}

/// Formats a loaded model in the given format. An edge list needs an Ising model without
/// fields or offset (invalid_argument otherwise, line 0); Matrix Market holds any model.
inline IoResult<std::string> format_model(const LoadedModel& m, FileFormat format, std::string_view name = "<model>") {
  if (format == FileFormat::matrix_market) {
    return m.visit([](const auto& model) { return format_matrix_market(model); });
  }
  if (m.form != Form::ising) {
    return IoStatus::error(
        StatusCode::invalid_argument, name, 0,
        "an edge list holds max-cut (Ising) models only; convert the QUBO model or write Matrix Market");
  }
  return m.integer ? format_edge_list(m.ising_integer, name) : format_edge_list(m.ising_real, name);
}

/// Writes a loaded model to a file in the given format; errors name `path`.
inline IoStatus write_model_file(const std::string& path, const LoadedModel& m, FileFormat format) {
  auto text = format_model(m, format, path);
  if (!text.ok()) return text.status();
  return write_file_text(path, text.value());
}

}  // namespace spinwright::io

#endif  // SPINWRIGHT_IO_MODEL_FILE_HPP
