// spinwright — Clock: seconds from a function the caller supplies (no <chrono> here;
// hosted code can use steady_clock() from control/steady_clock.hpp).
#ifndef SPINWRIGHT_CONTROL_CLOCK_HPP
#define SPINWRIGHT_CONTROL_CLOCK_HPP

#include "../config.hpp"

namespace spinwright {

// A clock is a plain function pointer with a context, returning seconds on any fixed origin.
// Firmware passes its own tick counter; hosted code passes steady_clock().
struct Clock {
  double (*now)(void* context) = nullptr;
  void* context = nullptr;
  bool valid() const noexcept { return now != nullptr; }
  double read() const noexcept { return now(context); }
};

}  // namespace spinwright

#endif  // SPINWRIGHT_CONTROL_CLOCK_HPP
