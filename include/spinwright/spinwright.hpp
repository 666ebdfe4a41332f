// spinwright — umbrella for the core layers (not io/, not parallel/).
#ifndef SPINWRIGHT_SPINWRIGHT_HPP
#define SPINWRIGHT_SPINWRIGHT_HPP

#include "config.hpp"
#include "control/control.hpp"
#include "kernels/solution.hpp"
#include "model.hpp"
#include "rng/xoshiro.hpp"
#include "state/spin_state.hpp"
#include "stats/tally.hpp"
#include "status.hpp"
#include "version.hpp"

#endif  // SPINWRIGHT_SPINWRIGHT_HPP
