// spinwright — the move concept: what a user type provides so that annealing and descent can
// drive it (proposal_type, moves_per_sweep, propose, delta, apply; optionally prepare,
// begin_sweep, and neighbourhood_size / proposal_at for descent), and the C++17 traits that
// check it with one readable static_assert. Kernels take the move as a template parameter: no
// virtual call in the loop. The concept, in full, is in docs/moves.md.
#ifndef SPINWRIGHT_MOVES_MOVE_HPP
#define SPINWRIGHT_MOVES_MOVE_HPP

#include "../config.hpp"
#include "../rng/xoshiro.hpp"
#include "../state/spin_state.hpp"

#include <cstddef>      // std::size_t
#include <type_traits>  // std::void_t, std::true_type, std::is_convertible_v
#include <utility>      // std::declval

namespace spinwright {

namespace detail {

template <class M, class = void>
struct has_proposal_type : std::false_type {};
template <class M>
struct has_proposal_type<M, std::void_t<typename M::proposal_type>> : std::true_type {};

template <class M, class S, class = void>
struct has_moves_per_sweep : std::false_type {};
template <class M, class S>
struct has_moves_per_sweep<M, S,
                           std::void_t<decltype(std::declval<const M&>().moves_per_sweep(std::declval<const S&>()))>>
    : std::is_convertible<decltype(std::declval<const M&>().moves_per_sweep(std::declval<const S&>())), std::size_t> {};

template <class M, class S, class = void>
struct has_propose : std::false_type {};
template <class M, class S>
struct has_propose<
    M, S, std::void_t<decltype(std::declval<M&>().propose(std::declval<const S&>(), std::declval<Xoshiro256&>()))>>
    : std::is_convertible<decltype(std::declval<M&>().propose(std::declval<const S&>(), std::declval<Xoshiro256&>())),
                          typename M::proposal_type> {};

template <class M, class S, class = void>
struct has_move_delta : std::false_type {};
template <class M, class S>
struct has_move_delta<M, S,
                      std::void_t<decltype(std::declval<const M&>().delta(
                          std::declval<const S&>(), std::declval<const typename M::proposal_type&>()))>>
    : std::is_convertible<decltype(std::declval<const M&>().delta(std::declval<const S&>(),
                                                                  std::declval<const typename M::proposal_type&>())),
                          typename S::energy_type> {};

template <class M, class S, class = void>
struct has_move_apply : std::false_type {};
template <class M, class S>
struct has_move_apply<
    M, S,
    std::void_t<decltype(std::declval<M&>().apply(std::declval<S&>(), std::declval<const typename M::proposal_type&>(),
                                                  std::declval<typename S::energy_type>()))>> : std::true_type {};

template <class M, class S, class = void>
struct has_prepare : std::false_type {};
template <class M, class S>
struct has_prepare<M, S, std::void_t<decltype(std::declval<M&>().prepare(std::declval<const S&>()))>> : std::true_type {
};

template <class M, class S, class = void>
struct has_begin_sweep : std::false_type {};
template <class M, class S>
struct has_begin_sweep<
    M, S, std::void_t<decltype(std::declval<M&>().begin_sweep(std::declval<const S&>(), std::declval<Xoshiro256&>()))>>
    : std::true_type {};

template <class M, class S, class = void>
struct has_neighbourhood : std::false_type {};
template <class M, class S>
struct has_neighbourhood<
    M, S,
    std::void_t<decltype(std::declval<const M&>().neighbourhood_size(std::declval<const S&>())),
                decltype(std::declval<const M&>().proposal_at(std::declval<const S&>(), std::size_t{}))>>
    : std::true_type {};

template <class M, class S, bool = has_proposal_type<M>::value>
struct move_checks {
  static constexpr bool propose_delta_apply = false;
  static constexpr bool enumerable = false;
};
template <class M, class S>
struct move_checks<M, S, true> {
  static constexpr bool propose_delta_apply = has_moves_per_sweep<M, S>::value && has_propose<M, S>::value &&
                                              has_move_delta<M, S>::value && has_move_apply<M, S>::value;
  static constexpr bool enumerable =
      has_move_delta<M, S>::value && has_move_apply<M, S>::value && has_neighbourhood<M, S>::value;
};

}  // namespace detail

/// True when `Move` can drive annealing on `Model` (see the list at the top of this file).
template <class Move, class Model>
inline constexpr bool is_move_generator_v = detail::move_checks<Move, SpinState<Model>>::propose_delta_apply;

/// True when `Move` can drive descent on `Model`: delta, apply and an enumerable neighbourhood.
template <class Move, class Model>
inline constexpr bool is_enumerable_move_v = detail::move_checks<Move, SpinState<Model>>::enumerable;

namespace detail {
// Optional hooks, called only when the move defines them.
template <class Move, class State>
void move_prepare(Move& m, const State& s) {
  if constexpr (has_prepare<Move, State>::value) m.prepare(s);
}
template <class Move, class State>
void move_begin_sweep(Move& m, const State& s, Xoshiro256& rng) {
  if constexpr (has_begin_sweep<Move, State>::value) m.begin_sweep(s, rng);
}
}  // namespace detail

}  // namespace spinwright

#endif  // SPINWRIGHT_MOVES_MOVE_HPP
