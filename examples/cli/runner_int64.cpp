// spinwright command-line program — the kernels for models with int64 values (one translation
// unit per value type keeps each compile short; see runner_kernels.hpp).
#include "runner_kernels.hpp"

#include <cstdint>  // std::int32_t, std::int64_t

namespace spinwright_cli::detail {
SPINWRIGHT_CLI_INSTANTIATE(std::int64_t)
}  // namespace spinwright_cli::detail
