// spinwright command-line program — the model a command works on, read from a file.
// A file whose values are all integers is held as int32 (energy range within int32) or int64,
// one with real values as double; 32-bit indices throughout. Kernels are instantiated once per
// value type, each in its own translation unit (runner_<type>.cpp). See docs/cli.md.
#ifndef SPINWRIGHT_CLI_LOADED_MODEL_HPP
#define SPINWRIGHT_CLI_LOADED_MODEL_HPP

#include "args.hpp"

#include <spinwright/io/model_file.hpp>
#include <spinwright/model/sparse_model.hpp>

#include <cstddef>  // std::size_t
#include <cstdint>  // std::int8_t, std::uint32_t
#include <string>   // std::string
#include <vector>   // std::vector

namespace spinwright_cli {

template <class Value>
using IsingOf = spinwright::IsingModel<Value, std::uint32_t>;
template <class Value>
using QuboOf = spinwright::QuboModel<Value, std::uint32_t>;

// The value type a model is held with (and the kernels run on).
enum class ValueType { int32, int64, real };
const char* value_type_name(ValueType v);  // "int32", "int64", "double"

struct LoadedModel {
  std::string path;
  std::string format;       // "edges" or "mtx"
  std::string description;  // for people, e.g. "edge list (max-cut graph)"
  spinwright::Form form = spinwright::Form::ising;
  bool graph = false;  // an edge list: a max-cut graph, J = w, h = 0
  ValueType value_type = ValueType::real;
  // Exactly one of these is the model read: the one selected by `form` and `value_type`.
  IsingOf<std::int32_t> ising32;
  QuboOf<std::int32_t> qubo32;
  IsingOf<std::int64_t> ising64;
  QuboOf<std::int64_t> qubo64;
  IsingOf<double> ising;
  QuboOf<double> qubo;

  std::size_t num_spins() const;
  std::size_t num_pairs() const;
  const char* form_name() const { return form == spinwright::Form::ising ? "ising" : "qubo"; }
  // Energy of an assignment (+1/-1), offset included, in the file's own form.
  double energy(const std::vector<std::int8_t>& spins) const;
  // Edge lists only: the cut of an assignment and the total edge weight.
  double cut(const std::vector<std::int8_t>& spins) const;
  double total_weight() const;
  // The energy range |offset| + sum |site terms| + sum |pairs| (scale of rounding tolerances).
  double energy_bound() const;
};

// Calls f(model) with the model that was read; every call must return the same type.
template <class F>
decltype(auto) visit(const LoadedModel& m, F&& f) {
  const bool ising = m.form == spinwright::Form::ising;
  switch (m.value_type) {
    case ValueType::int32:
      if (ising) return f(m.ising32);
      return f(m.qubo32);
    case ValueType::int64:
      if (ising) return f(m.ising64);
      return f(m.qubo64);
    case ValueType::real:
      break;
  }
  if (ising) return f(m.ising);
  return f(m.qubo);
}

// The --value-type option: "auto" (default), "int32", "int64" or "double".
struct ValueChoice {
  bool automatic = true;
  ValueType type = ValueType::real;
};
Failure value_type_option(const Args& args, const std::string& command, ValueChoice& out);

// Reads FILE. `forced` is "", "edges" or "mtx". Failures are input errors "file:line: reason".
// The value type: int32 for an all-integer file whose energy range (|offset| + sum of
// |coefficients|) is at most 2^31 - 1, int64 for other all-integer files, double for files
// with real values; `values` may ask for a wider type (int32 -> int64 -> double) but never a
// narrower one than the file needs.
Failure load_model(const std::string& path, const std::string& forced, LoadedModel& out,
                   const ValueChoice& values = {});

// Reads FILE keeping the value type the file implies (int64_t or double), for `convert`.
Failure load_raw_model(const std::string& path, const std::string& forced, spinwright::io::LoadedModel& out);

// Reads a state file for a model of `n` spins, as +1/-1 spins.
Failure load_state(const std::string& path, std::size_t n, std::vector<std::int8_t>& spins);
// Writes a state file; `as_bits` for QUBO models.
Failure save_state(const std::string& path, const std::vector<std::int8_t>& spins, bool as_bits);

// The --format option: "", "edges" or "mtx"; anything else is a usage error.
Failure check_format_option(const Args& args, const std::string& name, const std::string& command, std::string& out);

// Figures for `inspect` and for the automatic kernel choice.
struct ModelFigures {
  std::size_t nodes = 0;
  std::size_t pairs = 0;
  std::size_t min_degree = 0;
  std::size_t max_degree = 0;
  double mean_degree = 0;
  double density = 0;  // pairs / (N (N - 1) / 2)
  std::size_t site_terms_nonzero = 0;
  double site_term_min = 0;  // over all N site terms (fields or unary terms)
  double site_term_max = 0;
  double pair_min = 0;  // over stored pairs (0 when none)
  double pair_max = 0;
  double offset = 0;
  std::size_t components = 0;  // connected components of the pair graph (isolated nodes count)
  std::size_t largest_component = 0;
  double model_bytes = 0;  // the CSR model as stored
  double state_bytes = 0;  // one SpinState (spins, local fields, marks) per restart
};
ModelFigures figures_of(const LoadedModel& m);

}  // namespace spinwright_cli

#endif  // SPINWRIGHT_CLI_LOADED_MODEL_HPP
