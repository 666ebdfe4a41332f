// spinwright command-line program — model figures for `inspect` and the automatic kernel choice.
#include "loaded_model.hpp"

#include <spinwright/problems/max_cut.hpp>

#include <algorithm>    // std::max, std::min
#include <numeric>      // std::iota
#include <type_traits>  // std::decay_t

namespace spinwright_cli {

std::size_t LoadedModel::num_spins() const {
  return visit(*this, [](const auto& model) { return model.num_spins(); });
}

std::size_t LoadedModel::num_pairs() const {
  return visit(*this, [](const auto& model) { return model.num_pairs(); });
}

double LoadedModel::energy(const std::vector<std::int8_t>& spins) const {
  return visit(*this, [&](const auto& model) { return static_cast<double>(model.energy(spins.data())); });
}

double LoadedModel::energy_bound() const {
  return visit(*this, [](const auto& model) { return model.energy_bound(); });
}

double LoadedModel::cut(const std::vector<std::int8_t>& spins) const {
  return visit(*this, [&](const auto& model) -> double {
    using Model = std::decay_t<decltype(model)>;
    if constexpr (Model::form == spinwright::Form::ising) {
      return static_cast<double>(spinwright::cut_value(model, spins.data()));
    } else {
      return 0.0;
    }
  });
}

double LoadedModel::total_weight() const {
  return visit(*this, [](const auto& model) -> double {
    using Model = std::decay_t<decltype(model)>;
    if constexpr (Model::form == spinwright::Form::ising) {
      return static_cast<double>(spinwright::total_weight(model));
    } else {
      return 0.0;
    }
  });
}

namespace {

std::size_t find_root(std::vector<std::size_t>& parent, std::size_t i) {
  while (parent[i] != i) {
    parent[i] = parent[parent[i]];
    i = parent[i];
  }
  return i;
}

template <class Model>
void fill(const Model& m, ModelFigures& f) {
  using Index = typename Model::index_type;
  using Value = typename Model::value_type;
  const std::size_t n = m.num_spins();
  f.nodes = n;
  f.pairs = m.num_pairs();
  f.offset = static_cast<double>(m.offset());
  std::vector<std::size_t> parent(n);
  std::iota(parent.begin(), parent.end(), std::size_t{0});
  bool first_pair = true;
  for (std::size_t i = 0; i < n; ++i) {
    const auto ii = static_cast<Index>(i);
    const double lin = static_cast<double>(m.site_term(ii));
    if (lin != 0) ++f.site_terms_nonzero;
    f.site_term_min = i == 0 ? lin : std::min(f.site_term_min, lin);
    f.site_term_max = i == 0 ? lin : std::max(f.site_term_max, lin);
    const std::size_t d = m.degree(ii);
    f.min_degree = i == 0 ? d : std::min(f.min_degree, d);
    f.max_degree = std::max(f.max_degree, d);
    m.for_each_neighbour(ii, [&](Index j, Value value) {
      if (j <= ii) return;
      const double v = static_cast<double>(value);
      f.pair_min = first_pair ? v : std::min(f.pair_min, v);
      f.pair_max = first_pair ? v : std::max(f.pair_max, v);
      first_pair = false;
      const std::size_t a = find_root(parent, i);
      const std::size_t b = find_root(parent, j);
      if (a != b) parent[a] = b;
    });
  }
  std::vector<std::size_t> size(n, 0);
  for (std::size_t i = 0; i < n; ++i) ++size[find_root(parent, i)];
  for (std::size_t i = 0; i < n; ++i) {
    if (size[i] > 0) {
      ++f.components;
      f.largest_component = std::max(f.largest_component, size[i]);
    }
  }
  f.mean_degree = n == 0 ? 0 : 2.0 * static_cast<double>(f.pairs) / static_cast<double>(n);
  f.density = n < 2 ? 0 : static_cast<double>(f.pairs) / (0.5 * static_cast<double>(n) * static_cast<double>(n - 1));
  // CSR storage: site terms, row starts, and both directions of every pair.
  f.model_bytes = static_cast<double>(n) * sizeof(Value) + static_cast<double>(n + 1) * sizeof(std::size_t) +
                  2.0 * static_cast<double>(f.pairs) * (sizeof(Value) + sizeof(Index));
  // SpinState: one spin, one local field (energy type) and one mark byte per spin.
  f.state_bytes = static_cast<double>(n) * (sizeof(std::int8_t) + sizeof(typename Model::energy_type) + 1);
}

}  // namespace

ModelFigures figures_of(const LoadedModel& m) {
  ModelFigures f;
  visit(m, [&](const auto& model) { fill(model, f); });
  return f;
}

}  // namespace spinwright_cli
