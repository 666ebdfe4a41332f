// Misuse that must not go through silently: kernels and states over a temporary model do not
// compile (a detection idiom over std::is_constructible), a failed assertion prints file, line
// and message to stderr before aborting (each case runs in a child process whose stderr is
// read back), spin indices are checked in delta / flip, an error Result cannot be dereferenced,
// and negative or non-finite inverse temperatures are refused with a Status.
// Expectations are the library's own contract (common practice for precondition checks).
#include <doctest/doctest.h>

#include <spinwright/kernels/anneal.hpp>
#include <spinwright/kernels/descent.hpp>
#include <spinwright/kernels/tabu.hpp>
#include <spinwright/kernels/temper.hpp>
#include <spinwright/model/builder.hpp>

#include <cmath>
#include <csignal>
#include <cstdint>
#include <cstdio>
#include <cstdlib>
#include <limits>
#include <string>
#include <sys/wait.h>
#include <type_traits>
#include <unistd.h>

using namespace spinwright;

namespace {

using M = IsingModel<std::int32_t>;

// Kernels and states keep a pointer to their model: over an rvalue they must not be constructible.
static_assert(!std::is_constructible_v<SpinState<M>, M&&>);
static_assert(!std::is_constructible_v<SpinState<M>, const M&&>);
static_assert(!std::is_constructible_v<SpinState<M>, M&&, Arena&>);
static_assert(std::is_constructible_v<SpinState<M>, const M&>);
static_assert(std::is_constructible_v<SpinState<M>, const M&, Arena&>);
static_assert(!std::is_constructible_v<Annealer<M>, M&&, const AnnealParams&, std::uint64_t>);
static_assert(!std::is_constructible_v<Annealer<M>, M&&, const AnnealParams&, Arena&, std::uint64_t>);
static_assert(std::is_constructible_v<Annealer<M>, const M&, const AnnealParams&, std::uint64_t>);
static_assert(!std::is_constructible_v<Descender<M>, M&&, const DescentParams&, std::uint64_t>);
static_assert(!std::is_constructible_v<Descender<M>, M&&, const DescentParams&, Arena&, std::uint64_t>);
static_assert(std::is_constructible_v<Descender<M>, const M&, const DescentParams&, std::uint64_t>);
static_assert(!std::is_constructible_v<Tempering<M>, M&&, const TemperParams&, std::uint64_t>);
static_assert(!std::is_constructible_v<Tempering<M>, M&&, const TemperParams&, Arena&, std::uint64_t>);
static_assert(std::is_constructible_v<Tempering<M>, const M&, const TemperParams&, std::uint64_t>);
static_assert(!std::is_constructible_v<TabuWalker<M>, M&&, const TabuParams&, std::uint64_t>);
static_assert(!std::is_constructible_v<TabuWalker<M>, M&&, const TabuParams&, Arena&, std::uint64_t>);
static_assert(std::is_constructible_v<TabuWalker<M>, const M&, const TabuParams&, std::uint64_t>);

M two_spins() {
  IsingBuilder<std::int32_t> b(2);
  b.add_coupling(0, 1, -1);
  return std::move(b.build().value());
}

struct ChildOutcome {
  bool aborted = false;
  std::string err;
};

// Runs fn in a child process with stderr captured; reports whether it died by SIGABRT.
template <class Fn>
ChildOutcome in_child(Fn fn) {
  int fds[2];
  REQUIRE(pipe(fds) == 0);
  std::fflush(stdout);
  std::fflush(stderr);
  const pid_t pid = fork();
  REQUIRE(pid >= 0);
  if (pid == 0) {
    std::signal(SIGABRT, SIG_DFL);  // the test runner's crash handler stays in the parent
    dup2(fds[1], 2);
    close(fds[0]);
    std::FILE* quiet = std::freopen("/dev/null", "w", stdout);
    (void)quiet;
    fn();
    _exit(0);
  }
  close(fds[1]);
  ChildOutcome o;
  char buf[512];
  for (;;) {
    const ssize_t r = read(fds[0], buf, sizeof buf);
    if (r <= 0) break;
    o.err.append(buf, static_cast<std::size_t>(r));
  }
  close(fds[0]);
  int status = 0;
  waitpid(pid, &status, 0);
  o.aborted = WIFSIGNALED(status) && WTERMSIG(status) == SIGABRT;
  return o;
}

bool has(const std::string& s, const char* part) { return s.find(part) != std::string::npos; }

}  // namespace

TEST_CASE("a failed assertion prints file, line and message, then aborts") {
  if (!config::asserts) {
    MESSAGE("asserts are off in this build: nothing to check");
    return;
  }
  const M m = two_spins();
  SUBCASE("delta beyond the model") {
    const ChildOutcome o = in_child([&] {
      const SpinState<M> s(m);
      std::printf("%lld\n", static_cast<long long>(s.delta(5)));
    });
    CHECK(o.aborted);
    CHECK(has(o.err, "spin_state.hpp:"));
    CHECK(has(o.err, "spin index beyond the state's model (delta)"));
  }
  SUBCASE("flip beyond the model") {
    const ChildOutcome o = in_child([&] {
      SpinState<M> s(m);
      s.flip(5);
    });
    CHECK(o.aborted);
    CHECK(has(o.err, "spin index beyond the state's model"));
  }
  SUBCASE("dereferencing an error Result") {
    const ChildOutcome o = in_child([] {
      IsingBuilder<std::int32_t> b(2);
      b.add_coupling(0, 7, 1);  // beyond the declared size: build() returns an error
      auto r = b.build();
      std::printf("%zu\n", (*r).num_spins());
    });
    CHECK(o.aborted);
    CHECK(has(o.err, "status.hpp:"));
    CHECK(has(o.err, "Result::value() on an error"));
  }
  SUBCASE("a negative inverse temperature reaching the acceptance") {
    const ChildOutcome o = in_child([&] {
      AnnealParams p;
      p.schedule = Schedule::geometric(-1, 2);
      std::printf("%lld\n", static_cast<long long>(anneal(m, p, 1).energy));
    });
    CHECK(o.aborted);
    CHECK(has(o.err, "invalid parameters"));
  }
  SUBCASE("a correct call does not abort") {
    const ChildOutcome o = in_child([&] {
      SpinState<M> s(m);
      s.flip(1);
    });
    CHECK_FALSE(o.aborted);
    CHECK(o.err.empty());
  }
}

TEST_CASE("negative or non-finite inverse temperatures are refused with a status") {
  const double inf = std::numeric_limits<double>::infinity();
  const double nan = std::numeric_limits<double>::quiet_NaN();
  CHECK(Schedule{}.check().ok());  // automatic
  CHECK(Schedule::geometric(0.1, 3).check().ok());
  CHECK(Schedule::geometric(-0.1, 3).check().code == StatusCode::invalid_argument);
  CHECK(Schedule::linear(0.1, -3).check().code == StatusCode::invalid_argument);
  CHECK(Schedule::geometric(0.1, inf).check().code == StatusCode::non_finite_value);
  CHECK(Schedule::constant(nan).check().code == StatusCode::non_finite_value);

  AnnealParams ap;
  CHECK(check_params(ap).ok());
  ap.schedule = Schedule::constant(-2);
  CHECK_FALSE(check_params(ap).ok());
  ap = AnnealParams{};
  ap.hazard_below = nan;
  CHECK_FALSE(check_params(ap).ok());

  TemperParams tp;
  CHECK(check_params(tp).ok());
  tp.ladder.beta_min = -1;
  tp.ladder.beta_max = 2;
  CHECK(check_params(tp).code == StatusCode::invalid_argument);
  tp.ladder.beta_min = 0.1;
  tp.ladder.beta_max = inf;
  CHECK_FALSE(check_params(tp).ok());
  const double listed[] = {0.1, 0.5, nan, 2.0};
  tp = TemperParams{};
  tp.ladder.shape = LadderShape::listed;
  tp.ladder.temperatures = 4;
  tp.ladder.betas = listed;
  const Status s = check_params(tp);
  CHECK_FALSE(s.ok());
  CHECK(s.term == 2u);  // names the listed beta
  const double decreasing[] = {0.1, 0.5, 0.4, 2.0};
  tp.ladder.betas = decreasing;
  CHECK_FALSE(check_params(tp).ok());
  const double good[] = {0.1, 0.5, 0.9, 2.0};
  tp.ladder.betas = good;
  CHECK(check_params(tp).ok());
  tp.houdayer_beta_max = -0.5;
  CHECK_FALSE(check_params(tp).ok());
}

TEST_CASE("warm_schedule: heat 1 is the automatic range, heat 0 the cold end, and in between in log beta") {
  BetaSpan span;
  span.beta_start = 0.01;
  span.beta_end = 10;
  const Schedule full = warm_schedule(span, 1.0);
  CHECK(full.beta_start == doctest::Approx(0.01));
  CHECK(full.beta_end == 10);
  const Schedule cold = warm_schedule(span, 0.0);
  CHECK(cold.beta_start == 10);
  const Schedule half = warm_schedule(span, 0.5);
  CHECK(half.beta_start == doctest::Approx(std::sqrt(0.01 * 10)));      // geometric mean (log midpoint)
  CHECK(warm_schedule(span, 7.0).beta_start == doctest::Approx(0.01));  // clamped
  CHECK(warm_schedule(span, -1.0).beta_start == 10);
  CHECK(half.check().ok());
}
