// Cancellation: a stop requested from another thread ends every kernel that takes a Budget
// (annealing, tempering, tabu search, descent) within one sweep, and the result still holds the
// best state the run found. The sweep budget and the deadline are far away, so only the stop
// token can end these runs. No timing thresholds: the test thread and the kernel meet at a
// known sweep through the kernel's own observer, then the test thread requests the stop.
// (exact.hpp's solve_exact takes no Budget or StopToken, so it is not covered here.)
#include <doctest/doctest.h>

#include <spinwright/control.hpp>
#include <spinwright/control/steady_clock.hpp>
#include <spinwright/kernels/anneal.hpp>
#include <spinwright/kernels/descent.hpp>
#include <spinwright/kernels/tabu.hpp>
#include <spinwright/kernels/temper.hpp>
#include <spinwright/model/builder.hpp>
#include <spinwright/rng/xoshiro.hpp>

#include <atomic>   // std::atomic
#include <cstdint>  // std::int64_t, std::uint64_t
#include <limits>   // std::numeric_limits
#include <thread>   // std::thread, std::this_thread::yield
#include <utility>  // std::move
#include <vector>   // std::vector

namespace sw = spinwright;

namespace {

using Model = sw::IsingModel<std::int64_t>;

// Invented test instance: a sparse random integer spin glass (each spin coupled to 3 random
// others, couplings in [-5, 5] without 0, small fields), fixed seed.
Model glass(std::uint32_t n, std::uint64_t seed) {
  sw::Xoshiro256 rng(seed);
  sw::IsingBuilder<std::int64_t> b(n);
  for (std::uint32_t i = 0; i < n; ++i) {
    for (int k = 0; k < 3; ++k) {
      const std::uint32_t j = rng.below(n);
      const auto v = static_cast<std::int64_t>(rng.below(5)) + 1;
      if (j != i) b.add_coupling(i, j, rng.coin() ? v : -v);
    }
    b.add_field(i, static_cast<std::int64_t>(rng.below(3)) - 1);
  }
  auto m = b.build();
  REQUIRE(m.ok());
  return std::move(m).value();
}

// A budget that only the stop token can end: a sweep count and a deadline far away.
sw::Budget far_budget(const sw::StopToken& token) {
  sw::Budget b;
  b.with_sweeps(std::numeric_limits<std::uint64_t>::max() / 2)
      .with_time_limit(1e9, sw::steady_clock())
      .with_stop(token);
  return b;
}

// The observer runs on the kernel's thread. When it reports sweep `meet`, it tells the test
// thread and waits until that thread has requested the stop; it also records the best energy
// the kernel announced and the last sweep it reported.
struct Rendezvous {
  std::uint64_t meet = 0;
  std::atomic<int> phase{0};  // 0 running, 1 kernel waiting at `meet`, 2 stop requested, 3 run over
  double best_announced = std::numeric_limits<double>::infinity();
  std::uint64_t last_reported = 0;
  bool met = false;

  void reached(std::uint64_t sweep) {
    last_reported = sweep;
    if (sweep >= meet && !met) {
      met = true;
      phase.store(1);
      while (phase.load() != 2) std::this_thread::yield();
    }
  }
  void on_progress(std::uint64_t sweep, double) { reached(sweep); }
  void on_improvement(std::uint64_t sweep, double energy) {
    if (energy < best_announced) best_announced = energy;
    (void)sweep;
  }
};

// A descent observer meets on improvements (descent announces one per improving pass).
struct DescentRendezvous : Rendezvous {
  void on_improvement(std::uint64_t sweep, double energy) {
    if (energy < best_announced) best_announced = energy;
    reached(sweep);
  }
};

// Runs `run(observer)` on this thread while a helper thread waits for the meeting and then
// requests the stop. Returns the kernel's Solution.
template <class Observer, class Run>
auto run_with_stop_from_other_thread(sw::StopToken& token, Observer& observer, Run run) {
  std::thread stopper([&] {
    int p = 0;
    while ((p = observer.phase.load()) == 0) std::this_thread::yield();
    token.request_stop();
    if (p == 1) observer.phase.store(2);
  });
  auto solution = run(observer);
  int expected = 0;
  observer.phase.compare_exchange_strong(expected, 3);  // the run ended without meeting: release the helper
  stopper.join();
  return solution;
}

template <class Solution>
void check_best_state(const Model& m, const Solution& s, double best_announced) {
  REQUIRE(s.spins.size() == m.num_spins());
  for (const auto v : s.spins) REQUIRE((v == 1 || v == -1));
  // The reported energy is the energy of the reported spins ...
  CHECK(m.energy(s.spins.data()) == s.energy);
  // ... and it is the best the run announced (no better state was found and then lost).
  CHECK(static_cast<double>(s.energy) <= best_announced);
}

}  // namespace

TEST_CASE("a stop from another thread ends annealing within one sweep, keeping the best state") {
  const Model m = glass(400, 11);
  sw::StopToken token;
  Rendezvous obs;
  obs.meet = 25;
  sw::AnnealParams p;
  p.progress_every = 1;
  const auto s = run_with_stop_from_other_thread(
      token, obs, [&](Rendezvous& o) { return sw::anneal(m, p, 7, 0, far_budget(token), o); });
  REQUIRE(obs.met);
  CHECK(s.reason == sw::StopReason::stopped);
  CHECK(s.sweeps >= obs.meet);
  CHECK(s.sweeps <= obs.meet + 1);
  check_best_state(m, s, obs.best_announced);
}

TEST_CASE("a stop from another thread ends tempering within one sweep, keeping the best state") {
  const Model m = glass(300, 12);
  sw::StopToken token;
  Rendezvous obs;
  obs.meet = 15;
  sw::TemperParams p;
  p.progress_every = 1;
  const auto s = run_with_stop_from_other_thread(
      token, obs, [&](Rendezvous& o) { return sw::temper(m, p, 8, 0, far_budget(token), o); });
  REQUIRE(obs.met);
  CHECK(s.reason == sw::StopReason::stopped);
  CHECK(s.sweeps >= obs.meet);
  CHECK(s.sweeps <= obs.meet + 1);
  check_best_state(m, s, obs.best_announced);
}

TEST_CASE("a stop from another thread ends tabu search within one sweep, keeping the best state") {
  const Model m = glass(300, 13);
  sw::StopToken token;
  Rendezvous obs;
  obs.meet = 10;
  sw::TabuParams p;
  p.progress_every = 1;
  const auto s = run_with_stop_from_other_thread(
      token, obs, [&](Rendezvous& o) { return sw::tabu_walk(m, p, 9, 0, far_budget(token), o); });
  REQUIRE(obs.met);
  CHECK(s.reason == sw::StopReason::stopped);
  CHECK(s.sweeps >= obs.meet);
  CHECK(s.sweeps <= obs.meet + 1);
  check_best_state(m, s, obs.best_announced);
}

TEST_CASE("a stop from another thread ends descent within one pass, keeping the state reached") {
  // Invented chain built so that steepest descent from all +1 needs one pass per spin: only the
  // last spin starts with an improving flip (its field is large), and each flip makes the next
  // spin down the chain improving (ferromagnetic couplings, small positive fields).
  const std::uint32_t n = 3000;
  sw::IsingBuilder<std::int64_t> b(n);
  for (std::uint32_t i = 0; i + 1 < n; ++i) b.add_coupling(i, i + 1, -2);
  for (std::uint32_t i = 0; i + 1 < n; ++i) b.add_field(i, 1);
  b.add_field(n - 1, 5);
  auto built = b.build();
  REQUIRE(built.ok());
  const Model& m = built.value();
  const std::vector<std::int8_t> start(n, 1);

  sw::StopToken token;
  DescentRendezvous obs;
  obs.meet = 40;
  sw::DescentParams p;
  p.rule = sw::DescentRule::steepest;
  p.initial = start.data();
  const auto s = run_with_stop_from_other_thread(token, obs, [&](DescentRendezvous& o) {
    sw::Descender<Model> d(m, p, 10);
    return d.run(far_budget(token), o);
  });
  REQUIRE(obs.met);
  CHECK(s.reason == sw::StopReason::stopped);
  CHECK(s.sweeps >= obs.meet);
  CHECK(s.sweeps <= obs.meet + 1);
  check_best_state(m, s, obs.best_announced);
  // Descent never makes the state worse, so the state reached is the best one.
  CHECK(static_cast<double>(s.energy) == obs.best_announced);
}

TEST_CASE("a stop requested before the run starts ends every kernel before its first sweep") {
  const Model m = glass(200, 14);
  sw::StopToken token;
  token.request_stop();
  const sw::Budget budget = far_budget(token);
  const auto a = sw::anneal(m, sw::AnnealParams{}, 1, 0, budget);
  const auto t = sw::temper(m, sw::TemperParams{}, 1, 0, budget);
  const auto u = sw::tabu_walk(m, sw::TabuParams{}, 1, 0, budget);
  const auto d = sw::descend(m, sw::DescentParams{}, 1, 0, budget);
  for (const auto* s : {&a, &u, &d}) {
    CHECK(s->reason == sw::StopReason::stopped);
    CHECK(s->sweeps == 0);
    CHECK(m.energy(s->spins.data()) == s->energy);
  }
  CHECK(t.reason == sw::StopReason::stopped);
  CHECK(t.sweeps == 0);
  CHECK(m.energy(t.spins.data()) == t.energy);
}

TEST_CASE("a stop from another thread at an arbitrary moment ends annealing at the next sweep boundary") {
  // No meeting point: the helper requests the stop once the kernel has reported a few sweeps.
  // The observer notes the first sweep at which it can see the request; the run must end there
  // or one sweep later.
  struct Watch {
    const sw::StopToken* token = nullptr;
    std::atomic<std::uint64_t> sweeps{0};
    std::uint64_t first_seen = 0;
    void on_progress(std::uint64_t sweep, double) {
      sweeps.store(sweep);
      if (first_seen == 0 && token->stop_requested()) first_seen = sweep;
    }
  };
  const Model m = glass(400, 15);
  for (std::uint64_t seed = 1; seed <= 3; ++seed) {
    sw::StopToken token;
    Watch w;
    w.token = &token;
    sw::AnnealParams p;
    p.progress_every = 1;
    std::thread stopper([&] {
      while (w.sweeps.load() < 5 * seed) std::this_thread::yield();
      token.request_stop();
    });
    const auto s = sw::anneal(m, p, seed, 0, far_budget(token), w);
    stopper.join();
    CHECK(s.reason == sw::StopReason::stopped);
    CHECK(s.sweeps >= 5 * seed);
    if (w.first_seen != 0) CHECK(s.sweeps <= w.first_seen + 1);
    CHECK(m.energy(s.spins.data()) == s.energy);
  }
}
