// The deadline bounds the whole one-call function: building the workspace, the sweeps, the
// closing polish and the result all count against a time limit (Budget::start, stamped at the
// call's entry), and no sweep is begun that the last one's duration says would end past it.
// The clock here is fake and counts work: every visit of a model row (for_each_neighbour) adds
// the row's length + 1, every energy() evaluation a whole pass, and every clock read N (a
// read happens once per sweep, which stands for the sweep's N attempts). The "work after the
// deadline" is the clock at return minus (start + limit). Without the stamp, the workspace
// (about eight passes over the model) and the result lay outside the budget.
// Bounds are our own (common practice: a deadline overrun of at most one unit of work).
#include <doctest/doctest.h>

#include <spinwright/kernels/auto.hpp>
#include <spinwright/model/builder.hpp>

#include <cstdint>
#include <utility>

using namespace spinwright;

namespace {

std::uint64_t g_work = 0;

// An IsingModel whose reads are counted in g_work (the kernels are generic over the model).
struct CountingModel : IsingModel<std::int32_t> {
  using base = IsingModel<std::int32_t>;
  explicit CountingModel(base&& m) : base(std::move(m)) {}
  template <class Fn>
  void for_each_neighbour(index_type i, Fn&& f) const {
    g_work += degree(i) + 1;
    base::for_each_neighbour(i, std::forward<Fn>(f));
  }
  energy_type energy(const std::int8_t* spins) const noexcept {
    g_work += pass();
    return base::energy(spins);
  }
  std::uint64_t pass() const noexcept { return num_spins() + 2 * num_pairs(); }
};

struct WorkClock {
  std::uint64_t n = 0;
  static double read(void* self) {
    g_work += static_cast<WorkClock*>(self)->n;
    return static_cast<double>(g_work);
  }
};

// A ring plus one random chord per spin, couplings in -10..10 (invented data, fixed seed):
// sparse, some spins of degree 2, so solve_auto takes its time-filling annealing path.
CountingModel ring_with_chords(std::uint32_t n) {
  Xoshiro256 rng(13);
  IsingBuilder<std::int32_t> b(n);
  for (std::uint32_t i = 0; i < n; ++i) {
    b.add_coupling(i, (i + 1) % n, static_cast<std::int32_t>(rng.below(21)) - 10);
    // One draw per statement: argument order is unspecified, the model must not depend on it.
    const auto w = static_cast<std::int32_t>(rng.below(21)) - 10;
    const std::uint32_t j = rng.below(n);
    b.add_coupling(i, j, w);
  }
  return CountingModel(std::move(b.build().value()));
}

struct Overrun {
  double after = 0;    // work after the deadline (0 when the call returned before it)
  double seconds = 0;  // the call's own report
  double span = 0;     // clock at return minus the clock at entry
};

template <class Call>
Overrun measure(const CountingModel& m, double limit, Call call) {
  WorkClock wc{m.num_spins()};
  const Clock clock{&WorkClock::read, &wc};
  g_work = 0;
  const double entry = clock.read();
  const double seconds = call(Budget{}.with_time_limit(limit, clock));
  const double end = static_cast<double>(g_work);
  Overrun o;
  o.after = end - (entry + limit) > 0 ? end - (entry + limit) : 0;
  o.seconds = seconds;
  o.span = end - entry;
  return o;
}

}  // namespace

TEST_CASE("one-call functions count their workspace, polish and result against the deadline") {
  const CountingModel m = ring_with_chords(400);
  const double pass = static_cast<double>(m.pass());
  const double limit = 30 * pass;
  SUBCASE("anneal") {
    const Overrun o = measure(m, limit, [&](const Budget& b) { return anneal(m, AnnealParams{}, 1, 0, b).seconds; });
    CHECK(o.after <= pass);
    CHECK(o.seconds <= o.span);
    CHECK(o.seconds >= o.span - pass);  // the report covers the whole call, not only the sweeps
  }
  SUBCASE("anneal with unlimited sweeps") {
    const Overrun o = measure(m, limit, [&](const Budget& b) {
      Budget u = b;
      return anneal(m, AnnealParams{}, 2, 0, u.with_sweeps(unlimited_sweeps)).seconds;
    });
    CHECK(o.after <= pass);
    CHECK(o.span >= limit - 2 * pass);  // and the time is used
  }
  SUBCASE("solve_auto, time-filling annealing and its descents") {
    REQUIRE(auto_fill_kernel(m) == KernelKind::anneal);
    for (const double l : {limit, 3 * limit, 10 * limit}) {
      const Overrun o = measure(m, l, [&](const Budget& b) { return solve_auto(m, 3, 0, b).seconds; });
      CHECK(o.after <= pass);
      CHECK(o.seconds <= o.span);
    }
  }
  SUBCASE("temper") {
    TemperParams p;
    p.ladder.temperatures = 4;
    const Overrun o = measure(m, limit, [&](const Budget& b) { return temper(m, p, 4, 0, b).seconds; });
    CHECK(o.after <= 4 * pass);  // one sweep of tempering is a sweep of every replica
  }
  SUBCASE("tabu_walk") {
    const Overrun o = measure(m, limit, [&](const Budget& b) { return tabu_walk(m, TabuParams{}, 5, 0, b).seconds; });
    CHECK(o.after <= pass);
  }
  SUBCASE("descend") {
    DescentParams p;
    p.rule = DescentRule::steepest;
    const Overrun o = measure(m, 5 * pass, [&](const Budget& b) { return descend(m, p, 6, 0, b).seconds; });
    CHECK(o.after <= pass);
  }
}

TEST_CASE("a deadline that the workspace alone exceeds: no sweep, the start state, still bounded") {
  const CountingModel m = ring_with_chords(400);
  const double pass = static_cast<double>(m.pass());
  const Overrun o = measure(m, 2 * pass, [&](const Budget& b) {
    const auto s = solve_auto(m, 7, 0, b);
    CHECK(s.reason == StopReason::deadline);
    return s.seconds;
  });
  // The annealer's workspace is several passes: the overrun is that, not that plus descents.
  CHECK(o.after <= 10 * pass);
}

TEST_CASE("warm start from a caller's exact state: no rescan, the same run as from its spins") {
  const CountingModel m = ring_with_chords(400);
  const std::uint64_t pass = m.pass();
  SpinState<CountingModel> caller(m);
  Xoshiro256 rng(8);
  caller.randomize(rng);
  for (int k = 0; k < 500; ++k) caller.flip(static_cast<CountingModel::index_type>(rng.below(400)));

  SUBCASE("descent") {
    Descender<CountingModel> a(m, DescentParams{}, 1);
    Descender<CountingModel> b(m, DescentParams{}, 1);
    g_work = 0;
    a.warm_start(caller, 1, 0);
    CHECK(g_work == 0);  // spins, fields and energy copied: no row visited
    g_work = 0;
    b.warm_start(caller.spins(), 1, 0);
    CHECK(g_work >= pass);  // the spins path recomputes every field
    CHECK(a.state().check().exact);
    CHECK(a.energy() == b.energy());
    a.advance();
    b.advance();
    CHECK(a.energy() == b.energy());
    CHECK(a.passes() == b.passes());
  }
  SUBCASE("annealing: only the acceptance's pass over the values remains") {
    Annealer<CountingModel> a(m, AnnealParams{}, 1);
    Annealer<CountingModel> b(m, AnnealParams{}, 1);
    g_work = 0;
    a.warm_start(caller, 2, 0);
    CHECK(g_work <= pass);
    b.warm_start(caller.spins(), 2, 0);
    CHECK(a.state().check().exact);
    a.step(20);
    b.step(20);
    CHECK(a.best().energy == b.best().energy);
    CHECK(a.state().energy() == b.state().energy());
  }
  SUBCASE("tempering and tabu") {
    TemperParams tp;
    tp.ladder.temperatures = 3;
    Tempering<CountingModel> t(m, tp, 1);
    g_work = 0;
    t.warm_start(caller, 3, 0);
    CHECK(g_work <= 3 * pass);  // each rung's acceptance re-reads the values; no field recomputed
    for (std::size_t k = 0; k < 3; ++k) CHECK(t.state(k).energy() == caller.energy());
    TabuWalker<CountingModel> w(m, TabuParams{}, 1);
    w.warm_start(caller, 4, 0);
    CHECK(w.best().energy == caller.energy());
  }
}
