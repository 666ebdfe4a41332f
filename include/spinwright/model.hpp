// spinwright — model layer umbrella: builders, sparse and dense models, views over caller
// arrays, and the exact conversions between the Ising and QUBO forms.
#ifndef SPINWRIGHT_MODEL_HPP
#define SPINWRIGHT_MODEL_HPP

#include "config.hpp"
#include "model/builder.hpp"
#include "model/convert.hpp"
#include "model/dense_model.hpp"
#include "model/form.hpp"
#include "model/span.hpp"
#include "model/sparse_model.hpp"
#include "model/sparse_view.hpp"

#endif  // SPINWRIGHT_MODEL_HPP
