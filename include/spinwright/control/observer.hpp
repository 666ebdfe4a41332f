// spinwright — observers: user types with on_improvement / on_progress, called through
// notify_improvement / notify_progress so a type may define only what it needs.
#ifndef SPINWRIGHT_CONTROL_OBSERVER_HPP
#define SPINWRIGHT_CONTROL_OBSERVER_HPP

#include "../config.hpp"

#include <cstdint>      // std::uint64_t
#include <type_traits>  // std::void_t, std::false_type
#include <utility>      // std::declval

namespace spinwright {

// Observers: a user type with any of
//   void on_improvement(std::uint64_t sweep, double energy)
//   void on_progress(std::uint64_t sweep, double best_energy)   // every `progress_every` sweeps
// Kernels call them through these helpers, so a type may define only what it needs.
struct NoObserver {};

namespace detail {
template <class T, class = void>
struct has_on_improvement : std::false_type {};
template <class T>
struct has_on_improvement<T, std::void_t<decltype(std::declval<T&>().on_improvement(std::uint64_t{}, 0.0))>>
    : std::true_type {};
template <class T, class = void>
struct has_on_progress : std::false_type {};
template <class T>
struct has_on_progress<T, std::void_t<decltype(std::declval<T&>().on_progress(std::uint64_t{}, 0.0))>>
    : std::true_type {};
}  // namespace detail

template <class Observer>
void notify_improvement(Observer& o, std::uint64_t sweep, double energy) {
  if constexpr (detail::has_on_improvement<Observer>::value) o.on_improvement(sweep, energy);
}
template <class Observer>
void notify_progress(Observer& o, std::uint64_t sweep, double best) {
  if constexpr (detail::has_on_progress<Observer>::value) o.on_progress(sweep, best);
}

}  // namespace spinwright

#endif  // SPINWRIGHT_CONTROL_OBSERVER_HPP
