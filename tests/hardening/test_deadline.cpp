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

// The clock reads the work at one nanosecond a unit (about what a row visit costs), so that
// rules given in seconds (solve_auto's choice of groups of restarts, auto_fill_group_for) see
// limits of a realistic size: these limits are tens of microseconds, where solve_auto anneals
// one restart at a time. Limits and overruns below are in work units.
constexpr double work_unit_seconds = 1e-9;

struct WorkClock {
  std::uint64_t n = 0;
  static double read(void* self) {
    g_work += static_cast<WorkClock*>(self)->n;
    return static_cast<double>(g_work) * work_unit_seconds;
  }
};

Budget work_limit(double limit, const Clock& clock) { return Budget{}.with_time_limit(limit * work_unit_seconds, clock); }

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
  const double entry = clock.read() / work_unit_seconds;
  const double seconds = call(work_limit(limit, clock)) / work_unit_seconds;
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
      REQUIRE(auto_fill_group_for(m, l * work_unit_seconds) == AutoFillGroup::single);
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

namespace {

// The largest row of the model plus one: the work of one accepted flip on the counting model.
double widest_row(const CountingModel& m) {
  std::size_t w = 0;
  for (std::uint32_t i = 0; i < m.num_spins(); ++i) {
    const std::size_t d = m.degree(static_cast<CountingModel::index_type>(i));
    if (d > w) w = d;
  }
  return static_cast<double>(w + 1);
}

// The work a call does before its first sweep (the clock's reads cost nothing here).
template <class Build>
double set_up_work(Build build) {
  g_work = 0;
  build();
  return static_cast<double>(g_work);
}

}  // namespace

// A model larger than one watch period (detail::sweep_watch_every attempts): the first sweep of
// a timed run has no measured duration, so the drive cannot refuse to begin it; the kernel reads
// the deadline inside it. The limit leaves a twentieth of a pass after the set-up. Without the
// watch the whole first sweep (hot: most of its attempts accepted) ran past the deadline, several
// thousand row visits; with it the overrun is at most one watch period of accepted flips.
TEST_CASE("a first sweep of unknown duration ends within one watch period of the deadline") {
  const CountingModel m = ring_with_chords(32768);
  REQUIRE(m.num_spins() > 4 * detail::sweep_watch_every);
  const double pass = static_cast<double>(m.pass());
  const double period = static_cast<double>(detail::sweep_watch_every) * widest_row(m);
  REQUIRE(period < pass / 4);  // the bound below is well under a whole sweep's work
  auto overrun = [&](double limit, auto call) {
    WorkClock free_reads{0};
    const Clock clock{&WorkClock::read, &free_reads};
    g_work = 0;
    call(work_limit(limit, clock).starting_at(0));
    return static_cast<double>(g_work) - limit;
  };
  SUBCASE("anneal, random and sequential order") {
    for (const SiteOrder order : {SiteOrder::random, SiteOrder::sequential}) {
      AnnealParams p;
      p.order = order;
      const double setup = set_up_work([&] { Annealer<CountingModel> a(m, p, 1); });
      const double after = overrun(setup + pass / 20, [&](const Budget& b) {
        const auto s = anneal(m, p, 1, 0, b);
        CHECK(s.reason == StopReason::deadline);
        CHECK(s.attempted < m.num_spins());  // the first sweep was cut
        CHECK(s.energy == m.base::energy(s.spins.data()));
      });
      CHECK(after <= period);
    }
  }
  SUBCASE("solve_auto's time-filling anneal") {
    REQUIRE(auto_fill_kernel(m) == KernelKind::anneal);
    AnnealParams p;
    p.sweeps = auto_fill_first_sweeps;
    p.order = SiteOrder::sequential;
    p.acceptance = auto_fill_acceptance(m);
    const double setup = set_up_work([&] { Annealer<CountingModel> a(m, p, 2); });
    const double after = overrun(setup + pass / 20, [&](const Budget& b) {
      const auto s = solve_auto(m, 2, 0, b);
      CHECK(s.reason == StopReason::deadline);
      CHECK(s.energy == m.base::energy(s.spins.data()));
    });
    CHECK(after <= period);
  }
  SUBCASE("descend: the first pass of first improvement from random spins") {
    const DescentParams p;
    const double setup = set_up_work([&] { Descender<CountingModel> d(m, p, 3); });
    const double after = overrun(setup + pass / 20, [&](const Budget& b) {
      const auto s = descend(m, p, 3, 0, b);
      CHECK(s.reason == StopReason::deadline);
      CHECK(s.energy == m.base::energy(s.spins.data()));
    });
    CHECK(after <= period);
  }
}

TEST_CASE("a watched sweep that the deadline does not cut is the unwatched sweep") {
  // Same chain, same random draws: a timed run whose deadline is never reached (reads cost
  // nothing, the limit is far away) equals the untimed run of the same length.
  const CountingModel m = ring_with_chords(4096);
  REQUIRE(m.num_spins() > detail::sweep_watch_every);
  WorkClock free_reads{0};
  const Clock clock{&WorkClock::read, &free_reads};
  for (const SiteOrder order : {SiteOrder::random, SiteOrder::sequential}) {
    for (const Acceptance rule : {Acceptance::metropolis, Acceptance::heat_bath}) {
      AnnealParams p;
      p.order = order;
      p.acceptance = rule;
      p.sweeps = 30;
      const auto untimed = anneal(m, p, 9, 1);
      g_work = 0;
      Budget timed;
      timed = work_limit(1e18, clock);
      const auto watched = anneal(m, p, 9, 1, timed);
      CHECK(watched.energy == untimed.energy);
      CHECK(watched.spins == untimed.spins);
      CHECK(watched.attempted == untimed.attempted);
      CHECK(watched.accepted == untimed.accepted);
    }
  }
}

TEST_CASE("polish after the deadline builds no workspace and returns its input") {
  const CountingModel m = ring_with_chords(400);
  const auto from = anneal(m, AnnealParams{}, 4);
  WorkClock free_reads{0};
  const Clock clock{&WorkClock::read, &free_reads};
  g_work = 1000;
  Budget late;
  late = work_limit(10, clock).starting_at(0);  // the deadline (10 units) lies in the past
  const auto s = polish(m, from, DescentRule::steepest, late);
  CHECK(g_work == 1000);  // no pass over the model: the descender's state was not built
  CHECK(s.reason == StopReason::deadline);
  CHECK(s.spins == from.spins);
  CHECK(s.energy == from.energy);
  CHECK(s.sweeps == from.sweeps);
}
