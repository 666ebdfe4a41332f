// spinwright command-line program — reading models and states through io/, and the
// conversion of every model to double values (exact for integer files whose energy range is
// below 2^53, refused above).
#include "loaded_model.hpp"
#include "spread.hpp"

#include <spinwright/io/model_file.hpp>
#include <spinwright/io/state_file.hpp>
#include <spinwright/model/builder.hpp>

#include <type_traits>  // std::is_integral_v

namespace spinwright_cli {

namespace {

std::string io_message(const spinwright::io::IoStatus& st) {
  return st.line == 0 ? st.file + ": " + st.reason : st.message;
}

// Rebuilds a model with double values; integers are exact below 2^53.
template <spinwright::Form F, class Value>
spinwright::Result<spinwright::SparseModel<F, double, std::uint32_t>> to_double(
    const spinwright::SparseModel<F, Value, std::uint32_t>& m) {
  using Index = std::uint32_t;
  const std::size_t n = m.num_spins();
  std::conditional_t<F == spinwright::Form::ising, spinwright::IsingBuilder<double, Index>,
                     spinwright::QuboBuilder<double, Index>>
      b(n);
  b.reserve(m.num_pairs());
  for (std::size_t i = 0; i < n; ++i) {
    const auto ii = static_cast<Index>(i);
    const double lin = static_cast<double>(m.site_term(ii));
    if constexpr (F == spinwright::Form::ising) {
      b.add_field(i, lin);
    } else {
      b.add_unary(i, lin);
    }
    m.for_each_neighbour(ii, [&](Index j, Value v) {
      if (j <= ii) return;
      if constexpr (F == spinwright::Form::ising) {
        b.add_coupling(i, j, static_cast<double>(v));
      } else {
        b.add_pair(i, j, static_cast<double>(v));
      }
    });
  }
  b.add_offset(static_cast<double>(m.offset()));
  return b.build();
}

}  // namespace

Failure load_raw_model(const std::string& path, const std::string& forced, spinwright::io::LoadedModel& out) {
  namespace io = spinwright::io;
  auto text = io::read_file_text(path);
  if (!text.ok()) return input_failure(io_message(text.status()));
  const io::FileFormat detected = io::detect_format(text.value());
  if (forced == "mtx" && detected != io::FileFormat::matrix_market) {
    return input_failure(path + ":1: expected the Matrix Market banner '%%MatrixMarket' (--format mtx)");
  }
  if (forced == "edges" && detected == io::FileFormat::matrix_market) {
    // Read as an edge list all the same: the banner line is then a comment.
    auto parsed = io::parse_edge_list<double>(text.value(), path);
    if (!parsed.ok()) return input_failure(io_message(parsed.status()));
    out = io::LoadedModel{};
    out.format = io::FileFormat::edge_list;
    out.form = spinwright::Form::ising;
    out.integer = false;
    out.ising_real = std::move(parsed).value();
    return {};
  }
  auto parsed = io::parse_model_text(text.value(), path);
  if (!parsed.ok()) return input_failure(io_message(parsed.status()));
  out = std::move(parsed).value();
  return {};
}

namespace {

Failure read_model(const std::string& path, const std::string& forced, LoadedModel& out) {
  namespace io = spinwright::io;
  io::LoadedModel raw;
  Failure f = load_raw_model(path, forced, raw);
  if (f.failed()) return f;
  out.path = path;
  out.graph = raw.format == io::FileFormat::edge_list;
  out.format = out.graph ? "edges" : "mtx";
  out.form = raw.form;
  out.description = out.graph ? "edge list (max-cut graph)"
                              : std::string("Matrix Market coordinate, ") +
                                    (raw.form == spinwright::Form::ising ? "Ising form" : "QUBO form");
  return raw.visit([&](const auto& model) -> Failure {
    using Model = std::decay_t<decltype(model)>;
    using Value = typename Model::value_type;
    if constexpr (std::is_integral_v<Value>) {
      if (model.energy_bound() >= 0x1.0p53) {
        return input_failure(path +
                             ": integer coefficients too large: the energy range (sum of |coefficients|) "
                             "reaches 2^53, beyond exact arithmetic in double precision");
      }
    }
    auto converted = to_double(model);
    if (!converted) return input_failure(path + ": " + converted.status().message);
    if constexpr (Model::form == spinwright::Form::ising) {
      out.ising = std::move(converted).value();
    } else {
      out.qubo = std::move(converted).value();
    }
    return {};
  });
}

}  // namespace

Failure load_model(const std::string& path, const std::string& forced, LoadedModel& out) {
  Failure f = read_model(path, forced, out);
  // Under spinwright-mpi every rank reads the file; all go on only if all could.
  if (!job_agree(!f.failed()) && !f.failed()) {
    return input_failure(path + ": another rank of the job could not read this file (its message is on that rank)");
  }
  return f;
}

Failure load_state(const std::string& path, std::size_t n, std::vector<std::int8_t>& spins) {
  auto read = spinwright::io::read_state(path, n);
  if (!read.ok()) return input_failure(io_message(read.status()));
  spins = std::move(read).value();
  return {};
}

Failure save_state(const std::string& path, const std::vector<std::int8_t>& spins, bool as_bits) {
  if (!is_report_rank()) return {};
  const auto st = spinwright::io::write_state(
      path, spins, as_bits ? spinwright::io::StateStyle::bits : spinwright::io::StateStyle::spins);
  if (!st.ok()) return input_failure(io_message(st));
  return {};
}

}  // namespace spinwright_cli
