// spinwright — umbrella for the core layers: models, state, moves, kernels, control, random
// generators, statistics and problem encoders. Not io/ (files) and not parallel/ (threads):
// include those explicitly; a firmware build simply does not.
#ifndef SPINWRIGHT_SPINWRIGHT_HPP
#define SPINWRIGHT_SPINWRIGHT_HPP

#include "config.hpp"
#include "control/control.hpp"
#include "kernels/anneal.hpp"
#include "kernels/auto.hpp"
#include "kernels/descent.hpp"
#include "kernels/exact.hpp"
#include "kernels/schedule.hpp"
#include "kernels/solution.hpp"
#include "kernels/tabu.hpp"
#include "kernels/temper.hpp"
#include "model.hpp"
#include "moves.hpp"
#include "problems.hpp"
#include "rng/xoshiro.hpp"
#include "state/spin_state.hpp"
#include "stats/tally.hpp"
#include "status.hpp"
#include "version.hpp"

#endif  // SPINWRIGHT_SPINWRIGHT_HPP
