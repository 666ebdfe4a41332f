// spinwright — umbrella for the move layer: the move concept and the built-in moves.
#ifndef SPINWRIGHT_MOVES_HPP
#define SPINWRIGHT_MOVES_HPP

#include "config.hpp"
#include "moves/count_keeping_swap.hpp"
#include "moves/group_flip.hpp"
#include "moves/move.hpp"
#include "moves/single_flip.hpp"

#endif  // SPINWRIGHT_MOVES_HPP
