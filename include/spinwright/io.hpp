// spinwright — file formats umbrella (opt-in; not included by spinwright.hpp): weighted edge
// lists, Matrix Market coordinate files, state files, and the format-detecting model reader.
// These headers allocate and use <fstream>; they never throw on bad data. See docs/file-formats.md.
#ifndef SPINWRIGHT_IO_HPP
#define SPINWRIGHT_IO_HPP

#include "config.hpp"
#include "io/edge_list.hpp"
#include "io/io_status.hpp"
#include "io/matrix_market.hpp"
#include "io/model_file.hpp"
#include "io/state_file.hpp"
#include "io/text_input.hpp"

#endif  // SPINWRIGHT_IO_HPP
