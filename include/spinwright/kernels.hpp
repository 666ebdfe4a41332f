// spinwright — kernels layer umbrella: every kernel (one-call functions and stepping objects), their
// schedules, acceptance rules and results.
#ifndef SPINWRIGHT_KERNELS_HPP
#define SPINWRIGHT_KERNELS_HPP

#include "config.hpp"
#include "kernels/acceptance.hpp"
#include "kernels/anneal.hpp"
#include "kernels/auto.hpp"
#include "kernels/beta_span.hpp"
#include "kernels/bit_sliced.hpp"
#include "kernels/breakout.hpp"
#include "kernels/descent.hpp"
#include "kernels/exact.hpp"
#include "kernels/lanes.hpp"
#include "kernels/population.hpp"
#include "kernels/quantum_anneal.hpp"
#include "kernels/schedule.hpp"
#include "kernels/solution.hpp"
#include "kernels/tabu.hpp"
#include "kernels/temper.hpp"

#endif  // SPINWRIGHT_KERNELS_HPP
