// Fixed-temperature sampling with the annealing kernel (Schedule::constant) against exact
// statistical mechanics. Sign convention: physics H = -sum J s_i s_j - sum h s_i, ours
// E = +sum J s_i s_j + sum h s_i, so the ferromagnet J = 1 is our coupling -1 and the
// energy per spin E/N equals the physics u. Tolerance: 4 standard errors from binning
// (REFERENCES.md sections 1-3: "MC tolerance 4 sigma with sigma from binning").
#include <doctest/doctest.h>

#include <spinwright/kernels/anneal.hpp>
#include <spinwright/model/builder.hpp>

#include "support/anneal_graph.hpp"

#include <cmath>
#include <cstdint>
#include <cstdlib>
#include <vector>

using namespace spinwright;

namespace {

// Onsager's internal energy per spin of the infinite 2D ferromagnet, J = 1:
//   u(T) = -coth(2K) [1 + (2/pi)(2 tanh^2(2K) - 1) K1(q)],  q = 2 sinh(2K) / cosh^2(2K),
// K1 the complete elliptic integral of the first kind with modulus q.
// L. Onsager, Phys. Rev. 65, 117 (1944); form as in REFERENCES.md section 1.
double onsager_u(double T) {
  const double K = 1.0 / T;
  const double q = 2 * std::sinh(2 * K) / (std::cosh(2 * K) * std::cosh(2 * K));
  const double t = std::tanh(2 * K);
  return -(1 / t) * (1 + (2 / M_PI) * (2 * t * t - 1) * std::comp_ellint_1(q));
}

// Yang's spontaneous magnetisation, T < T_c: m = (1 - sinh(2K)^-4)^(1/8).
// C. N. Yang, Phys. Rev. 85, 808 (1952).
double yang_m(double T) {
  const double s = std::sinh(2.0 / T);
  return std::pow(1 - 1 / (s * s * s * s), 0.125);
}

struct Estimate {
  double mean = 0;
  double error = 0;  // standard error from the bin means
};

struct Samples {
  Estimate u;
  Estimate abs_m;
};

Estimate binned(const std::vector<double>& x, std::size_t bins) {
  const std::size_t per = x.size() / bins;
  std::vector<double> means(bins, 0.0);
  for (std::size_t b = 0; b < bins; ++b) {
    for (std::size_t k = 0; k < per; ++k) means[b] += x[b * per + k];
    means[b] /= static_cast<double>(per);
  }
  Estimate e;
  for (double m : means) e.mean += m;
  e.mean /= static_cast<double>(bins);
  double var = 0;
  for (double m : means) var += (m - e.mean) * (m - e.mean);
  var /= static_cast<double>(bins - 1);
  e.error = std::sqrt(var / static_cast<double>(bins));
  return e;
}

// Samples E/N and |m| once per sweep after `burn` sweeps.
// `hazard_below`: AnnealParams::hazard_below (integer Metropolis: 0 never takes the hazard
// path, 2 takes it from the second sweep on).
template <class Model>
Samples sample(const Model& model, double T, Acceptance rule, SiteOrder order, std::uint64_t burn,
               std::uint64_t measure, std::uint64_t seed, double hazard_below = AnnealParams{}.hazard_below) {
  AnnealParams p;
  p.hazard_below = hazard_below;
  p.schedule = Schedule::constant(1.0 / T);
  p.acceptance = rule;
  p.order = order;
  p.sweeps = burn + measure;
  Annealer<Model> a(model, p, seed);
  a.step(burn);
  const double n = static_cast<double>(model.num_spins());
  std::vector<double> u, m;
  u.reserve(measure);
  m.reserve(measure);
  for (std::uint64_t k = 0; k < measure; ++k) {
    a.step(1);
    u.push_back(static_cast<double>(a.state().energy()) / n);
    long sum = 0;
    for (std::size_t i = 0; i < model.num_spins(); ++i) sum += a.state().spins()[i];
    m.push_back(std::abs(static_cast<double>(sum)) / n);
  }
  return {binned(u, 100), binned(m, 100)};
}

}  // namespace

TEST_CASE("the exact formulas match the published table (REFERENCES.md section 1)") {
  // Values computed with mpmath in REFERENCES.md section 1.
  CHECK(onsager_u(1.5) == doctest::Approx(-1.95111657308).epsilon(1e-10));
  CHECK(onsager_u(2.0) == doctest::Approx(-1.74556457531).epsilon(1e-10));
  CHECK(onsager_u(3.0) == doctest::Approx(-0.817309592502).epsilon(1e-10));
  CHECK(yang_m(2.0) == doctest::Approx(0.911319377877).epsilon(1e-10));
  CHECK(yang_m(1.5) == doctest::Approx(0.986499602621).epsilon(1e-10));
}

TEST_CASE("Metropolis on the 32x32 periodic ferromagnet reproduces Onsager's energy and Yang's magnetisation") {
  // L = 32: the finite-size bias of u is below 2e-7 at T = 1.5, 2.0, 3.0 (REFERENCES.md
  // section 1, exact torus values), far below the statistical error; <|m|> is compared with
  // Yang only for T <= 2.0 (same section).
  const auto int_model = anneal_support::square_lattice<std::int32_t>(32, -1);
  const auto dbl_model = anneal_support::square_lattice<double>(32, -1.0);
  const auto flt_model = anneal_support::square_lattice<float>(32, -1.0f);
  struct Case {
    double T;
    int kind;  // 0 int32 (threshold table), 1 double, 2 float (log comparison)
  };
  for (const Case c : {Case{1.5, 0}, Case{2.0, 0}, Case{3.0, 0}, Case{2.0, 1}, Case{3.0, 2}}) {
    CAPTURE(c.T);
    CAPTURE(c.kind);
    Samples s;
    if (c.kind == 0) s = sample(int_model, c.T, Acceptance::metropolis, SiteOrder::sequential, 2000, 30000, 11);
    if (c.kind == 1) s = sample(dbl_model, c.T, Acceptance::metropolis, SiteOrder::sequential, 2000, 30000, 12);
    if (c.kind == 2) s = sample(flt_model, c.T, Acceptance::metropolis, SiteOrder::random, 2000, 30000, 13);
    CAPTURE(s.u.mean);
    CAPTURE(s.u.error);
    CHECK(std::abs(s.u.mean - onsager_u(c.T)) <= 4 * s.u.error);
    if (c.T <= 2.0) {
      CAPTURE(s.abs_m.mean);
      CAPTURE(s.abs_m.error);
      CHECK(std::abs(s.abs_m.mean - yang_m(c.T)) <= 4 * s.abs_m.error);
    }
  }
}

TEST_CASE("integer Metropolis: the uniform path and the hazard path each reproduce Onsager and Yang") {
  // The same published values as above (Onsager 1944, Yang 1952), with the acceptance path
  // forced: hazard_below = 0 draws one uniform per uphill attempt, 2 one exponential per
  // accepted uphill flip (kernels/acceptance.hpp). Either path alone must give the equilibrium.
  const auto int_model = anneal_support::square_lattice<std::int32_t>(32, -1);
  for (const double hazard_below : {0.0, 2.0}) {
    for (const double T : {1.5, 2.0, 3.0}) {
      for (const SiteOrder order : {SiteOrder::sequential, SiteOrder::random}) {
        CAPTURE(hazard_below);
        CAPTURE(T);
        CAPTURE(static_cast<int>(order));
        const Samples s = sample(int_model, T, Acceptance::metropolis, order, 1000, 12000, 61, hazard_below);
        CAPTURE(s.u.mean);
        CAPTURE(s.u.error);
        CHECK(std::abs(s.u.mean - onsager_u(T)) <= 4 * s.u.error);
        if (T <= 2.0) {
          CAPTURE(s.abs_m.mean);
          CAPTURE(s.abs_m.error);
          CHECK(std::abs(s.abs_m.mean - yang_m(T)) <= 4 * s.abs_m.error);
        }
      }
    }
  }
}

TEST_CASE("a 16-spin glass with fields: every rule, order and acceptance path samples the exact Boltzmann average") {
  // Frustrated +-1 couplings on about half the pairs and fields in [-2, 2] give deltas of many
  // sizes and both signs (the lattices above only have 0, +-4, +-8). The reference is <E> by
  // enumerating all 2^16 states (Boltzmann weights, as in Metropolis et al., J. Chem. Phys.
  // 21, 1087 (1953)); 4 standard errors from 100 bins.
  IsingBuilder<std::int32_t> b(16);
  Xoshiro256 pick(5);
  for (std::uint32_t i = 0; i < 16; ++i) {
    for (std::uint32_t j = i + 1; j < 16; ++j) {
      if (pick.coin()) b.add_coupling(i, j, pick.coin() ? 1 : -1);
    }
  }
  for (std::uint32_t i = 0; i < 16; ++i) b.add_field(i, static_cast<std::int32_t>(pick.below(5)) - 2);
  const auto model = b.build().value();
  for (const double beta : {0.8, 1.5}) {
    const double exact = anneal_support::exact_mean_energy(model, beta) / 16.0;
    for (const Acceptance rule : {Acceptance::metropolis, Acceptance::heat_bath}) {
      for (const SiteOrder order : {SiteOrder::sequential, SiteOrder::random}) {
        for (const double hazard_below : {0.0, 2.0}) {
          CAPTURE(beta);
          CAPTURE(static_cast<int>(rule));
          CAPTURE(static_cast<int>(order));
          CAPTURE(hazard_below);
          const Samples s = sample(model, 1.0 / beta, rule, order, 1000, 60000, 81, hazard_below);
          CAPTURE(s.u.mean);
          CAPTURE(s.u.error);
          CAPTURE(exact);
          CHECK(std::abs(s.u.mean - exact) <= 4 * s.u.error);
        }
      }
    }
  }
}

TEST_CASE("heat-bath on the 32x32 periodic ferromagnet reproduces Onsager's energy") {
  const auto int_model = anneal_support::square_lattice<std::int32_t>(32, -1);
  const auto dbl_model = anneal_support::square_lattice<double>(32, -1.0);
  for (const double T : {2.0, 3.0}) {
    CAPTURE(T);
    const Samples a = sample(int_model, T, Acceptance::heat_bath, SiteOrder::sequential, 2000, 30000, 21);
    CHECK(std::abs(a.u.mean - onsager_u(T)) <= 4 * a.u.error);
    const Samples b = sample(dbl_model, T, Acceptance::heat_bath, SiteOrder::random, 2000, 30000, 22);
    CHECK(std::abs(b.u.mean - onsager_u(T)) <= 4 * b.u.error);
  }
  // Integer heat-bath with each acceptance path forced (kernels/acceptance.hpp).
  for (const double hazard_below : {0.0, 2.0}) {
    CAPTURE(hazard_below);
    const Samples m =
        sample(int_model, 2.0, Acceptance::heat_bath, SiteOrder::sequential, 2000, 30000, 23, hazard_below);
    CHECK(std::abs(m.u.mean - onsager_u(2.0)) <= 4 * m.u.error);
    CHECK(std::abs(m.abs_m.mean - yang_m(2.0)) <= 4 * m.abs_m.error);
  }
}

TEST_CASE("the 1D ring reproduces its transfer-matrix energy") {
  // Physics H = -J sum s_i s_{i+1} - h sum s_i on a ring of N spins, T = 1:
  // Z_N = l+^N + l-^N, l+- = e^K cosh B +- sqrt(e^{2K} sinh^2 B + e^{-2K}), K = J/T, B = h/T;
  // u_N = -(1/N) d ln Z / d beta. Transfer matrix: E. Ising, Z. Phys. 31, 253 (1925); finite-N
  // values from REFERENCES.md section 2: (J=1, h=0, N=10) u = -0.795566108943,
  // (J=1, h=0.5, N=10) u = -1.44308038068.
  struct Case {
    double h;
    double u;
  };
  for (const Case c : {Case{0.0, -0.795566108943}, Case{0.5, -1.44308038068}}) {
    CAPTURE(c.h);
    // Ours: coupling -J, field -h.
    const auto di = anneal_support::ring<double>(10, -1.0, -c.h);
    // Metropolis in random site order: sequential Metropolis is not ergodic on a ring with
    // h = 0 (delta-0 flips are always accepted, so domain walls ride along with the sweep;
    // observed here: <E>/N = -0.583 instead of -0.796). Heat-bath is fine in either order.
    struct Variant {
      Acceptance rule;
      SiteOrder order;
    };
    for (const Variant v :
         {Variant{Acceptance::metropolis, SiteOrder::random}, Variant{Acceptance::heat_bath, SiteOrder::sequential},
          Variant{Acceptance::heat_bath, SiteOrder::random}}) {
      const Samples s = sample(di, 1.0, v.rule, v.order, 1000, 200000, 31);
      CAPTURE(s.u.mean);
      CAPTURE(s.u.error);
      CHECK(std::abs(s.u.mean - c.u) <= 4 * s.u.error);
    }
  }
  // Integer couplings (h = 0 only: the field 0.5 is not an integer).
  const auto ri = anneal_support::ring<std::int32_t>(10, -1);
  for (const double hazard_below : {0.0, 2.0}) {
    CAPTURE(hazard_below);
    const Samples s = sample(ri, 1.0, Acceptance::metropolis, SiteOrder::random, 1000, 200000, 32, hazard_below);
    CAPTURE(s.u.mean);
    CAPTURE(s.u.error);
    CHECK(std::abs(s.u.mean - (-0.795566108943)) <= 4 * s.u.error);
  }
}

TEST_CASE("the 4x4 periodic lattice matches full enumeration of its partition function") {
  // Exact <E>/N by enumerating all 2^16 states here; the enumeration itself is checked
  // against REFERENCES.md section 3 (u(2.269) = -1.56576893133, u(2.5) = -1.37911648226,
  // computed there from the published density of states, cf. Beale, PRL 76, 78 (1996)).
  const auto model = anneal_support::square_lattice<std::int32_t>(4, -1);
  auto exact_u = [&model](double T) { return anneal_support::exact_mean_energy(model, 1.0 / T) / 16.0; };
  CHECK(exact_u(2.269) == doctest::Approx(-1.56576893133).epsilon(1e-10));
  CHECK(exact_u(2.5) == doctest::Approx(-1.37911648226).epsilon(1e-10));
  for (const double T : {1.5, 2.269, 2.5, 5.0}) {
    CAPTURE(T);
    const double u = exact_u(T);
    for (const double hazard_below : {0.0, 2.0}) {
      CAPTURE(hazard_below);
      const Samples a = sample(model, T, Acceptance::metropolis, SiteOrder::sequential, 1000, 300000, 41, hazard_below);
      CAPTURE(a.u.mean);
      CAPTURE(a.u.error);
      CHECK(std::abs(a.u.mean - u) <= 4 * a.u.error);
    }
    for (const double hazard_below : {0.0, 2.0}) {
      CAPTURE(hazard_below);
      const Samples b = sample(model, T, Acceptance::heat_bath, SiteOrder::random, 1000, 300000, 42, hazard_below);
      CAPTURE(b.u.mean);
      CAPTURE(b.u.error);
      CHECK(std::abs(b.u.mean - u) <= 4 * b.u.error);
      const Samples c = sample(model, T, Acceptance::heat_bath, SiteOrder::sequential, 1000, 300000, 43, hazard_below);
      CAPTURE(c.u.mean);
      CAPTURE(c.u.error);
      CHECK(std::abs(c.u.mean - u) <= 4 * c.u.error);
    }
  }
}
