// spinwright — configuration: the only header that reads configuration macros.
// Every macro is normalised to 0 or 1 and tested with #if. See docs/configuration.md.
#ifndef SPINWRIGHT_CONFIG_HPP
#define SPINWRIGHT_CONFIG_HPP

#include <cstdlib>  // std::abort

#ifndef SPINWRIGHT_ASSERTS
#if defined(NDEBUG)
#define SPINWRIGHT_ASSERTS 0
#else
#define SPINWRIGHT_ASSERTS 1
#endif
#endif

#ifndef SPINWRIGHT_NO_HEAP
#define SPINWRIGHT_NO_HEAP 0
#endif

#if defined(__cpp_exceptions) || defined(__EXCEPTIONS) || defined(_CPPUNWIND)
#define SPINWRIGHT_HAS_EXCEPTIONS 1
#else
#define SPINWRIGHT_HAS_EXCEPTIONS 0
#endif

#if defined(__cpp_rtti) || defined(__GXX_RTTI) || defined(_CPPRTTI)
#define SPINWRIGHT_HAS_RTTI 1
#else
#define SPINWRIGHT_HAS_RTTI 0
#endif

// A failed assertion calls SPINWRIGHT_ASSERT_HANDLER(file, line, message), then std::abort().
// Without a handler of the user's, the default prints "file:line: spinwright assertion failed:
// message" to stderr (<cstdio>); firmware defines its own handler (or SPINWRIGHT_ASSERTS=0) to
// keep stdio out of the image.
#if SPINWRIGHT_ASSERTS
#if !defined(SPINWRIGHT_ASSERT_HANDLER)
#include <cstdio>  // std::fprintf, stderr (the default handler)
namespace spinwright::detail {
inline void print_assert_failure(const char* file, int line, const char* message) noexcept {
  std::fprintf(stderr, "%s:%d: spinwright assertion failed: %s\n", file, line, message);
  std::fflush(stderr);
}
}  // namespace spinwright::detail
#define SPINWRIGHT_ASSERT_HANDLER(file, line, message) ::spinwright::detail::print_assert_failure(file, line, message)
#endif
#define SPINWRIGHT_ASSERT(cond, msg)                      \
  do {                                                    \
    if (!(cond)) {                                        \
      SPINWRIGHT_ASSERT_HANDLER(__FILE__, __LINE__, msg); \
      std::abort();                                       \
    }                                                     \
  } while (false)
#else
#define SPINWRIGHT_ASSERT(cond, msg) static_cast<void>(0)
#endif

// Forces inlining of the few small functions on a kernel's innermost path (a flip's field
// update, the acceptance test): in a translation unit that instantiates many kernels (the
// command-line program's runners) the compiler's growth limits otherwise leave them as calls,
// and the per-attempt cost of a sweep grows several-fold.
#if defined(__GNUC__) || defined(__clang__)
#define SPINWRIGHT_HOT_INLINE __attribute__((always_inline)) inline
#else
#define SPINWRIGHT_HOT_INLINE inline
#endif

namespace spinwright::config {
inline constexpr bool asserts = SPINWRIGHT_ASSERTS != 0;
inline constexpr bool no_heap = SPINWRIGHT_NO_HEAP != 0;
inline constexpr bool has_exceptions = SPINWRIGHT_HAS_EXCEPTIONS != 0;
inline constexpr bool has_rtti = SPINWRIGHT_HAS_RTTI != 0;
}  // namespace spinwright::config

#endif  // SPINWRIGHT_CONFIG_HPP
