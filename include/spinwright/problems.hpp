// spinwright — problems layer umbrella: penalties, constraint checks and problem encoders.
#ifndef SPINWRIGHT_PROBLEMS_HPP
#define SPINWRIGHT_PROBLEMS_HPP

#include "config.hpp"
#include "problems/colouring.hpp"
#include "problems/constraints.hpp"
#include "problems/graph.hpp"
#include "problems/independent_set.hpp"
#include "problems/knapsack.hpp"
#include "problems/lattice.hpp"
#include "problems/max_cut.hpp"
#include "problems/partition.hpp"
#include "problems/penalty.hpp"
#include "problems/selection.hpp"

#endif  // SPINWRIGHT_PROBLEMS_HPP
