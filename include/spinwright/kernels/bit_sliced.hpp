// spinwright — bit-sliced (multi-spin-coded) annealing for Ising models whose couplings are all
// +-J, fields 0 or +-J, at most 15 neighbours a spin: 64 restarts per 64-bit word (restart k of a
// word is bit k), Words words per site advanced together, unsatisfied bonds counted by bitwise
// full adders, Metropolis acceptance from one uniform per word and site shared by its 64
// restarts (default) or from independent random bits per restart, sequential sweeps; with
// shared draws, even periodic square and cubic lattices are swept by sublattice, eight sites
// per vector step (BitSlicedParams::checkerboard).
// bit_sliced_fits(model) says whether a model qualifies; the method: docs/kernels.md ("Bit-sliced").
#ifndef SPINWRIGHT_KERNELS_BIT_SLICED_HPP
#define SPINWRIGHT_KERNELS_BIT_SLICED_HPP

#include "../arena.hpp"
#include "../config.hpp"
#include "../control.hpp"
#include "../detail/buffer.hpp"
#include "../model/form.hpp"
#include "../rng/xoshiro.hpp"
#include "../status.hpp"
#include "beta_span.hpp"
#include "detail/bit_count.hpp"
#include "detail/drive.hpp"
#include "schedule.hpp"
#include "solution.hpp"

#include <cmath>    // std::exp, std::ldexp
#include <cstddef>  // std::size_t
#include <cstdint>  // std::uint64_t, std::uint32_t, std::int8_t, std::int64_t

#if !SPINWRIGHT_NO_HEAP
#include <vector>  // std::vector (solutions() only)
#endif

namespace spinwright {

/// Neighbours a spin may have in a model the bit-sliced kernel takes (a non-zero field counts as one).
inline constexpr std::size_t bit_sliced_max_degree = 15;

struct BitSlicedParams {
  std::uint64_t sweeps = 1000;           // schedule length (a Budget's sweeps override it)
  Schedule schedule{};                   // default: geometric over the beta span from the model
  const std::int8_t* initial = nullptr;  // warm start of every restart (n spins, +1/-1); random otherwise
  std::uint64_t progress_every = 0;      // observers' on_progress period in sweeps (0: never)
  // One uniform random number per (word, site) shared by the word's 64 restarts (each
  // restart's chain is still exact Metropolis, but restarts of one word are correlated);
  // false: independent random bits per restart (about eight random words per word and site).
  bool shared_draws = true;
  // Energies counted and bests kept every best_every sweeps (0 counts as 1), at the last sweep
  // of a schedule, and whenever a best or the current energies are asked for.
  std::uint64_t best_every = 8;
  // With shared draws, a model that is the L x L periodic square lattice or the L x L x L
  // periodic cubic lattice (sites numbered as problems/lattice.hpp does, L even and at least 4,
  // no fields) is swept by sublattice: every site of one colour (x + y + z even), then every
  // site of the other, eight sites per step with one uniform each from eight streams per word
  // of each block of rows (bit_sliced_site_stream). Faster than the sequential sweep, and different draws; false: the
  // sequential sweep for every model.
  bool checkerboard = true;
};

/// The vector unit the checkerboard sweep runs on (BitSlicedAnnealer::set_unit). Every unit
/// gives the same answer.
enum class BitSlicedUnit : std::uint8_t { plain, avx2, avx512 };

/// The widest unit this CPU and build can run (plain off x86-64 or with other compilers).
inline BitSlicedUnit bit_sliced_best_unit() noexcept {
#if SPINWRIGHT_BIT_DISPATCH
  if (__builtin_cpu_supports("avx512f") && __builtin_cpu_supports("avx512bw") && __builtin_cpu_supports("avx512vl") &&
      __builtin_cpu_supports("avx512dq")) {
    return BitSlicedUnit::avx512;
  }
  if (__builtin_cpu_supports("avx2")) return BitSlicedUnit::avx2;
#endif
  return BitSlicedUnit::plain;
}

/// The restart index r of Xoshiro256::for_restart(seed, r) of stream g (0 .. 7) of the eight
/// that give block `block` of the checkerboard sweep of 64-bit word `word` its uniforms (a
/// block is one z layer of a cubic lattice, one row of a square one): 2^63 + (8 block + g + 1)
/// 2^40 + word (distinct from every bit_sliced_stream for words below 2^40, blocks below 2^20).
constexpr std::uint64_t bit_sliced_site_stream(std::uint64_t word, std::uint64_t block, std::uint64_t g) noexcept {
  return (std::uint64_t{1} << 63) | ((8 * block + g + 1) << 40) | word;
}

/// Helpers that share each half-sweep of the checkerboard (BitSlicedAnnealer::set_team; one
/// on threads: parallel/bit_sliced_restarts.hpp). The blocks of a colour are split into
/// parts() contiguous ranges; each block has its own streams, so the answer does not depend
/// on the number of parts.
struct BitSlicedTeam {
  virtual ~BitSlicedTeam() = default;
  virtual unsigned parts() const noexcept = 0;
  /// Calls work(context, p) once for every p in 0 .. parts() - 1, on any threads, and returns
  /// when every call has returned.
  virtual void run(void (*work)(void*, unsigned), void* context) noexcept = 0;
};

/// Whether the bit-sliced kernel takes `model`: an Ising model whose couplings all have one
/// magnitude J, whose fields are 0 or +-J, and whose spins have at most bit_sliced_max_degree
/// neighbours (a non-zero field counting as one). Otherwise the Status names the first term
/// that does not fit (i, j; i == j for a field or a spin).
template <class Model>
Status bit_sliced_fits(const Model& model) {
  using index_type = typename Model::index_type;
  using value_type = typename Model::value_type;
  if constexpr (Model::form != Form::ising) {
    return Status::error(StatusCode::invalid_argument,
                         "the bit-sliced kernel takes Ising models only (convert a QUBO model with ising_from)");
  } else {
    const std::size_t n = model.num_spins();
    if (n >= (std::size_t{1} << 31) - 1) {
      return Status::error(StatusCode::size_limit, "the bit-sliced kernel takes fewer than 2^31 - 1 spins");
    }
    value_type magnitude{0};
    Status bad = Status::success();
    auto see = [&](value_type v, std::size_t i, std::size_t j, const char* message) {
      const value_type a = v < value_type{0} ? value_type(-v) : v;
      if (a == value_type{0} || !bad.ok()) return;
      if (magnitude == value_type{0}) magnitude = a;
      if (a != magnitude) bad = Status::error(StatusCode::invalid_argument, message).at_term(no_term, i, j);
    };
    for (std::size_t i = 0; i < n && bad.ok(); ++i) {
      const auto ii = static_cast<index_type>(i);
      std::size_t degree = model.site_term(ii) != value_type{0} ? 1 : 0;
      model.for_each_neighbour(ii, [&](index_type j, value_type v) {
        if (j == ii || v == value_type{0}) return;
        ++degree;
        see(v, i, static_cast<std::size_t>(j),
            "coupling magnitude differs from the others (the bit-sliced kernel needs couplings of one "
            "magnitude, +-J)");
      });
      see(model.site_term(ii), i, i, "field is neither 0 nor +-J, the coupling magnitude (bit-sliced kernel)");
      if (bad.ok() && degree > bit_sliced_max_degree) {
        bad = Status::error(StatusCode::size_limit,
                            "spin has more than 15 neighbours (a non-zero field counts as one) for the "
                            "bit-sliced kernel")
                  .at_term(no_term, i, i);
      }
    }
    return bad;
  }
}

namespace detail {

// Words xoshiro256++ streams stepped side by side (state stored [word] per component, so the
// loops vectorise); each stream is the same sequence Xoshiro256 gives from the same state.
template <std::size_t Words>
struct StreamSet {
  std::uint64_t s0[Words], s1[Words], s2[Words], s3[Words];

  static constexpr std::uint64_t rotl(std::uint64_t x, int k) noexcept { return (x << k) | (x >> (64 - k)); }

  // Next output of every stream into out; streams w with move[w] == 0 stay where they are.
  // Lane w becomes the stream of Xoshiro256::for_restart(seed, r) (the same seeding steps).
  void seed_lane(std::size_t w, std::uint64_t seed, std::uint64_t r) noexcept {
    std::uint64_t a = seed;
    std::uint64_t b = r ^ 0xD1B54A32D192ED03ULL;
    std::uint64_t sm = splitmix64(a) ^ (splitmix64(b) * 0xA24BAED4963EE407ULL);
    s0[w] = splitmix64(sm);
    s1[w] = splitmix64(sm);
    s2[w] = splitmix64(sm);
    s3[w] = splitmix64(sm);
  }

  // Next output of every stream into out; every stream moves.
  SPINWRIGHT_BIT_INLINE void next_all(std::uint64_t* out) noexcept {
    for (std::size_t w = 0; w < Words; ++w) {
      const std::uint64_t a = s0[w], b = s1[w], c = s2[w], d = s3[w];
      out[w] = rotl(a + d, 23) + a;
      const std::uint64_t t = b << 17;
      const std::uint64_t c1 = c ^ a;
      const std::uint64_t d1 = d ^ b;
      s0[w] = a ^ d1;
      s1[w] = b ^ c1;
      s2[w] = c1 ^ t;
      s3[w] = rotl(d1, 45);
    }
  }

  SPINWRIGHT_BIT_INLINE void next(std::uint64_t* out, const std::uint64_t* move) noexcept {
    for (std::size_t w = 0; w < Words; ++w) {
      const std::uint64_t a = s0[w], b = s1[w], c = s2[w], d = s3[w];
      out[w] = rotl(a + d, 23) + a;
      const std::uint64_t t = b << 17;
      const std::uint64_t c1 = c ^ a;
      const std::uint64_t d1 = d ^ b;
      const std::uint64_t b1 = b ^ c1;
      const std::uint64_t a1 = a ^ d1;
      // With one word the caller draws only when that word needs it: the stream always moves.
      const std::uint64_t keep = (Words == 1 || move[w] != 0) ? 0 : ~std::uint64_t{0};
      s0[w] = (a & keep) | (a1 & ~keep);
      s1[w] = (b & keep) | (b1 & ~keep);
      s2[w] = (c & keep) | ((c1 ^ t) & ~keep);
      s3[w] = (d & keep) | (rotl(d1, 45) & ~keep);
    }
  }
};

// A probability as a 64-bit fraction: u < threshold for a uniform 64-bit u has probability
// threshold / 2^64; `one` marks probability 1.
struct FixedProbability {
  std::uint64_t threshold = 0;
  bool one = false;

  static FixedProbability of(double p) noexcept {
    FixedProbability f;
    if (!(p < 1.0)) {
      f.one = true;
    } else if (p > 0) {
      const double scaled = std::ldexp(p, 64);
      f.threshold = scaled >= 18446744073709551615.0 ? ~std::uint64_t{0} : static_cast<std::uint64_t>(scaled);
    }
    return f;
  }
};

// A model the checkerboard sweep takes: the periodic square (dims 2) or cubic (dims 3)
// lattice of even side `side` >= 4, site (x, y, z) numbered x + side (y + side z), one bond to
// each of the 2 dims nearest neighbours, no field; dims 0 otherwise.
struct BitLattice {
  std::size_t side = 0;
  int dims = 0;
  std::size_t half() const noexcept { return side / 2; }
  std::size_t padded() const noexcept { return (half() + 7) / 8 * 8; }    // sites of a row, to a multiple of 8
  std::size_t stride() const noexcept { return padded() + 2; }             // a row with its two ghost words
  std::size_t rows() const noexcept { return dims == 3 ? side * side : side; }  // rows of one colour
  std::size_t plane() const noexcept { return rows() * stride(); }
};

// The periodic neighbours of coordinate c on a side of `side`, without a division (the sweep,
// the count and the set-up each ran at a division per row or site).
constexpr std::size_t periodic_up(std::size_t c, std::size_t side) noexcept { return c + 1 == side ? 0 : c + 1; }
constexpr std::size_t periodic_down(std::size_t c, std::size_t side) noexcept { return (c == 0 ? side : c) - 1; }

// Site coordinates walked in site order (x fastest).
struct LatticeWalk {
  std::size_t side, x = 0, y = 0, z = 0;
  explicit LatticeWalk(std::size_t s) noexcept : side(s) {}
  void next() noexcept {
    if (++x != side) return;
    x = 0;
    if (++y != side) return;
    y = 0;
    ++z;
  }
  std::size_t up(std::size_t c) const noexcept { return periodic_up(c, side); }
  std::size_t down(std::size_t c) const noexcept { return periodic_down(c, side); }
};

template <class Model>
BitLattice bit_lattice_of(const Model& m) {
  using index_type = typename Model::index_type;
  using value_type = typename Model::value_type;
  const std::size_t n = m.num_spins();
  for (int dims = 3; dims >= 2; --dims) {
    std::size_t side = 4;
    while ((dims == 3 ? side * side * side : side * side) < n) side += 2;
    if ((dims == 3 ? side * side * side : side * side) != n) continue;
    bool ok = true;
    const std::size_t layer = side * side;
    LatticeWalk at(side);
    for (std::size_t i = 0; i < n && ok; ++i, at.next()) {
      const auto ii = static_cast<index_type>(i);
      if (m.site_term(ii) != value_type{0}) {
        ok = false;
        break;
      }
      const std::size_t x = at.x, y = at.y, z = at.z;
      const std::size_t base_y = i - x, base_z = i - y * side;
      const std::size_t want[6] = {base_y + at.up(x),
                                   base_y + at.down(x),
                                   base_z + at.up(y) * side,
                                   base_z + at.down(y) * side,
                                   i - z * layer + at.up(z) * layer,
                                   i - z * layer + at.down(z) * layer};
      unsigned found = 0;
      m.for_each_neighbour(ii, [&](index_type j, value_type v) {
        if (j == ii || v == value_type{0}) return;
        unsigned hit = 0;
        for (int d = 0; d < 2 * dims; ++d)
          if (want[d] == static_cast<std::size_t>(j)) hit |= 1u << d;
        if (hit == 0 || (found & hit) != 0) ok = false;
        found |= hit;
      });
      if (found != (1u << (2 * dims)) - 1) ok = false;
    }
    if (ok) return BitLattice{side, dims};
  }
  return BitLattice{};
}

}  // namespace detail

/// The restart index r of Xoshiro256::for_restart(seed, r) that drives 64-bit word `word` of a
/// bit-sliced run (its restarts 64 word .. 64 word + 63): 2^63 + word.
constexpr std::uint64_t bit_sliced_stream(std::uint64_t word) noexcept { return (std::uint64_t{1} << 63) | word; }

// The bit-sliced annealer over 64 * Words restarts side by side: those of the 64-bit words
// first_word .. first_word + Words - 1 (restart 64 v + b is bit b of word v). Word v draws from
// Xoshiro256::for_restart(seed, bit_sliced_stream(v)) only (shared draws: one number per site
// of degree >= 1; independent bits: only while it has undecided bits), so a restart's run does not depend on Words or
// on how words are spread over threads. Sweep k of a schedule of S sweeps uses beta(k / (S - 1)) (negative beta counts
// as 0).
template <class Model, std::size_t Words = 1>
class BitSlicedAnnealer : public detail::Drive<BitSlicedAnnealer<Model, Words>> {
  static_assert(Words >= 1 && Words <= 16, "Words is the number of 64-bit words per site (1 to 16)");

 public:
  using model_type = Model;
  using energy_type = typename Model::energy_type;
  using value_type = typename Model::value_type;
  using index_type = typename Model::index_type;
  static constexpr std::size_t words = Words;
  static constexpr std::size_t restarts_per_group = 64 * Words;

  template <class... Args>
  BitSlicedAnnealer(const Model&&, Args&&...) = delete;

#if !SPINWRIGHT_NO_HEAP
  /// Restarts 64 first_word ... 64 (first_word + Words) - 1 of a run seeded with `seed`. Allocates on the heap.
  /// A model that bit_sliced_fits refuses leaves the kernel not valid() (status() says why).
  BitSlicedAnnealer(const Model& model, const BitSlicedParams& params, std::uint64_t seed, std::uint64_t first_word = 0)
      : model_(&model),
        params_(params),
        status_(bit_sliced_fits(model)),
        row_(status_.ok() ? model.num_spins() + 1 : 0, 0),
        slots_(status_.ok() ? count_slots(model) : 0, 0),
        spins_(status_.ok() ? (model.num_spins() + 1) * Words : 0, 0),
        best_(status_.ok() ? model.num_spins() * Words : 0, 0),
        lane_spins_(status_.ok() ? model.num_spins() : 0, 1),
        best_unsat_(status_.ok() ? restarts_per_group : 0, 0),
        lattice_(lattice_for(model, params, status_)),
        board_(board_words(lattice_), 0),
        block_streams_(lattice_.dims != 0 ? Words * lattice_.side : 0) {
    if (valid()) init(seed, first_word);
  }
#endif

  /// The same with the workspace carved from a caller's arena; check valid().
  BitSlicedAnnealer(const Model& model, const BitSlicedParams& params, Arena& arena, std::uint64_t seed,
                    std::uint64_t first_word = 0)
      : model_(&model),
        params_(params),
        status_(bit_sliced_fits(model)),
        row_(status_.ok() ? model.num_spins() + 1 : 0, arena, 0),
        slots_(status_.ok() ? count_slots(model) : 0, arena, 0),
        spins_(status_.ok() ? (model.num_spins() + 1) * Words : 0, arena, 0),
        best_(status_.ok() ? model.num_spins() * Words : 0, arena, 0),
        lane_spins_(status_.ok() ? model.num_spins() : 0, arena, 1),
        best_unsat_(status_.ok() ? restarts_per_group : 0, arena, 0),
        lattice_(lattice_for(model, params, status_)),
        board_(board_words(lattice_), arena, 0),
        block_streams_(lattice_.dims != 0 ? Words * lattice_.side : 0, arena) {
    if (valid()) init(seed, first_word);
  }

  /// Arena bytes the arena constructor needs.
  static std::size_t bytes_needed(const Model& model, const BitSlicedParams& params) {
    const std::size_t n = model.num_spins();
    return arena_bytes<std::uint32_t>(n + 1) + arena_bytes<std::uint32_t>(count_slots(model)) +
           arena_bytes<std::uint64_t>((n + 1) * Words) + arena_bytes<std::uint64_t>(n * Words) +
           arena_bytes<std::int8_t>(n) + arena_bytes<std::int64_t>(restarts_per_group) +
           arena_bytes<std::uint64_t>(board_words(lattice_for(model, params, bit_sliced_fits(model)))) +
           arena_bytes<detail::StreamSet<8>>(lattice_for(model, params, bit_sliced_fits(model)).dims != 0
                                                 ? Words * lattice_for(model, params, bit_sliced_fits(model)).side
                                                 : 0);
  }

  /// False when the model does not qualify (status()) or an arena was too small.
  bool valid() const noexcept {
    return status_.ok() && row_.valid() && slots_.valid() && spins_.valid() && best_.valid() && lane_spins_.valid() &&
           best_unsat_.valid() && board_.valid() && block_streams_.valid();
  }

  /// Whether sweeps run by sublattice (BitSlicedParams::checkerboard, shared draws, a periodic
  /// lattice of even side); the unit they run on, and a way to pick another (false, and no
  /// change, when this CPU or build lacks it). Every unit gives the same answer.
  bool checkerboard() const noexcept { return lattice_.dims != 0 && params_.shared_draws; }
  BitSlicedUnit unit() const noexcept { return unit_; }
  /// Share each half-sweep of the checkerboard with a team (nullptr: none); the answer is the
  /// same with any team. The team must outlive the sweeps it is used for.
  void set_team(BitSlicedTeam* team) noexcept { team_ = team; }
  bool set_unit(BitSlicedUnit unit) noexcept {
    const BitSlicedUnit best = bit_sliced_best_unit();
    if (static_cast<int>(unit) > static_cast<int>(best)) return false;
    unit_ = unit;
    return true;
  }
  /// Why the model does not qualify (bit_sliced_fits), or success.
  const Status& status() const noexcept { return status_; }

  /// New streams for the words from `first_word`, random spins in every restart; counters and bests cleared.
  void reset(std::uint64_t seed, std::uint64_t first_word = 0) {
    if (!valid()) return;
    seed_streams(seed, first_word);
    const std::size_t n = model_->num_spins();
    std::uint64_t all[Words];
    for (std::size_t w = 0; w < Words; ++w) all[w] = 1;
    for (std::size_t i = 0; i < n; ++i) streams_.next(spins_.data() + i * Words, all);
    start();
  }

  /// Every restart of the group starts from the given spins (+1/-1, n of them).
  void warm_start(const std::int8_t* spins, std::uint64_t seed, std::uint64_t first_word = 0) {
    if (!valid()) return;
    seed_streams(seed, first_word);
    const std::size_t n = model_->num_spins();
    for (std::size_t i = 0; i < n; ++i)
      for (std::size_t w = 0; w < Words; ++w) spins_[i * Words + w] = spins[i] < 0 ? ~std::uint64_t{0} : 0;
    start();
  }

  /// Restarts in the group, and the index (seed, r) of the first of them.
  std::size_t restarts() const noexcept { return restarts_per_group; }
  std::uint64_t first_restart() const noexcept { return 64 * first_word_; }

  /// Best energy restart k (0 .. restarts() - 1) of the group has reached at a sweep end.
  energy_type best_energy(std::size_t k) const noexcept {
    track();
    return energy_of_unsat(best_unsat_[k]);
  }
  /// Its best spins (+1/-1) into out[0 .. n - 1].
  void best_spins(std::size_t k, std::int8_t* out) const noexcept {
    track();
    copy_best(k, out);
  }
  /// The restarts of word w (bit k: restart 64 w + k) whose best state has a single flip that
  /// lowers its energy: a descent from it would move. A clear bit is a local minimum of single
  /// flips, on which a steepest descent makes its one pass of N attempts and stops; this
  /// check does that pass for the 64 restarts at once, counting each spin's unsatisfied bonds
  /// with bitwise adders (O(bonds) word operations). No allocation. On the checkerboard it
  /// unpacks the board's best words into scratch storage: one call at a time per kernel.
  std::uint64_t improvable_best(std::size_t w) const noexcept {
    if (!valid() || w >= Words) return 0;
    track();
    const std::size_t n = model_->num_spins();
    if (lattice_.dims != 0) {
      // The best words live on the board: bring word w's into best_ (unused by that layout).
      const std::size_t plane = lattice_.plane(), side = lattice_.side, stride = lattice_.stride();
      const std::uint64_t* from = board_.data() + 2 * Words * plane + 2 * w * plane;
      for (std::size_t r = 0, i = 0; r < n / side; ++r) {
        const std::size_t parity = (r + r / side) & 1u;
        const std::uint64_t* row = from + r * stride + 1;
        for (std::size_t x = 0; x < side; ++x, ++i) best_[i * Words + w] = row[((x + parity) & 1u) * plane + x / 2];
      }
    }
    std::uint64_t improvable = 0;
    for (std::size_t i = 0; i < n; ++i) {
      const std::uint64_t own = best_[i * Words + w];
      std::uint64_t count[5] = {0, 0, 0, 0, 0};  // degree <= 15, plus a field: at most 16 bonds
      for (std::uint32_t t = row_[i]; t < row_[i + 1]; ++t) {
        const std::uint32_t slot = slots_[t];
        const std::size_t j = slot & ~antiparallel_flag;
        const std::uint64_t other = j == n ? 0 : best_[j * Words + w];  // site n: the field's +1
        std::uint64_t carry = own ^ other ^ ((slot & antiparallel_flag) ? ~std::uint64_t{0} : 0);  // unsatisfied
        for (std::uint64_t& plane : count) {
          const std::uint64_t next = plane & carry;
          plane ^= carry;
          carry = next;
        }
      }
      // With k of D bonds unsatisfied the flip changes the energy by 2 J (D - 2 k): it lowers
      // the energy where k >= D / 2 + 1 (the lanes whose count is at least that).
      const std::uint32_t least = (row_[i + 1] - row_[i]) / 2 + 1;
      std::uint64_t above = 0, equal = ~std::uint64_t{0};
      for (int b = 4; b >= 0; --b) {
        const std::uint64_t plane = count[b];
        if ((least >> b) & 1u) {
          equal &= plane;
        } else {
          above |= equal & plane;
          equal &= ~plane;
        }
      }
      improvable |= above | equal;
    }
    return improvable;
  }
  /// The current energy of every restart of the group into out[0 .. restarts() - 1] (counts
  /// the unsatisfied bonds: O(bonds) word operations).
  void current_energies(energy_type* out) const noexcept {
    std::int64_t unsat[restarts_per_group];
    count_unsatisfied(unsat);
    for (std::size_t k = 0; k < restarts_per_group; ++k) out[k] = energy_of_unsat(unsat[k]);
  }
  /// Its current spins (+1/-1) into out[0 .. n - 1].
  void current_spins(std::size_t k, std::int8_t* out) const noexcept {
    sync();
    copy_lane(spins_.data(), k, out);
  }

  /// The best restart of the group (lowest energy, ties to the lowest k) as a BestView; the
  /// spins are unpacked into the kernel's own buffer, valid until the next call or sweep.
  BestView<energy_type> best() const noexcept {
    track();
    const std::size_t k = best_lane();
    if (valid()) copy_best(k, lane_spins_.data());
    return {lane_spins_.data(), lane_spins_.size(), valid() ? best_energy(k) : energy_type{}, best_sweep_};
  }
  std::size_t best_restart() const noexcept {
    track();
    return best_lane();
  }

#if !SPINWRIGHT_NO_HEAP
  /// The best restart as a Solution (its energy from the counted unsatisfied bonds, which is
  /// the model's energy of its spins: J (2 unsatisfied - bonds) + offset).
  Solution<energy_type> solution() const { return solution_of(best_lane()); }
  /// Restart k of the group as a Solution; restart = first_restart() + k. With_spins false:
  /// everything but the spins (left empty), for a caller that needs only energies and counters.
  Solution<energy_type> solution_of(std::size_t k, bool with_spins = true) const {
    Solution<energy_type> s;
    if (!valid()) return s;
    track();
    if (with_spins) {
      s.spins.assign(model_->num_spins(), 1);
      copy_best(k, s.spins.data());
    }
    s.energy = energy_of_unsat(best_unsat_[k]);
    s.sweeps = sweeps_;
    s.attempted = sweeps_ * model_->num_spins();
    s.accepted = 0;  // not counted per restart (accepted() counts the whole group)
    s.restart = first_restart() + k;
    return s;
  }
  std::vector<Solution<energy_type>> solutions() const {
    std::vector<Solution<energy_type>> all;
    for (std::size_t k = 0; k < restarts_per_group; ++k) all.push_back(solution_of(k));
    return all;
  }
#endif

  const Model& model() const noexcept { return *model_; }
  std::uint64_t sweeps_done() const noexcept { return sweeps_; }
  /// Flip attempts of all restarts of the group together, and the accepted ones.
  std::uint64_t attempted() const noexcept { return sweeps_ * model_->num_spins() * restarts_per_group; }
  std::uint64_t accepted() const noexcept {
    std::uint64_t a = 0;
    for (std::size_t w = 0; w < Words; ++w) a += accepted_lane_[w];
    return a;
  }
  double beta() const noexcept { return beta_at_sweep(sweeps_); }
  const Schedule& schedule() const noexcept { return schedule_; }
  const BetaSpan& beta_span() const noexcept { return range_; }
  void set_schedule_sweeps(std::uint64_t s) noexcept { schedule_sweeps_ = s; }

  std::uint64_t default_sweeps() const noexcept { return params_.sweeps; }
  std::uint64_t progress_every() const noexcept { return params_.progress_every; }
  /// The best energy as of the last sweep at which energies were counted (best_every).
  double best_for_target() const noexcept {
    return valid() ? static_cast<double>(energy_of_unsat(best_unsat_[best_lane()])) : 0.0;
  }

 private:
  friend class detail::Drive<BitSlicedAnnealer>;

  static constexpr std::uint32_t antiparallel_flag = std::uint32_t{1} << 31;

  static std::size_t count_slots(const Model& model) {
    std::size_t total = 0;
    const std::size_t n = model.num_spins();
    for (std::size_t i = 0; i < n; ++i) {
      const auto ii = static_cast<index_type>(i);
      if (model.site_term(ii) != value_type{0}) ++total;
      model.for_each_neighbour(ii, [&](index_type j, value_type v) { total += (j != ii && v != value_type{0}); });
    }
    return total;
  }

  void begin_advance(std::uint64_t limit) noexcept {
    schedule_sweeps_ = limit;
    time_fraction_ = 0;
  }
  void before_sweep(double time_fraction) noexcept { time_fraction_ = time_fraction; }
  bool settled() const noexcept { return !valid(); }

  // Compressed rows of the model: neighbour j with the flag set where J_ij > 0 (a bond is
  // unsatisfied when J s_i s_j > 0, i.e. bits equal for J > 0, different for J < 0); a field
  // is a bond to the extra site n, whose bits stay 0 (spin +1).
  void init(std::uint64_t seed, std::uint64_t first_word) {
    const Model& m = *model_;
    const std::size_t n = m.num_spins();
    std::size_t k = 0;
    bonds_ = 0;
    magnitude_ = 0;
    for (std::size_t i = 0; i < n; ++i) {
      const auto ii = static_cast<index_type>(i);
      row_[i] = static_cast<std::uint32_t>(k);
      m.for_each_neighbour(ii, [&](index_type j, value_type v) {
        if (j == ii || v == value_type{0}) return;
        slots_[k++] = static_cast<std::uint32_t>(j) | (v > value_type{0} ? antiparallel_flag : 0u);
        if (static_cast<std::size_t>(j) > i) ++bonds_;
        if (magnitude_ == 0) magnitude_ = static_cast<energy_type>(v < value_type{0} ? value_type(-v) : v);
      });
      const value_type h = m.site_term(ii);
      if (h != value_type{0}) {
        slots_[k++] = static_cast<std::uint32_t>(n) | (h > value_type{0} ? antiparallel_flag : 0u);
        ++bonds_;
        if (magnitude_ == 0) magnitude_ = static_cast<energy_type>(h < value_type{0} ? value_type(-h) : h);
      }
    }
    row_[n] = static_cast<std::uint32_t>(k);
    unit_ = bit_sliced_best_unit();
    if (lattice_.dims != 0) load_bonds();
    planes_ = 1;
    while (planes_ < 40 && (std::int64_t{1} << planes_) <= bonds_) ++planes_;
    schedule_sweeps_ = params_.sweeps;
    schedule_ = params_.schedule;
    if (schedule_.automatic()) {
      range_ = estimate_beta_span(m);
      schedule_.beta_start = range_.beta_start;
      schedule_.beta_end = range_.beta_end;
    } else {
      range_.beta_start = schedule_.beta_start;
      range_.beta_end = schedule_.beta_end;
    }
    if (params_.initial != nullptr) {
      warm_start(params_.initial, seed, first_word);
    } else {
      reset(seed, first_word);
    }
  }

  void seed_streams(std::uint64_t seed, std::uint64_t first_word) noexcept {
    first_word_ = first_word;
    for (std::size_t w = 0; w < Words; ++w) {
      streams_.seed_lane(w, seed, bit_sliced_stream(first_word + w));
      if (lattice_.dims != 0) {
        for (std::size_t b = 0; b < lattice_.side; ++b) {
          for (std::size_t g = 0; g < 8; ++g) {
            block_streams_[w * lattice_.side + b].seed_lane(g, seed, bit_sliced_site_stream(first_word + w, b, g));
          }
        }
      }
    }
  }

  void start() {
    const std::size_t n = model_->num_spins();
    for (std::size_t w = 0; w < Words; ++w) spins_[n * Words + w] = 0;
    for (std::size_t w = 0; w < Words; ++w) accepted_lane_[w] = 0;
    for (std::size_t k = 0; k < n * Words; ++k) best_[k] = spins_[k];
    stale_ = false;
    if (lattice_.dims != 0) {
      load_board();
      const std::size_t half = 2 * Words * lattice_.plane();
      for (std::size_t k = 0; k < half; ++k) board_[half + k] = board_[k];
    }
    std::int64_t unsat[restarts_per_group];
    count_unsatisfied(unsat);
    for (std::size_t k = 0; k < restarts_per_group; ++k) best_unsat_[k] = unsat[k];
    sweeps_ = 0;
    tracked_at_ = 0;
    best_sweep_ = 0;
    time_fraction_ = 0;
  }

  energy_type energy_of_unsat(std::int64_t unsat) const noexcept {
    return magnitude_ * static_cast<energy_type>(2 * unsat - bonds_) + model_->offset();
  }

  std::size_t best_lane() const noexcept {
    std::size_t k = 0;
    for (std::size_t q = 1; q < best_unsat_.size(); ++q)
      if (best_unsat_[q] < best_unsat_[k]) k = q;
    return k;
  }

  // Restart k's best spins: from the best words of the board when sweeps run by sublattice.
  void copy_best(std::size_t k, std::int8_t* out) const noexcept {
    if (lattice_.dims == 0) {
      copy_lane(best_.data(), k, out);
      return;
    }
    const std::size_t n = model_->num_spins(), plane = lattice_.plane();
    const std::size_t w = k / 64;
    const unsigned bit = static_cast<unsigned>(k % 64);
    const std::uint64_t* best = board_.data() + 2 * Words * plane + 2 * w * plane;
    const std::size_t side = lattice_.side, stride = lattice_.stride(), rows = n / side;
    for (std::size_t r = 0; r < rows; ++r) {  // r = z side + y: site r side + x
      const std::size_t parity = (r + r / side) & 1u;  // (y + z) & 1
      const std::uint64_t* row = best + r * stride + 1;
      std::int8_t* o = out + r * side;
      for (std::size_t x = 0; x < side; ++x) {
        const std::size_t colour = (x + parity) & 1u;
        o[x] = static_cast<std::int8_t>(1 - 2 * static_cast<int>((row[colour * plane + x / 2] >> bit) & 1u));
      }
    }
  }

  void copy_lane(const std::uint64_t* packed, std::size_t k, std::int8_t* out) const noexcept {
    const std::size_t n = model_->num_spins();
    const std::size_t w = k / 64;
    const unsigned bit = static_cast<unsigned>(k % 64);
    for (std::size_t i = 0; i < n; ++i)
      out[i] = static_cast<std::int8_t>(1 - 2 * static_cast<int>((packed[i * Words + w] >> bit) & 1u));
  }

  double beta_at_sweep(std::uint64_t k) const noexcept {
    const double f = schedule_sweeps_ > 1 ? static_cast<double>(k) / static_cast<double>(schedule_sweeps_ - 1) : 1.0;
    const double b = schedule_.beta_at(f > time_fraction_ ? f : time_fraction_);
    return b > 0 ? b : 0.0;
  }

  // Unsatisfied bonds of every restart: the bonds' words are counted 15 at a time by the
  // bitwise adders into 4 planes, which are added into a counter of `planes_` planes per word.
  void count_unsatisfied(std::int64_t* unsat) const noexcept {
    if (lattice_.dims != 0) {
      count_board_all(unsat);
      return;
    }
    const std::size_t n = model_->num_spins();
    std::uint64_t total[Words][40] = {};
    std::uint64_t batch[Words][15];
    int fill = 0;
    auto flush = [&]() {
      for (std::size_t w = 0; w < Words; ++w) {
        for (int t = fill; t < 15; ++t) batch[w][t] = 0;
        std::uint64_t four[4];
        detail::count_bits<15>(batch[w], four);
        std::uint64_t carry = 0;
        for (int p = 0; p < planes_; ++p) {
          const std::uint64_t x = p < 4 ? four[p] : 0;
          if (p >= 4 && carry == 0) break;
          const std::uint64_t t = total[w][p];
          total[w][p] = t ^ x ^ carry;
          carry = (t & x) | (carry & (t ^ x));
        }
      }
      fill = 0;
    };
    const std::uint64_t* s = spins_.data();
    for (std::size_t i = 0; i < n; ++i) {
      for (std::uint32_t t = row_[i]; t < row_[i + 1]; ++t) {
        const std::uint32_t slot = slots_[t];
        const std::size_t j = slot & ~antiparallel_flag;
        if (j < i) continue;
        const std::uint64_t flip = (slot & antiparallel_flag) ? ~std::uint64_t{0} : 0;
        for (std::size_t w = 0; w < Words; ++w) batch[w][fill] = s[i * Words + w] ^ s[j * Words + w] ^ flip;
        if (++fill == 15) flush();
      }
    }
    if (fill > 0) flush();
    for (std::size_t w = 0; w < Words; ++w) {
      for (unsigned b = 0; b < 64; ++b) {
        std::int64_t c = 0;
        for (int p = 0; p < planes_; ++p) c |= static_cast<std::int64_t>((total[w][p] >> b) & 1u) << p;
        unsat[w * 64 + b] = c;
      }
    }
  }

  // Bits set with probability p each, independently, among the bits of `undecided`: the bits
  // of a uniform u are drawn from the highest down and compared with p's, until every bit is
  // decided (u < p: set). Stream w draws only while word w has undecided bits.
  SPINWRIGHT_BIT_INLINE static void draw_mask(detail::StreamSet<Words>& streams, std::uint64_t* undecided,
                                              const detail::FixedProbability& p, std::uint64_t* out) noexcept {
    for (std::size_t w = 0; w < Words; ++w) out[w] = 0;
    if (p.one) {
      for (std::size_t w = 0; w < Words; ++w) out[w] = undecided[w];
      return;
    }
    if (p.threshold == 0) return;
    for (int j = 63; j >= 0; --j) {
      std::uint64_t any = 0;
      for (std::size_t w = 0; w < Words; ++w) any |= undecided[w];
      if (any == 0) return;
      const std::uint64_t digit = ((p.threshold >> j) & 1u) ? ~std::uint64_t{0} : 0;
      std::uint64_t r[Words];
      streams.next(r, undecided);
      for (std::size_t w = 0; w < Words; ++w) {
        out[w] |= undecided[w] & ~r[w] & digit;
        undecided[w] &= ~(r[w] ^ digit);
      }
    }
  }

  // One Metropolis update of site i (D neighbours) in every restart. With k of the D bonds
  // unsatisfied, the flip changes the energy by 2 J (D - 2 k): accepted outright for
  // k > kmax = (D - 1) / 2, otherwise with probability base * step^(kmax - k), base =
  // exp(-2 beta J (D - 2 kmax)) and step = exp(-4 beta J): one trial of `base`, then one of
  // `step` for each further level, each trial only for the bits still in the running.
  template <int D>
  SPINWRIGHT_BIT_INLINE void update_site(std::size_t i, detail::StreamSet<Words>& streams) noexcept {
    std::uint64_t* s = spins_.data();
    const std::uint32_t* slot = slots_.data() + row_[i];
    std::uint64_t x[Words];
    for (std::size_t w = 0; w < Words; ++w) x[w] = s[i * Words + w];
    std::uint64_t in[Words][static_cast<std::size_t>(D > 0 ? D : 1)];
    for (int t = 0; t < D; ++t) {
      const std::size_t j = slot[t] & ~antiparallel_flag;
      const std::uint64_t flip = (slot[t] & antiparallel_flag) ? ~std::uint64_t{0} : 0;
      for (std::size_t w = 0; w < Words; ++w) in[w][t] = s[j * Words + w] ^ x[w] ^ flip;
    }
    std::uint64_t accept[Words];
    if constexpr (D == 0) {
      for (std::size_t w = 0; w < Words; ++w) accept[w] = ~std::uint64_t{0};
    } else {
      constexpr int planes = detail::count_planes(D);
      constexpr unsigned kmax = (D - 1) / 2;
      std::uint64_t count[Words][static_cast<std::size_t>(planes)];
      std::uint64_t running[Words];
      std::uint64_t even[Words];  // k = D / 2: the flip leaves the energy unchanged
      for (std::size_t w = 0; w < Words; ++w) {
        detail::count_bits<D>(in[w], count[w]);
        running[w] = detail::at_most<planes>(count[w], kmax);
        accept[w] = ~running[w];
        even[w] = D % 2 == 0 ? accept[w] & detail::at_most<planes>(count[w], kmax + 1) : 0;
      }
      if constexpr (D % 2 == 0) {
        // Unchanged energy: accepted with probability 1/2 (one coin per bit), which keeps
        // detailed balance and breaks the deterministic cycles a sequential sweep can fall
        // into when every flip it meets leaves the energy unchanged (a 4 x 4 torus does).
        std::uint64_t any = 0;
        for (std::size_t w = 0; w < Words; ++w) any |= even[w];
        if (any != 0) {
          std::uint64_t coin[Words];
          streams.next(coin, even);  // moves only the streams whose word has such bits
          for (std::size_t w = 0; w < Words; ++w) accept[w] &= ~(even[w] & coin[w]);
        }
      }
      std::uint64_t won[Words];
      draw_mask(streams, running, base_[D], won);
      for (unsigned level = 1; level <= kmax; ++level) {
        std::uint64_t any = 0;
        for (std::size_t w = 0; w < Words; ++w) {
          const std::uint64_t more = detail::at_most<planes>(count[w], kmax - level);
          accept[w] |= won[w] & ~more;
          running[w] = won[w] & more;
          any |= running[w];
        }
        if (any == 0) {
          for (std::size_t w = 0; w < Words; ++w) won[w] = 0;
          break;
        }
        draw_mask(streams, running, step_, won);
      }
      for (std::size_t w = 0; w < Words; ++w) accept[w] |= won[w];
    }
    for (std::size_t w = 0; w < Words; ++w) {
      s[i * Words + w] = x[w] ^ accept[w];
      accepted_lane_[w] += popcount(accept[w]);
    }
  }

  // The same update with one uniform u per word shared by its 64 restarts. A bit with k
  // unsatisfied bonds, k <= kmax, is flipped when u / 2 < threshold(D - 2 k), 2^63 exp(-2 beta
  // J (D - 2 k)); those thresholds grow with k, so the flipped bits are those with k >= kstar,
  // kstar = the number of levels whose threshold u / 2 reaches (one scalar per word, turned
  // into bit planes and compared with the counts by detail::below). A bit with k = D / 2 (no
  // change) is flipped when u's top bit is 0. Each bit is in one class, so each restart's chain
  // is exact Metropolis (with the coin); restarts of a word share u and so are correlated.
  template <int D>
  SPINWRIGHT_BIT_INLINE void update_site_shared(std::size_t i, detail::StreamSet<Words>& streams,
                                                detail::Lanes<Words>& flips) noexcept {
    using L = detail::Lanes<Words>;
    std::uint64_t* s = spins_.data();
    const std::uint32_t* slot = slots_.data() + row_[i];
    L x;
    for (std::size_t w = 0; w < Words; ++w) x.v[w] = s[i * Words + w];
    L accept = L::all(~std::uint64_t{0});
    if constexpr (D > 0) {
      L in[static_cast<std::size_t>(D)];
      for (int t = 0; t < D; ++t) {
        const std::uint64_t* nb = s + (slot[t] & ~antiparallel_flag) * Words;
        const std::uint64_t flip = (slot[t] & antiparallel_flag) ? ~std::uint64_t{0} : 0;
        for (std::size_t w = 0; w < Words; ++w) in[t].v[w] = nb[w] ^ x.v[w] ^ flip;
      }
      constexpr int planes = detail::count_planes(D);
      constexpr int kmax = (D - 1) / 2;
      L count[static_cast<std::size_t>(planes)];
      detail::count_bits<D>(in, count);
      std::uint64_t u[Words];
      streams.next_all(u);
      std::uint64_t kstar[Words];
      for (std::size_t w = 0; w < Words; ++w) {
        const std::uint64_t half = u[w] >> 1;
        std::uint64_t k = 0;
        for (int level = 0; level <= kmax; ++level) k += half >= threshold_[D - 2 * level] ? 1u : 0u;
        kstar[w] = k;
      }
      L limit[static_cast<std::size_t>(planes)];
      for (int p = 0; p < planes; ++p)
        for (std::size_t w = 0; w < Words; ++w) limit[p].v[w] = std::uint64_t{0} - ((kstar[w] >> p) & 1u);
      accept = ~detail::below<planes>(count, limit);
      if constexpr (D % 2 == 0) {
        const L even = detail::at_most<planes>(count, D / 2) & ~detail::at_most<planes>(count, D / 2 - 1);
        L tails;
        for (std::size_t w = 0; w < Words; ++w) tails.v[w] = std::uint64_t{0} - (u[w] >> 63);
        accept &= ~(even & tails);
      }
    }
    for (std::size_t w = 0; w < Words; ++w) {
      s[i * Words + w] = x.v[w] ^ accept.v[w];
      flips.v[w] += byte_counts(accept.v[w]);
    }
  }

  SPINWRIGHT_BIT_INLINE static detail::Lanes<8> load8(const std::uint64_t* p) noexcept {
    detail::Lanes<8> r;
    for (std::size_t j = 0; j < 8; ++j) r.v[j] = p[j];
    return r;
  }
  static detail::BitLattice lattice_for(const Model& model, const BitSlicedParams& params, const Status& fits) {
    if (!fits.ok() || !params.checkerboard || !params.shared_draws) return detail::BitLattice{};
    return detail::bit_lattice_of(model);
  }
  static std::size_t board_words(const detail::BitLattice& l) noexcept {
    return l.dims == 0 ? 0 : (4 * Words + 2) * l.plane();
  }
  // Where site i sits on the board: its colour and its offset within the colour's plane.
  void board_place(const detail::LatticeWalk& c, std::size_t& colour, std::size_t& at) const noexcept {
    colour = (c.x + c.y + c.z) & 1u;
    at = (c.z * lattice_.side + c.y) * lattice_.stride() + 1 + c.x / 2;
  }
  // The ghost words of every row of one colour plane: the row's last site before its first,
  // its first after its last.
  void refresh_ghosts(std::uint64_t* plane) const noexcept {
    const std::size_t rows = lattice_.rows(), stride = lattice_.stride(), half = lattice_.half();
    for (std::size_t r = 0; r < rows; ++r) {
      std::uint64_t* row = plane + r * stride;
      row[0] = row[half];
      row[half + 1] = row[1];
    }
  }
  // The bond signs: one word per site at the site's board offset in its colour's plane, bit d
  // set where the bond to neighbour d (+x, -x, +y, -y, +z, -z) has J > 0 (a word, not a byte:
  // the loops over eight sites then hold one type, which the vectoriser needs).
  const std::uint64_t* bond_bits() const noexcept { return board_.data() + 4 * Words * lattice_.plane(); }
  void load_bonds() noexcept {
    const Model& m = *model_;
    const std::size_t n = m.num_spins(), side = lattice_.side, plane = lattice_.plane();
    const std::size_t layer = side * side;
    std::uint64_t* bits = board_.data() + 4 * Words * plane;
    detail::LatticeWalk c(side);
    for (std::size_t i = 0; i < n; ++i, c.next()) {
      const std::size_t x = c.x, y = c.y, z = c.z;
      const std::size_t base_y = i - x, base_z = i - y * side, base = i - z * layer;
      const std::size_t want[6] = {base_y + c.up(x),          base_y + c.down(x),
                                   base_z + c.up(y) * side, base_z + c.down(y) * side,
                                   base + c.up(z) * layer,  base + c.down(z) * layer};
      std::size_t colour = 0, at = 0;
      board_place(c, colour, at);
      std::uint64_t b = 0;
      m.for_each_neighbour(static_cast<index_type>(i), [&](index_type j, value_type v) {
        for (int d = 0; d < 2 * lattice_.dims; ++d) {
          if (static_cast<std::size_t>(j) == want[d] && v > value_type{0}) b |= std::uint64_t{1} << d;
        }
      });
      bits[colour * plane + at] = b;
    }
  }
  // spins_ -> board_ (after a reset or warm start).
  void load_board() noexcept {
    const std::size_t n = model_->num_spins(), plane = lattice_.plane();
    detail::LatticeWalk c(lattice_.side);
    for (std::size_t i = 0; i < n; ++i, c.next()) {
      std::size_t colour = 0, at = 0;
      board_place(c, colour, at);
      for (std::size_t w = 0; w < Words; ++w) board_[(2 * w + colour) * plane + at] = spins_[i * Words + w];
    }
    for (std::size_t p = 0; p < 2 * Words; ++p) refresh_ghosts(board_.data() + p * plane);
  }
  // board_ -> spins_, when a sweep by sublattice has left spins_ behind.
  void sync() const noexcept {
    if (!stale_) return;
    stale_ = false;
    const std::size_t n = model_->num_spins(), plane = lattice_.plane();
    detail::LatticeWalk c(lattice_.side);
    for (std::size_t i = 0; i < n; ++i, c.next()) {
      std::size_t colour = 0, at = 0;
      board_place(c, colour, at);
      for (std::size_t w = 0; w < Words; ++w) spins_[i * Words + w] = board_[(2 * w + colour) * plane + at];
    }
  }

  // The count of the board's layers z0 .. z1 - 1 (a cubic lattice; a square one has one) on
  // the chosen unit, into unsat.
  void count_board_on_unit(std::int64_t* unsat, std::size_t z0, std::size_t z1) const noexcept {
    switch (unit_) {
#if SPINWRIGHT_BIT_DISPATCH
      case BitSlicedUnit::avx512:
        count_board_avx512(unsat, z0, z1);
        break;
      case BitSlicedUnit::avx2:
        count_board_avx2(unsat, z0, z1);
        break;
#endif
      default:
        count_board_any(unsat, z0, z1);
        break;
    }
  }
#if SPINWRIGHT_BIT_DISPATCH
  __attribute__((target("avx2"))) void count_board_avx2(std::int64_t* unsat, std::size_t z0,
                                                         std::size_t z1) const noexcept {
    count_board_any(unsat, z0, z1);
  }
  __attribute__((target("avx2,avx512f,avx512bw,avx512vl,avx512dq"))) void count_board_avx512(
      std::int64_t* unsat, std::size_t z0, std::size_t z1) const noexcept {
    count_board_any(unsat, z0, z1);
  }
#endif
  SPINWRIGHT_BIT_INLINE void count_board_any(std::int64_t* unsat, std::size_t z0, std::size_t z1) const noexcept {
    if (lattice_.dims == 3) {
      count_board<6>(unsat, z0, z1);
    } else {
      count_board<4>(unsat, z0, z1);
    }
  }

  // The count over the whole board: a cubic lattice with a team splits its layers among the
  // team's parts (at most count_parts_max), each counting its own; the sums are integers, so
  // the answer is the same.
  static constexpr unsigned count_parts_max = 4;
  void count_board_all(std::int64_t* unsat) const noexcept {
    const std::size_t layers = lattice_.dims == 3 ? lattice_.side : 1;
    const unsigned parts = team_ != nullptr ? team_->parts() : 1;
    if (parts > 1 && layers >= 2) {
      count_on_team(unsat, parts);
    } else {
      count_board_on_unit(unsat, 0, layers);
    }
  }
  struct CountCall {
    const BitSlicedAnnealer* self;
    unsigned used;
    std::int64_t (*partial)[restarts_per_group];
  };
  static void count_work(void* context, unsigned p) noexcept {
    auto* call = static_cast<CountCall*>(context);
    if (p >= call->used) return;
    const std::size_t layers = call->self->lattice_.side;
    call->self->count_board_on_unit(call->partial[p], layers * p / call->used, layers * (p + 1) / call->used);
  }
  // Not inlined: its partial counts (up to 4 x 64 x Words words) stay off the frame of every
  // caller that has no team (firmware builds among them).
#if defined(__GNUC__) || defined(__clang__)
  __attribute__((noinline))
#endif
  void count_on_team(std::int64_t* unsat, unsigned parts) const noexcept {
    const std::size_t layers = lattice_.side;
    unsigned used = parts < count_parts_max ? parts : count_parts_max;
    if (used > layers) used = static_cast<unsigned>(layers);
    std::int64_t partial[count_parts_max][restarts_per_group];
    CountCall call{this, used, partial};
    team_->run(&count_work, &call);
    for (std::size_t k = 0; k < restarts_per_group; ++k) {
      std::int64_t sum = 0;
      for (unsigned p = 0; p < used; ++p) sum += partial[p][k];
      unsat[k] = sum;
    }
  }

  // Unsatisfied bonds of every restart from the board: every bond has one end of colour 0, so
  // the colour-0 sites' bond words, eight sites a step through the same adders, are summed
  // into bitwise counters per step position (8 planes, emptied every 42 steps into wide ones).
  template <int D>
  SPINWRIGHT_BIT_INLINE void count_board(std::int64_t* unsat, std::size_t z0, std::size_t z1) const noexcept {
    const std::size_t side = lattice_.side, half = lattice_.half(), padded = lattice_.padded();
    const std::size_t stride = lattice_.stride(), plane = lattice_.plane();
    const std::uint64_t* board = board_.data();
    const std::uint64_t* bits = bond_bits();
    for (std::size_t w = 0; w < Words; ++w) {
      const std::uint64_t* own = board + 2 * w * plane;
      const std::uint64_t* other = own + plane;
      std::uint64_t near[8 * 8] = {};   // [plane][position]
      std::uint64_t wide[40 * 8] = {};  // [plane][position]
      unsigned pending = 0;
      auto empty = [&]() {
        for (std::size_t j = 0; j < 8; ++j) {
          std::uint64_t carry = 0;
          for (std::size_t p = 0; p < 40; ++p) {
            const std::uint64_t x = p < 8 ? near[p * 8 + j] : 0;
            if (p >= 8 && carry == 0) break;
            const std::uint64_t t = wide[p * 8 + j];
            wide[p * 8 + j] = t ^ x ^ carry;
            carry = (t & x) | (carry & (t ^ x));
          }
        }
        for (std::size_t k = 0; k < 64; ++k) near[k] = 0;
        pending = 0;
      };
      for (std::size_t z = z0; z < z1; ++z) {
        const std::size_t zu = detail::periodic_up(z, side), zd = detail::periodic_down(z, side);
        for (std::size_t y = 0; y < side; ++y) {
          const std::size_t yu = detail::periodic_up(y, side), yd = detail::periodic_down(y, side);
          const std::size_t o = (y + z) & 1u;
          const std::size_t row = (z * side + y) * stride;
          const std::size_t y_down = (z * side + yd) * stride;
          const std::size_t z_down = (zd * side + y) * stride;
          const std::size_t y_up = (z * side + yu) * stride;
          const std::size_t z_up = (zu * side + y) * stride;
          for (std::size_t h = 0; h < padded; h += 8) {
            board_count_step<D>(own + row + 1 + h, other + row + o + 1 + h, other + row + o + h,
                                other + y_up + 1 + h, other + y_down + 1 + h, other + z_up + 1 + h,
                                other + z_down + 1 + h, bits + row + 1 + h, near, half - h);
            if (++pending == 42) empty();
          }
        }
      }
      empty();
      // The eight position counters summed into one (every count is at most the bonds, below
      // 2^planes_, and so is each partial sum), then read out restart by restart.
      const auto used = static_cast<std::size_t>(planes_);
      std::uint64_t total[40] = {};
      for (std::size_t j = 0; j < 8; ++j) {
        std::uint64_t carry = 0;
        for (std::size_t p = 0; p < used; ++p) {
          const std::uint64_t t = total[p], x = wide[p * 8 + j];
          total[p] = t ^ x ^ carry;
          carry = (t & x) | (carry & (t ^ x));
        }
      }
      for (unsigned b = 0; b < 64; ++b) {
        std::int64_t c = 0;
        for (std::size_t p = 0; p < used; ++p) c |= static_cast<std::int64_t>((total[p] >> b) & 1u) << p;
        unsat[w * 64 + b] = c;
      }
    }
  }

  // The count of one step of count_board: the unsatisfied bonds of eight colour-0 sites added
  // into near[plane][j] (sites j >= live are padding and add nothing).
  template <int D>
  SPINWRIGHT_BIT_INLINE static void board_count_step(
      const std::uint64_t* SPINWRIGHT_BIT_RESTRICT s, const std::uint64_t* SPINWRIGHT_BIT_RESTRICT n0,
      const std::uint64_t* SPINWRIGHT_BIT_RESTRICT n1, const std::uint64_t* SPINWRIGHT_BIT_RESTRICT n2,
      const std::uint64_t* SPINWRIGHT_BIT_RESTRICT n3, const std::uint64_t* SPINWRIGHT_BIT_RESTRICT n4,
      const std::uint64_t* SPINWRIGHT_BIT_RESTRICT n5, const std::uint64_t* SPINWRIGHT_BIT_RESTRICT bits,
      std::uint64_t* SPINWRIGHT_BIT_RESTRICT near, std::uint64_t live) noexcept {
    SPINWRIGHT_BIT_LOOP for (std::size_t j = 0; j < 8; ++j) {
      const std::uint64_t x = s[j];
      const std::uint64_t keep = j < live ? ~std::uint64_t{0} : 0;
      std::uint64_t in[static_cast<std::size_t>(D)];
      const std::uint64_t b = bits[j];
      in[0] = (n0[j] ^ sign(b, 0) ^ x) & keep;
      in[1] = (n1[j] ^ sign(b, 1) ^ x) & keep;
      in[2] = (n2[j] ^ sign(b, 2) ^ x) & keep;
      in[3] = (n3[j] ^ sign(b, 3) ^ x) & keep;
      if constexpr (D == 6) {
        in[4] = (n4[j] ^ sign(b, 4) ^ x) & keep;
        in[5] = (n5[j] ^ sign(b, 5) ^ x) & keep;
      }
      std::uint64_t count[3];
      detail::count_bits<D>(in, count);
      // The count added into the eight planes, written out (full adders for its three planes,
      // then the carry alone): as a loop it keeps GCC at -O2 from vectorising over sites.
      std::uint64_t carry = 0;
      auto full = [&](std::size_t p, std::uint64_t x2) {
        const std::uint64_t a = near[p * 8 + j];
        near[p * 8 + j] = a ^ x2 ^ carry;
        carry = (a & x2) | (carry & (a ^ x2));
      };
      auto half_add = [&](std::size_t p) {
        const std::uint64_t a = near[p * 8 + j];
        near[p * 8 + j] = a ^ carry;
        carry &= a;
      };
      full(0, count[0]);
      full(1, count[1]);
      full(2, count[2]);
      half_add(3);
      half_add(4);
      half_add(5);
      half_add(6);
      half_add(7);
    }
  }

  struct TeamCall {
    BitSlicedAnnealer* self;
    std::size_t word, colour;
    unsigned parts;
    std::uint64_t flipped[64];
  };
  static void team_work(void* context, unsigned p) noexcept {
    auto* call = static_cast<TeamCall*>(context);
    const std::size_t blocks = call->self->lattice_.side;
    call->flipped[p] = call->self->sweep_part(call->word, call->colour, blocks * p / call->parts,
                                              blocks * (p + 1) / call->parts);
  }

  void sweep_board() noexcept {
    const std::size_t blocks = lattice_.side;
    unsigned parts = team_ != nullptr ? team_->parts() : 1;
    if (parts > 64) parts = 64;
    if (parts > blocks) parts = static_cast<unsigned>(blocks);
    for (std::size_t w = 0; w < Words; ++w) {
      for (std::size_t c = 0; c < 2; ++c) {
        if (parts > 1 && team_->parts() == parts) {
          TeamCall call{this, w, c, parts, {}};
          team_->run(&team_work, &call);
          for (unsigned p = 0; p < parts; ++p) accepted_lane_[w] += call.flipped[p];
        } else {
          accepted_lane_[w] += sweep_part(w, c, 0, blocks);
        }
      }
    }
    stale_ = true;
  }
  // Blocks b0 .. b1 - 1 of colour c of word w on the chosen unit; the flips made.
  std::uint64_t sweep_part(std::size_t w, std::size_t c, std::size_t b0, std::size_t b1) noexcept {
    switch (unit_) {
#if SPINWRIGHT_BIT_DISPATCH
      case BitSlicedUnit::avx512:
        return sweep_part_avx512(w, c, b0, b1);
      case BitSlicedUnit::avx2:
        return sweep_part_avx2(w, c, b0, b1);
#endif
      default:
        return sweep_part_any(w, c, b0, b1);
    }
  }
#if SPINWRIGHT_BIT_DISPATCH
  __attribute__((target("avx2"))) std::uint64_t sweep_part_avx2(std::size_t w, std::size_t c, std::size_t b0,
                                                                std::size_t b1) noexcept {
    return sweep_part_any(w, c, b0, b1);
  }
  __attribute__((target("avx2,avx512f,avx512bw,avx512vl,avx512dq"))) std::uint64_t sweep_part_avx512(
      std::size_t w, std::size_t c, std::size_t b0, std::size_t b1) noexcept {
    return sweep_part_any(w, c, b0, b1);
  }
#endif
  SPINWRIGHT_BIT_INLINE std::uint64_t sweep_part_any(std::size_t w, std::size_t c, std::size_t b0,
                                                     std::size_t b1) noexcept {
    return lattice_.dims == 3 ? sweep_blocks<6>(w, c, b0, b1) : sweep_blocks<4>(w, c, b0, b1);
  }

  // All ones where bit d of a site's bond byte is set (that bond has J > 0).
  SPINWRIGHT_BIT_INLINE static std::uint64_t sign(std::uint64_t bits, unsigned d) noexcept {
    return std::uint64_t{0} - ((bits >> d) & 1u);
  }

  // Eight sites of one row of one colour: one site per j, plain scalar code over eight sites
  // that the loop vectoriser turns into one (AVX-512) or two (AVX2) vector operations per line
  // (restrict: the spins written, the other colour's spins and the bonds read, the streams and
  // the counters never overlap). Sites j >= live are padding and never flip.
  template <int D>
  SPINWRIGHT_BIT_INLINE static void board_step(
      std::uint64_t* SPINWRIGHT_BIT_RESTRICT s, const std::uint64_t* SPINWRIGHT_BIT_RESTRICT n0,
      const std::uint64_t* SPINWRIGHT_BIT_RESTRICT n1, const std::uint64_t* SPINWRIGHT_BIT_RESTRICT n2,
      const std::uint64_t* SPINWRIGHT_BIT_RESTRICT n3, const std::uint64_t* SPINWRIGHT_BIT_RESTRICT n4,
      const std::uint64_t* SPINWRIGHT_BIT_RESTRICT n5, const std::uint64_t* SPINWRIGHT_BIT_RESTRICT bits,
      std::uint64_t* SPINWRIGHT_BIT_RESTRICT r0,
      std::uint64_t* SPINWRIGHT_BIT_RESTRICT r1, std::uint64_t* SPINWRIGHT_BIT_RESTRICT r2,
      std::uint64_t* SPINWRIGHT_BIT_RESTRICT r3, std::uint64_t* SPINWRIGHT_BIT_RESTRICT flips,
      const std::uint64_t* SPINWRIGHT_BIT_RESTRICT limit, std::uint64_t live) noexcept {
    constexpr std::size_t dims = D / 2;
    SPINWRIGHT_BIT_LOOP for (std::size_t j = 0; j < 8; ++j) {
      const std::uint64_t x = s[j];
      std::uint64_t in[static_cast<std::size_t>(D)];
      const std::uint64_t bb = bits[j];
      in[0] = n0[j] ^ sign(bb, 0) ^ x;
      in[1] = n1[j] ^ sign(bb, 1) ^ x;
      in[2] = n2[j] ^ sign(bb, 2) ^ x;
      in[3] = n3[j] ^ sign(bb, 3) ^ x;
      if constexpr (D == 6) {
        in[4] = n4[j] ^ sign(bb, 4) ^ x;
        in[5] = n5[j] ^ sign(bb, 5) ^ x;
      }
      std::uint64_t count[3];
      detail::count_bits<D>(in, count);
      // Stream j's next uniform (xoshiro256++, as StreamSet::next_all).
      const std::uint64_t a = r0[j], b = r1[j], c = r2[j], d = r3[j];
      const std::uint64_t u = detail::StreamSet<8>::rotl(a + d, 23) + a;
      const std::uint64_t t = b << 17;
      const std::uint64_t c1 = c ^ a;
      const std::uint64_t d1 = d ^ b;
      r0[j] = a ^ d1;
      r1[j] = b ^ c1;
      r2[j] = c1 ^ t;
      r3[j] = detail::StreamSet<8>::rotl(d1, 45);
      // Level masks (u / 2 at or above the level's threshold) and the coin (u's top bit).
      const std::uint64_t hu = u >> 1;
      // Written out, not looped over k: a loop inside this one keeps GCC at -O2 (which does not
      // unroll it completely) from vectorising the loop over sites, four times slower.
      std::uint64_t above[3];
      above[0] = hu >= limit[0] ? ~std::uint64_t{0} : 0;
      above[1] = hu >= limit[1] ? ~std::uint64_t{0} : 0;
      above[2] = D == 6 && hu >= limit[dims - 1] ? ~std::uint64_t{0} : 0;
      const std::uint64_t tails = std::uint64_t{0} - (u >> 63);
      std::uint64_t accept;
      if constexpr (D == 6) {
        // k >= 4 (count[2]); k = 3: coin not tails; k = 2, 1, 0: u / 2 below the level's threshold.
        const std::uint64_t odd = (count[0] & ~tails) | (~count[0] & ~above[2]);   // k = 3 or 2
        const std::uint64_t low = (count[0] & ~above[1]) | (~count[0] & ~above[0]);  // k = 1 or 0
        accept = count[2] | (count[1] & odd) | (~count[1] & low);
      } else {
        // k >= 3; k = 2: coin not tails; k = 1, 0: u / 2 below the level's threshold.
        const std::uint64_t low = (count[0] & ~above[1]) | (~count[0] & ~above[0]);
        accept = count[2] | (count[1] & (count[0] | ~tails)) | (~count[1] & low);
      }
      accept &= j < live ? ~std::uint64_t{0} : 0;
      s[j] = x ^ accept;
      flips[j] += byte_counts(accept);
    }
  }

  // Blocks b0 .. b1 - 1 (z layers of a cubic lattice, rows of a square one) of colour c of word
  // w; a sweep is colour 0 then colour 1, each row of a colour in steps
  // of eight sites (the row padded to a multiple of eight; padding sites are computed and never
  // flipped). Every site of a colour has its 2 dims neighbours in the other colour; the y and z
  // neighbours sit at the same offset in the neighbouring rows, the x neighbours one word left
  // or right depending on the row's parity (the ghost words close the ring). Site h of a step
  // takes the next uniform u of stream h mod 8 of its block (every stream moves once a step) and the rule
  // of update_site_shared: with k of D bonds unsatisfied, flipped for k > D / 2, for k = D / 2
  // when u's top bit is 0, for k < D / 2 when u / 2 < threshold_[D - 2 k].
  template <int D>
  SPINWRIGHT_BIT_INLINE std::uint64_t sweep_blocks(std::size_t w, std::size_t c, std::size_t b0,
                                                   std::size_t b1) noexcept {
    constexpr std::size_t dims = D / 2;
    const std::size_t side = lattice_.side, half = lattice_.half(), padded = lattice_.padded();
    const std::size_t stride = lattice_.stride(), plane = lattice_.plane();
    std::uint64_t* board = board_.data();
    const std::uint64_t* bits = bond_bits();
    std::uint64_t flips[8] = {};
    unsigned pending = 0;
    std::uint64_t flipped = 0;
    // Thresholds of the rises 2 J m for the levels k = 0 .. D / 2 - 1 (m = D - 2 k).
    std::uint64_t limit[dims];
    for (std::size_t k = 0; k < dims; ++k) limit[k] = threshold_[D - 2 * k];
    std::uint64_t* own = board + (2 * w + c) * plane;
    const std::uint64_t* other = board + (2 * w + 1 - c) * plane;
    const std::uint64_t* bits_own = bits + c * plane;
    for (std::size_t b = b0; b < b1; ++b) {
      detail::StreamSet<8> rng = block_streams_[w * side + b];
      // Row r = z side + y; the neighbouring rows by wrapping (a division per neighbour and row
      // cost about a tenth of the sweep).
      const std::size_t z = D == 6 ? b : 0;
      const std::size_t zu = detail::periodic_up(z, side), zd = detail::periodic_down(z, side);
      for (std::size_t y = D == 6 ? 0 : b; y < (D == 6 ? side : b + 1); ++y) {
        const std::size_t r = z * side + y;
        const std::size_t yu = detail::periodic_up(y, side), yd = detail::periodic_down(y, side);
        const std::size_t o = (c + y + z) & 1u;
        const std::size_t row = r * stride;
        const std::size_t y_up = (z * side + yu) * stride;
        const std::size_t y_down = (z * side + yd) * stride;
        const std::size_t z_up = (zu * side + y) * stride;
        const std::size_t z_down = (zd * side + y) * stride;
        std::uint64_t* s = own + row + 1;
        const std::uint64_t* x_up = other + row + o + 1;
        const std::uint64_t* x_down = other + row + o;
        for (std::size_t h = 0; h < padded; h += 8) {
          const std::uint64_t live = half - h;  // sites of this step inside the row (8 or more: all)
          board_step<D>(s + h, x_up + h, x_down + h, other + y_up + 1 + h, other + y_down + 1 + h,
                        other + z_up + 1 + h, other + z_down + 1 + h, bits_own + row + 1 + h, rng.s0, rng.s1,
                        rng.s2, rng.s3, flips, limit, live);
          if (++pending == 31) {
            for (std::size_t j = 0; j < 8; ++j) flipped += fold_bytes(flips[j]);
            for (std::size_t j = 0; j < 8; ++j) flips[j] = 0;
            pending = 0;
          }
        }
        s[-1] = s[half - 1];  // the row's ghost words (read by the other colour only)
        s[half] = s[0];
      }
      block_streams_[w * side + b] = rng;
    }
    for (std::size_t j = 0; j < 8; ++j) flipped += fold_bytes(flips[j]);
    return flipped;
  }

  // Set bits of every byte of v, in that byte (0 .. 8): added over up to 31 sites, then folded.
  SPINWRIGHT_BIT_INLINE static std::uint64_t byte_counts(std::uint64_t v) noexcept {
    v = v - ((v >> 1) & 0x5555555555555555ULL);
    v = (v & 0x3333333333333333ULL) + ((v >> 2) & 0x3333333333333333ULL);
    return (v + (v >> 4)) & 0x0F0F0F0F0F0F0F0FULL;
  }
  static std::uint64_t fold_bytes(std::uint64_t v) noexcept {
    v = (v & 0x00FF00FF00FF00FFULL) + ((v >> 8) & 0x00FF00FF00FF00FFULL);
    v = v + (v >> 16);
    v = v + (v >> 32);
    return v & 0xFFFFu;
  }

  static std::uint64_t popcount(std::uint64_t v) noexcept {
    v = v - ((v >> 1) & 0x5555555555555555ULL);
    v = (v & 0x3333333333333333ULL) + ((v >> 2) & 0x3333333333333333ULL);
    v = (v + (v >> 4)) & 0x0F0F0F0F0F0F0F0FULL;
    return (v * 0x0101010101010101ULL) >> 56;
  }

  void set_beta(double beta) noexcept {
    const double bj = beta * static_cast<double>(magnitude_);
    for (int d = 1; d <= static_cast<int>(bit_sliced_max_degree); ++d) {
      const int smallest = d - 2 * ((d - 1) / 2);  // 1 for odd d, 2 for even d
      base_[d] = detail::FixedProbability::of(std::exp(-2.0 * bj * smallest));
    }
    step_ = detail::FixedProbability::of(std::exp(-4.0 * bj));
    threshold_[0] = std::uint64_t{1} << 63;
    for (int m = 1; m <= static_cast<int>(bit_sliced_max_degree); ++m) {
      const double p = std::exp(-2.0 * bj * m);
      const double scaled = std::ldexp(p, 63);
      threshold_[m] = !(p < 1.0) ? std::uint64_t{1} << 63 : static_cast<std::uint64_t>(scaled);
    }
    beta_now_ = beta;
  }

  template <bool Shared, int D>
  SPINWRIGHT_BIT_INLINE void update(std::size_t i, detail::StreamSet<Words>& rng,
                                    detail::Lanes<Words>& flips) noexcept {
    if constexpr (Shared) {
      update_site_shared<D>(i, rng, flips);
    } else {
      update_site<D>(i, rng);
    }
  }

  template <bool Shared>
  void sweep_sites(detail::StreamSet<Words>& streams) noexcept {
    const std::size_t n = model_->num_spins();
    // A local copy whose address never leaves the inlined updates: kept in registers.
    detail::StreamSet<Words> rng = streams;
    // Shared draws count flips per byte of the words (folded every 31 sites, before a byte
    // can pass 255).
    detail::Lanes<Words> flips = detail::Lanes<Words>::all(0);
    unsigned pending = 0;
    for (std::size_t i = 0; i < n; ++i) {
      if (Shared && ++pending == 32) {
        for (std::size_t w = 0; w < Words; ++w) accepted_lane_[w] += fold_bytes(flips.v[w]);
        flips = detail::Lanes<Words>::all(0);
        pending = 1;
      }
      switch (row_[i + 1] - row_[i]) {
        case 0:
          update<Shared, 0>(i, rng, flips);
          break;
        case 1:
          update<Shared, 1>(i, rng, flips);
          break;
        case 2:
          update<Shared, 2>(i, rng, flips);
          break;
        case 3:
          update<Shared, 3>(i, rng, flips);
          break;
        case 4:
          update<Shared, 4>(i, rng, flips);
          break;
        case 5:
          update<Shared, 5>(i, rng, flips);
          break;
        case 6:
          update<Shared, 6>(i, rng, flips);
          break;
        case 7:
          update<Shared, 7>(i, rng, flips);
          break;
        case 8:
          update<Shared, 8>(i, rng, flips);
          break;
        case 9:
          update<Shared, 9>(i, rng, flips);
          break;
        case 10:
          update<Shared, 10>(i, rng, flips);
          break;
        case 11:
          update<Shared, 11>(i, rng, flips);
          break;
        case 12:
          update<Shared, 12>(i, rng, flips);
          break;
        case 13:
          update<Shared, 13>(i, rng, flips);
          break;
        case 14:
          update<Shared, 14>(i, rng, flips);
          break;
        default:
          update<Shared, 15>(i, rng, flips);
          break;
      }
    }
    for (std::size_t w = 0; w < Words; ++w) accepted_lane_[w] += fold_bytes(flips.v[w]);
    streams = rng;
  }

  bool sweep_once() {
    const double beta = beta_at_sweep(sweeps_);
    if (sweeps_ == 0 || beta != beta_now_) set_beta(beta);
    // The streams in a local whose address never leaves the inlined site updates, so that
    // they stay in registers across the spin writes.
    if (checkerboard()) {
      sweep_board();
    } else {
      detail::StreamSet<Words> rng = streams_;
      if (params_.shared_draws) {
        sweep_sites<true>(rng);
      } else {
        sweep_sites<false>(rng);
      }
      streams_ = rng;
    }
    ++sweeps_;
    const std::uint64_t every = params_.best_every == 0 ? 1 : params_.best_every;
    if (sweeps_ % every != 0 && sweeps_ < schedule_sweeps_) return false;
    const std::int64_t before = best_unsat_[best_lane()];
    track();
    return best_unsat_[best_lane()] < before;
  }

  // Counts every restart's energy after the last sweep (if not done yet) and keeps the bests.
  void track() const noexcept {
    if (!valid() || tracked_at_ == sweeps_) return;
    tracked_at_ = sweeps_;
    const std::size_t n = model_->num_spins();
    std::int64_t unsat[restarts_per_group];
    count_unsatisfied(unsat);
    const std::int64_t before = best_unsat_[best_lane()];
    for (std::size_t w = 0; w < Words; ++w) {
      std::uint64_t improved = 0;
      for (unsigned b = 0; b < 64; ++b) {
        const std::size_t k = w * 64 + b;
        if (unsat[k] < best_unsat_[k]) {
          best_unsat_[k] = unsat[k];
          improved |= std::uint64_t{1} << b;
        }
      }
      if (improved == 0) continue;
      if (lattice_.dims != 0) {
        const std::size_t span = 2 * lattice_.plane();
        const std::uint64_t* now = board_.data() + w * span;
        std::uint64_t* best = board_.data() + (Words + w) * span;
        for (std::size_t x = 0; x < span; ++x) best[x] = (best[x] & ~improved) | (now[x] & improved);
        continue;
      }
      for (std::size_t i = 0; i < n; ++i) {
        const std::size_t at = i * Words + w;
        best_[at] = (best_[at] & ~improved) | (spins_[at] & improved);
      }
    }
    if (best_unsat_[best_lane()] < before) best_sweep_ = sweeps_;
  }

  const Model* model_;
  BitSlicedParams params_;
  Status status_;
  detail::Buffer<std::uint32_t> row_;
  detail::Buffer<std::uint32_t> slots_;
  mutable detail::Buffer<std::uint64_t> spins_;  // [site][word], site n is the field's fixed +1 spin
  mutable detail::Buffer<std::uint64_t> best_;  // [site][word], best state of every restart
  mutable detail::Buffer<std::int8_t> lane_spins_;
  mutable detail::Buffer<std::int64_t> best_unsat_;
  detail::BitLattice lattice_{};
  // Checkerboard sweep: the spins of word w, colour c at board_[(2 w + c) plane + row stride +
  // 1 + h] (row = z side + y, site x = 2 h + ((c + y + z) & 1)), a ghost word either side of a
  // row (its last and first site); then the best spins in the same form, (2 Words + 2 w + c)
  // plane + ...; then the bond signs, one word per site (bond_bits).
  // spins_ is brought up to date from the board (sync) only when a restart's spins are read.
  mutable detail::Buffer<std::uint64_t> board_;
  detail::Buffer<detail::StreamSet<8>> block_streams_;  // [word][block]
  BitSlicedTeam* team_ = nullptr;
  BitSlicedUnit unit_ = BitSlicedUnit::plain;
  mutable bool stale_ = false;  // spins_ behind board_
  detail::StreamSet<Words> streams_{};
  detail::FixedProbability base_[bit_sliced_max_degree + 1]{};
  detail::FixedProbability step_{};
  // Shared draws: an energy rise of 2 J m is taken when u / 2 < threshold_[m] (2^63 exp(-2 beta J m)).
  std::uint64_t threshold_[bit_sliced_max_degree + 1]{};
  std::uint64_t accepted_lane_[Words]{};
  Schedule schedule_{};
  BetaSpan range_{};
  energy_type magnitude_{0};
  std::int64_t bonds_ = 0;
  int planes_ = 1;
  std::uint64_t first_word_ = 0;
  std::uint64_t sweeps_ = 0;
  mutable std::uint64_t best_sweep_ = 0;
  mutable std::uint64_t tracked_at_ = 0;  // sweeps_ when energies were last counted
  std::uint64_t schedule_sweeps_ = 0;
  double beta_now_ = 0;
  double time_fraction_ = 0;
};

}  // namespace spinwright

#endif  // SPINWRIGHT_KERNELS_BIT_SLICED_HPP
