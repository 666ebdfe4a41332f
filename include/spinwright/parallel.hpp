// spinwright — opt-in parallel layer (uses <thread>; never included by spinwright.hpp): restarts
// and exact enumeration on threads.
#ifndef SPINWRIGHT_PARALLEL_HPP
#define SPINWRIGHT_PARALLEL_HPP

#include "config.hpp"
#include "parallel/bit_sliced_restarts.hpp"
#include "parallel/exact_threads.hpp"
#include "parallel/restarts.hpp"

#endif  // SPINWRIGHT_PARALLEL_HPP
