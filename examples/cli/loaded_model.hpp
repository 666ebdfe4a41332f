// spinwright command-line program — the model a command works on, read from a file.
// Every model is held with double values and 32-bit indices: integer weights stay exact
// (|energies| below 2^53), and one instantiation of each kernel serves every file.
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

using Ising = spinwright::IsingModel<double, std::uint32_t>;
using Qubo = spinwright::QuboModel<double, std::uint32_t>;

struct LoadedModel {
  std::string path;
  std::string format;       // "edges" or "mtx"
  std::string description;  // for people, e.g. "edge list (max-cut graph)"
  spinwright::Form form = spinwright::Form::ising;
  bool graph = false;  // an edge list: a max-cut graph, J = w, h = 0
  Ising ising;
  Qubo qubo;

  std::size_t num_spins() const { return form == spinwright::Form::ising ? ising.num_spins() : qubo.num_spins(); }
  std::size_t num_pairs() const { return form == spinwright::Form::ising ? ising.num_pairs() : qubo.num_pairs(); }
  const char* form_name() const { return form == spinwright::Form::ising ? "ising" : "qubo"; }
  // Energy of an assignment (+1/-1), offset included, in the file's own form.
  double energy(const std::vector<std::int8_t>& spins) const;
};

// Calls f(model) with the Ising or the QUBO model.
template <class F>
decltype(auto) visit(const LoadedModel& m, F&& f) {
  if (m.form == spinwright::Form::ising) return f(m.ising);
  return f(m.qubo);
}

// Reads FILE. `forced` is "", "edges" or "mtx". Failures are input errors "file:line: reason".
Failure load_model(const std::string& path, const std::string& forced, LoadedModel& out);

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
