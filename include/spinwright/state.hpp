// spinwright — state layer umbrella: the incremental state of a run (spins, local fields, energy).
#ifndef SPINWRIGHT_STATE_HPP
#define SPINWRIGHT_STATE_HPP

#include "config.hpp"
#include "state/spin_state.hpp"

#endif  // SPINWRIGHT_STATE_HPP
