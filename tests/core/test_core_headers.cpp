// The core headers stay fit for firmware: the umbrella pulls in no <iostream>, <fstream>,
// <thread> or <chrono>, and the build mode the test suite was compiled in is the one it
// claims (the test-clang preset builds every test with -fno-exceptions -fno-rtti).
#include <spinwright/kernels/auto.hpp>
#include <spinwright/moves.hpp>
#include <spinwright/problems.hpp>
#include <spinwright/spinwright.hpp>

#if defined(__GLIBCXX__)
#if defined(_GLIBCXX_IOSTREAM) || defined(_GLIBCXX_FSTREAM) || defined(_GLIBCXX_THREAD) || defined(_GLIBCXX_CHRONO)
#error "a core header pulled in <iostream>, <fstream>, <thread> or <chrono>"
#endif
#endif

#include <doctest/doctest.h>

#include <cstdint>

using namespace spinwright;

TEST_CASE("build mode matches the preset") {
#if defined(SPINWRIGHT_TEST_EXPECT_NO_EXCEPTIONS)
  CHECK_FALSE(config::has_exceptions);
  CHECK_FALSE(config::has_rtti);
#else
  CHECK(config::has_exceptions);
  CHECK(config::has_rtti);
#endif
}

TEST_CASE("every kernel runs in this build mode") {
  // A 5-cycle: odd cycle, max cut 4 (common practice), so E_min = 5 - 2 * 4 = -3.
  IsingBuilder<std::int32_t> b(5);
  for (std::uint32_t i = 0; i < 5; ++i) b.add_coupling(i, (i + 1) % 5, 1);
  const auto m = b.build().value();
  AnnealParams ap;
  ap.sweeps = 200;
  CHECK(anneal(m, ap, 1).energy == -3);
  TabuParams tp;
  tp.sweeps = 20;
  CHECK(tabu_walk(m, tp, 1).energy == -3);
  TemperParams pp;
  pp.sweeps = 100;
  CHECK(temper(m, pp, 1).energy == -3);
  CHECK(solve_exact(m).value().energy == -3);
  CHECK(solve_exact(m).value().ground_states == 10);  // 5 positions of the uncut edge, times the global flip
}
