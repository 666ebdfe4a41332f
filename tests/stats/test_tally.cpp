// Tally over restarts and time to solution.
#include <doctest/doctest.h>
#include <spinwright/parallel/restarts.hpp>
#include <spinwright/spinwright.hpp>

#include <cmath>
#include <cstdint>
#include <limits>

using namespace spinwright;

TEST_CASE("time to solution: the published formula and its edge cases") {
  // TTS(0.99) = t_run ln(1 - 0.99) / ln(1 - p_s) (Roennow et al., Science 345, 420, 2014).
  // Worked example of the reference sheet: t_run = 1 ms, p_s = 0.2 -> R = 20.6377, TTS = 20.638 ms.
  CHECK(time_to_solution(1e-3, 0.2) == doctest::Approx(0.020637702317032342).epsilon(1e-12));
  CHECK(time_to_solution(1e-3, 0.2) / 1e-3 == doctest::Approx(20.6377).epsilon(1e-5));
  CHECK(time_to_solution(2.0, 0.995) == 2.0);  // p_s >= p_target: one run
  CHECK(time_to_solution(2.0, 1.0) == 2.0);
  CHECK(time_to_solution(2.0, 0.0) == std::numeric_limits<double>::infinity());
}

TEST_CASE("tally: best, energies in restart order, histogram, success probability, residual") {
  Tally<std::int64_t> t;
  const std::int64_t energies[] = {-3, -5, -5, -1, -5, -3};
  for (std::uint64_t r = 0; r < 6; ++r) {
    Solution<std::int64_t> s;
    s.energy = energies[r];
    s.restart = r;
    s.sweeps = 10;
    s.seconds = 0.5 + static_cast<double>(r);
    s.spins = {static_cast<std::int8_t>(r % 2 ? -1 : 1)};
    t.add(s);
  }
  CHECK(t.restarts() == 6);
  CHECK(t.best().energy == -5);
  CHECK(t.best().restart == 1);  // ties go to the lowest restart
  CHECK(t.total_sweeps() == 60);
  const auto h = t.histogram();
  REQUIRE(h.size() == 3);
  CHECK(h[0].first == -5);
  CHECK(h[0].second == 3);
  CHECK(h[1].first == -3);
  CHECK(h[1].second == 2);
  CHECK(h[2].first == -1);
  CHECK(h[2].second == 1);
  CHECK(t.success_probability(-5) == doctest::Approx(0.5));
  CHECK(t.success_probability(-4) == doctest::Approx(0.5));
  CHECK(t.success_probability(-10) == 0.0);
  CHECK(t.residual_energy(-5) == doctest::Approx(-22.0 / 6 + 5));
  CHECK(t.median_seconds() == doctest::Approx(3.0));  // median of 0.5, 1.5, ..., 5.5
  CHECK(t.tts99(-5) == doctest::Approx(3.0 * std::log(0.01) / std::log(0.5)));
}

TEST_CASE("restarts on threads: the same tally whatever the thread count") {
  // A 24-spin +-1 ring glass from a fixed seed; 12 annealing restarts of 30 sweeps each.
  Xoshiro256 rng(31);
  IsingBuilder<std::int32_t> b(24);
  for (std::uint32_t i = 0; i < 24; ++i) {
    b.add_coupling(i, (i + 1) % 24, rng.coin() ? 1 : -1);
    b.add_coupling(i, (i + 7) % 24, rng.coin() ? 1 : -1);
  }
  const auto m = b.build().value();
  AnnealParams p;
  p.sweeps = 30;
  auto run = [&](unsigned threads) {
    return run_restarts<std::int64_t>(12, threads, [&](std::uint64_t r) { return anneal(m, p, 99, r); });
  };
  const auto one = run(1);
  for (unsigned threads : {2u, 3u, 5u}) {
    const auto many = run(threads);
    CHECK(many.energies() == one.energies());
    CHECK(many.best().spins == one.best().spins);
    CHECK(many.best().restart == one.best().restart);
  }
}

// The success tolerance of floating energies (a second path beside the command-line program):
// a restart succeeds when E <= target + tolerance, so energies that differ from the target
// only by rounding count, and one just beyond the tolerance does not (counted by hand below;
// common practice for floating targets).
TEST_CASE("tally: success within the tolerance, by hand on floating energies") {
  Tally<double> t;
  const double target = -12.3;
  const double energies[] = {-12.3, -12.3 + 4e-10, -12.3 + 2e-9, -12.3 - 1e-3, -11.0};
  for (std::uint64_t r = 0; r < 5; ++r) {
    Solution<double> s;
    s.energy = energies[r];
    s.restart = r;
    s.seconds = 1.0;
    t.add(s);
  }
  CHECK(t.success_probability(target) == doctest::Approx(2.0 / 5));        // -12.3 and below only
  CHECK(t.success_probability(target, 1e-9) == doctest::Approx(3.0 / 5));  // + the 4e-10 one
  CHECK(t.success_probability(target, 1e-8) == doctest::Approx(4.0 / 5));  // + the 2e-9 one
  CHECK(t.success_probability(target, 2.0) == doctest::Approx(1.0));       // all
  CHECK(t.tts99(target, 1e-9) == doctest::Approx(std::log(0.01) / std::log(1 - 3.0 / 5)));
}
