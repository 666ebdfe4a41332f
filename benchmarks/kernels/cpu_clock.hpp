// Benchmark helper: CPU seconds of the calling thread (CLOCK_THREAD_CPUTIME_ID), as a plain
// function and as a spinwright::Clock for Budget deadlines. The benchmark machines are
// shared, so time spent waiting for a core is not counted against a run.
#ifndef SPINWRIGHT_BENCH_CPU_CLOCK_HPP
#define SPINWRIGHT_BENCH_CPU_CLOCK_HPP

#include <spinwright/control/clock.hpp>

#include <ctime>  // clock_gettime, CLOCK_THREAD_CPUTIME_ID

namespace bench_support {

inline double thread_seconds(void* = nullptr) noexcept {
  timespec ts{};
  clock_gettime(CLOCK_THREAD_CPUTIME_ID, &ts);
  return static_cast<double>(ts.tv_sec) + 1e-9 * static_cast<double>(ts.tv_nsec);
}

inline spinwright::Clock cpu_clock() noexcept { return spinwright::Clock{&thread_seconds, nullptr}; }

}  // namespace bench_support

#endif  // SPINWRIGHT_BENCH_CPU_CLOCK_HPP
