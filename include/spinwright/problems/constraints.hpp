// spinwright — constraint records and the feasibility check of a returned state.
//
// Every penalty builder (problems/penalty.hpp) registers one Constraint in a ConstraintSet:
// its kind, the relation it enforces (=, <=, >=), the decision variables with integer
// coefficients, the bound, the slack bits it owns and the penalty weight. check_bits() and
// check_spins() evaluate every constraint on a state and name the first one violated (its
// position in the set, its kind, its label and tag, and by how much).
//
// Constraint data are integers (std::int64_t), so feasibility is decided exactly and every
// violation is at least 1 — this is what makes the penalty-weight bound of penalty.hpp exact.
#ifndef SPINWRIGHT_PROBLEMS_CONSTRAINTS_HPP
#define SPINWRIGHT_PROBLEMS_CONSTRAINTS_HPP

#include "../config.hpp"

#include <cstddef>  // std::size_t
#include <cstdint>  // std::int64_t, std::uint64_t, std::int8_t, std::uint8_t
#include <utility>  // std::move
#include <vector>   // std::vector

namespace spinwright {

/// Which penalty built the constraint.
enum class ConstraintKind : std::uint8_t {
  one_hot,             // sum x = 1,        penalty A (1 - sum x)^2
  k_hot,               // sum x = k,        penalty A (k - sum x)^2
  pairwise_exclusion,  // sum x <= 1,       penalty A sum_{i<j} x_i x_j
  pair_cover,          // x_u + x_v >= 1,   penalty A (1 - x_u)(1 - x_v)  (two variables only)
  sum_equal,           // sum a x = b,      penalty A (sum a x - b)^2
  sum_at_most,         // sum a x <= b,     penalty A (sum a x + slack - b)^2, slack bits
};

inline constexpr const char* to_string(ConstraintKind kind) noexcept {
  switch (kind) {
    case ConstraintKind::one_hot:
      return "one-hot";
    case ConstraintKind::k_hot:
      return "k-hot";
    case ConstraintKind::pairwise_exclusion:
      return "pairwise exclusion";
    case ConstraintKind::pair_cover:
      return "pair cover";
    case ConstraintKind::sum_equal:
      return "weighted sum equal to a bound";
    case ConstraintKind::sum_at_most:
      return "weighted sum at most a bound";
  }
  return "unknown";
}

/// The relation between the left-hand side sum a x and the bound.
enum class Relation : std::uint8_t { equal, at_most, at_least };

/// A caller-chosen name for a constraint: a string literal (never copied or freed) and an
/// integer tag, e.g. {"one colour per vertex", 7} for vertex 7.
struct ConstraintLabel {
  const char* text = "";
  std::uint64_t tag = 0;
};

/// One registered constraint. `coefficients[k]` multiplies bit `variables[k]`; slack bits
/// (inequalities only) are `slack_begin .. slack_begin + slack_weights.size() - 1`, bit m
/// carrying the value `slack_weights[m]`. `weight` is the penalty weight A as a double.
struct Constraint {
  ConstraintKind kind = ConstraintKind::sum_equal;
  Relation relation = Relation::equal;
  ConstraintLabel label{};
  std::vector<std::uint64_t> variables;
  std::vector<std::int64_t> coefficients;
  std::int64_t bound = 0;
  std::uint64_t slack_begin = 0;
  std::vector<std::int64_t> slack_weights;
  double weight = 0;

  /// sum_k coefficients[k] * x[variables[k]] for a bit vector (0/1). O(size).
  std::int64_t lhs_of_bits(const std::uint8_t* bits) const noexcept {
    std::int64_t s = 0;
    for (std::size_t k = 0; k < variables.size(); ++k) {
      if (bits[variables[k]] != 0) s += coefficients[k];
    }
    return s;
  }
  /// The same for spins (+1 is bit 0, -1 is bit 1).
  std::int64_t lhs_of_spins(const std::int8_t* spins) const noexcept {
    std::int64_t s = 0;
    for (std::size_t k = 0; k < variables.size(); ++k) {
      if (spins[variables[k]] < 0) s += coefficients[k];
    }
    return s;
  }
  /// How far `lhs` is from satisfying the constraint: 0 when satisfied, otherwise
  /// |lhs - bound| (equal), lhs - bound (at_most) or bound - lhs (at_least); always >= 1 when
  /// violated, because the data are integers.
  std::int64_t violation(std::int64_t lhs) const noexcept {
    switch (relation) {
      case Relation::equal:
        return lhs >= bound ? lhs - bound : bound - lhs;
      case Relation::at_most:
        return lhs > bound ? lhs - bound : 0;
      case Relation::at_least:
        return lhs < bound ? bound - lhs : 0;
    }
    return 0;
  }
};

/// The outcome of a feasibility check: whether every constraint holds, how many do not, and
/// the first violated one (lowest position in the set) with its left-hand side and violation.
struct Feasibility {
  bool feasible = true;
  std::size_t violated_count = 0;
  std::size_t first = 0;  // position of the first violated constraint (meaningful if !feasible)
  ConstraintKind kind = ConstraintKind::sum_equal;
  ConstraintLabel label{};
  std::int64_t lhs = 0;
  std::int64_t bound = 0;
  std::int64_t amount = 0;  // violation of the first violated constraint (>= 1)

  explicit operator bool() const noexcept { return feasible; }
};

/// The constraints of one encoded problem, and the number of binary variables in use
/// (decision variables first, then slack bits as inequalities allocate them).
class ConstraintSet {
 public:
  ConstraintSet() = default;
  /// `num_decision_variables` bits are the problem's own; slack bits are numbered after them.
  explicit ConstraintSet(std::uint64_t num_decision_variables)
      : decision_(num_decision_variables), variables_(num_decision_variables) {}

  std::size_t size() const noexcept { return constraints_.size(); }
  bool empty() const noexcept { return constraints_.empty(); }
  const Constraint& operator[](std::size_t k) const noexcept {
    SPINWRIGHT_ASSERT(k < constraints_.size(), "constraint index out of range");
    return constraints_[k];
  }
  const Constraint* begin() const noexcept { return constraints_.data(); }
  const Constraint* end() const noexcept { return constraints_.data() + constraints_.size(); }

  std::uint64_t num_decision_variables() const noexcept { return decision_; }
  /// Decision variables plus every slack bit allocated so far: the size of the full model.
  std::uint64_t num_variables() const noexcept { return variables_; }

  /// Reserve `count` new variables (slack bits) and return the first index. Used by the
  /// inequality penalty; allocates nothing.
  std::uint64_t allocate_variables(std::uint64_t count) noexcept {
    const std::uint64_t first = variables_;
    variables_ += count;
    return first;
  }

  /// Append a record and return its position.
  std::size_t add(Constraint c) {
    constraints_.push_back(std::move(c));
    return constraints_.size() - 1;
  }

  /// Evaluate every constraint on a bit vector of num_variables() bits (only decision
  /// variables are read). O(total constraint size), no allocation.
  Feasibility check_bits(const std::uint8_t* bits) const noexcept {
    return check_with([bits](const Constraint& c) { return c.lhs_of_bits(bits); });
  }
  /// The same for spins (+1 is bit 0, -1 is bit 1).
  Feasibility check_spins(const std::int8_t* spins) const noexcept {
    return check_with([spins](const Constraint& c) { return c.lhs_of_spins(spins); });
  }

 private:
  template <class Lhs>
  Feasibility check_with(Lhs&& lhs_of) const noexcept {
    Feasibility f;
    for (std::size_t k = 0; k < constraints_.size(); ++k) {
      const Constraint& c = constraints_[k];
      const std::int64_t lhs = lhs_of(c);
      const std::int64_t v = c.violation(lhs);
      if (v == 0) continue;
      if (f.feasible) {
        f.feasible = false;
        f.first = k;
        f.kind = c.kind;
        f.label = c.label;
        f.lhs = lhs;
        f.bound = c.bound;
        f.amount = v;
      }
      ++f.violated_count;
    }
    return f;
  }

  std::uint64_t decision_ = 0;
  std::uint64_t variables_ = 0;
  std::vector<Constraint> constraints_;
};

}  // namespace spinwright

#endif  // SPINWRIGHT_PROBLEMS_CONSTRAINTS_HPP
