// The automatic kernel choice: the documented rule, and strong results without tuning.
#include <doctest/doctest.h>
#include <spinwright/kernels/auto.hpp>
#include <spinwright/spinwright.hpp>

#include <algorithm>
#include <cstdint>
#include <fstream>
#include <set>
#include <string>
#include <utility>
#include <vector>

#include "support/enumerate.hpp"

using namespace spinwright;

namespace {
IsingModel<std::int32_t> ring(std::uint32_t n, std::int32_t w) {
  IsingBuilder<std::int32_t> b(n);
  for (std::uint32_t i = 0; i < n; ++i) b.add_coupling(i, (i + 1) % n, w);
  return std::move(b.build().value());
}
}  // namespace

TEST_CASE("choose_kernel follows the documented rule") {
  CHECK(choose_kernel(ring(20, 1)).kernel == KernelKind::exact);
  CHECK(choose_kernel(ring(30, 1)).kernel == KernelKind::anneal);
  CHECK(choose_kernel(ring(30, 1)).sweeps == 4000);
  CHECK(choose_kernel(ring(21, 1)).kernel == KernelKind::breakout);  // 21 pairs of 210: density 0.10
  CHECK(choose_kernel(ring(21, 1)).sweeps == 1000);
  // K_30: density 1.
  IsingBuilder<double> b(30);
  for (std::uint32_t i = 0; i < 30; ++i)
    for (std::uint32_t j = i + 1; j < 30; ++j) b.add_coupling(i, j, 1.0);
  const auto k30 = b.build().value();
  CHECK(choose_kernel(k30).kernel == KernelKind::breakout);
  CHECK(choose_kernel(DenseIsingModel<std::int32_t>::from(ring(40, 1)).value()).kernel == KernelKind::breakout);
}

TEST_CASE("solve_auto: exact ground state of a small frustrated model matches enumeration") {
  Xoshiro256 rng(2024);
  QuboBuilder<std::int32_t> b(16);
  for (int k = 0; k < 60; ++k) b.add_pair(rng.below(16), rng.below(16), static_cast<std::int32_t>(rng.below(21)) - 10);
  for (std::uint32_t i = 0; i < 16; ++i) b.add_unary(i, static_cast<std::int32_t>(rng.below(11)) - 5);
  const auto m = b.build().value();
  std::int64_t ground = INT64_MAX;
  test_support::for_each_assignment(16, [&](const std::int8_t* s) { ground = std::min(ground, m.energy(s)); });
  const auto s = solve_auto(m, 1);
  CHECK(s.energy == ground);
  CHECK(m.energy(s.spins.data()) == ground);
}

TEST_CASE("solve_auto: odd antiferromagnetic ring of 101 spins reaches its ground energy") {
  // An odd cycle C_n has max cut n - 1 (common practice), so E_min = W - 2 (n - 1) = -(n - 2).
  const auto m = ring(101, 1);
  const auto s = solve_auto(m, 7);
  CHECK(s.energy == -99);
  CHECK(cut_value(m, s.spins.data()) == 100);
}

TEST_CASE("solve_auto: K_40 max cut is floor(n^2/4) = 400") {
  // Max cut of K_n is floor(n^2 / 4) (Mantel/Turan; common practice).
  IsingBuilder<std::int32_t> b(40);
  for (std::uint32_t i = 0; i < 40; ++i)
    for (std::uint32_t j = i + 1; j < 40; ++j) b.add_coupling(i, j, 1);
  const auto m = b.build().value();
  const auto s = solve_auto(m, 3);
  CHECK(cut_value(m, s.spins.data()) == 400);
}

#include <spinwright/io/edge_list.hpp>
#include <spinwright/parallel/restarts.hpp>

TEST_CASE("solve_auto reaches the proven optimum of bqp250-1 and bqp250-3 without tuning") {
  // Beasley's OR-Library bqp250 instances (J. E. Beasley, J. Oper. Res. Soc. 41, 1990; optima
  // in Beasley 1998), in the shared max-cut form with one extra node: the max cut equals the
  // published optimum (45607 and 49037, shared/data/maxcut/reference.csv).
  const struct {
    const char* file;
    std::int64_t cut;
  } cases[] = {{"bqp250-1.txt", 45607}, {"bqp250-3.txt", 49037}};
  for (const auto& c : cases) {
    auto m = io::read_edge_list<std::int32_t>(std::string(SPINWRIGHT_DATA_DIR) + "/maxcut/" + c.file);
    REQUIRE(m.ok());
    const auto w = total_weight(*m);
    Budget budget;
    budget.with_target(static_cast<double>(energy_from_cut<std::int64_t>(w, c.cut)));
    const auto tally = run_restarts<std::int64_t>(4, 2, [&](std::uint64_t r) { return solve_auto(*m, 11, r, budget); });
    CHECK(cut_value(*m, tally.best().spins.data()) == c.cut);
  }
}

// ---- The time-filling mode (a Budget with a clock, finite seconds and sweeps == 0) ----------

namespace {

// A fake clock: every read advances it by `step` "seconds", so a budget of S seconds is close
// to S clock reads (about one per sweep: the kernels read the clock once per sweep). Runs are
// deterministic and no test depends on the machine's speed. It can also request a stop at a
// given read.
struct Ticker {
  double now = 0;
  double step = 1;
  std::uint64_t reads = 0;
  std::uint64_t stop_at = 0;  // 0: never
  StopToken* token = nullptr;
};

double tick(void* context) noexcept {
  auto* t = static_cast<Ticker*>(context);
  t->now += t->step;
  ++t->reads;
  if (t->token != nullptr && t->stop_at != 0 && t->reads >= t->stop_at) t->token->request_stop();
  return t->now;
}

Budget ticking(Ticker& t, double seconds) { return Budget{}.with_time_limit(seconds, Clock{&tick, &t}); }

// Random 3-regular-like sparse graph with +-1 couplings (invented data: a spin glass on 300
// spins with 3 random partners per spin), density far below 0.10, so auto anneals it.
IsingModel<std::int32_t> sparse_glass(std::uint32_t n, std::uint64_t seed) {
  Xoshiro256 rng(seed);
  IsingBuilder<std::int32_t> b(n);
  for (std::uint32_t i = 0; i < n; ++i) {
    for (int k = 0; k < 3; ++k) {
      const std::uint32_t j = rng.below(n);
      if (j != i) b.add_coupling(i, j, rng.coin() ? 1 : -1);
    }
  }
  return std::move(b.build().value());
}

// Distinct pairs only (a repeated pair is skipped), so every coupling is +-1 and the bit-sliced
// kernel takes the model; with `magnitude` 2 the first pair's coupling is +-2 and it does not
// (invented data, as above).
IsingModel<std::int32_t> distinct_glass(std::uint32_t n, std::uint64_t seed, std::int32_t magnitude = 1) {
  Xoshiro256 rng(seed);
  IsingBuilder<std::int32_t> b(n);
  std::set<std::pair<std::uint32_t, std::uint32_t>> seen;
  for (std::uint32_t i = 0; i < n; ++i) {
    for (int k = 0; k < 3; ++k) {
      const std::uint32_t j = rng.below(n);
      const bool plus = rng.coin();
      if (j == i || !seen.insert({std::min(i, j), std::max(i, j)}).second) continue;
      const std::int32_t w = seen.size() == 1 ? magnitude : 1;
      b.add_coupling(i, j, plus ? w : -w);
    }
  }
  return std::move(b.build().value());
}

// A random 3-regular simple graph (pairing model, retried until simple; invented data, fixed
// seed) with +-1 couplings.
IsingModel<std::int32_t> random_cubic_graph(std::uint32_t n, std::uint64_t seed) {
  Xoshiro256 rng(seed);
  for (;;) {
    std::vector<std::uint32_t> stubs;
    for (std::uint32_t i = 0; i < n; ++i)
      for (int k = 0; k < 3; ++k) stubs.push_back(i);
    for (std::uint32_t k = 3 * n; k > 1; --k) std::swap(stubs[k - 1], stubs[rng.below(k)]);
    std::set<std::pair<std::uint32_t, std::uint32_t>> seen;
    bool simple = true;
    for (std::size_t k = 0; k + 1 < stubs.size() && simple; k += 2) {
      const std::uint32_t a = stubs[k], b = stubs[k + 1];
      simple = a != b && seen.insert({std::min(a, b), std::max(a, b)}).second;
    }
    if (!simple) continue;
    IsingBuilder<std::int32_t> b(n);
    for (const auto& e : seen) b.add_coupling(e.first, e.second, rng.coin() ? 1 : -1);
    return std::move(b.build().value());
  }
}

}  // namespace

TEST_CASE("time-filling annealing: uses the time, stops by the deadline, keeps the best of several runs") {
  const auto m = sparse_glass(300, 5);
  REQUIRE(choose_kernel(m).kernel == KernelKind::anneal);
  CHECK(auto_fills_time(Budget{}.with_time_limit(1.0, Clock{&tick, nullptr})));
  CHECK_FALSE(auto_fills_time(Budget{}));
  CHECK_FALSE(auto_fills_time(Budget{}.with_time_limit(1.0, Clock{&tick, nullptr}).with_sweeps(10)));

  // The documented acceptance rule: Metropolis here (every spin has several partners), heat-bath
  // on a ring (every spin has degree 2).
  CHECK(auto_fill_acceptance(m) == Acceptance::metropolis);
  CHECK(auto_fill_acceptance(ring(101, 1)) == Acceptance::heat_bath);

  const double seconds = 6000;
  Ticker t;
  const auto s = solve_auto(m, 3, 0, ticking(t, seconds));
  CHECK(s.reason == StopReason::deadline);
  // Stopped by the deadline: the clock time used is within a few reads past the budget.
  CHECK(s.seconds <= seconds + 8);
  // The whole time is used: about one clock read per sweep, so nearly `seconds` sweeps were
  // run, far more than the single first run of auto_fill_first_sweeps (several runs).
  CHECK(s.sweeps >= static_cast<std::uint64_t>(0.8 * seconds));
  CHECK(s.sweeps > 4 * auto_fill_first_sweeps);
  // The kept state is consistent, and at least as good as the first run alone (256 sweeps,
  // same seed and restart, same schedule, order and acceptance, steepest descent).
  CHECK(s.energy == m.energy(s.spins.data()));
  AnnealParams first;
  first.sweeps = auto_fill_first_sweeps;
  first.order = SiteOrder::sequential;
  first.acceptance = auto_fill_acceptance(m);
  const auto run0 = polish(m, anneal(m, first, 3, 0), DescentRule::steepest);
  CHECK(s.energy <= run0.energy);
  CHECK(s.restart == 0);
}

TEST_CASE("time-filling annealing: the closing anneal follows the clock to the limit") {
  // Limits of several sizes: after the growing runs, the closing run has no sweep count and
  // ends cold shortly before the limit, leaving room for its descent only; the whole call ends
  // at the limit. (A closing run sized to the 90 % margin, or no closing run once fewer than
  // auto_fill_first_sweeps sweeps fit, leaves up to a tenth of the limit unused: 651 of 700.)
  // The three ways of annealing: bit-sliced groups, lanes groups, one restart at a time (a
  // clock step of 1e-6 s makes the limits too short for groups).
  const auto glass = distinct_glass(300, 5);
  const auto mixed = distinct_glass(300, 5, 2);
  for (const double step : {1.0, 1e-6}) {
    for (const auto* m : {&glass, &mixed}) {
      for (const double ticks : {700.0, 1500.0, 6000.0, 25000.0}) {
        const double seconds = ticks * step;
        CAPTURE(step);
        CAPTURE(seconds);
        CAPTURE(to_string(auto_fill_group_for(*m, seconds)));
        Ticker t;
        t.step = step;
        const auto s = solve_auto(*m, 3, 0, ticking(t, seconds));
        CHECK(s.reason == StopReason::deadline);
        CHECK(s.seconds <= seconds + 8 * step);
        CHECK(s.seconds >= 0.99 * seconds);
        CHECK(s.energy == m->energy(s.spins.data()));
      }
    }
  }
}

TEST_CASE("time-filling annealing: groups of restarts by the documented rule") {
  // Pessimistic costs (auto.hpp): a bit-sliced sweep 50 ns a spin, a lanes sweep 32 x (2 ns a
  // spin + 0.2 ns a stored entry); groups when 1024 such sweeps fit the limit.
  const auto glass = distinct_glass(300, 5);     // +-1, degree <= 15: the bit-sliced kernel takes it
  const auto mixed = distinct_glass(300, 5, 2);  // one coupling of magnitude 2: lanes only
  REQUIRE(bit_sliced_fits(glass).ok());
  REQUIRE_FALSE(bit_sliced_fits(mixed).ok());
  const double bit_limit = 1024 * 300 * 50e-9;
  const double lane_limit = [](const IsingModel<std::int32_t>& m) {
    return 1024 * 32 * (300 * 2e-9 + 2.0 * static_cast<double>(m.num_pairs()) * 0.2e-9);
  }(mixed);
  CHECK(auto_fill_group_for(glass, 6000) == AutoFillGroup::bit_sliced);
  CHECK(auto_fill_group_for(glass, bit_limit * 1.01) == AutoFillGroup::bit_sliced);
  CHECK(auto_fill_group_for(glass, bit_limit * 0.99) == AutoFillGroup::single);  // lanes need more still
  CHECK(auto_fill_group_for(mixed, 6000) == AutoFillGroup::lanes);
  CHECK(auto_fill_group_for(mixed, lane_limit * 1.01) == AutoFillGroup::lanes);
  CHECK(auto_fill_group_for(mixed, lane_limit * 0.99) == AutoFillGroup::single);
  CHECK(auto_fill_group_for(qubo_from(glass).value(), 6000) == AutoFillGroup::lanes);  // bit-sliced: Ising only
  CHECK(auto_fill_group_for(DenseIsingModel<std::int32_t>::from(glass).value(), 6000) == AutoFillGroup::single);
  CHECK(std::string(to_string(AutoFillGroup::bit_sliced)) == "bit-sliced");

  // The first group is group 0 of the documented sequence: restarts 0 .. 31 of the lanes kernel,
  // 256 sweeps, each polished by steepest descent. The whole run keeps at least its best.
  Ticker t;
  const auto s = solve_auto(mixed, 3, 1, ticking(t, 6000));
  CHECK(s.energy == mixed.energy(s.spins.data()));
  CHECK(s.restart == 1);
  AnnealParams first;
  first.sweeps = auto_fill_first_sweeps;
  first.order = SiteOrder::sequential;
  first.acceptance = auto_fill_acceptance(mixed);
  LaneAnnealer<IsingModel<std::int32_t>> group0(mixed, first, 3, 32);
  group0.advance();
  std::int64_t lowest = INT64_MAX;
  for (std::size_t l = 0; l < 32; ++l) {
    Solution<std::int64_t> lane = group0.solution(l);
    lowest = std::min(lowest, polish(mixed, lane, DescentRule::steepest).energy);
  }
  CHECK(s.energy <= lowest);
  // Same seed and clock: the same answer; restarts of a group count as sweeps of their own.
  Ticker u;
  const auto again = solve_auto(mixed, 3, 1, ticking(u, 6000));
  CHECK(again.spins == s.spins);
  CHECK(again.sweeps == s.sweeps);
  CHECK(s.sweeps >= 32 * 4000);

  // Every restart is polished: the state returned by either group kind is a local minimum of
  // single flips (checked flip by flip against the model's energy).
  for (const auto* model : {&glass, &mixed}) {
    Ticker v;
    const auto r = solve_auto(*model, 5, 0, ticking(v, 2000));
    std::vector<std::int8_t> x = r.spins;
    for (std::size_t i = 0; i < x.size(); ++i) {
      x[i] = static_cast<std::int8_t>(-x[i]);
      CHECK(model->energy(x.data()) >= r.energy);
      x[i] = static_cast<std::int8_t>(-x[i]);
    }
  }
}

TEST_CASE("time-filling annealing: the same seed and clock sequence give the same answer") {
  const auto m = sparse_glass(300, 6);
  Ticker a;
  Ticker b;
  const auto s1 = solve_auto(m, 9, 2, ticking(a, 3000));
  const auto s2 = solve_auto(m, 9, 2, ticking(b, 3000));
  CHECK(s1.spins == s2.spins);
  CHECK(s1.energy == s2.energy);
  CHECK(s1.sweeps == s2.sweeps);
  CHECK(s1.seconds == s2.seconds);
  CHECK(a.reads == b.reads);
  // Another restart index is another stream.
  Ticker c;
  const auto s3 = solve_auto(m, 9, 3, ticking(c, 3000));
  CHECK(s3.restart == 3);
  CHECK(s3.energy == m.energy(s3.spins.data()));
}

TEST_CASE("time-filling annealing honours a target and a stop token") {
  // Odd antiferromagnetic ring C_101: ground energy -(n - 2) = -99 (max cut n - 1; common
  // practice). Sequential heat-bath sweeps must still let the domain walls meet.
  const auto ring101 = ring(101, 1);
  {
    Ticker t;
    const auto s = solve_auto(ring101, 4, 0, ticking(t, 1e6).with_target(-99));
    CHECK(s.reason == StopReason::target_reached);
    CHECK(s.energy == -99);
    CHECK(s.seconds < 1e6);
  }
  {
    // Without a target the ring still ends at its ground energy within the time.
    Ticker t;
    const auto s = solve_auto(ring101, 5, 0, ticking(t, 20000));
    CHECK(s.energy == -99);
  }
  {
    // A stop requested at the 700th clock read (inside the second or third run) ends the
    // sequence there; the best so far is returned and consistent.
    const auto m = sparse_glass(300, 7);
    StopToken token;
    Ticker t;
    t.token = &token;
    t.stop_at = 700;
    const auto s = solve_auto(m, 1, 0, ticking(t, 1e6).with_stop(token));
    CHECK(s.reason == StopReason::stopped);
    CHECK(t.reads < 800);
    CHECK(s.energy == m.energy(s.spins.data()));
  }
  {
    // A stop requested before the start: no sweep at all.
    const auto m = sparse_glass(300, 7);
    StopToken token;
    token.request_stop();
    Ticker t;
    const auto s = solve_auto(m, 1, 0, ticking(t, 1e6).with_stop(token));
    CHECK(s.reason == StopReason::stopped);
    CHECK(s.sweeps == 0);
    CHECK(s.energy == m.energy(s.spins.data()));
  }
}

TEST_CASE("time-filling mode on a lattice: tempering with cluster moves, by the documented rule") {
  // An even periodic square lattice is bipartite: every bond can be satisfied, E_min = -2 N
  // (common practice). Every spin has degree 4, so the time-filling mode tempers it.
  IsingBuilder<std::int32_t> b(256);
  for (std::uint32_t r = 0; r < 16; ++r)
    for (std::uint32_t c = 0; c < 16; ++c) {
      b.add_coupling(r * 16 + c, r * 16 + (c + 1) % 16, 1);
      b.add_coupling(r * 16 + c, ((r + 1) % 16) * 16 + c, 1);
    }
  const auto m = b.build().value();
  CHECK(choose_kernel(m).kernel == KernelKind::anneal);
  CHECK(auto_fill_kernel(m) == KernelKind::temper);
  CHECK(auto_fill_kernel(ring(101, 1)) == KernelKind::anneal);          // degree 2
  CHECK(auto_fill_kernel(sparse_glass(300, 5)) == KernelKind::anneal);  // degrees spread beyond 4
  // A limit too short for 100 sweeps of 16 rungs at 10 ns per replica attempt: annealing.
  const double least = 100 * 2 * 16 * 256 * 10e-9;
  CHECK(auto_fill_kernel(m, least * 1.01) == KernelKind::temper);
  CHECK(auto_fill_kernel(m, least * 0.99) == KernelKind::anneal);
  // Degree 3 everywhere but hardly any cycle of four (a random 3-regular graph), and the
  // periodic cubic lattice (degree 6): annealing.
  const auto cubic = [] {
    IsingBuilder<std::int32_t> c(216);
    for (std::uint32_t x = 0; x < 6; ++x)
      for (std::uint32_t y = 0; y < 6; ++y)
        for (std::uint32_t z = 0; z < 6; ++z) {
          const std::uint32_t i = (x * 6 + y) * 6 + z;
          c.add_coupling(i, (((x + 1) % 6) * 6 + y) * 6 + z, 1);
          c.add_coupling(i, (x * 6 + (y + 1) % 6) * 6 + z, 1);
          c.add_coupling(i, (x * 6 + y) * 6 + (z + 1) % 6, -1);
        }
    return std::move(c.build().value());
  }();
  CHECK(auto_fill_kernel(cubic) == KernelKind::anneal);
  const auto regular = random_cubic_graph(300, 11);
  for (std::uint32_t i = 0; i < 300; ++i) REQUIRE(regular.degree(i) == 3);
  CHECK(auto_fill_kernel(regular) == KernelKind::anneal);
  // A 12 x 12 periodic lattice with four bonds removed (spins of degree 3 and 4): still tempering.
  {
    IsingBuilder<std::int32_t> c(144);
    for (std::uint32_t r = 0; r < 12; ++r)
      for (std::uint32_t q = 0; q < 12; ++q) {
        if (r % 5 != 0 || q != 0) c.add_coupling(r * 12 + q, r * 12 + (q + 1) % 12, q % 2 == 0 ? 1 : -1);
        c.add_coupling(r * 12 + q, ((r + 1) % 12) * 12 + q, 1);
      }
    CHECK(auto_fill_kernel(c.build().value()) == KernelKind::temper);
  }
  // Rungs: about 200 ladder sweeps at the same cost, 16 to the automatic clamp(sqrt(N) + 4, 2, 32).
  CHECK(auto_fill_rungs(20000, 5.0) == 32);
  CHECK(auto_fill_rungs(20000, 1.0) == 16);  // 12.5 fit: the fewest, 16
  CHECK(auto_fill_rungs(14000, 1.0) == 17);  // 17.9 fit
  CHECK(auto_fill_rungs(256, 1e9) == 20);
  CHECK(auto_fill_rungs(100, 1e9) == 14);  // the automatic count is below 16
  {
    Ticker t;
    const auto s = solve_auto(m, 2, 0, ticking(t, 1500));
    CHECK(s.reason == StopReason::deadline);
    CHECK(s.seconds <= 1500 + 8);
    CHECK(s.sweeps >= 1000);  // about one clock read per sweep of the whole ladder
    CHECK(s.energy == m.energy(s.spins.data()));
    CHECK(s.energy == -512);
    Ticker u;
    const auto again = solve_auto(m, 2, 0, ticking(u, 1500));
    CHECK(again.spins == s.spins);
    CHECK(again.sweeps == s.sweeps);
  }
  {
    Ticker t;
    const auto s = solve_auto(m, 3, 0, ticking(t, 1e6).with_target(-512));
    CHECK(s.reason == StopReason::target_reached);
    CHECK(s.energy == -512);
  }
  {
    StopToken token;
    Ticker t;
    t.token = &token;
    t.stop_at = 100;
    const auto s = solve_auto(m, 4, 0, ticking(t, 1e6).with_stop(token));
    CHECK(s.reason == StopReason::stopped);
    CHECK(s.sweeps < 110);
    CHECK(s.energy == m.energy(s.spins.data()));
  }
}

TEST_CASE("a sweep budget keeps the fixed mode, even with a clock") {
  const auto m = sparse_glass(300, 8);
  Ticker t;
  const auto s = solve_auto(m, 4, 0, ticking(t, 1e9).with_sweeps(300));
  AnnealParams params;
  params.sweeps = choose_kernel(m).sweeps;
  const auto expected = polish(m, anneal(m, params, 4, 0, Budget{}.with_sweeps(300)), DescentRule::steepest);
  CHECK(s.spins == expected.spins);
  CHECK(s.energy == expected.energy);
  CHECK(s.sweeps == expected.sweeps);
}

TEST_CASE("time-filling breakout search: one run stopped by the deadline") {
  // K_40 (density 1, so auto picks breakout); max cut floor(n^2 / 4) = 400 (Mantel/Turan; common practice).
  IsingBuilder<std::int32_t> b(40);
  for (std::uint32_t i = 0; i < 40; ++i)
    for (std::uint32_t j = i + 1; j < 40; ++j) b.add_coupling(i, j, 1);
  const auto m = b.build().value();
  REQUIRE(choose_kernel(m).kernel == KernelKind::breakout);
  Ticker t;
  const auto s = solve_auto(m, 3, 0, ticking(t, 3000));
  CHECK(s.reason == StopReason::deadline);
  // More sweeps than the fixed mode's 1000: the run filled the time (one read per sweep).
  CHECK(s.sweeps > choose_kernel(m).sweeps);
  CHECK(s.sweeps <= 3000);
  CHECK(cut_value(m, s.spins.data()) == 400);
  Ticker u;
  const auto again = solve_auto(m, 3, 0, ticking(u, 3000));
  CHECK(again.spins == s.spins);
}

TEST_CASE("time-filling solve_auto reaches the proven optimum of bqp250-1 within a sweep-like budget") {
  // Beasley's OR-Library bqp250-1 (J. E. Beasley, J. Oper. Res. Soc. 41, 1990; optimum 45607 in
  // Beasley 1998, shared/data/maxcut/reference.csv), in max-cut form with one extra node. The
  // fake clock turns the budget into about 2000 sweeps.
  auto m = io::read_edge_list<std::int32_t>(std::string(SPINWRIGHT_DATA_DIR) + "/maxcut/bqp250-1.txt");
  REQUIRE(m.ok());
  const auto w = total_weight(*m);
  const double target = static_cast<double>(energy_from_cut<std::int64_t>(w, 45607));
  for (std::uint64_t seed = 1; seed <= 3; ++seed) {
    Ticker t;
    const auto s = solve_auto(*m, seed, 0, ticking(t, 2000).with_target(target));
    CHECK(s.reason == StopReason::target_reached);
    CHECK(cut_value(*m, s.spins.data()) == 45607);
  }
}
