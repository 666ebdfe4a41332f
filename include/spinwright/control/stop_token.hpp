// spinwright — StopToken: a flag another thread or a signal handler sets to end a run.
#ifndef SPINWRIGHT_CONTROL_STOP_TOKEN_HPP
#define SPINWRIGHT_CONTROL_STOP_TOKEN_HPP

#include "../config.hpp"

#include <atomic>  // std::atomic (lock-free bool on every supported target)

namespace spinwright {

// A flag another thread (or a signal handler) sets to stop a run; kernels poll it once per
// sweep, so a run stops within one sweep of the request.
class StopToken {
 public:
  void request_stop() noexcept { flag_.store(true, std::memory_order_relaxed); }
  bool stop_requested() const noexcept { return flag_.load(std::memory_order_relaxed); }
  void reset() noexcept { flag_.store(false, std::memory_order_relaxed); }

 private:
  std::atomic<bool> flag_{false};
};

}  // namespace spinwright

#endif  // SPINWRIGHT_CONTROL_STOP_TOKEN_HPP
