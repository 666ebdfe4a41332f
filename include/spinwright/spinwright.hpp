// spinwright — umbrella for the core layers: models, state, moves, kernels, control, random
// generators, statistics and problem encoders. Not io/ (files) and not parallel/ (threads):
// include those explicitly; a firmware build simply does not.
#ifndef SPINWRIGHT_SPINWRIGHT_HPP
#define SPINWRIGHT_SPINWRIGHT_HPP

#include "arena.hpp"
#include "config.hpp"
#include "control.hpp"
#include "kernels.hpp"
#include "model.hpp"
#include "moves.hpp"
#include "problems.hpp"
#include "rng.hpp"
#include "state.hpp"
#include "stats.hpp"
#include "status.hpp"
#include "version.hpp"

#endif  // SPINWRIGHT_SPINWRIGHT_HPP
