// spinwright — the acceptance rules of the sampling kernels (Metropolis, heat-bath) and the
// Acceptor that decides them without an exponential per attempt: threshold tables for integer
// models, a squeezed log-uniform comparison for floating ones, and the hazard tables of cold
// sweeps. How and why each works: docs/moves.md ("Acceptance without an exponential per attempt").
#ifndef SPINWRIGHT_KERNELS_ACCEPTANCE_HPP
#define SPINWRIGHT_KERNELS_ACCEPTANCE_HPP

#include "../arena.hpp"
#include "../config.hpp"
#include "../model/detail/energy_range.hpp"
#include "../detail/buffer.hpp"
#include "../model/form.hpp"
#include "../rng/xoshiro.hpp"
#include "beta_span.hpp"

#include <cmath>        // std::exp, std::log, std::log1p
#include <cstddef>      // std::size_t, std::ptrdiff_t
#include <cstdint>      // std::uint64_t, std::uint8_t
#include <type_traits>  // std::is_integral_v

namespace spinwright {

enum class Acceptance : std::uint8_t {
  metropolis,  // min(1, exp(-beta delta))
  heat_bath,   // 1 / (1 + exp(beta delta))  (Glauber)
};

namespace detail {

// Power of two that divides every flip delta of an integer model: the gcd's trailing zeros,
// plus one for Ising (delta = -2 s_i f_i). Returns the shift.
template <class Model>
unsigned delta_shift(const Model& model) {
  using index_type = typename Model::index_type;
  using value_type = typename Model::value_type;
  std::uint64_t bits = 0;  // OR of every magnitude: its lowest set bit is the common power of 2
  for (std::size_t i = 0; i < model.num_spins(); ++i) {
    const auto ii = static_cast<index_type>(i);
    bits |= magnitude_u64(model.site_term(ii));
    model.for_each_neighbour(ii, [&bits](index_type, value_type v) { bits |= magnitude_u64(v); });
  }
  unsigned shift = Model::form == Form::ising ? 1 : 0;
  if (bits == 0) return shift;
  while ((bits & 1) == 0) {
    bits >>= 1;
    ++shift;
  }
  return shift;
}

// Largest possible |delta| of one flip, in delta units (saturating).
template <class Model>
std::uint64_t max_flip_delta(const Model& model) {
  using index_type = typename Model::index_type;
  using value_type = typename Model::value_type;
  std::uint64_t best = 0;
  for (std::size_t i = 0; i < model.num_spins(); ++i) {
    const auto ii = static_cast<index_type>(i);
    std::uint64_t s = magnitude_u64(model.site_term(ii));
    model.for_each_neighbour(
        ii, [&s](index_type, value_type v) { add_bounded(s, magnitude_u64(v), integer_energy_limit); });
    if (s > best) best = s;
  }
  return Model::form == Form::ising ? 2 * best : best;
}

// Floating models whose coefficients are all integers (a max-cut graph read as double, say):
// their local fields and flip deltas are exact integers as long as every sum stays below
// 2^53, so the integer threshold table decides them exactly. True when every coefficient is
// an integer of magnitude below 2^31 and the largest |delta| below 2^50; `shift` and
// `max_delta` are then the integer model's (delta_shift, max_flip_delta).
template <class Model>
bool integral_float_model(const Model& model, unsigned& shift, std::uint64_t& max_delta) {
  using index_type = typename Model::index_type;
  using value_type = typename Model::value_type;
  constexpr double value_limit = 2147483648.0;  // 2^31
  constexpr std::uint64_t delta_limit = std::uint64_t{1} << 50;
  bool ok = true;
  std::uint64_t bits = 0;
  std::uint64_t best = 0;
  auto magnitude = [&ok](double v) -> std::uint64_t {
    const double a = v < 0 ? -v : v;
    if (!(a < value_limit) || a != static_cast<double>(static_cast<std::int64_t>(a))) {
      ok = false;
      return 0;
    }
    return static_cast<std::uint64_t>(a);
  };
  for (std::size_t i = 0; i < model.num_spins() && ok; ++i) {
    const auto ii = static_cast<index_type>(i);
    std::uint64_t row = magnitude(static_cast<double>(model.site_term(ii)));
    bits |= row;
    model.for_each_neighbour(ii, [&](index_type, value_type v) {
      const std::uint64_t m = magnitude(static_cast<double>(v));
      bits |= m;
      add_bounded(row, m, delta_limit);
    });
    if (row > best) best = row;
  }
  if (!ok || bits == 0) return false;
  best = Model::form == Form::ising ? 2 * best : best;
  if (best >= delta_limit) return false;
  shift = Model::form == Form::ising ? 1 : 0;
  while ((bits & 1) == 0) {
    bits >>= 1;
    ++shift;
  }
  max_delta = best;
  return true;
}

}  // namespace detail

// 53 ln 2: beyond this |beta * delta| no 53-bit uniform can change an acceptance decision.
inline constexpr double acceptance_cutoff = 36.736800569677101;

// Fixed-point scale of the hazard path's integers (see the header comment): 2^52, so the
// largest exponential draw (-ln 2^-53 = 36.7) stays below 2^58.
inline constexpr double hazard_scale = 4503599627370496.0;

// Decides acceptance of a move with energy change `delta` at the current beta.
// Construct once per kernel (the table is allocated then); set_beta() allocates nothing.
template <class Energy>
class Acceptor {
 public:
  using energy_type = Energy;
  static constexpr bool integer = std::is_integral_v<Energy>;
  static constexpr std::size_t default_table_limit = 4096;

  Acceptor() = default;

#if !SPINWRIGHT_NO_HEAP
  // `shift` and `max_delta` from the model (see make_acceptor); table_limit bounds the table.
  // `hazard`: also allocate the hazard table (integer models; see prepare_hazard).
  Acceptor(Acceptance rule, unsigned shift, std::uint64_t max_delta, std::size_t table_limit = default_table_limit,
           bool hazard = false)
      : rule_(rule),
        shift_(shift),
        table_(table_entries(shift, max_delta, table_limit), 0),
        hazard_(hazard_entries(rule, hazard, table_.size()), 0) {
    table_mode_ = integer || table_.size() != 0;
  }
#endif

  // The same with the table carved from an arena; check valid().
  Acceptor(Acceptance rule, unsigned shift, std::uint64_t max_delta, std::size_t table_limit, Arena& arena,
           bool hazard = false)
      : rule_(rule),
        shift_(shift),
        table_(table_entries(shift, max_delta, table_limit), arena, 0),
        hazard_(hazard_entries(rule, hazard, table_.size()), arena, 0) {
    table_mode_ = integer || table_.size() != 0;
  }

  // Arena bytes of the tables.
  static std::size_t bytes_needed(Acceptance rule, unsigned shift, std::uint64_t max_delta, std::size_t table_limit,
                                  bool hazard = false) noexcept {
    const std::size_t entries = table_entries(shift, max_delta, table_limit);
    return arena_bytes<std::uint64_t>(entries) + arena_bytes<std::uint64_t>(hazard_entries(rule, hazard, entries));
  }

  // Entries of the threshold table (0 for floating models).
  static std::size_t table_entries(unsigned shift, std::uint64_t max_delta, std::size_t table_limit) noexcept {
    if (!integer && max_delta == 0) {
      return 0;  // floating model with non-integer coefficients: no table
    } else {
      std::uint64_t entries = (max_delta >> shift) + 1;
      if (entries > table_limit) entries = table_limit;
      if (entries < 2) entries = 2;
      return static_cast<std::size_t>(entries);
    }
  }

  bool valid() const noexcept { return table_.valid() && hazard_.valid(); }

  // True when the hazard table was requested and applies (integer models).
  bool has_hazard() const noexcept { return hazard_.size() != 0; }

  // Follow a model whose coefficients were edited in place: the table is indexed by
  // |delta| >> shift, so a shift larger than the new common power of two would merge unequal
  // deltas. The table keeps its size (deltas beyond it take the exact logarithm path), the
  // current beta is kept and the table refilled. No allocation.
  template <class Model>
  void retune(const Model& model) noexcept {
    if constexpr (integer) {
      const unsigned shift = detail::delta_shift(model);
      if (shift != shift_) {
        shift_ = shift;
        set_beta(beta_);
      }
    } else if (table_.size() != 0) {
      // A floating model built with integer coefficients: edits may have left them.
      unsigned shift = 0;
      std::uint64_t max_delta = 0;
      const bool integral = detail::integral_float_model(model, shift, max_delta);
      if (integral != table_mode_ || shift != shift_) {
        table_mode_ = integral;
        shift_ = shift;
        set_beta(beta_);
      }
    }
  }

  // True when the threshold table decides (integer models, and floating models whose
  // coefficients are all integers: detail::integral_float_model).
  bool table_decides() const noexcept { return table_mode_; }
  Acceptance rule() const noexcept { return rule_; }
  double beta() const noexcept { return beta_; }
  std::size_t table_size() const noexcept { return table_.size(); }
  std::size_t table_used() const noexcept { return used_; }

  // O(entries with a non-zero threshold); one exp() per call.
  void set_beta(double beta) noexcept {
    SPINWRIGHT_ASSERT(beta >= 0 && beta - beta == 0, "beta must be finite and >= 0");
    beta_ = beta;
    hazard_ready_ = false;
    if (table_mode_) {
      const double step = static_cast<double>(std::uint64_t{1} << shift_);
      const double p = std::exp(-beta * step);  // acceptance ratio of one table step
      const std::size_t size = table_.size();
      double pk = 1;  // p^k
      std::size_t k = 0;
      for (; k < size; ++k) {
        const double prob = rule_ == Acceptance::metropolis ? pk : pk / (1 + pk);
        const double t = prob * two53;
        if (t < 1) break;
        table_[k] = static_cast<std::uint64_t>(t);
        pk *= p;
      }
      used_ = k;
      overflow_ = (k == size);
      for (std::size_t z = k; z < size && table_[z] != 0; ++z) table_[z] = 0;
    }
  }

  // A copy of the acceptance state for one sweep, with the rule fixed at compile time, so a
  // kernel's loop keeps everything in registers. Valid until the next set_beta().
  template <Acceptance Rule>
  struct Fixed {
    const std::uint64_t* table;
    std::uint64_t used;
    unsigned shift;
    bool overflow;
    double beta;

    bool accept(Energy delta, Xoshiro256& rng) const noexcept {
      if constexpr (integer) {
        return accept_table(delta, rng);
      } else {
        // Integer coefficients held as floating values: the delta is an exact integer.
        if (table != nullptr) return accept_table(static_cast<std::int64_t>(delta), rng);
        return accept_by_log<Rule>(beta, static_cast<double>(delta), rng);
      }
    }

   private:
    template <class Int>
    bool accept_table(Int delta, Xoshiro256& rng) const noexcept {
      {
        if constexpr (Rule == Acceptance::metropolis) {
          if (delta <= 0) return true;
          const auto k = static_cast<std::uint64_t>(delta) >> shift;
          if (k < used) return (rng.next() >> 11) < table[k];
          if (!overflow) return false;
          return accept_rare<Rule>(beta, static_cast<double>(delta), rng);
        } else {
          if (delta == 0) return rng.coin();
          const std::uint64_t k =
              (delta < 0 ? std::uint64_t{0} - static_cast<std::uint64_t>(delta) : static_cast<std::uint64_t>(delta)) >>
              shift;
          if (k < used) {
            const std::uint64_t u = rng.next() >> 11;
            return delta > 0 ? u < table[k] : u >= table[k];
          }
          if (!overflow) return delta < 0;
          return accept_rare<Rule>(beta, static_cast<double>(delta), rng);
        }
      }
    }

    // The integer table's rare fall-back works on a copy of the generator, so a kernel's own
    // generator never has its address taken by an out-of-line call and stays in registers
    // (taking it would put the whole stream through memory at every draw of the hot loop).
    template <Acceptance R>
    static bool accept_rare(double beta, double delta, Xoshiro256& rng) noexcept {
      Xoshiro256 copy = rng;
      const bool accepted = accept_by_log<R>(beta, delta, copy);
      rng = copy;
      return accepted;
    }
  };

  template <Acceptance Rule>
  Fixed<Rule> fixed() const noexcept {
    return {table_mode_ ? table_.data() : nullptr, used_, shift_, overflow_, beta_};
  }

  // The hazard path (integer models; see the header comment). A copy for one sweep, valid
  // until the next set_beta(); call prepare_hazard() first.
  struct Hazard {
    const std::uint64_t* table;  // 2^52 * -ln(1 - p) of delta = k << shift at table[k]
                                 // (k > 0; heat-bath also k <= 0: the table is centred)
    std::uint64_t size;          // entries on each side
    unsigned shift;
    bool overflow;
    bool heat_bath;
    double beta;

    // Scaled hazard of an uphill delta (> 0), either rule.
    std::uint64_t of(Energy delta) const noexcept {
      const std::uint64_t k = static_cast<std::uint64_t>(delta) >> shift;
      if (k < size) return table[k];
      return overflow ? hazard_beyond(beta, static_cast<double>(delta), heat_bath) : 0;
    }

    // Scaled hazard of any delta under heat-bath acceptance. Deltas are multiples of
    // 2^shift, so the arithmetic shift divides exactly; one range check covers both signs.
    std::uint64_t of_heat_bath(Energy delta) const noexcept {
      static_assert((Energy{-8} >> 1) == Energy{-4}, "arithmetic right shift of negative values");
      const auto k = static_cast<std::ptrdiff_t>(delta >> shift);
      if (static_cast<std::uint64_t>(k) + (size - 1) < 2 * size - 1) return table[k];
      return heat_bath_beyond(delta);
    }

    std::uint64_t heat_bath_beyond(Energy delta) const noexcept {
      if (delta > 0) return overflow ? hazard_beyond(beta, static_cast<double>(delta), true) : 0;
      if (!overflow) return hazard_certain;  // acceptance within 2^-53 of 1
      const double x = -beta * static_cast<double>(delta);
      return scaled_hazard(x + log1p_small(std::exp(-x)));
    }

    // A fresh exponential draw, scaled; at least 1, so 0 can mark "spent".
    static std::uint64_t draw(Xoshiro256& rng) noexcept {
      const double e = -std::log(rng.uniform_open_zero()) * hazard_scale;
      const auto scaled = static_cast<std::uint64_t>(e);
      return scaled == 0 ? 1 : scaled;
    }
  };

  static constexpr bool has_hazard_path = integer;

  // A scaled hazard at least this large accepts whatever E is (E <= 53 ln 2 * 2^52 < 2^58).
  static constexpr std::uint64_t hazard_certain = std::uint64_t{1} << 60;

  // Fills the hazard table for the current beta when it is stale: Metropolis O(entries with a
  // non-zero threshold), heat-bath O(entries); one log1p per entry where e^{-beta d} > 1e-4, a
  // series below. No allocation.
  void prepare_hazard() noexcept {
    if constexpr (integer) {
      SPINWRIGHT_ASSERT(has_hazard(), "the hazard path needs an Acceptor built with hazard = true");
      if (hazard_ready_) return;
      const std::size_t size = hazard_side();
      std::uint64_t* centre = hazard_.data() + (hazard_.size() - size);
      const double step = beta_ * static_cast<double>(std::uint64_t{1} << shift_);
      const double p = std::exp(-step);
      double pk = 1;
      std::size_t k = 1;
      if (rule_ == Acceptance::metropolis) {
        centre[0] = hazard_certain;  // delta 0 is accepted before any lookup
        for (; k < used_ && k < size; ++k) {
          pk *= p;
          centre[k] = scaled_hazard(-log1m(pk));
        }
        for (; k < size && centre[k] != 0; ++k) centre[k] = 0;
      } else {
        centre[0] = scaled_hazard(0.69314718055994531);  // ln 2
        for (; k < size; ++k) {
          pk *= p;  // underflows to 0 harmlessly
          const double up = log1p_small(pk);
          centre[k] = scaled_hazard(up);
          const double down = step * static_cast<double>(k) + up;
          centre[-static_cast<std::ptrdiff_t>(k)] = scaled_hazard(down);
        }
      }
      hazard_ready_ = true;
    }
  }

  // Whether the hazard table matches the current beta, and how many entries per side carry a
  // probability of at least 2^-53 at this beta (1 + floor(53 ln 2 / (beta 2^shift))): the
  // costly entries of a fill. Kernels weigh this against a sweep's attempts, because
  // refilling a long table every sweep on a small model costs more than the draws it saves.
  // It depends on beta and the delta unit only, not on the table's size, so a kernel reused
  // after in-place edits chooses exactly as a fresh one would.
  bool hazard_ready() const noexcept { return hazard_ready_; }
  std::size_t hazard_fill_entries() const noexcept {
    const double step = beta_ * static_cast<double>(std::uint64_t{1} << shift_);
    const double limit = 1e9;  // "very many": beta near 0
    const double entries = step > 0 ? acceptance_cutoff / step : limit;
    return entries < limit ? static_cast<std::size_t>(entries) + 1 : static_cast<std::size_t>(limit);
  }

  Hazard hazard() const noexcept {
    SPINWRIGHT_ASSERT(hazard_ready_, "prepare_hazard() before hazard()");
    const std::size_t size = hazard_side();
    return {hazard_.data() + (hazard_.size() - size), size, shift_, overflow_, rule_ == Acceptance::heat_bath, beta_};
  }

  bool accept(Energy delta, Xoshiro256& rng) const noexcept {
    if (rule_ == Acceptance::metropolis) return fixed<Acceptance::metropolis>().accept(delta, rng);
    return fixed<Acceptance::heat_bath>().accept(delta, rng);
  }

 private:
  static constexpr double two53 = 9007199254740992.0;

  // Metropolis: one side (index k >= 0); heat-bath: both sides around a centre entry.
  static std::size_t hazard_entries(Acceptance rule, bool hazard, std::size_t entries) noexcept {
    if (!integer || !hazard) return 0;
    return rule == Acceptance::metropolis ? entries : 2 * entries - 1;
  }
  std::size_t hazard_side() const noexcept {
    return rule_ == Acceptance::metropolis ? hazard_.size() : (hazard_.size() + 1) / 2;
  }

  // ln(1 - q) and ln(1 + q) for q in [0, 1): the series to q^4 where its remainder is below
  // 2^-53 relative (q < 1e-4), log1p otherwise.
  static double log1m(double q) noexcept {
    if (q < 1e-4) return -q * (1 + q * (0.5 + q * (1.0 / 3 + q * 0.25)));
    return std::log1p(-q);
  }
  static double log1p_small(double q) noexcept {
    if (q < 1e-4) return q * (1 - q * (0.5 - q * (1.0 / 3 - q * 0.25)));
    return std::log1p(q);
  }
  static std::uint64_t scaled_hazard(double h) noexcept {
    const double scaled = h * hazard_scale;
    return scaled >= static_cast<double>(hazard_certain) ? hazard_certain : static_cast<std::uint64_t>(scaled);
  }

  // Uphill deltas beyond a table that was too short for this beta.
  static std::uint64_t hazard_beyond(double beta, double delta, bool heat_bath) noexcept {
    const double x = beta * delta;
    if (x > acceptance_cutoff) return 0;
    const double q = std::exp(-x);
    return scaled_hazard(heat_bath ? log1p_small(q) : -log1m(q));
  }

  // exp(x) >= 1 + x + x^2/2 + x^3/6 for x >= 0, so u * that > 1 proves u > exp(-x). The
  // margin keeps every shortcut decision identical to the exact comparison despite rounding.
  static double exp_lower(double x) noexcept { return 1 + x * (1 + x * (0.5 + x * (1.0 / 6))); }
  static constexpr double squeeze_margin = 1 + 1e-12;

  // Exact decisions by comparison with log(u); a polynomial squeeze settles most draws
  // without the logarithm (same outcome, same RNG use).
  template <Acceptance Rule>
  static bool accept_by_log(double beta, double delta, Xoshiro256& rng) noexcept {
    const double x = beta * delta;
    if constexpr (Rule == Acceptance::metropolis) {
      if (!(x > 0)) return true;
      if (x > acceptance_cutoff) return false;
      const double u = rng.uniform_open_zero();
      if (u * exp_lower(x) > squeeze_margin) return false;
      return x < -std::log(u);
    } else {
      if (x > acceptance_cutoff) return false;
      if (x < -acceptance_cutoff) return true;
      const double u = rng.uniform_open_zero();
      // Acceptance 1 / (1 + e^x): below e^-x for x > 0, above 1 - e^x for x < 0.
      if (x > 0 && u * exp_lower(x) > squeeze_margin) return false;
      if (x < 0 && (1 - u) * exp_lower(-x) > squeeze_margin) return true;
      return x < std::log((1 - u) / u);
    }
  }

  Acceptance rule_ = Acceptance::metropolis;
  unsigned shift_ = 0;
  double beta_ = 0;
  detail::Buffer<std::uint64_t> table_;   // integer models: 2^53 * acceptance of delta = k << shift
  detail::Buffer<std::uint64_t> hazard_;  // integer Metropolis: 2^52 * -ln(1 - acceptance), on demand
  std::size_t used_ = 0;                  // entries [0, used_) are non-zero
  bool overflow_ = false;                 // the table was too short for this beta
  bool hazard_ready_ = false;             // hazard_ matches beta_
  bool table_mode_ = integer;             // the table decides (integer models; floating ones with integer coefficients)
};

namespace detail {

// What an annealer's set-up reads off the coefficients: the acceptance tables' shift and
// largest delta (equal to delta_shift / max_flip_delta, or integral_float_model for floating
// models) and estimate_beta_span(model).cold_delta, the bound sample_beta_span needs. One
// pass for integer models; floating ones take the two passes they took before.
struct CoefficientScan {
  unsigned shift = 0;
  std::uint64_t max_delta = 0;  // 0 with shift 0 for floating models without integer coefficients
  double cold_bound = 0;
};

template <class Model>
CoefficientScan scan_coefficients(const Model& model) {
  using index_type = typename Model::index_type;
  using value_type = typename Model::value_type;
  CoefficientScan r;
  const std::size_t n = model.num_spins();
  if constexpr (std::is_integral_v<typename Model::energy_type>) {
    std::uint64_t bits = 0;
    std::uint64_t best = 0;
    // Values of 32 bits or fewer cannot overflow a row sum in 64 bits: the row is summed
    // plainly and capped once, the same result as capping at every step.
    constexpr bool narrow = sizeof(value_type) <= 4;
    std::uint64_t smallest = ~std::uint64_t{0};  // all ones: none seen yet
    for (std::size_t i = 0; i < n; ++i) {
      const auto ii = static_cast<index_type>(i);
      const std::uint64_t lin = magnitude_u64(model.site_term(ii));
      bits |= lin;
      std::uint64_t row = lin;
      if (lin != 0 && lin < smallest) smallest = lin;
      model.for_each_neighbour(ii, [&](index_type j, value_type v) {
        const std::uint64_t m = magnitude_u64(v);
        bits |= m;
        if constexpr (narrow) {
          row += m;
        } else {
          add_bounded(row, m, integer_energy_limit);
        }
        if (m < smallest && m != 0 && j != ii) smallest = m;
      });
      if (narrow && row > integer_energy_limit) row = integer_energy_limit;
      if (row > best) best = row;
    }
    if (smallest == ~std::uint64_t{0}) smallest = 0;
    r.shift = Model::form == Form::ising ? 1 : 0;
    if (bits != 0) {
      while ((bits & 1) == 0) {
        bits >>= 1;
        ++r.shift;
      }
    }
    r.max_delta = Model::form == Form::ising ? 2 * best : best;
    // estimate_beta_span's cold_delta: rounding to double is monotonic, so the smallest
    // magnitude converted equals the smallest of the converted magnitudes; an integer model
    // with a non-zero coefficient has a non-zero sum of squares.
    r.cold_bound = (Model::form == Form::ising ? 2 : 1) * static_cast<double>(smallest);
  } else {
    if (!integral_float_model(model, r.shift, r.max_delta)) {
      r.shift = 0;
      r.max_delta = 0;
    }
    r.cold_bound = estimate_beta_span(model).cold_delta;
  }
  return r;
}

}  // namespace detail

// The acceptor from a scan already made (kernels that need the scan for more than the tables).
#if !SPINWRIGHT_NO_HEAP
template <class Energy>
Acceptor<Energy> make_acceptor_from_scan(const detail::CoefficientScan& scan, Acceptance rule, std::size_t table_limit,
                                         bool hazard = false) {
  if constexpr (std::is_integral_v<Energy>) {
    return Acceptor<Energy>(rule, scan.shift, scan.max_delta, table_limit, hazard);
  } else {
    return Acceptor<Energy>(rule, scan.shift, scan.max_delta, table_limit);
  }
}
#endif
template <class Energy>
Acceptor<Energy> make_acceptor_from_scan(const detail::CoefficientScan& scan, Acceptance rule, std::size_t table_limit,
                                         Arena& arena, bool hazard = false) {
  if constexpr (std::is_integral_v<Energy>) {
    return Acceptor<Energy>(rule, scan.shift, scan.max_delta, table_limit, arena, hazard);
  } else {
    return Acceptor<Energy>(rule, scan.shift, scan.max_delta, table_limit, arena);
  }
}

#if !SPINWRIGHT_NO_HEAP
// The acceptor suited to a model (integer models get the threshold table; `hazard` adds the
// hazard table for integer Metropolis).
template <class Model>
Acceptor<typename Model::energy_type> make_acceptor(
    const Model& model, Acceptance rule,
    std::size_t table_limit = Acceptor<typename Model::energy_type>::default_table_limit, bool hazard = false) {
  using energy_type = typename Model::energy_type;
  if constexpr (std::is_integral_v<energy_type>) {
    return Acceptor<energy_type>(rule, detail::delta_shift(model), detail::max_flip_delta(model), table_limit, hazard);
  } else {
    unsigned shift = 0;
    std::uint64_t max_delta = 0;
    if (!detail::integral_float_model(model, shift, max_delta)) {
      shift = 0;
      max_delta = 0;
    }
    return Acceptor<energy_type>(rule, shift, max_delta, table_limit);
  }
}
#endif

// The same with the tables carved from an arena; check valid().
template <class Model>
Acceptor<typename Model::energy_type> make_acceptor(const Model& model, Acceptance rule, std::size_t table_limit,
                                                    Arena& arena, bool hazard = false) {
  using energy_type = typename Model::energy_type;
  if constexpr (std::is_integral_v<energy_type>) {
    return Acceptor<energy_type>(rule, detail::delta_shift(model), detail::max_flip_delta(model), table_limit, arena,
                                 hazard);
  } else {
    unsigned shift = 0;
    std::uint64_t max_delta = 0;
    if (!detail::integral_float_model(model, shift, max_delta)) {
      shift = 0;
      max_delta = 0;
    }
    return Acceptor<energy_type>(rule, shift, max_delta, table_limit, arena);
  }
}

// Arena bytes the acceptance tables of a model need.
template <class Model>
std::size_t acceptor_bytes(const Model& model, Acceptance rule, std::size_t table_limit, bool hazard = false) {
  using energy_type = typename Model::energy_type;
  if constexpr (std::is_integral_v<energy_type>) {
    return Acceptor<energy_type>::bytes_needed(rule, detail::delta_shift(model), detail::max_flip_delta(model),
                                               table_limit, hazard);
  } else {
    unsigned shift = 0;
    std::uint64_t max_delta = 0;
    if (!detail::integral_float_model(model, shift, max_delta)) return 0;
    return Acceptor<energy_type>::bytes_needed(rule, shift, max_delta, table_limit);
  }
}

}  // namespace spinwright

#endif  // SPINWRIGHT_KERNELS_ACCEPTANCE_HPP
