// Benchmark helper: a deliberately plain annealing loop to measure the kernels against.
// Sequential sites; the local field is recomputed from the adjacency at every attempt; the
// acceptance draws u from std::mt19937_64 and computes exp(-beta delta) at every attempt
// (textbook Metropolis, no tables, no incremental fields). Ising form only.
#ifndef SPINWRIGHT_BENCH_REFERENCE_ANNEAL_HPP
#define SPINWRIGHT_BENCH_REFERENCE_ANNEAL_HPP

#include <cmath>    // std::exp
#include <cstdint>  // std::int8_t, std::uint64_t
#include <random>   // std::mt19937_64, std::uniform_real_distribution
#include <vector>   // std::vector

namespace reference {

template <class Value>
class PlainAnnealer {
 public:
  template <class Model>
  PlainAnnealer(const Model& model, std::uint64_t seed) : rng_(seed) {
    const std::size_t n = model.num_spins();
    h_.resize(n);
    adj_.resize(n);
    spins_.resize(n);
    for (std::size_t i = 0; i < n; ++i) {
      const auto ii = static_cast<typename Model::index_type>(i);
      h_[i] = model.site_term(ii);
      model.for_each_neighbour(ii, [&](typename Model::index_type j, Value v) {
        adj_[i].push_back({static_cast<std::uint32_t>(j), v});
      });
      spins_[i] = (rng_() >> 63) ? 1 : -1;
    }
  }

  // One sweep at inverse temperature beta; returns accepted flips.
  std::uint64_t sweep(double beta) {
    std::uint64_t accepted = 0;
    const std::size_t n = spins_.size();
    for (std::size_t i = 0; i < n; ++i) {
      double f = static_cast<double>(h_[i]);
      for (const auto& e : adj_[i]) f += static_cast<double>(e.v) * spins_[e.j];
      const double delta = -2.0 * spins_[i] * f;
      if (uniform_(rng_) < std::exp(-beta * delta)) {
        spins_[i] = static_cast<std::int8_t>(-spins_[i]);
        ++accepted;
      }
    }
    return accepted;
  }

  std::size_t size() const { return spins_.size(); }
  const std::vector<std::int8_t>& spins() const { return spins_; }

 private:
  struct Entry {
    std::uint32_t j;
    Value v;
  };
  std::vector<Value> h_;
  std::vector<std::vector<Entry>> adj_;
  std::vector<std::int8_t> spins_;
  std::mt19937_64 rng_;
  std::uniform_real_distribution<double> uniform_{0.0, 1.0};
};

}  // namespace reference

#endif  // SPINWRIGHT_BENCH_REFERENCE_ANNEAL_HPP
