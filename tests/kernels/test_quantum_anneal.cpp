// Simulated quantum annealing (path-integral Monte Carlo) against exact quantum results:
// the transverse-field Ising chain (Pfeuty, Ann. Phys. 57, 79 (1970): free fermions; the
// finite periodic chain with both fermion parities), exact diagonalisation of small
// transverse-field models with Eigen (test-only), and bqp250 optima (Beasley 1998). Budgets
// are sweep counts with fixed seeds, never time. Parameters and estimator: docs/quantum.md.
#include <doctest/doctest.h>

#include <spinwright/kernels/quantum_anneal.hpp>
#include <spinwright/model/builder.hpp>
#include <spinwright/model/convert.hpp>
#include <spinwright/model/dense_model.hpp>
#include <spinwright/problems/max_cut.hpp>

#include <Eigen/Dense>

#include "support/anneal_graph.hpp"

#include <algorithm>
#include <cmath>
#include <cstdint>
#include <string>
#include <vector>

using namespace spinwright;

namespace {

constexpr long double pi_l = 3.141592653589793238462643383279502884L;

// ln Z of the periodic chain H = -J sum s^z_i s^z_(i+1) - G sum s^x_i (L even) by the
// Jordan-Wigner mapping with both fermion parities (Pfeuty 1970; the parity projection of the
// periodic chain: Lieb, Schultz & Mattis, Ann. Phys. 16, 407 (1961)):
//   Z = 1/2 [ prod_A 2cosh(b e_k/2) + prod_A 2sinh(b e_k/2) + prod_P 2cosh(b e_k/2) - prod_P 2sinh(b e_k/2) ]
// with e_k = 2 sqrt(J^2 + G^2 - 2 J G cos k), k = (2n+1) pi / L (A) or 2 n pi / L (P), the
// k = 0 mode of P taken with its sign, e_0 = 2 (G - J). Checked against exact diagonalisation
// below. Long double, terms scaled by the largest exponent.
long double chain_log_z(int L, long double J, long double G, long double beta) {
  long double lc_a = 0, ls_a = 0, lc_p = 0, ls_p = 0;
  int sign_s_a = 1, sign_s_p = 1;
  bool zero_a = false, zero_p = false;
  auto add = [&](long double e, long double& lc, long double& ls, int& sign, bool& zero) {
    const long double x = beta * e / 2;
    lc += std::log(2 * std::cosh(x));
    const long double s = 2 * std::sinh(x);
    if (s == 0) {
      zero = true;
    } else {
      ls += std::log(std::fabs(s));
      if (s < 0) sign = -sign;
    }
  };
  for (int n = 0; n < L; ++n) {
    const long double ka = (2 * n + 1) * pi_l / L;
    const long double ea = 2 * std::sqrt(J * J + G * G - 2 * J * G * std::cos(ka));
    add(ea, lc_a, ls_a, sign_s_a, zero_a);
    const long double kp = 2 * n * pi_l / L;
    const long double ep = n == 0 ? 2 * (G - J) : 2 * std::sqrt(J * J + G * G - 2 * J * G * std::cos(kp));
    add(ep, lc_p, ls_p, sign_s_p, zero_p);
  }
  long double m = lc_a;
  if (lc_p > m) m = lc_p;
  long double z = std::exp(lc_a - m) + std::exp(lc_p - m);
  if (!zero_a) z += sign_s_a * std::exp(ls_a - m);
  if (!zero_p) z -= sign_s_p * std::exp(ls_p - m);
  return m + std::log(z / 2);
}

// Thermal energy -d ln Z / d beta by a central difference in long double.
double chain_energy(int L, double J, double G, double beta) {
  const long double h = 1e-5L * (beta > 1 ? beta : 1);
  return static_cast<double>(-(chain_log_z(L, J, G, beta + h) - chain_log_z(L, J, G, beta - h)) / (2 * h));
}

// Ground-state energy per site of the infinite chain (Pfeuty 1970):
//   e0 = -(1 / pi) int_0^pi sqrt(J^2 + G^2 - 2 J G cos k) dk * 2 / 2 ... = -(1/pi) int_0^pi e_k / 2 dk.
double pfeuty_energy_per_site(double J, double G) {
  const int m = 200000;  // midpoint rule
  long double sum = 0;
  for (int i = 0; i < m; ++i) {
    const long double k = (i + 0.5L) * pi_l / m;
    sum += std::sqrt(J * J + G * G - 2 * J * G * std::cos(k));
  }
  return static_cast<double>(-sum / m);
}

// A transverse-field model: problem couplings (our Ising form, E = sum h s + sum J s s) and a
// uniform transverse field A; H = B E(sigma^z) - A sum sigma^x.
struct Tfm {
  std::size_t n = 0;
  std::vector<double> h;
  std::vector<std::vector<double>> J;
};

IsingModel<double> problem_of(const Tfm& t) {
  IsingBuilder<double> b(static_cast<std::uint64_t>(t.n));
  for (std::size_t i = 0; i < t.n; ++i) {
    if (t.h[i] != 0) b.add_field(static_cast<std::uint32_t>(i), t.h[i]);
    for (std::size_t j = i + 1; j < t.n; ++j) {
      if (t.J[i][j] != 0) b.add_coupling(static_cast<std::uint32_t>(i), static_cast<std::uint32_t>(j), t.J[i][j]);
    }
  }
  return b.build().value();
}

// Eigenvalues of the 2^n x 2^n Hamiltonian B E(z) - A sum sigma^x (basis bit i set: s_i = -1).
Eigen::VectorXd spectrum(const Tfm& t, double A, double B) {
  const int dim = 1 << t.n;
  Eigen::MatrixXd H = Eigen::MatrixXd::Zero(dim, dim);
  for (int b = 0; b < dim; ++b) {
    double e = 0;
    for (std::size_t i = 0; i < t.n; ++i) {
      const double si = (b >> i) & 1 ? -1.0 : 1.0;
      e += t.h[i] * si;
      for (std::size_t j = i + 1; j < t.n; ++j) e += t.J[i][j] * si * ((b >> j) & 1 ? -1.0 : 1.0);
    }
    H(b, b) = B * e;
    for (std::size_t i = 0; i < t.n; ++i) H(b ^ (1 << i), b) -= A;
  }
  Eigen::SelfAdjointEigenSolver<Eigen::MatrixXd> solver(H, Eigen::EigenvaluesOnly);
  return solver.eigenvalues();
}

double thermal_energy(const Eigen::VectorXd& ev, double beta) {
  const double e0 = ev.minCoeff();
  long double z = 0, ez = 0;
  for (Eigen::Index k = 0; k < ev.size(); ++k) {
    const long double w = std::exp(-static_cast<long double>(beta) * (ev[k] - e0));
    z += w;
    ez += w * ev[k];
  }
  return static_cast<double>(ez / z);
}

Tfm chain_tfm(std::size_t L, double J) {
  Tfm t;
  t.n = L;
  t.h.assign(L, 0.0);
  t.J.assign(L, std::vector<double>(L, 0.0));
  for (std::size_t i = 0; i < L; ++i) {
    const std::size_t j = (i + 1) % L;
    t.J[std::min(i, j)][std::max(i, j)] += -J;
  }
  return t;
}

// Mean of the path-integral energy estimator at fixed A, B, T, with its standard error from
// 20 block means (common practice: batch means).
struct Estimate {
  double mean = 0;
  double error = 0;
};

template <class Model>
Estimate measure(const Model& model, double A, double B, double T, std::uint32_t P, std::uint64_t burn,
                 std::uint64_t samples, std::uint64_t seed, SliceMoves moves = SliceMoves::both) {
  QuantumAnnealParams p;
  p.slices = P;
  p.temperature = T;
  p.field = Schedule::constant(A);
  p.problem = Schedule::constant(B);
  p.moves = moves;
  QuantumAnnealer<Model> q(model, p, seed);
  REQUIRE(q.valid());
  // Start with every slice alike: independent random slices carry about N P / 2 kinks along
  // imaginary time, which local moves remove only diffusively (about P^2 sweeps).
  std::vector<std::int8_t> start(model.num_spins());
  Xoshiro256 rng(seed);
  for (auto& s : start) s = rng.coin() ? 1 : -1;
  q.warm_start(start.data(), seed);
  q.step(burn);
  const int blocks = 20;
  const std::uint64_t per = samples / blocks;
  std::vector<double> means;
  for (int b = 0; b < blocks; ++b) {
    double sum = 0;
    for (std::uint64_t s = 0; s < per; ++s) {
      q.step(1);
      sum += q.energy_estimate();
    }
    means.push_back(sum / static_cast<double>(per));
  }
  double m = 0;
  for (double x : means) m += x;
  m /= blocks;
  double v = 0;
  for (double x : means) v += (x - m) * (x - m);
  v /= (blocks - 1);
  return {m, std::sqrt(v / blocks)};
}

}  // namespace

TEST_CASE("free-fermion chain: matches exact diagonalisation and Pfeuty's infinite chain") {
  // The finite-chain formula against the 2^L spectrum (Eigen), several fields and temperatures.
  for (int L : {4, 6, 8}) {
    for (double G : {0.5, 1.0, 1.7}) {
      const auto ev = spectrum(chain_tfm(static_cast<std::size_t>(L), 1.0), G, 1.0);
      for (double beta : {0.3, 1.0, 4.0}) {
        CAPTURE(L);
        CAPTURE(G);
        CAPTURE(beta);
        CHECK(chain_energy(L, 1.0, G, beta) == doctest::Approx(thermal_energy(ev, beta)).epsilon(1e-7));
      }
    }
  }
  // The ground state at the critical field, -2 / sin(pi / 2L) (antiperiodic sector, Pfeuty
  // 1970), and the infinite chain, -4/pi per site.
  for (int L : {16, 64}) {
    const double e0 = -2.0 / std::sin(3.14159265358979323846 / (2 * L));
    CHECK(chain_energy(L, 1.0, 1.0, 400.0) == doctest::Approx(e0).epsilon(1e-7));
  }
  CHECK(pfeuty_energy_per_site(1.0, 1.0) == doctest::Approx(-4 / 3.14159265358979323846).epsilon(1e-9));
  CHECK(chain_energy(512, 1.0, 1.0, 4000.0) / 512 == doctest::Approx(pfeuty_energy_per_site(1.0, 1.0)).epsilon(1e-5));
}

TEST_CASE("critical chain, L = 64, P = 128, low T: energy per site within 0.5 % of the exact finite chain") {
  // Pfeuty 1970 (free fermions) for the exact value at the same temperature; the goal of the
  // kernel (docs/quantum.md). The path-integral energy carries a Trotter error of order
  // (beta / P)^2 besides the sampling error: measured 1.1 % at beta / P = 1/8, hence P = 128
  // at beta = 8 (docs/quantum.md).
  const int L = 64;
  const double beta = 8;
  const auto model = anneal_support::ring<double>(L, -1.0);
  const Estimate e = measure(model, 1.0, 1.0, 1 / beta, 128, 400, 2000, 11);
  const double exact = chain_energy(L, 1.0, 1.0, beta);
  MESSAGE("L=64 P=128 beta=8: ", e.mean / L, " +- ", e.error / L, " exact ", exact / L, " ground ",
          -2.0 / std::sin(3.14159265358979323846 / (2 * L)) / L);
  CHECK(std::fabs(e.mean - exact) < 0.005 * std::fabs(exact));
  CHECK(std::fabs(e.mean - exact) < 4 * e.error + 0.004 * std::fabs(exact));
  // And Pfeuty's infinite chain, -4/pi per site, within 1 % (finite size and T add 0.15 %).
  CHECK(std::fabs(e.mean / L - pfeuty_energy_per_site(1.0, 1.0)) < 0.01 * 4 / 3.14159265358979323846);
}

TEST_CASE("periodic chains off the critical field: the free-fermion energy at L = 16") {
  // Pfeuty 1970 (free fermions, both parities): ordered (G = 0.5) and disordered (G = 1.5)
  // chains, beta = 4, P = 64 (beta / P = 1/16), within four standard errors plus 0.3 % for the
  // Trotter error.
  const int L = 16;
  const auto model = anneal_support::ring<double>(L, -1.0);
  for (double G : {0.5, 1.5}) {
    CAPTURE(G);
    const Estimate e = measure(model, G, 1.0, 0.25, 64, 300, 10000, 31);
    const double exact = chain_energy(L, 1.0, G, 4.0);
    MESSAGE("L=16 G=", G, ": ", e.mean / L, " +- ", e.error / L, " exact ", exact / L);
    CHECK(std::fabs(e.mean - exact) < 4 * e.error + 0.003 * std::fabs(exact));
  }
}

TEST_CASE("small random transverse-field models: thermal energy converges to exact diagonalisation as P grows") {
  // Exact diagonalisation of the 2^N x 2^N Hamiltonian (Eigen); random couplings and fields
  // (common practice). The Trotter error shrinks as P grows (Suzuki, Prog. Theor. Phys. 56,
  // 1454 (1976)): P = 2 is far off, P = 32 agrees within the sampling error.
  Xoshiro256 rng(7);
  for (std::size_t n : {std::size_t{6}, std::size_t{8}}) {
    Tfm t;
    t.n = n;
    t.h.resize(n);
    t.J.assign(n, std::vector<double>(n, 0.0));
    for (std::size_t i = 0; i < n; ++i) {
      t.h[i] = rng.uniform() - 0.5;
      for (std::size_t j = i + 1; j < n; ++j) {
        if (rng.uniform() < 0.6) t.J[i][j] = 2 * rng.uniform() - 1;
      }
    }
    const auto model = problem_of(t);
    const double A = 1.0, B = 1.0, beta = 2.0;
    const double exact = thermal_energy(spectrum(t, A, B), beta);
    const Estimate p2 = measure(model, A, B, 1 / beta, 2, 200, 4000, 21);
    const Estimate p8 = measure(model, A, B, 1 / beta, 8, 200, 4000, 22);
    const Estimate p32 = measure(model, A, B, 1 / beta, 32, 200, 4000, 23);
    MESSAGE("n=", n, " exact ", exact, " P2 ", p2.mean, "+-", p2.error, " P8 ", p8.mean, "+-", p8.error, " P32 ",
            p32.mean, "+-", p32.error);
    CHECK(std::fabs(p2.mean - exact) > 4 * p2.error);
    CHECK(std::fabs(p8.mean - exact) < std::fabs(p2.mean - exact));
    CHECK(std::fabs(p32.mean - exact) < 4 * p32.error + 0.002 * std::fabs(exact));
  }
}

namespace {

struct Recorder {
  std::vector<double> improvements;
  std::uint64_t progress = 0;
  void on_improvement(std::uint64_t, double e) { improvements.push_back(e); }
  void on_progress(std::uint64_t, double) { ++progress; }
};

// A 3 x 3 torus spin glass with fields (couplings +-1 from a fixed stream; common practice).
IsingModel<std::int32_t> small_glass(std::uint64_t seed) {
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

// The ground energy by enumeration of the 2^n states (common practice).
template <class Model>
double brute_ground(const Model& m) {
  const std::size_t n = m.num_spins();
  std::vector<std::int8_t> s(n);
  double best = 1e300;
  for (std::uint64_t b = 0; b < (std::uint64_t{1} << n); ++b) {
    for (std::size_t i = 0; i < n; ++i) s[i] = (b >> i) & 1 ? -1 : 1;
    const double e = static_cast<double>(m.energy(s.data()));
    if (e < best) best = e;
  }
  return best;
}

}  // namespace

TEST_CASE("every model type: sparse and dense, Ising and QUBO, reach the enumerated ground state") {
  // Ground states by enumeration (common practice); QUBO through qubo_from (same energies).
  const auto ising = small_glass(3);
  const double ground = brute_ground(ising);
  QuantumAnnealParams p;
  p.sweeps = 300;
  p.slices = 8;
  const auto s1 = quantum_anneal(ising, p, 5);
  CHECK(static_cast<double>(s1.energy) == ground);
  CHECK(s1.energy == ising.energy(s1.spins.data()));
  const auto as_double = ising_from(qubo_from(ising).value()).value();
  CHECK(static_cast<double>(quantum_anneal(as_double, p, 6).energy) == doctest::Approx(ground));
  const auto qubo = qubo_from(ising).value();
  const auto s2 = quantum_anneal(qubo, p, 7);
  CHECK(static_cast<double>(s2.energy) == ground);
  const auto dense = DenseIsingModel<std::int32_t>::from(ising).value();
  CHECK(static_cast<double>(quantum_anneal(dense, p, 8).energy) == ground);
  const auto dense_q = DenseQuboModel<std::int32_t>::from(qubo).value();
  CHECK(static_cast<double>(quantum_anneal(dense_q, p, 9).energy) == ground);
  for (SliceMoves m : {SliceMoves::local, SliceMoves::time_cluster}) {
    p.moves = m;
    CHECK(static_cast<double>(quantum_anneal(ising, p, 10).energy) == ground);
  }
}

TEST_CASE("the kernel shape: seeds, reset, warm start, arena, budgets, observers, refused parameters") {
  const auto model = small_glass(4);
  QuantumAnnealParams p;
  p.sweeps = 50;
  p.slices = 6;
  const auto a = quantum_anneal(model, p, 42, 3);
  const auto b = quantum_anneal(model, p, 42, 3);
  CHECK(a.spins == b.spins);
  CHECK(a.accepted == b.accepted);
  CHECK(a.attempted == 50u * (9u * 6u + 9u));
  CHECK(a.restart == 3u);
  // Stepping object = one-call function; reset replays.
  QuantumAnnealer<IsingModel<std::int32_t>> q(model, p, 42, 3);
  q.step(50);
  CHECK(q.accepted() == a.accepted);
  CHECK(q.solution().spins == a.spins);
  q.reset(42, 3);
  q.step(50);
  CHECK(q.accepted() == a.accepted);
  // Every slice state stays exact.
  for (std::size_t k = 0; k < q.num_slices(); ++k) CHECK(q.slice(k).check().exact);
  // Arena constructor: the same run, no heap.
  std::vector<unsigned char> memory(QuantumAnnealer<IsingModel<std::int32_t>>::bytes_needed(model, p));
  Arena arena(memory.data(), memory.size());
  QuantumAnnealer<IsingModel<std::int32_t>> qa(model, p, arena, 42, 3);
  REQUIRE(qa.valid());
  qa.advance();
  CHECK(qa.accepted() == a.accepted);
  CHECK(qa.best().energy == a.energy);
  Arena small(memory.data(), memory.size() / 2);
  QuantumAnnealer<IsingModel<std::int32_t>> qs(model, p, small, 42, 3);
  CHECK_FALSE(qs.valid());
  CHECK(qs.advance() == StopReason::budget_exhausted);  // never sweeps
  CHECK(qs.sweeps_done() == 0u);
  // Warm start: every slice holds the given spins; the best starts there.
  std::vector<std::int8_t> start(9, -1);
  q.warm_start(start.data(), 1);
  for (std::size_t k = 0; k < q.num_slices(); ++k) CHECK(q.slice(k).energy() == model.energy(start.data()));
  CHECK(q.best().energy == model.energy(start.data()));
  // Budgets: sweeps, target, stop token, deadline on a fake clock.
  q.reset(1);
  CHECK(q.advance(Budget{}.with_sweeps(7)) == StopReason::budget_exhausted);
  CHECK(q.sweeps_done() == 7u);
  q.reset(1);
  const double ground = brute_ground(model);
  CHECK(q.advance(Budget{}.with_target(ground)) == StopReason::target_reached);
  CHECK(static_cast<double>(q.best().energy) == ground);
  StopToken stop;
  stop.request_stop();
  q.reset(1);
  CHECK(q.advance(Budget{}.with_stop(stop)) == StopReason::stopped);
  CHECK(q.sweeps_done() == 0u);
  {
    // A clock that jumps past the limit after a few reads (common practice): the run ends
    // at the deadline.
    struct Jump {
      std::uint64_t calls = 0;
      static double read(void* self) { return ++static_cast<Jump*>(self)->calls > 3 ? 10.0 : 0.0; }
    } jump;
    q.reset(1);
    CHECK(q.advance(Budget{}.with_time_limit(1.0, Clock{&Jump::read, &jump}).with_sweeps(unlimited_sweeps)) ==
          StopReason::deadline);
    CHECK(q.sweeps_done() >= 1u);
  }
  // Observers: improvements are strictly decreasing; progress every 10 sweeps.
  p.progress_every = 10;
  QuantumAnnealer<IsingModel<std::int32_t>> qo(model, p, 9);
  Recorder rec;
  qo.advance(Budget{}, rec);
  CHECK(rec.progress == 5u);
  for (std::size_t k = 1; k < rec.improvements.size(); ++k) CHECK(rec.improvements[k] < rec.improvements[k - 1]);
  if (!rec.improvements.empty()) CHECK(rec.improvements.back() == static_cast<double>(qo.best().energy));
  // Refused parameters, named.
  QuantumAnnealParams bad = p;
  bad.slices = 0;
  CHECK(QuantumAnnealer<IsingModel<std::int32_t>>::check(bad).code == StatusCode::invalid_argument);
  QuantumAnnealer<IsingModel<std::int32_t>> qb(model, bad, 1);
  CHECK_FALSE(qb.valid());
  CHECK(std::string(qb.status().message).find("slices") != std::string::npos);
  bad = p;
  bad.temperature = -1;
  CHECK(std::string(QuantumAnnealer<IsingModel<std::int32_t>>::check(bad).message).find("temperature") !=
        std::string::npos);
}

TEST_CASE("the schedule: linear field by default, a user callable, J_perp from the Trotter formula") {
  const auto model = small_glass(5);
  QuantumAnnealParams p;
  p.sweeps = 11;
  p.slices = 4;
  p.temperature = 0.25;
  p.field = Schedule::linear(2.0, 0.0);
  QuantumAnnealer<IsingModel<std::int32_t>> q(model, p, 1);
  q.step(1);
  CHECK(q.field() == doctest::Approx(2.0));
  // J_perp = -(P T / 2) ln tanh(A / (P T)) (Santoro et al., Science 295, 2427 (2002)).
  CHECK(q.slice_coupling() == doctest::Approx(-0.5 * std::log(std::tanh(2.0))));
  q.step(5);
  CHECK(q.field() == doctest::Approx(2.0 - 2.0 * 5 / 10));
  q.step(5);
  CHECK(q.field() == 0.0);
  CHECK(std::isinf(q.slice_coupling()));
  // At A = 0 the slices are locked: every slice holds the same spins after a few sweeps.
  q.step(3);
  for (std::size_t k = 1; k < q.num_slices(); ++k) {
    CHECK(std::vector<std::int8_t>(q.slice(k).spins(), q.slice(k).spins() + 9) ==
          std::vector<std::int8_t>(q.slice(0).spins(), q.slice(0).spins() + 9));
  }
  const auto half = [](double f) { return f < 0.5 ? 3.0 : 1.0; };
  p.field = Schedule::from(half);
  p.problem = Schedule::linear(0.5, 1.5);
  QuantumAnnealer<IsingModel<std::int32_t>> c(model, p, 1);
  c.step(1);
  CHECK(c.field() == 3.0);
  CHECK(c.problem_factor() == doctest::Approx(0.5));
  c.step(10);
  CHECK(c.field() == 1.0);
  CHECK(c.problem_factor() == doctest::Approx(1.5));
}

TEST_CASE("bqp250 instances: the optimum cut within a fixed sweep budget") {
  // Beasley's OR-Library bqp250 in max-cut form, proven optima in
  // shared/data/maxcut/reference.csv (Beasley 1998). Budget: up to 4 restarts of 1000 sweeps,
  // P = 16, P T = u / 10 (u: the model's energy scale, docs/quantum.md).
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
    const auto w = total_weight(model);
    QuantumAnnealParams p;
    p.sweeps = 1000;
    p.slices = 16;
    p.temperature = estimate_beta_span(model).hot_delta / 2 / 10 / 16;
    long long best = 0;
    std::uint64_t restarts = 0;
    for (std::uint64_t r = 0; r < 4 && best < inst.optimum; ++r, ++restarts) {
      const auto s = quantum_anneal(model, p, 2026, r);
      const auto cut = static_cast<long long>(cut_from_energy(w, s.energy));
      if (cut > best) best = cut;
    }
    MESSAGE(std::string(inst.file), ": cut ", best, " after ", restarts, " restarts");
    CHECK(best == inst.optimum);
  }
}

TEST_CASE("G11 (800-spin toroidal grid, weights +-1): the best-known cut within a fixed sweep budget") {
  // G-set G11, best-known cut 564 (Benlic & Hao, Eng. Appl. Artif. Intell. 26, 1162 (2013);
  // shared/data/maxcut/reference.csv). Budget: up to 4 restarts of 1000 sweeps, P = 16, defaults.
  const auto g = anneal_support::read_edge_list(std::string(SPINWRIGHT_DATA_DIR) + "/maxcut/G11.txt");
  REQUIRE(g.ok);
  const auto model = anneal_support::maxcut_model<std::int32_t>(g);
  const auto w = total_weight(model);
  QuantumAnnealParams p;
  p.sweeps = 1000;
  p.slices = 16;
  long long best = 0;
  for (std::uint64_t r = 0; r < 4 && best < 564; ++r) {
    best = std::max(best, static_cast<long long>(cut_from_energy(w, quantum_anneal(model, p, 2026, r).energy)));
  }
  CHECK(best == 564);
}
