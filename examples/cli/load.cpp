// spinwright command-line program — reading models and states through io/, and the choice of
// the value type a model is held with: int32 or int64 for all-integer files (exact), double for
// files with real values (see load_model in loaded_model.hpp).
#include "loaded_model.hpp"
#include "spread.hpp"

#include <spinwright/io/model_file.hpp>
#include <spinwright/io/state_file.hpp>
#include <spinwright/model/convert.hpp>

#include <cstdint>      // std::int32_t, std::int64_t
#include <limits>       // std::numeric_limits
#include <type_traits>  // std::is_integral_v

namespace spinwright_cli {

const char* value_type_name(ValueType v) {
  switch (v) {
    case ValueType::int32:
      return "int32";
    case ValueType::int64:
      return "int64";
    case ValueType::real:
      break;
  }
  return "double";
}

Failure value_type_option(const Args& args, const std::string& command, ValueChoice& out) {
  out = ValueChoice{};
  const std::string* v = args.value("value-type");
  if (v == nullptr || *v == "auto") return {};
  out.automatic = false;
  if (*v == "int32") {
    out.type = ValueType::int32;
  } else if (*v == "int64") {
    out.type = ValueType::int64;
  } else if (*v == "double") {
    out.type = ValueType::real;
  } else {
    return usage_failure("option '--value-type' expects 'auto', 'int32', 'int64' or 'double', got '" + *v + "'",
                         "run 'spinwright " + command + " --help' for the options");
  }
  return {};
}

namespace {

std::string io_message(const spinwright::io::IoStatus& st) {
  return st.line == 0 ? st.file + ": " + st.reason : st.message;
}

template <class Value, spinwright::Form F, class From>
Failure store(const std::string& path, const spinwright::SparseModel<F, From, std::uint32_t>& model,
              spinwright::SparseModel<F, Value, std::uint32_t>& out) {
  // The same pattern with another value type (no re-sort); callers have checked that every
  // value converts exactly (int64 -> int32 within the int32 range; integers -> double below 2^53).
  auto converted = spinwright::with_value_type<Value>(model);
  if (!converted) return input_failure(path + ": " + converted.status().message);
  out = std::move(converted).value();
  return {};
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

Failure read_model(const std::string& path, const std::string& forced, LoadedModel& out, const ValueChoice& values) {
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
    constexpr bool ising = Model::form == spinwright::Form::ising;
    ValueType need = ValueType::real;
    if constexpr (std::is_integral_v<Value>) {
      need = model.energy_bound() <= static_cast<double>(std::numeric_limits<std::int32_t>::max()) ? ValueType::int32
                                                                                                   : ValueType::int64;
    }
    ValueType use = need;
    if (!values.automatic) {
      if (static_cast<int>(values.type) < static_cast<int>(need)) {
        return input_failure(
            path + ": --value-type " + value_type_name(values.type) + " cannot hold this model exactly; it needs " +
            value_type_name(need) +
            (need == ValueType::int64 ? " (the energy range is beyond 2^31 - 1)" : " (the file has real values)"));
      }
      use = values.type;
    }
    if constexpr (std::is_integral_v<Value>) {
      if (use == ValueType::real && model.energy_bound() >= 0x1.0p53) {
        return input_failure(path +
                             ": --value-type double cannot hold this model exactly: the energy range "
                             "(sum of |coefficients|) reaches 2^53");
      }
    }
    out.value_type = use;
    switch (use) {
      case ValueType::int32:
        if constexpr (std::is_integral_v<Value>) {
          if constexpr (ising) return store<std::int32_t>(path, model, out.ising32);
          if constexpr (!ising) return store<std::int32_t>(path, model, out.qubo32);
        }
        break;
      case ValueType::int64:
        if constexpr (std::is_integral_v<Value>) {
          if constexpr (ising) return store<std::int64_t>(path, model, out.ising64);
          if constexpr (!ising) return store<std::int64_t>(path, model, out.qubo64);
        }
        break;
      case ValueType::real:
        if constexpr (ising) return store<double>(path, model, out.ising);
        if constexpr (!ising) return store<double>(path, model, out.qubo);
        break;
    }
    return input_failure(path + ": internal error: no value type for this model");
  });
}

}  // namespace

Failure load_model(const std::string& path, const std::string& forced, LoadedModel& out, const ValueChoice& values) {
  Failure f = read_model(path, forced, out, values);
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
