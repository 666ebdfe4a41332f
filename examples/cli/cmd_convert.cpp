// spinwright command-line program — `convert IN OUT --to ising|qubo`: exact conversion between
// the two forms (model/convert.hpp) and the two file formats (io/). The energy of every
// assignment is preserved, offset included; the command checks this on a few assignments
// before writing, and refuses when it does not hold to within rounding.
#include "commands.hpp"
#include "spread.hpp"
#include "loaded_model.hpp"
#include "text.hpp"

#include <spinwright/io/edge_list.hpp>
#include <spinwright/io/matrix_market.hpp>
#include <spinwright/model/convert.hpp>
#include <spinwright/rng/xoshiro.hpp>

#include <cmath>        // std::fabs
#include <type_traits>  // std::is_integral_v, std::decay_t

namespace spinwright_cli {

namespace {

const std::vector<OptionSpec>& convert_options() {
  static const std::vector<OptionSpec> specs = {
      {"to", "ising|qubo", "form of the output model (required)"},
      {"format", "edges|mtx", "input format (default: detected from the content)"},
      {"out-format", "edges|mtx", "output format (default: edges for OUT ending in .txt or .edges, else mtx)"},
      {"help", nullptr, "show this help"},
  };
  return specs;
}

bool ends_with(const std::string& s, const std::string& tail) {
  return s.size() >= tail.size() && s.compare(s.size() - tail.size(), tail.size(), tail) == 0;
}

// The largest energy difference between the two models over a few assignments (all zeros,
// all ones, and random ones from a fixed seed).
template <class A, class B>
double largest_difference(const A& a, const B& b) {
  const std::size_t n = a.num_spins();
  std::vector<std::int8_t> s(n, 1);
  spinwright::Xoshiro256 rng(2026);
  double worst = 0;
  for (int k = 0; k < 18; ++k) {
    for (std::size_t i = 0; i < n; ++i) s[i] = k == 0 ? 1 : k == 1 ? -1 : (rng.coin() ? 1 : -1);
    const double d = std::fabs(static_cast<double>(a.energy(s.data())) - static_cast<double>(b.energy(s.data())));
    worst = d > worst ? d : worst;
  }
  return worst;
}

template <class Model>
Failure write_model(const std::string& path, const std::string& out_format, const Model& model) {
  if (!is_report_rank()) return {};  // spinwright-mpi: rank 0 writes the file
  spinwright::io::IoStatus st;
  if (out_format == "mtx") {
    st = spinwright::io::write_matrix_market(path, model);
  } else if constexpr (Model::form == spinwright::Form::ising) {
    st = spinwright::io::write_edge_list(path, model);
  } else {
    return usage_failure(
        "an edge list holds only max-cut graphs (Ising couplings); a QUBO model needs --out-format mtx",
        "write OUT as Matrix Market (e.g. name it OUT.mtx)");
  }
  if (!st.ok()) {
    if (st.code == spinwright::StatusCode::invalid_argument) {
      // The library's reason already says to write Matrix Market: name the option there, once.
      std::string reason = st.reason;
      const std::string advice = "(write Matrix Market instead)";
      const std::size_t at = reason.find(advice);
      if (at != std::string::npos) {
        reason.replace(at, advice.size(), "(write Matrix Market instead: --out-format mtx)");
      } else {
        reason += " (write Matrix Market instead: --out-format mtx)";
      }
      return input_failure(path + ": " + reason);
    }
    return input_failure(st.line == 0 ? path + ": " + st.reason : st.message);
  }
  return {};
}

}  // namespace

int run_convert(int argc, const char* const* argv) {
  Args args;
  const int early = parse_or_exit(argc, argv, convert_options(), "convert", "IN OUT --to ising|qubo [options]",
                                  "Converts a model between forms and file formats; every energy is kept, offset "
                                  "included.",
                                  args);
  if (early >= 0) return early;
  Failure f = expect_positional(args, 2, "convert", "IN OUT --to ising|qubo");
  if (f.failed()) return fail(f);
  const std::string* to = args.value("to");
  if (to == nullptr) {
    return fail(
        usage_failure("'convert' needs --to ising or --to qubo", "usage: spinwright convert IN OUT --to ising|qubo"));
  }
  if (*to != "ising" && *to != "qubo") {
    return fail(usage_failure("option '--to' expects 'ising' or 'qubo', got '" + *to + "'",
                              "run 'spinwright convert --help' for the options"));
  }
  std::string format, out_format;
  if ((f = check_format_option(args, "format", "convert", format)).failed()) return fail(f);
  if ((f = check_format_option(args, "out-format", "convert", out_format)).failed()) return fail(f);
  const std::string& out = args.positional[1];
  if (out_format.empty()) out_format = (ends_with(out, ".txt") || ends_with(out, ".edges")) ? "edges" : "mtx";
  if (out_format == "edges" && *to == "qubo") {
    return fail(usage_failure("an edge list holds only max-cut graphs; '--to qubo' needs Matrix Market output",
                              "add --out-format mtx or name OUT with the .mtx extension"));
  }

  spinwright::io::LoadedModel m;
  const std::string& in = args.positional[0];
  if ((f = load_raw_model(in, format, m)).failed()) return fail(f);
  const bool want_ising = *to == "ising";
  f = m.visit([&](const auto& model) -> Failure {
    using Model = std::decay_t<decltype(model)>;
    const double scale = model.energy_bound();
    const double tolerance = std::is_integral_v<typename Model::value_type> ? 0 : 1e-12 * (scale > 1 ? scale : 1.0);
    if constexpr (Model::form == spinwright::Form::ising) {
      if (want_ising) return write_model(out, out_format, model);
      auto converted = spinwright::qubo_from(model);
      if (!converted) return input_failure(in + ": cannot convert: " + converted.status().message);
      if (largest_difference(model, converted.value()) > tolerance) {
        return input_failure(in + ": the QUBO form of this model is not exact in double precision");
      }
      return write_model(out, out_format, converted.value());
    } else {
      if (!want_ising) return write_model(out, out_format, model);
      auto converted = spinwright::ising_from(model);
      if (!converted) return input_failure(in + ": cannot convert: " + converted.status().message);
      if (largest_difference(model, converted.value()) > tolerance) {
        return input_failure(in + ": the Ising form of this model is not exact in double precision");
      }
      return write_model(out, out_format, converted.value());
    }
  });
  if (f.failed()) return fail(f);
  return exit_ok;
}

}  // namespace spinwright_cli
