// A move written by the user: ShiftTransfer moves one worker from the shift they work to
// another shift, so every worker keeps exactly one shift for the whole run. It is passed to
// anneal_with() and to Descender as a template parameter, and the annealed rota is checked
// against exact enumeration of all 2^18 assignments.
// The rota is invented for this example: 6 workers, 3 shifts (early, late, night) wanting 2
// workers each, per-worker dislikes of each shift, and 4 pairs of workers who clash. Steepest
// descent with the same move, from everyone on the early shift, stops in a worse local minimum.
#include <spinwright/kernels/anneal.hpp>
#include <spinwright/kernels/descent.hpp>
#include <spinwright/kernels/exact.hpp>
#include <spinwright/problems/penalty.hpp>

#include <cstdint>
#include <cstdio>
#include <vector>

namespace rota {
using namespace spinwright;
using Model = QuboModel<int>;
constexpr std::uint32_t workers = 6, shifts = 3;
constexpr std::uint32_t bit(std::uint32_t w, std::uint32_t t) { return w * shifts + t; }  // x = 1: w works t

// Proposal: worker w leaves shift `from` (bit 1 -> 0) and joins shift `to` (bit 0 -> 1).
class ShiftTransfer {
 public:
  struct proposal_type {
    std::uint32_t worker, from, to;
  };
  void prepare(const SpinState<Model>& s) {  // read each worker's shift off the state (spin -1 = bit 1)
    shift_of_.assign(workers, 0);
    for (std::uint32_t w = 0; w < workers; ++w) {
      for (std::uint32_t t = 0; t < shifts; ++t) shift_of_[w] = s.spin(bit(w, t)) < 0 ? t : shift_of_[w];
    }
  }
  std::size_t moves_per_sweep(const SpinState<Model>&) const { return workers * (shifts - 1); }
  proposal_type propose(const SpinState<Model>&, Xoshiro256& rng) const {
    const std::uint32_t w = rng.below(workers), from = shift_of_[w];
    return {w, from, (from + 1 + rng.below(shifts - 1)) % shifts};
  }
  // Two QUBO flips: delta(i) counts nothing for Q_ij (x_j = 0), delta(j) counts +Q_ij (x_i = 1),
  // yet x_i x_j is 0 before and after, so Q_ij comes off once.
  std::int64_t delta(const SpinState<Model>& s, const proposal_type& p) const {
    const std::uint32_t i = bit(p.worker, p.from), j = bit(p.worker, p.to);
    return s.delta(i) + s.delta(j) - s.model().pair(i, j);
  }
  void apply(SpinState<Model>& s, const proposal_type& p, std::int64_t) {  // flip() keeps the fields exact
    s.flip(bit(p.worker, p.from));
    s.flip(bit(p.worker, p.to));
    shift_of_[p.worker] = p.to;
  }
  // For descent: transfer k sends worker k / (shifts - 1) to the k % (shifts - 1)-th other shift.
  std::size_t neighbourhood_size(const SpinState<Model>& s) const { return moves_per_sweep(s); }
  proposal_type proposal_at(const SpinState<Model>&, std::size_t k) const {
    const auto w = static_cast<std::uint32_t>(k / (shifts - 1)), from = shift_of_[w];
    return {w, from, (from + 1 + static_cast<std::uint32_t>(k % (shifts - 1))) % shifts};
  }

 private:
  std::vector<std::uint32_t> shift_of_;  // sized by the first prepare(), reused afterwards
};
}  // namespace rota

int main() {
  using namespace rota;
  static_assert(is_move_generator_v<ShiftTransfer, Model> && is_enumerable_move_v<ShiftTransfer, Model>);
  const int dislike[workers][shifts] = {{0, 5, 6}, {0, 2, 6}, {6, 3, 1}, {0, 6, 4}, {0, 2, 4}, {0, 5, 1}};
  const std::uint32_t clash[4][2] = {{4, 5}, {0, 1}, {0, 4}, {0, 2}};  // most would rather work early
  const int demand = 2, cover = 3, clash_cost = 5;
  QuboBuilder<int> objective(workers * shifts);
  for (std::uint32_t t = 0; t < shifts; ++t) {  // cover (demand - sum_w x_wt)^2, expanded with x^2 = x
    objective.add_offset(cover * demand * demand);
    for (std::uint32_t w = 0; w < workers; ++w) {
      objective.add_unary(bit(w, t), dislike[w][t] + cover * (1 - 2 * demand));
      for (std::uint32_t v = w + 1; v < workers; ++v) objective.add_pair(bit(w, t), bit(v, t), 2 * cover);
    }
    for (const auto& c : clash) objective.add_pair(bit(c[0], t), bit(c[1], t), clash_cost);
  }
  auto f = objective.build();
  auto weight = f ? suggest_penalty_weight(*f) : Result<int>(f.status());
  QuboBuilder<int> full = objective;  // + one shift per worker, so enumeration agrees with the move
  ConstraintSet one_shift(workers * shifts);
  for (std::uint32_t w = 0; w < workers && weight; ++w) {
    if (!add_one_hot(full, one_shift, {bit(w, 0), bit(w, 1), bit(w, 2)}, *weight)) return 1;
  }
  auto model = full.build();
  auto exact = model ? solve_exact(*model) : Result<ExactResult<std::int64_t>>(model.status());
  if (!weight || !exact) return 1;

  std::vector<std::int8_t> start(workers * shifts, 1);
  for (std::uint32_t w = 0; w < workers; ++w) start[bit(w, 0)] = -1;  // everyone on the early shift
  AnnealParams params;
  params.sweeps = 200;
  params.schedule = Schedule::geometric(0.6931 / 8, 6.9078);  // transfer deltas: integers, typically < 10
  params.initial = start.data();
  const auto best = anneal_with(*model, params, ShiftTransfer{}, /*seed*/ 7);
  Descender<Model, ShiftTransfer> local(*model, DescentParams{DescentRule::steepest, start.data()}, ShiftTransfer{}, 0);
  const auto greedy = local.run();
  local.warm_start(best.spins.data(), 7);
  bool ok = local.step(1) == 0 && local.done();  // no transfer improves the annealed rota
  for (std::size_t k = 0; k < local.move().neighbourhood_size(local.state()); ++k) {  // delta = recomputed change
    const auto p = local.move().proposal_at(local.state(), k);
    std::vector<std::int8_t> after(best.spins);
    after[bit(p.worker, p.from)] = 1;
    after[bit(p.worker, p.to)] = -1;
    ok = ok && local.move().delta(local.state(), p) == model->energy(after.data()) - best.energy;
  }
  ok = ok && best.energy == exact->energy && one_shift.check_spins(best.spins.data()).feasible &&
       one_shift.check_spins(greedy.spins.data()).feasible;
  std::printf("rota (worker:shift):");
  const char* names[shifts] = {"early", "late", "night"};
  for (std::uint32_t b = 0; b < workers * shifts; ++b) {
    if (best.spins[b] < 0) std::printf(" %u:%s", static_cast<unsigned>(b / shifts), names[b % shifts]);
  }
  std::printf("\nannealed energy %lld, exact ground energy %lld, steepest transfers from the start %lld\n%s\n",
              static_cast<long long>(best.energy), static_cast<long long>(exact->energy),
              static_cast<long long>(greedy.energy), ok ? "one shift each, optimal, deltas exact" : "WRONG");
  return ok ? 0 : 1;
}
