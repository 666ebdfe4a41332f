// Population annealing against exact thermodynamics of the 2D Ising ferromagnet: Kaufman's
// finite-torus partition function (Phys. Rev. 76, 1232 (1949)), exact enumeration of the 4 x 4
// torus, Onsager's energy per spin (Phys. Rev. 65, 117 (1944)); bqp250 optima (Beasley 1998);
// the same result whatever the thread split. Budgets are sweep counts with fixed seeds.
#include <doctest/doctest.h>

#include <spinwright/kernels/population.hpp>
#include <spinwright/model/builder.hpp>
#include <spinwright/model/convert.hpp>
#include <spinwright/model/dense_model.hpp>
#include <spinwright/problems/max_cut.hpp>

#include "support/anneal_graph.hpp"

#include <algorithm>
#include <cmath>
#include <cstdint>
#include <string>
#include <thread>
#include <vector>

using namespace spinwright;

namespace {

constexpr long double pi_l = 3.141592653589793238462643383279502884L;

// ln Z of the L x L torus, H = -J sum_<ij> s_i s_j, K = beta J (Kaufman 1949, in the form
// Z = 1/2 (2 sinh 2K)^(L^2/2) (Z1 + Z2 + Z3 + Z4) with products over r = 0..L-1 of
// 2cosh / 2sinh (L gamma_k / 2), k = 2r + 1 (Z1, Z2) or 2r (Z3, Z4),
// cosh gamma_k = cosh 2K coth 2K - cos(pi k / L), gamma_0 = 2K + ln tanh K; the form of
// Beale, Phys. Rev. Lett. 76, 78 (1996)). Long double, log-scaled, signs kept.
long double kaufman_log_z(int L, long double K) {
  long double lc_odd = 0, ls_odd = 0, lc_even = 0, ls_even = 0;
  int sign_odd = 1, sign_even = 1;
  bool zero_odd = false, zero_even = false;
  const long double c = std::cosh(2 * K) / std::tanh(2 * K);
  auto gamma = [&](int k) -> long double {
    if (k == 0) return 2 * K + std::log(std::tanh(K));
    return std::acosh(c - std::cos(pi_l * k / L));
  };
  auto add = [&](long double g, long double& lc, long double& ls, int& sign, bool& zero) {
    const long double x = L * g / 2;
    lc += std::log(2 * std::cosh(x));
    const long double s = 2 * std::sinh(x);
    if (s == 0) {
      zero = true;
    } else {
      ls += std::log(std::fabs(s));
      if (s < 0) sign = -sign;
    }
  };
  for (int r = 0; r < L; ++r) {
    add(gamma(2 * r + 1), lc_odd, ls_odd, sign_odd, zero_odd);
    add(gamma(2 * r), lc_even, ls_even, sign_even, zero_even);
  }
  long double m = std::max(lc_odd, lc_even);
  long double z = std::exp(lc_odd - m) + std::exp(lc_even - m);
  if (!zero_odd) z += sign_odd * std::exp(ls_odd - m);
  if (!zero_even) z += sign_even * std::exp(ls_even - m);
  return std::log(0.5L) + (L * L / 2.0L) * std::log(2 * std::sinh(2 * K)) + m + std::log(z);
}

// Energy -d ln Z / d beta (J = 1) by a central difference in long double.
double kaufman_energy(int L, double beta) {
  const long double h = 1e-6L;
  return static_cast<double>(-(kaufman_log_z(L, beta + h) - kaufman_log_z(L, beta - h)) / (2 * h));
}

// Onsager's energy per spin of the infinite lattice (J = 1):
// u = -coth 2K [1 + (2/pi)(2 tanh^2 2K - 1) K1(k)], k = 2 sinh 2K / cosh^2 2K, K1 the complete
// elliptic integral of the first kind (by the arithmetic-geometric mean; Abramowitz & Stegun 17.6).
double onsager_energy(double K) {
  const long double k = 2 * std::sinh(2.0L * K) / (std::cosh(2.0L * K) * std::cosh(2.0L * K));
  long double a = 1, b = std::sqrt(1 - k * k);
  for (int i = 0; i < 40; ++i) {
    const long double an = (a + b) / 2;
    b = std::sqrt(a * b);
    a = an;
  }
  const long double k1 = pi_l / (2 * a);
  const long double t = std::tanh(2.0L * K);
  return static_cast<double>(-(1 / t) * (1 + (2 / pi_l) * (2 * t * t - 1) * k1));
}

// ln Z and the energy of a model by enumeration of its 2^N states (common practice).
template <class Model>
void enumerate(const Model& m, double beta, double& log_z, double& energy) {
  const std::size_t n = m.num_spins();
  std::vector<std::int8_t> s(n);
  std::vector<double> es;
  for (std::uint64_t b = 0; b < (std::uint64_t{1} << n); ++b) {
    for (std::size_t i = 0; i < n; ++i) s[i] = (b >> i) & 1 ? -1 : 1;
    es.push_back(static_cast<double>(m.energy(s.data())));
  }
  const double low = *std::min_element(es.begin(), es.end());
  long double z = 0, ez = 0;
  for (double e : es) {
    const long double w = std::exp(-static_cast<long double>(beta) * (e - low));
    z += w;
    ez += w * e;
  }
  log_z = static_cast<double>(std::log(z) - beta * low);
  energy = static_cast<double>(ez / z);
}

struct Mean {
  double mean = 0;
  double error = 0;  // standard error over the runs
};

Mean mean_of(const std::vector<double>& x) {
  double m = 0;
  for (double v : x) m += v;
  m /= static_cast<double>(x.size());
  double var = 0;
  for (double v : x) var += (v - m) * (v - m);
  var /= static_cast<double>(x.size() - 1);
  return {m, std::sqrt(var / static_cast<double>(x.size()))};
}

// Runs `runs` independent populations along beta_j = step_beta * j (j = 1..steps) and records
// ln Z and the mean energy (after the step's sweeps) at the steps listed in `at`.
template <class Model>
void pa_runs(const Model& model, std::size_t R, std::uint64_t steps, double step_beta, std::uint64_t sps, int runs,
             const std::vector<std::uint64_t>& at, std::vector<std::vector<double>>& log_z,
             std::vector<std::vector<double>>& energy) {
  PopulationParams p;
  p.population = R;
  p.steps = steps;
  p.sweeps_per_step = sps;
  p.schedule = Schedule::linear(step_beta, step_beta * static_cast<double>(steps));
  log_z.assign(at.size(), {});
  energy.assign(at.size(), {});
  for (int r = 0; r < runs; ++r) {
    PopulationAnnealer<Model> pa(model, p, 77, static_cast<std::uint64_t>(r));
    REQUIRE(pa.valid());
    pa.set_schedule_steps(steps);
    for (std::uint64_t j = 1; j <= steps; ++j) {
      pa.step(sps);
      for (std::size_t a = 0; a < at.size(); ++a) {
        if (at[a] == j) {
          CHECK(pa.beta() == doctest::Approx(step_beta * static_cast<double>(j)));
          const PopulationStats st = pa.stats();
          log_z[a].push_back(st.log_partition);
          energy[a].push_back(st.mean_energy);
        }
      }
    }
  }
}

}  // namespace

TEST_CASE("Kaufman's torus partition function: enumeration of 4 x 4 and Onsager's limit") {
  // The formula against all 2^16 states of the 4 x 4 torus (exact), and its energy per spin
  // for L = 128 against Onsager's infinite lattice away from the critical point.
  const auto model = anneal_support::square_lattice<std::int32_t>(4, -1);
  for (double beta : {0.1, 0.3, 0.4406868, 0.6, 1.0}) {
    CAPTURE(beta);
    double lz = 0, e = 0;
    enumerate(model, beta, lz, e);
    CHECK(static_cast<double>(kaufman_log_z(4, beta)) == doctest::Approx(lz).epsilon(1e-12));
    CHECK(kaufman_energy(4, beta) == doctest::Approx(e).epsilon(1e-7));
  }
  for (double beta : {0.3, 0.6}) {
    CHECK(kaufman_energy(128, beta) / (128 * 128) == doctest::Approx(onsager_energy(beta)).epsilon(1e-6));
  }
}

TEST_CASE("4 x 4 torus: free energy and energy against enumeration, within three standard errors") {
  const auto model = anneal_support::square_lattice<std::int32_t>(4, -1);
  std::vector<std::vector<double>> lz, en;
  const std::vector<std::uint64_t> at = {5, 10, 20};  // beta 0.2, 0.4, 0.8
  pa_runs(model, 200, 20, 0.04, 5, 12, at, lz, en);
  for (std::size_t a = 0; a < at.size(); ++a) {
    const double beta = 0.04 * static_cast<double>(at[a]);
    double exact_lz = 0, exact_e = 0;
    enumerate(model, beta, exact_lz, exact_e);
    const Mean z = mean_of(lz[a]);
    const Mean e = mean_of(en[a]);
    MESSAGE("4x4 beta=", beta, ": ln Z ", z.mean, " +- ", z.error, " exact ", exact_lz, "; E ", e.mean, " +- ", e.error,
            " exact ", exact_e);
    CHECK(std::fabs(z.mean - exact_lz) < 3 * z.error);
    CHECK(std::fabs(e.mean - exact_e) < 3 * e.error);
  }
}

TEST_CASE("16 x 16 torus: free energy within three standard errors of Kaufman at three temperatures") {
  // The goal of the kernel (docs/quantum.md); and the energy per spin against Onsager away
  // from the critical point, where the 16 x 16 torus is within 1e-4 of the infinite lattice
  // (Kaufman's formula above shows it).
  const int L = 16;
  const auto model = anneal_support::square_lattice<std::int32_t>(L, -1);
  std::vector<std::vector<double>> lz, en;
  const std::vector<std::uint64_t> at = {30, 44, 60};  // beta 0.30, 0.44 (near critical), 0.60
  pa_runs(model, 300, 60, 0.01, 5, 8, at, lz, en);
  for (std::size_t a = 0; a < at.size(); ++a) {
    const double beta = 0.01 * static_cast<double>(at[a]);
    const double exact = static_cast<double>(kaufman_log_z(L, beta));
    const Mean z = mean_of(lz[a]);
    const Mean e = mean_of(en[a]);
    MESSAGE("16x16 beta=", beta, ": -beta F / N ", z.mean / (L * L), " +- ", z.error / (L * L), " Kaufman ",
            exact / (L * L), "; E/N ", e.mean / (L * L), " +- ", e.error / (L * L), " finite ",
            kaufman_energy(L, beta) / (L * L), " Onsager ", onsager_energy(beta));
    CHECK(std::fabs(z.mean - exact) < 3 * z.error);
    if (at[a] != 44) {
      CHECK(std::fabs(kaufman_energy(L, beta) / (L * L) - onsager_energy(beta)) < 1e-4);
      CHECK(std::fabs(e.mean / (L * L) - onsager_energy(beta)) < 3 * e.error / (L * L) + 1e-4);
    }
  }
}

namespace {

// Splits [0, count) into `threads` ranges on std::thread (the test's own executor).
struct Threads {
  unsigned threads = 1;
  static void run(void* self, std::size_t count, void* job, void (*body)(void*, std::size_t, std::size_t)) {
    const unsigned t = static_cast<Threads*>(self)->threads;
    std::vector<std::thread> pool;
    for (unsigned k = 0; k < t; ++k) {
      const std::size_t b = count * k / t, e = count * (k + 1) / t;
      pool.emplace_back([=] { body(job, b, e); });
    }
    for (auto& th : pool) th.join();
  }
};

struct Recorder {
  std::vector<double> improvements;
  std::uint64_t progress = 0;
  void on_improvement(std::uint64_t, double e) { improvements.push_back(e); }
  void on_progress(std::uint64_t, double) { ++progress; }
};

IsingModel<std::int32_t> small_glass(std::uint64_t seed) {
  // A 3 x 3 torus spin glass with fields, couplings +-1 from a fixed stream (common practice).
  Xoshiro256 rng(seed);
  IsingBuilder<std::int32_t> b(9);
  for (std::uint32_t y = 0; y < 3; ++y) {
    for (std::uint32_t x = 0; x < 3; ++x) {
      const std::uint32_t i = y * 3 + x;
      b.add_coupling(i, y * 3 + (x + 1) % 3, rng.coin() ? 1 : -1);
      b.add_coupling(i, ((y + 1) % 3) * 3 + x, rng.coin() ? 1 : -1);
      b.add_field(i, static_cast<std::int32_t>(rng.below(3)) - 1);
    }
  }
  return b.build().value();
}

}  // namespace

TEST_CASE("the same result whatever the thread count") {
  // Every replica has its own stream and resampling is serial: 1, 2 and 3 threads agree bit
  // for bit (spins, energies, ln Z, families).
  const auto model = anneal_support::square_lattice<std::int32_t>(8, -1);
  PopulationParams p;
  p.population = 64;
  p.steps = 10;
  p.sweeps_per_step = 3;
  std::vector<double> log_z;
  std::vector<std::vector<std::int8_t>> last;
  for (unsigned t : {0u, 1u, 2u, 3u}) {
    Threads exec{t};
    if (t != 0) p.parallel = ParallelFor{&Threads::run, &exec};
    PopulationAnnealer<IsingModel<std::int32_t>> pa(model, p, 5);
    pa.advance();
    log_z.push_back(pa.log_partition());
    std::vector<std::int8_t> all;
    for (std::size_t j = 0; j < pa.population(); ++j) {
      all.insert(all.end(), pa.replica(j).spins(), pa.replica(j).spins() + 64);
      all.push_back(static_cast<std::int8_t>(pa.family(j) & 0x7F));
    }
    last.push_back(all);
  }
  for (std::size_t k = 1; k < log_z.size(); ++k) {
    CHECK(log_z[k] == log_z[0]);
    CHECK(last[k] == last[0]);
  }
}

TEST_CASE("the kernel shape: model types, seeds, reset, warm start, arena, budgets, observers, statistics") {
  const auto model = small_glass(4);
  PopulationParams p;
  p.population = 50;
  p.steps = 20;
  p.sweeps_per_step = 2;
  // The ground state by enumeration (common practice), for every model type.
  double ground = 1e300;
  {
    std::vector<std::int8_t> s(9);
    for (int b = 0; b < 512; ++b) {
      for (std::size_t i = 0; i < 9; ++i) s[i] = (b >> i) & 1 ? -1 : 1;
      ground = std::min(ground, static_cast<double>(model.energy(s.data())));
    }
  }
  const auto a = population_anneal(model, p, 42, 3);
  CHECK(static_cast<double>(a.energy) == ground);
  CHECK(a.sweeps == 40u);
  CHECK(a.attempted == 40u * 50u * 9u);
  CHECK(a.restart == 3u);
  const auto qubo = qubo_from(model).value();
  CHECK(static_cast<double>(population_anneal(qubo, p, 1).energy) == ground);
  CHECK(static_cast<double>(population_anneal(DenseIsingModel<std::int32_t>::from(model).value(), p, 2).energy) ==
        ground);
  CHECK(static_cast<double>(population_anneal(DenseQuboModel<std::int32_t>::from(qubo).value(), p, 3).energy) ==
        ground);
  CHECK(population_anneal(ising_from(qubo).value(), p, 4).energy == doctest::Approx(ground));
  // Same seed, same run; stepping object = one-call; reset replays.
  PopulationAnnealer<IsingModel<std::int32_t>> pa(model, p, 42, 3);
  pa.step(40);
  CHECK(pa.accepted() == a.accepted);
  CHECK(pa.solution().spins == a.spins);
  const double lz = pa.log_partition();
  pa.reset(42, 3);
  pa.step(40);
  CHECK(pa.log_partition() == lz);
  for (std::size_t j = 0; j < pa.population(); ++j) CHECK(pa.replica(j).check().exact);
  // Statistics: families shrink, rho_t and the family entropy agree with them.
  const PopulationStats st = pa.stats();
  CHECK(st.step == 20u);
  CHECK(st.families >= 1u);
  CHECK(st.families < 50u);
  CHECK(st.family_entropy <= std::log(static_cast<double>(st.families)) + 1e-12);
  CHECK(st.rho_t >= 50.0 / static_cast<double>(st.families) - 1e-9);  // R sum nu^2 >= R / families
  CHECK(st.effective_size > 0);
  CHECK(st.effective_size <= 50.0);
  CHECK(st.smallest_effective_size <= st.effective_size);
  CHECK(st.free_energy == doctest::Approx(-st.log_partition / st.beta));
  // Arena: the same run without the heap; too small an arena is reported and never sweeps.
  std::vector<unsigned char> memory(PopulationAnnealer<IsingModel<std::int32_t>>::bytes_needed(model, p));
  Arena arena(memory.data(), memory.size());
  PopulationAnnealer<IsingModel<std::int32_t>> pb(model, p, arena, 42, 3);
  REQUIRE(pb.valid());
  pb.advance();
  CHECK(pb.log_partition() == lz);
  Arena small(memory.data(), memory.size() / 2);
  PopulationAnnealer<IsingModel<std::int32_t>> ps(model, p, small, 42, 3);
  CHECK_FALSE(ps.valid());
  ps.advance();
  CHECK(ps.sweeps_done() == 0u);
  // Warm start: every replica at the given spins; no free-energy estimate.
  std::vector<std::int8_t> start(9, 1);
  pa.warm_start(start.data(), 7);
  CHECK(pa.best().energy == model.energy(start.data()));
  CHECK(std::isnan(pa.log_partition()));
  // Budgets: sweeps, target, stop token.
  pa.reset(1);
  CHECK(pa.advance(Budget{}.with_sweeps(7)) == StopReason::budget_exhausted);
  CHECK(pa.sweeps_done() == 7u);
  CHECK(pa.steps_done() == 4u);
  pa.reset(1);
  CHECK(pa.advance(Budget{}.with_target(ground)) == StopReason::target_reached);
  CHECK(static_cast<double>(pa.best().energy) == ground);
  StopToken stop;
  stop.request_stop();
  pa.reset(1);
  CHECK(pa.advance(Budget{}.with_stop(stop)) == StopReason::stopped);
  // Observers.
  p.progress_every = 10;
  PopulationAnnealer<IsingModel<std::int32_t>> po(model, p, 9);
  Recorder rec;
  po.advance(Budget{}, rec);
  CHECK(rec.progress == 4u);
  for (std::size_t k = 1; k < rec.improvements.size(); ++k) CHECK(rec.improvements[k] < rec.improvements[k - 1]);
  // Refused parameters, named.
  PopulationParams bad = p;
  bad.population = 0;
  PopulationAnnealer<IsingModel<std::int32_t>> pz(model, bad, 1);
  CHECK_FALSE(pz.valid());
  CHECK(std::string(pz.status().message).find("population") != std::string::npos);
  bad = p;
  bad.sweeps_per_step = 0;
  CHECK(std::string(PopulationAnnealer<IsingModel<std::int32_t>>::check(bad).message).find("sweeps_per_step") !=
        std::string::npos);
  bad = p;
  bad.steps = 0;
  CHECK(PopulationAnnealer<IsingModel<std::int32_t>>::check(bad).code == StatusCode::invalid_argument);
}

TEST_CASE("bqp250 instances: the optimum cut within a fixed sweep budget") {
  // Beasley's OR-Library bqp250 in max-cut form, proven optima in
  // shared/data/maxcut/reference.csv (Beasley 1998). One run: R = 100, 200 steps of 2 sweeps,
  // the default geometric schedule over the model's beta span.
  struct Instance {
    const char* file;
    long long optimum;
  };
  for (const Instance inst :
       {Instance{"bqp250-1.txt", 45607}, Instance{"bqp250-2.txt", 44810}, Instance{"bqp250-3.txt", 49037},
        Instance{"bqp250-4.txt", 41274}, Instance{"bqp250-5.txt", 47961}}) {
    CAPTURE(inst.file);
    const auto g = anneal_support::read_edge_list(std::string(SPINWRIGHT_DATA_DIR) + "/maxcut/" + inst.file);
    REQUIRE(g.ok);
    const auto model = anneal_support::maxcut_model<std::int32_t>(g);
    PopulationParams p;
    p.population = 100;
    p.steps = 200;
    p.sweeps_per_step = 2;
    const auto s = population_anneal(model, p, 2026);
    const auto cut = static_cast<long long>(cut_from_energy(total_weight(model), s.energy));
    MESSAGE(std::string(inst.file), ": cut ", cut);
    CHECK(cut == inst.optimum);
  }
}

TEST_CASE("resampling is multinomial: occupancy of the families after one step of equal weights") {
  // At beta_1 = 1e-12 every weight is equal to within 1e-10, so resampling draws R parents
  // uniformly: the expected fraction of parents with a child is 1 - (1 - 1/R)^R (occupancy of
  // R bins by R balls; common practice, e.g. Feller, An Introduction to Probability Theory,
  // vol. 1, ch. IV), with standard deviation below 0.5 / sqrt(R).
  const auto model = anneal_support::square_lattice<std::int32_t>(3, -1);
  PopulationParams p;
  p.population = 20000;
  p.steps = 1;
  p.sweeps_per_step = 1;
  p.schedule = Schedule::constant(1e-12);
  PopulationAnnealer<IsingModel<std::int32_t>> pa(model, p, 3);
  pa.step(1);
  const double R = 20000;
  const double expected = 1 - std::pow(1 - 1 / R, R);
  const PopulationStats st = pa.stats();
  CHECK(std::fabs(static_cast<double>(st.families) / R - expected) < 4 * 0.5 / std::sqrt(R));
  CHECK(st.effective_size == doctest::Approx(R).epsilon(1e-9));
}
