// spinwright — control layer umbrella: budgets, clocks, stop tokens, observers and how a run
// ended. Not control/steady_clock.hpp (it needs <chrono>): include it in hosted code.
#ifndef SPINWRIGHT_CONTROL_HPP
#define SPINWRIGHT_CONTROL_HPP

#include "config.hpp"
#include "control/budget.hpp"
#include "control/clock.hpp"
#include "control/observer.hpp"
#include "control/stop_reason.hpp"
#include "control/stop_token.hpp"

#endif  // SPINWRIGHT_CONTROL_HPP
