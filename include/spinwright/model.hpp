// spinwright — model layer umbrella.
#ifndef SPINWRIGHT_MODEL_HPP
#define SPINWRIGHT_MODEL_HPP

#include "model/builder.hpp"
#include "model/convert.hpp"
#include "model/dense_model.hpp"
#include "model/form.hpp"
#include "model/maxcut.hpp"
#include "model/sparse_model.hpp"
#include "model/sparse_view.hpp"

#endif  // SPINWRIGHT_MODEL_HPP
