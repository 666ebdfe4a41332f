// The lockstep lanes kernel (kernels/lanes.hpp): every lane samples the right equilibrium
// (Onsager's energy and Yang's magnetisation on the 2D ferromagnet, exact enumeration on the
// 4x4 torus and a 16-spin glass, the 1D ring's transfer matrix), and a restart's result does
// not depend on the lane width, the thread count, the block it ran in or the vector unit.
// Sign convention as in test_anneal_sampling.cpp: ours E = +sum J s s + sum h s, so the
// ferromagnet is coupling -1. MC tolerance: 4 standard errors from 100 bins (REFERENCES.md
// sections 1-3).
#include <doctest/doctest.h>

#include <spinwright/kernels/lanes.hpp>
#include <spinwright/model/builder.hpp>
#include <spinwright/parallel/restarts.hpp>

#include "support/anneal_graph.hpp"

#include <cmath>
#include <cstdint>
#include <string>
#include <vector>

using namespace spinwright;

namespace {

// Onsager's internal energy per spin of the infinite 2D ferromagnet, J = 1:
//   u(T) = -coth(2K) [1 + (2/pi)(2 tanh^2(2K) - 1) K1(q)],  q = 2 sinh(2K) / cosh^2(2K).
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
  double error = 0;
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

struct LaneSamples {
  std::vector<Estimate> u;      // E/N per lane
  std::vector<Estimate> abs_m;  // |m| per lane
};

// Fixed-temperature sampling: every lane's E/N and |m| once per sweep after `burn` sweeps.
template <std::size_t W, class Model>
LaneSamples sample_lanes(const Model& model, double T, Acceptance rule, SiteOrder order, std::uint64_t burn,
                         std::uint64_t measure, std::uint64_t seed) {
  AnnealParams p;
  p.schedule = Schedule::constant(1.0 / T);
  p.acceptance = rule;
  p.order = order;
  p.sweeps = burn + measure;
  LaneAnnealer<Model, W> a(model, p, seed);
  REQUIRE(a.valid());
  a.step(burn);
  const std::size_t n = model.num_spins();
  std::vector<std::vector<double>> u(W), m(W);
  for (std::uint64_t k = 0; k < measure; ++k) {
    a.step(1);
    for (std::size_t l = 0; l < W; ++l) {
      u[l].push_back(static_cast<double>(a.energy(l)) / static_cast<double>(n));
      long sum = 0;
      for (std::size_t i = 0; i < n; ++i) sum += a.spin(l, i);
      m[l].push_back(std::abs(static_cast<double>(sum)) / static_cast<double>(n));
    }
  }
  LaneSamples s;
  for (std::size_t l = 0; l < W; ++l) {
    s.u.push_back(binned(u[l], 100));
    s.abs_m.push_back(binned(m[l], 100));
  }
  return s;
}

template <std::size_t W, class Model>
void check_every_lane(const Model& model, double T, Acceptance rule, SiteOrder order, std::uint64_t burn,
                      std::uint64_t measure, std::uint64_t seed, double exact_u, double exact_m = -1) {
  const LaneSamples s = sample_lanes<W>(model, T, rule, order, burn, measure, seed);
  for (std::size_t l = 0; l < W; ++l) {
    CAPTURE(l);
    CAPTURE(s.u[l].mean);
    CAPTURE(s.u[l].error);
    CHECK(std::abs(s.u[l].mean - exact_u) <= 4 * s.u[l].error);
    if (exact_m >= 0) {
      CAPTURE(s.abs_m[l].mean);
      CAPTURE(s.abs_m[l].error);
      CHECK(std::abs(s.abs_m[l].mean - exact_m) <= 4 * s.abs_m[l].error);
    }
  }
}

// A frustrated 16-spin glass with fields: deltas of many sizes and both signs (more than
// LaneAnnealer::lane_levels units, so the table path runs), as in test_anneal_sampling.cpp.
template <class Value>
IsingModel<Value> glass16(Value unit) {
  IsingBuilder<Value> b(16);
  Xoshiro256 pick(5);
  for (std::uint32_t i = 0; i < 16; ++i) {
    for (std::uint32_t j = i + 1; j < 16; ++j) {
      if (pick.coin()) b.add_coupling(i, j, static_cast<Value>(pick.coin() ? unit : -unit));
    }
  }
  for (std::uint32_t i = 0; i < 16; ++i) {
    b.add_field(i, static_cast<Value>(unit * static_cast<Value>(static_cast<std::int32_t>(pick.below(5)) - 2)));
  }
  return b.build().value();
}

template <class Energy>
void check_same(const Solution<Energy>& a, const Solution<Energy>& b) {
  CHECK(a.restart == b.restart);
  CHECK(a.energy == b.energy);
  CHECK(a.spins == b.spins);
  CHECK(a.accepted == b.accepted);
  CHECK(a.sweeps == b.sweeps);
}

}  // namespace

TEST_CASE("the acceptance arithmetic follows exp(-x) to a few parts in 10^8 plus 2^-30") {
  // Reference: std::exp (C library, correctly rounded to within an ulp). q is 2^30 e^{-x} with
  // x = y ln 2 / 2^24; the table's interpolation error is (ln 2 / 4096)^2 / 8 = 3.6e-9 and the
  // shift's truncation 2^-30 absolute (common practice: error bound of linear interpolation).
  double worst = 0;
  for (std::int32_t y = 0; y < 536870911; y += 9973) {
    const double exact = std::exp(-static_cast<double>(y) * 0.69314718055994531 / 16777216.0) * 1073741824.0;
    const double q = detail::lane_exp_q(y, detail::lane_exp_table);
    const double err = std::abs(q - exact) - 1.0;  // 1: the shift's truncation
    worst = err / exact > worst ? err / exact : worst;
  }
  CHECK(worst < 5e-8);
  CHECK(detail::lane_exp_q(0, detail::lane_exp_table) == (1 << 30));
  // The integer multiplier reproduces |delta| * scale (truncated) to within one unit.
  for (const double beta : {0.0, 1e-9, 0.01, 0.3, 1.0, 7.5, 40.0}) {
    const double scale = beta * detail::lane_beta_unit;
    const detail::LaneMultiplier m = detail::lane_multiplier(scale);
    for (const std::uint32_t d : {0u, 1u, 2u, 4u, 6u, 8u, 34u, 1000u, 123457u}) {
      CAPTURE(beta);
      CAPTURE(d);
      const double exact = std::fmin(static_cast<double>(d) * scale, detail::lane_y_max);
      CHECK(std::abs(static_cast<double>(detail::lane_y(d, m)) - exact) <= 1.0 + exact * 1e-9);
    }
  }
}

TEST_CASE("lanes start where the Annealer starts: the same coins of (seed, r)") {
  const auto model = anneal_support::square_lattice<std::int32_t>(8, -1);
  AnnealParams p;
  LaneAnnealer<IsingModel<std::int32_t>, 8> lanes(model, p, 41, 5);
  for (std::size_t l = 0; l < 8; ++l) {
    Annealer<IsingModel<std::int32_t>> one(model, p, 41, 5 + l);
    bool same = true;
    for (std::size_t i = 0; i < model.num_spins(); ++i) same = same && lanes.spin(l, i) == one.state().spins()[i];
    CHECK(same);
    CHECK(lanes.energy(l) == one.state().energy());
  }
}

TEST_CASE("every lane on the 32x32 ferromagnet reproduces Onsager's energy and Yang's magnetisation") {
  // L = 32: the finite-size bias of u is below 2e-7 at these T (REFERENCES.md section 1);
  // <|m|> is compared with Yang only below T_c = 2.269.
  const auto model = anneal_support::square_lattice<std::int32_t>(32, -1);
  check_every_lane<8>(model, 1.5, Acceptance::metropolis, SiteOrder::sequential, 500, 6000, 11, onsager_u(1.5),
                      yang_m(1.5));
  check_every_lane<8>(model, 2.0, Acceptance::metropolis, SiteOrder::sequential, 500, 6000, 12, onsager_u(2.0),
                      yang_m(2.0));
  check_every_lane<8>(model, 3.0, Acceptance::metropolis, SiteOrder::random, 500, 6000, 13, onsager_u(3.0));
  check_every_lane<8>(model, 2.0, Acceptance::heat_bath, SiteOrder::random, 500, 6000, 14, onsager_u(2.0), yang_m(2.0));
  check_every_lane<8>(model, 3.0, Acceptance::heat_bath, SiteOrder::sequential, 500, 6000, 15, onsager_u(3.0));
  // Floating couplings take the double path of the acceptance arithmetic.
  const auto dbl = anneal_support::square_lattice<double>(32, -1.0);
  check_every_lane<4>(dbl, 2.0, Acceptance::metropolis, SiteOrder::sequential, 500, 6000, 16, onsager_u(2.0),
                      yang_m(2.0));
  check_every_lane<4>(dbl, 3.0, Acceptance::heat_bath, SiteOrder::random, 500, 6000, 17, onsager_u(3.0));
}

TEST_CASE("every lane on the 4x4 torus matches full enumeration, both rules and both orders") {
  // Exact <E>/N by enumerating all 2^16 states (anneal_support::exact_mean_energy, itself
  // checked against REFERENCES.md section 3 in test_anneal_sampling.cpp).
  const auto model = anneal_support::square_lattice<std::int32_t>(4, -1);
  for (const double T : {1.5, 2.269, 5.0}) {
    CAPTURE(T);
    const double u = anneal_support::exact_mean_energy(model, 1.0 / T) / 16.0;
    check_every_lane<8>(model, T, Acceptance::metropolis, SiteOrder::sequential, 500, 60000, 41, u);
    check_every_lane<8>(model, T, Acceptance::metropolis, SiteOrder::random, 500, 60000, 42, u);
    check_every_lane<8>(model, T, Acceptance::heat_bath, SiteOrder::sequential, 500, 60000, 43, u);
    check_every_lane<8>(model, T, Acceptance::heat_bath, SiteOrder::random, 500, 60000, 44, u);
  }
}

TEST_CASE("every lane on a 16-spin glass with fields matches enumeration (table path, int32/float/double)") {
  // Reference: Boltzmann weights of all 2^16 states (Metropolis et al., J. Chem. Phys. 21,
  // 1087 (1953)); the same model in three value types (the float and double ones scaled by
  // 0.37, with beta divided by 0.37, so the same distribution).
  const auto m32 = glass16<std::int32_t>(1);
  const auto mf = glass16<float>(0.37f);
  const auto md = glass16<double>(0.37);
  for (const double beta : {0.8, 1.5}) {
    CAPTURE(beta);
    const double u = anneal_support::exact_mean_energy(m32, beta) / 16.0;
    check_every_lane<8>(m32, 1.0 / beta, Acceptance::metropolis, SiteOrder::sequential, 500, 40000, 81, u);
    check_every_lane<8>(m32, 1.0 / beta, Acceptance::heat_bath, SiteOrder::random, 500, 40000, 82, u);
    check_every_lane<8>(m32, 1.0 / beta, Acceptance::heat_bath, SiteOrder::sequential, 500, 40000, 83, u);
    check_every_lane<4>(mf, 0.37 / beta, Acceptance::metropolis, SiteOrder::random, 500, 40000, 84, 0.37 * u);
    check_every_lane<4>(md, 0.37 / beta, Acceptance::heat_bath, SiteOrder::sequential, 500, 40000, 85, 0.37 * u);
  }
}

TEST_CASE("every lane on the 1D ring reproduces its transfer-matrix energy") {
  // Transfer matrix: E. Ising, Z. Phys. 31, 253 (1925); finite-N values from REFERENCES.md
  // section 2: (J=1, h=0, N=10) u = -0.795566108943, (J=1, h=0.5, N=10) u = -1.44308038068.
  // Metropolis in random order only (sequential Metropolis is not ergodic on a ring at h = 0).
  const auto r0 = anneal_support::ring<double>(10, -1.0);
  const auto r5 = anneal_support::ring<double>(10, -1.0, -0.5);
  const auto ri = anneal_support::ring<std::int32_t>(10, -1);
  check_every_lane<8>(r0, 1.0, Acceptance::metropolis, SiteOrder::random, 500, 60000, 31, -0.795566108943);
  check_every_lane<8>(r5, 1.0, Acceptance::heat_bath, SiteOrder::sequential, 500, 60000, 32, -1.44308038068);
  check_every_lane<8>(ri, 1.0, Acceptance::heat_bath, SiteOrder::random, 500, 60000, 33, -0.795566108943);
  check_every_lane<8>(ri, 1.0, Acceptance::metropolis, SiteOrder::random, 500, 60000, 34, -0.795566108943);
}

TEST_CASE("a restart's result does not depend on the lane width or on its block") {
  // Common practice: restart r depends on (seed, r) only. Width 4, 8, 16 put restart r in
  // different blocks at different lane positions; the results must be identical.
  const auto g = anneal_support::random_cubic(200, 3);
  const auto model = anneal_support::maxcut_model<std::int32_t>(g);
  const auto dbl = anneal_support::maxcut_model<double>(g);
  for (const SiteOrder order : {SiteOrder::sequential, SiteOrder::random}) {
    for (const Acceptance rule : {Acceptance::metropolis, Acceptance::heat_bath}) {
      CAPTURE(static_cast<int>(order));
      CAPTURE(static_cast<int>(rule));
      AnnealParams p;
      p.sweeps = 60;
      p.order = order;
      p.acceptance = rule;
      const auto a = anneal_lanes<4>(model, p, 9, 20);
      const auto b = anneal_lanes<8>(model, p, 9, 20);
      const auto c = anneal_lanes<16>(model, p, 9, 20);
      REQUIRE(a.size() == 20);
      REQUIRE(b.size() == 20);
      REQUIRE(c.size() == 20);
      for (std::size_t r = 0; r < 20; ++r) {
        CAPTURE(r);
        check_same(a[r], b[r]);
        check_same(a[r], c[r]);
        CHECK(a[r].energy == model.energy(a[r].spins.data()));
      }
      const auto da = anneal_lanes<4>(dbl, p, 9, 10);
      const auto db = anneal_lanes<16>(dbl, p, 9, 10);
      for (std::size_t r = 0; r < 10; ++r) check_same(da[r], db[r]);
      // A block that starts elsewhere: restarts 5..12 as lanes 0..7.
      LaneAnnealer<IsingModel<std::int32_t>, 8> shifted(model, p, 9, 5);
      shifted.advance();
      for (std::size_t l = 0; l < 8; ++l) check_same(shifted.solution(l), a[5 + l]);
    }
  }
}

TEST_CASE("every vector unit gives the same answer") {
  // Common practice: the run-time dispatch must be invisible. Every unit this CPU has is forced
  // in turn (the plain path always exists) and compared lane by lane, with both rules, both
  // orders and integer and floating models.
  const auto g = anneal_support::random_cubic(300, 8);
  const auto model = anneal_support::maxcut_model<std::int32_t>(g);
  const auto dbl = anneal_support::maxcut_model<double>(g);
  const auto glass = glass16<std::int32_t>(1);
  std::vector<LaneUnit> units;
  for (const LaneUnit u : {LaneUnit::plain, LaneUnit::avx2, LaneUnit::avx512}) {
    if (lane_unit_supported(u)) units.push_back(u);
  }
  MESSAGE("units on this CPU: " << units.size() << ", best " << std::string(lane_unit_name(best_lane_unit())));
  auto run = [](const auto& m, const AnnealParams& p, LaneUnit unit) {
    LaneAnnealer<std::decay_t<decltype(m)>, 16> a(m, p, 21, 0);
    REQUIRE(a.set_unit(unit));
    a.advance();
    return a.solutions();
  };
  for (const SiteOrder order : {SiteOrder::sequential, SiteOrder::random}) {
    for (const Acceptance rule : {Acceptance::metropolis, Acceptance::heat_bath}) {
      AnnealParams p;
      p.sweeps = 50;
      p.order = order;
      p.acceptance = rule;
      const auto ref_int = run(model, p, LaneUnit::plain);
      const auto ref_dbl = run(dbl, p, LaneUnit::plain);
      const auto ref_glass = run(glass, p, LaneUnit::plain);
      for (const LaneUnit u : units) {
        CAPTURE(lane_unit_name(u));
        const auto a = run(model, p, u);
        const auto b = run(dbl, p, u);
        const auto c = run(glass, p, u);
        for (std::size_t l = 0; l < 16; ++l) {
          check_same(a[l], ref_int[l]);
          check_same(b[l], ref_dbl[l]);
          check_same(c[l], ref_glass[l]);
        }
      }
    }
  }
}

TEST_CASE("narrow stored fields (int8, int16) and every way of finding q give the same answers") {
  // The lanes keep int32 fields as int8 or int16 when the field bound allows, and find q by
  // selection, lookup or interpolation as the model's delta sizes allow. Multiplying every
  // coefficient by 2^k and every beta by 2^-k leaves each acceptance exactly as it was (the
  // integer y of detail/lane_accept.hpp is unchanged), so the scalings 1, 2^8 and 2^16, stored
  // in int8, int16 and int32, must give the same spins, the same accepted counts and energies
  // in proportion, on every vector unit and with every path the model allows.
  const auto g = anneal_support::random_cubic(300, 4);
  auto scaled_cubic = [&g](std::int32_t unit) {
    IsingBuilder<std::int32_t> b(300);
    for (const auto& e : g.edges) b.add_coupling(e.i, e.j, unit * static_cast<std::int32_t>(e.w));
    return b.build().value();
  };
  // Couplings of many sizes (1..199, odd and even) on a ring with chords: more than
  // lane_table_levels delta sizes, so the default path interpolates.
  auto wide_glass = [](std::int32_t unit) {
    IsingBuilder<std::int32_t> b(64);
    Xoshiro256 pick(11);
    for (std::uint32_t i = 0; i < 64; ++i) {
      for (const std::uint32_t k : {1u, 7u}) {
        const auto w = static_cast<std::int32_t>(pick.below(199)) + 1;
        b.add_coupling(i, (i + k) % 64, unit * (pick.coin() ? w : -w));
      }
    }
    return b.build().value();
  };
  struct Family {
    std::vector<IsingModel<std::int32_t>> models;
    std::vector<std::int32_t> units;
    std::vector<std::size_t> bytes;
    LanePath path;
  };
  std::vector<Family> families(3);
  for (const std::int32_t u : {1, 1 << 8, 1 << 16}) {
    families[0].models.push_back(scaled_cubic(u));
    families[1].models.push_back(glass16<std::int32_t>(u));
    families[0].units.push_back(u);
    families[1].units.push_back(u);
  }
  families[0].bytes = {1, 2, 4};
  families[1].bytes = {1, 2, 4};
  families[0].path = LanePath::select;
  families[1].path = LanePath::lookup;
  for (const std::int32_t u : {1, 1 << 8}) {
    families[2].models.push_back(wide_glass(u));
    families[2].units.push_back(u);
  }
  families[2].bytes = {2, 4};
  families[2].path = LanePath::interpolate;
  std::vector<LaneUnit> lane_units;
  for (const LaneUnit u : {LaneUnit::plain, LaneUnit::avx2, LaneUnit::avx512}) {
    if (lane_unit_supported(u)) lane_units.push_back(u);
  }
  using Lanes = LaneAnnealer<IsingModel<std::int32_t>, 16>;
  for (std::size_t f = 0; f < families.size(); ++f) {
    const Family& fam = families[f];
    for (const SiteOrder order : {SiteOrder::sequential, SiteOrder::random}) {
      for (const Acceptance rule : {Acceptance::metropolis, Acceptance::heat_bath}) {
        CAPTURE(f);
        CAPTURE(static_cast<int>(order));
        CAPTURE(static_cast<int>(rule));
        std::vector<Solution<IsingModel<std::int32_t>::energy_type>> ref;
        std::size_t runs = 0;
        for (std::size_t k = 0; k < fam.models.size(); ++k) {
          const auto& m = fam.models[k];
          REQUIRE(Lanes::field_bytes_for(m) == fam.bytes[k]);
          for (const LaneUnit unit : lane_units) {
            for (const LanePath path : {LanePath::select, LanePath::lookup, LanePath::interpolate}) {
              AnnealParams p;
              p.sweeps = 60;
              p.order = order;
              p.acceptance = rule;
              p.schedule = Schedule::geometric(0.1 / fam.units[k], 3.0 / fam.units[k]);
              Lanes a(m, p, 13, 0);
              REQUIRE(a.field_bytes() == fam.bytes[k]);
              REQUIRE(a.path() == fam.path);
              REQUIRE(a.set_unit(unit));
              const bool allowed = path == LanePath::interpolate || path == LanePath::lookup
                                       ? fam.path != LanePath::interpolate || path == LanePath::interpolate
                                       : fam.path == LanePath::select;
              CHECK(a.set_path(path) == allowed);
              if (!allowed) continue;
              a.advance();
              CHECK(a.field_error() == 0);
              const auto got = a.solutions();
              ++runs;
              if (ref.empty()) {
                ref = got;
                continue;
              }
              CAPTURE(k);
              CAPTURE(lane_unit_name(unit));
              CAPTURE(static_cast<int>(path));
              for (std::size_t l = 0; l < 16; ++l) {
                CAPTURE(l);
                CHECK(got[l].spins == ref[l].spins);
                CHECK(got[l].accepted == ref[l].accepted);
                CHECK(got[l].energy == ref[l].energy * fam.units[k]);
              }
            }
          }
        }
        CHECK(runs >= fam.models.size() * lane_units.size());
      }
    }
  }
}

TEST_CASE("run_restarts takes lanes for many restarts and gives the same tally on any thread count") {
  const auto g = anneal_support::random_cubic(400, 5);
  const auto model = anneal_support::maxcut_model<std::int32_t>(g);
  AnnealParams p;
  p.sweeps = 80;
  const auto one = run_restarts(model, p, 17, 40, 1);
  const auto two = run_restarts(model, p, 17, 40, 2);
  CHECK(one.lane_width == default_lane_width);
  CHECK(two.lane_width == default_lane_width);
  REQUIRE(one.restarts() == 40);
  CHECK(one.energies() == two.energies());
  CHECK(one.best().spins == two.best().spins);
  CHECK(one.best().restart == two.best().restart);
  CHECK(one.best().energy == model.energy(one.best().spins.data()));
  // The lanes' restarts are those of anneal_lanes (any width), in restart order.
  const auto direct = anneal_lanes<8>(model, p, 17, 40);
  for (std::size_t r = 0; r < 40; ++r) CHECK(one.energies()[r] == direct[r].energy);
  // Few restarts, a target, or LaneUse::never: one Annealer per restart, as before.
  const auto few = run_restarts(model, p, 17, 3, 2);
  CHECK(few.lane_width == 0);
  const auto never = run_restarts(model, p, 17, 40, 2, Budget{}, LaneUse::never);
  CHECK(never.lane_width == 0);
  for (std::size_t r = 0; r < 3; ++r) CHECK(never.energies()[r] == anneal(model, p, 17, r).energy);
  CHECK(few.energies()[2] == never.energies()[2]);
  Budget with_target;
  with_target.with_target(-1e9);
  const auto target = run_restarts(model, p, 17, 40, 2, with_target);
  CHECK(target.lane_width == 0);
}

TEST_CASE("a model beyond the int32 field bound is refused clearly, and the restarts fall back") {
  // |site term| + sum |pair| above 2^30 at a spin: int32 local fields could overflow.
  IsingBuilder<std::int32_t> b(3);
  b.add_coupling(0, 1, 600000000);
  b.add_coupling(0, 2, 600000000);
  const auto model = b.build().value();
  CHECK_FALSE(LaneAnnealer<IsingModel<std::int32_t>>::fits(model));
  AnnealParams p;
  p.sweeps = 10;
  LaneAnnealer<IsingModel<std::int32_t>> a(model, p, 1);
  CHECK_FALSE(a.valid());
  CHECK(anneal_lanes(model, p, 1, 20).empty());
  const auto t = run_restarts(model, p, 1, 20, 1);
  CHECK(t.lane_width == 0);
  CHECK(t.restarts() == 20);
  CHECK(t.best().energy == -1200000000);
  // The edge: a field bound of 2^30 is refused (2 |field| would not fit), 2^30 - 1 taken.
  IsingBuilder<std::int32_t> at(3), below(3);
  at.add_coupling(0, 1, 1 << 29);
  at.add_coupling(0, 2, 1 << 29);
  below.add_coupling(0, 1, 1 << 29);
  below.add_coupling(0, 2, (1 << 29) - 1);
  CHECK_FALSE(LaneAnnealer<IsingModel<std::int32_t>>::fits(at.build().value()));
  const auto edge = below.build().value();
  REQUIRE(LaneAnnealer<IsingModel<std::int32_t>>::fits(edge));
  const auto e = anneal_lanes<4>(edge, p, 1, 4);
  REQUIRE(e.size() == 4);
  for (const auto& s : e) CHECK(s.energy == -(1 << 30) + 1);
}

TEST_CASE("the arena constructor needs no heap and gives the heap constructor's answer") {
  const auto model = anneal_support::square_lattice<std::int32_t>(6, -1);
  AnnealParams p;
  p.sweeps = 40;
  using Lanes = LaneAnnealer<IsingModel<std::int32_t>, 8>;
  std::vector<unsigned char> memory(Lanes::bytes_needed(model, p));
  Arena arena(memory.data(), memory.size());
  Lanes a(model, p, arena, 3, 0);
  REQUIRE(a.valid());
  Lanes h(model, p, 3, 0);
  a.advance();
  h.advance();
  for (std::size_t l = 0; l < 8; ++l) {
    CHECK(a.best(l).energy == h.best(l).energy);
    CHECK(a.best(l).energy == model.energy(a.best(l).spins));
  }
  CHECK(a.field_error() == 0);
  std::vector<unsigned char> small(Lanes::bytes_needed(model, p) / 2);
  Arena tight(small.data(), small.size());
  Lanes t(model, p, tight, 3, 0);
  CHECK_FALSE(t.valid());
}
