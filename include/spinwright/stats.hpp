// spinwright — statistics over restarts: Tally, success probability, time to solution.
#ifndef SPINWRIGHT_STATS_HPP
#define SPINWRIGHT_STATS_HPP

#include "config.hpp"
#include "stats/tally.hpp"

#endif  // SPINWRIGHT_STATS_HPP
