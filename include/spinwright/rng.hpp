// spinwright — random generators: splitmix64 and xoshiro256++, identical streams on every platform.
#ifndef SPINWRIGHT_RNG_HPP
#define SPINWRIGHT_RNG_HPP

#include "config.hpp"
#include "rng/xoshiro.hpp"

#endif  // SPINWRIGHT_RNG_HPP
