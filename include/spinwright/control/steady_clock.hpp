// spinwright — a Clock over std::chrono::steady_clock for hosted builds (not in the core).
#ifndef SPINWRIGHT_CONTROL_STEADY_CLOCK_HPP
#define SPINWRIGHT_CONTROL_STEADY_CLOCK_HPP

#include "clock.hpp"

#include <chrono>  // std::chrono::steady_clock

namespace spinwright {

inline double steady_seconds(void*) noexcept {
  using namespace std::chrono;
  return duration<double>(steady_clock::now().time_since_epoch()).count();
}

inline Clock steady_clock() noexcept { return Clock{&steady_seconds, nullptr}; }

}  // namespace spinwright

#endif  // SPINWRIGHT_CONTROL_STEADY_CLOCK_HPP
