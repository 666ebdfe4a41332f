#ifndef SPINWRIGHT_VERSION_HPP
#define SPINWRIGHT_VERSION_HPP

#define SPINWRIGHT_VERSION_MAJOR 0
#define SPINWRIGHT_VERSION_MINOR 1
#define SPINWRIGHT_VERSION_PATCH 0

namespace spinwright {
inline constexpr const char* version_string = "0.1.0";
}

#endif  // SPINWRIGHT_VERSION_HPP
