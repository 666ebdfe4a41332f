// spinwright — how a run ended (StopReason): data, not an error.
#ifndef SPINWRIGHT_CONTROL_STOP_REASON_HPP
#define SPINWRIGHT_CONTROL_STOP_REASON_HPP

#include "../config.hpp"

#include <cstdint>  // std::uint8_t

namespace spinwright {

// How a run ended. Data, not an error.
enum class StopReason : std::uint8_t {
  budget_exhausted,  // the sweep budget was spent
  deadline,          // the clock passed the deadline
  target_reached,    // a state at or below the target energy was found
  stopped,           // the stop token was set
};

inline constexpr const char* to_string(StopReason r) noexcept {
  switch (r) {
    case StopReason::budget_exhausted:
      return "budget_exhausted";
    case StopReason::deadline:
      return "deadline";
    case StopReason::target_reached:
      return "target_reached";
    case StopReason::stopped:
      return "stopped";
  }
  return "unknown";
}

}  // namespace spinwright

#endif  // SPINWRIGHT_CONTROL_STOP_REASON_HPP
