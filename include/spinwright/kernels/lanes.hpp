// spinwright — lockstep lanes: LaneAnnealer advances W restarts of simulated annealing over one
// model together (spins and local fields stored [site][lane], one generator per lane from
// (seed, r), acceptance without branches), so each attempt and each neighbour update is one
// vector operation over all lanes. Restart r's result depends on (seed, r) only: not on W, the
// thread count, the vector unit or, for integer models, the architecture. See docs/kernels.md.
#ifndef SPINWRIGHT_KERNELS_LANES_HPP
#define SPINWRIGHT_KERNELS_LANES_HPP

#include "../arena.hpp"
#include "../config.hpp"
#include "../control.hpp"
#include "../detail/buffer.hpp"
#include "../model/form.hpp"
#include "../rng/xoshiro.hpp"
#include "acceptance.hpp"
#include "anneal.hpp"
#include "beta_span.hpp"
#include "detail/drive.hpp"
#include "detail/lane_accept.hpp"
#include "schedule.hpp"
#include "solution.hpp"

#include <cstddef>      // std::size_t
#include <cstdint>      // std::int8_t, std::int32_t, std::uint32_t, std::uint64_t
#include <limits>       // std::numeric_limits
#include <type_traits>  // std::conditional_t, std::is_integral_v

#if !SPINWRIGHT_NO_HEAP
#include <vector>  // std::vector
#endif

// Run-time choice of the vector unit: GCC and Clang on x86-64 compile the sweep three times
// (plain, AVX2, AVX-512) and pick the widest the CPU has; everything else gets the plain path.
#if (defined(__GNUC__) || defined(__clang__)) && defined(__x86_64__)
#define SPINWRIGHT_LANE_DISPATCH 1
#define SPINWRIGHT_LANE_INLINE __attribute__((always_inline)) inline
#else
#define SPINWRIGHT_LANE_DISPATCH 0
#if defined(__GNUC__) || defined(__clang__)
#define SPINWRIGHT_LANE_INLINE __attribute__((always_inline)) inline
#else
#define SPINWRIGHT_LANE_INLINE inline
#endif
#endif

// Loops over the lanes stay loops until the vectoriser has seen them: GCC otherwise unrolls
// them completely first and vectorises the straight-line result far less well (measured: 2x).
#if defined(__GNUC__) || defined(__clang__)
#define SPINWRIGHT_LANE_LOOP _Pragma("GCC unroll 1")
#else
#define SPINWRIGHT_LANE_LOOP
#endif

namespace spinwright {

/// The lanes a LaneAnnealer advances together unless told otherwise: 32 int32 values are four
/// AVX2 (two AVX-512) registers; with GCC 12 on AVX2 this measured 1.3-1.7x faster per
/// restart-attempt than 16 lanes (docs/kernels.md).
inline constexpr std::size_t default_lane_width = 32;

/// The vector unit a LaneAnnealer's sweep runs on. Every unit gives the same answer.
enum class LaneUnit : std::uint8_t { plain, avx2, avx512 };

/// The widest unit this CPU and build can run (plain off x86-64 or with other compilers).
inline LaneUnit best_lane_unit() noexcept {
#if SPINWRIGHT_LANE_DISPATCH
  if (__builtin_cpu_supports("avx512f") && __builtin_cpu_supports("avx512bw") && __builtin_cpu_supports("avx512vl") &&
      __builtin_cpu_supports("avx512dq")) {
    return LaneUnit::avx512;
  }
  if (__builtin_cpu_supports("avx2")) return LaneUnit::avx2;
#endif
  return LaneUnit::plain;
}

/// Whether `unit` can run here.
inline bool lane_unit_supported(LaneUnit unit) noexcept {
  const LaneUnit best = best_lane_unit();
  if (unit == LaneUnit::plain) return true;
  if (unit == LaneUnit::avx2) return best != LaneUnit::plain;
  return best == LaneUnit::avx512;
}

inline const char* lane_unit_name(LaneUnit unit) noexcept {
  switch (unit) {
    case LaneUnit::plain:
      return "plain";
    case LaneUnit::avx2:
      return "avx2";
    case LaneUnit::avx512:
      return "avx512";
  }
  return "plain";
}

/// How a LaneAnnealer finds q = 2^30 exp(-beta |delta|) for each lane: by selection among this
/// sweep's values for the few delta sizes of the model (int32 models whose |delta| takes fewer
/// than lane_levels units), by lookup in a table of them (fewer than lane_table_levels units),
/// or by interpolation in the exp table (any model). All three give the same q.
enum class LanePath : std::uint8_t { interpolate = 0, select = 1, lookup = 2 };

/// The local-field type of the lanes kernel: int32 for integer values up to 32 bits (a model
/// whose field bound reaches 2^30 is refused: fits() is false), int64 for int64 values,
/// double for floating values.
template <class Value>
using lane_field_t = std::conditional_t<std::is_integral_v<Value>,
                                        std::conditional_t<(sizeof(Value) <= 4), std::int32_t, std::int64_t>, double>;

template <class Model, std::size_t Width = default_lane_width>
class LaneAnnealer : public detail::Drive<LaneAnnealer<Model, Width>> {
  static_assert(Width >= 1 && Width <= 64, "lane width between 1 and 64");

 public:
  using model_type = Model;
  using value_type = typename Model::value_type;
  using index_type = typename Model::index_type;
  using energy_type = typename Model::energy_type;
  using field_type = lane_field_t<value_type>;
  static constexpr std::size_t width = Width;
  /// int32 models whose largest |delta| is below this many delta units select q per sweep.
  static constexpr std::size_t lane_levels = 8;
  /// int32 models whose largest |delta| is below this many delta units look q up in a table
  /// of this sweep's values, one entry per delta size.
  static constexpr std::size_t lane_table_levels = 256;

  template <class... Args>
  LaneAnnealer(const Model&&, Args&&...) = delete;

#if !SPINWRIGHT_NO_HEAP
  /// Lanes l = 0..W-1 run restarts first_restart + l of (seed, r); `count` of them (at most W)
  /// are reported. Random starts as the Annealer's (the first draws of each lane's stream), or
  /// params.initial for every lane. Uses params.sweeps, schedule, acceptance, order, initial
  /// and progress_every. Allocates on the heap; check valid() (false when !fits(model)).
  LaneAnnealer(const Model& model, const AnnealParams& params, std::uint64_t seed, std::uint64_t first_restart = 0,
               std::size_t count = Width)
      : model_(&model),
        params_(params),
        fits_(fits(model)),
        n_(fits_ ? model.num_spins() : 0),
        field_bytes_(field_bytes_for(model)),
        row_(n_ + 1, std::size_t{0}),
        nb_(count_entries(model, fits_)),
        val_(nb_.size()),
        site_(n_),
        spins_(n_ * Width, std::int8_t{1}),
        best_spins_(n_ * Width, std::int8_t{1}),
        fields_(field_bytes_ == sizeof(field_type) ? n_ * Width : 0),
        fields16_(field_bytes_ == 2 ? n_ * Width : 0),
        fields8_(field_bytes_ == 1 ? n_ * Width : 0),
        lane_spins_(n_) {
    init(seed, first_restart, count);
  }
#endif

  /// The same with the workspace carved from a caller's arena (no heap); check valid().
  LaneAnnealer(const Model& model, const AnnealParams& params, Arena& arena, std::uint64_t seed,
               std::uint64_t first_restart = 0, std::size_t count = Width)
      : model_(&model),
        params_(params),
        fits_(fits(model)),
        n_(fits_ ? model.num_spins() : 0),
        field_bytes_(field_bytes_for(model)),
        row_(n_ + 1, arena, std::size_t{0}),
        nb_(count_entries(model, fits_), arena),
        val_(nb_.size(), arena),
        site_(n_, arena),
        spins_(n_ * Width, arena, std::int8_t{1}),
        best_spins_(n_ * Width, arena, std::int8_t{1}),
        fields_(field_bytes_ == sizeof(field_type) ? n_ * Width : 0, arena),
        fields16_(field_bytes_ == 2 ? n_ * Width : 0, arena),
        fields8_(field_bytes_ == 1 ? n_ * Width : 0, arena),
        lane_spins_(n_, arena) {
    if (valid()) init(seed, first_restart, count);
  }

  /// Arena bytes the arena constructor needs.
  static std::size_t bytes_needed(const Model& model, const AnnealParams&) {
    const std::size_t n = model.num_spins();
    const std::size_t entries = count_entries(model, true);
    return arena_bytes<std::size_t>(n + 1) + arena_bytes<std::uint32_t>(entries) + arena_bytes<field_type>(entries) +
           arena_bytes<field_type>(n) + 2 * arena_bytes<std::int8_t>(n * Width) + stored_field_bytes(model, n * Width) +
           arena_bytes<std::int8_t>(n);
  }

  /// Bytes per stored local field: int32 models keep their fields as int8 when the field bound
  /// (|site term| + sum |pair| at the worst spin) is at most 63, as int16 up to 16383, so that
  /// every field and every change of one (2 |pair| for Ising) fits; otherwise sizeof(field_type).
  /// The arithmetic stays in field_type, so the answers do not depend on this choice.
  static std::size_t field_bytes_for(const Model& model) noexcept {
    if constexpr (std::is_same_v<field_type, std::int32_t>) {
      if (!fits(model)) return sizeof(field_type);
      std::uint64_t bound = 0;
      for (std::size_t i = 0; i < model.num_spins(); ++i) {
        const auto ii = static_cast<index_type>(i);
        std::uint64_t s = detail::magnitude_u64(model.site_term(ii));
        model.for_each_neighbour(ii, [&s](index_type, value_type v) { s += detail::magnitude_u64(v); });
        bound = s > bound ? s : bound;
      }
      return bound <= 63 ? 1 : bound <= 16383 ? 2 : sizeof(field_type);
    } else {
      static_cast<void>(model);
      return sizeof(field_type);
    }
  }
  /// This annealer's bytes per stored local field (field_bytes_for(model)).
  std::size_t field_bytes() const noexcept { return field_bytes_; }

  /// Whether the lanes kernel takes this model: fewer than 2^32 spins and, for int32 local
  /// fields, |site term| + sum |pair| below 2^30 at every spin (2^62 for int64), so 2 |field| fits.
  static bool fits(const Model& model) noexcept {
    const std::size_t n = model.num_spins();
    if (static_cast<std::uint64_t>(n) >= (std::uint64_t{1} << 32)) return false;
    if constexpr (std::is_integral_v<field_type>) {
      const std::uint64_t limit = sizeof(field_type) == 4 ? (std::uint64_t{1} << 30) - 1 : (std::uint64_t{1} << 62) - 1;
      for (std::size_t i = 0; i < n; ++i) {
        const auto ii = static_cast<index_type>(i);
        std::uint64_t s = detail::magnitude_u64(model.site_term(ii));
        model.for_each_neighbour(ii, [&](index_type, value_type v) {
          const std::uint64_t m = detail::magnitude_u64(v);
          s = (m > limit || s + m > limit) ? limit + 1 : s + m;
        });
        if (s > limit) return false;
      }
    }
    return true;
  }

  bool valid() const noexcept {
    return fits_ && row_.valid() && nb_.valid() && val_.valid() && site_.valid() && spins_.valid() &&
           best_spins_.valid() && fields_.valid() && fields16_.valid() && fields8_.valid() && lane_spins_.valid();
  }

  /// New streams (seed, first_restart + l) and random starts; counters and bests cleared.
  void reset(std::uint64_t seed, std::uint64_t first_restart = 0) {
    begin(seed, first_restart);
    switch (unit_) {
#if SPINWRIGHT_LANE_DISPATCH
      case LaneUnit::avx512:
        random_spins_avx512();
        break;
      case LaneUnit::avx2:
        random_spins_avx2();
        break;
#endif
      default:
        random_spins();
        break;
    }
    start_from_spins();
  }

  /// Every lane starts from the same spins (+1/-1, n of them); streams (seed, first_restart + l).
  void warm_start(const std::int8_t* spins, std::uint64_t seed, std::uint64_t first_restart = 0) {
    begin(seed, first_restart);
    for (std::size_t i = 0; i < n_; ++i) {
      SPINWRIGHT_ASSERT(spins[i] == 1 || spins[i] == -1, "spins are +1 or -1");
      for (std::size_t l = 0; l < Width; ++l) spins_[i * Width + l] = spins[i] > 0 ? 1 : -1;
    }
    start_from_spins();
  }

  /// Lanes reported (the first `count` of W).
  std::size_t lanes() const noexcept { return count_; }
  std::uint64_t first_restart() const noexcept { return first_; }
  std::size_t size() const noexcept { return n_; }

  /// Lane l's best state so far, copied into a scratch row (valid until the next call or step).
  BestView<energy_type> best(std::size_t l) const noexcept {
    SPINWRIGHT_ASSERT(l < Width, "lane out of range");
    for (std::size_t i = 0; i < n_; ++i) lane_spins_[i] = best_spins_[i * Width + l];
    return {lane_spins_.data(), n_, best_energy_[l], best_sweep_[l]};
  }
  /// The lowest best energy over the reported lanes.
  energy_type best_energy() const noexcept {
    energy_type e = best_energy_[0];
    for (std::size_t l = 1; l < count_; ++l) e = best_energy_[l] < e ? best_energy_[l] : e;
    return e;
  }
  /// Lane l's current spin i.
  std::int8_t spin(std::size_t l, std::size_t i) const noexcept { return spins_[i * Width + l]; }
  /// Lane l's tracked energy.
  energy_type energy(std::size_t l) const noexcept { return energy_[l]; }
  /// Largest |tracked - recomputed| local field over every lane (0 for integer models).
  double field_error() const noexcept;

#if !SPINWRIGHT_NO_HEAP
  /// Lane l's best state as a Solution of restart first_restart + l (energy recomputed).
  Solution<energy_type> solution(std::size_t l) const {
    Solution<energy_type> s;
    s.spins.resize(n_);
    for (std::size_t i = 0; i < n_; ++i) s.spins[i] = best_spins_[i * Width + l];
    s.energy = model_->energy(s.spins.data());
    s.sweeps = sweeps_;
    s.attempted = sweeps_ * n_;
    s.accepted = accepted_[l];
    s.restart = first_ + l;
    return s;
  }
  /// The best lane (lowest energy, then lowest restart) as a Solution (for run()).
  Solution<energy_type> solution() const {
    std::size_t pick = 0;
    for (std::size_t l = 1; l < count_; ++l) {
      if (best_energy_[l] < best_energy_[pick]) pick = l;
    }
    return solution(pick);
  }
  /// Every reported lane's Solution, in restart order.
  std::vector<Solution<energy_type>> solutions() const {
    std::vector<Solution<energy_type>> out;
    out.reserve(count_);
    for (std::size_t l = 0; l < count_; ++l) out.push_back(solution(l));
    return out;
  }
#endif

  /// Run the sweeps on this unit (false, and no change, when the CPU lacks it).
  bool set_unit(LaneUnit unit) noexcept {
    if (!lane_unit_supported(unit)) return false;
    unit_ = unit;
    return true;
  }
  LaneUnit unit() const noexcept { return unit_; }

  /// The way q is found (chosen at construction: the cheapest this model allows).
  LanePath path() const noexcept { return static_cast<LanePath>(path_); }
  /// Find q this way instead (false, and no change, when the model's delta sizes do not allow
  /// it); the answers are the same.
  bool set_path(LanePath path) noexcept {
    const int p = static_cast<int>(path);
    const bool allowed = p == path_interpolate || (p == path_lookup && best_path_ != path_interpolate) ||
                         (p == path_select && best_path_ == path_select);
    if (!allowed) return false;
    path_ = p;
    return true;
  }

  const Model& model() const noexcept { return *model_; }
  std::uint64_t sweeps_done() const noexcept { return sweeps_; }
  std::uint64_t attempted(std::size_t) const noexcept { return sweeps_ * n_; }
  std::uint64_t accepted(std::size_t l) const noexcept { return accepted_[l]; }
  double beta() const noexcept { return beta_at_sweep(sweeps_); }
  const Schedule& schedule() const noexcept { return schedule_; }
  const BetaSpan& beta_span() const noexcept { return range_; }
  void set_schedule_sweeps(std::uint64_t s) noexcept { schedule_sweeps_ = s; }

  std::uint64_t default_sweeps() const noexcept { return params_.sweeps; }
  std::uint64_t progress_every() const noexcept { return params_.progress_every; }
  double best_for_target() const noexcept { return static_cast<double>(best_energy()); }

 private:
  friend class detail::Drive<LaneAnnealer>;

  static std::size_t stored_field_bytes(const Model& model, std::size_t count) noexcept {
    const std::size_t bytes = field_bytes_for(model);
    return bytes == 1 ? arena_bytes<std::int8_t>(count)
                      : bytes == 2 ? arena_bytes<std::int16_t>(count) : arena_bytes<field_type>(count);
  }

  // The stored fields in their type (S is field_type, int16 or int8 as field_bytes_ says).
  template <class S>
  S* field_data() noexcept {
    if constexpr (std::is_same_v<S, std::int8_t>) {
      return fields8_.data();
    } else if constexpr (std::is_same_v<S, std::int16_t>) {
      return fields16_.data();
    } else {
      return fields_.data();
    }
  }
  field_type field_at(std::size_t x) const noexcept {
    if (field_bytes_ == 1) return static_cast<field_type>(fields8_[x]);
    if (field_bytes_ == 2) return static_cast<field_type>(fields16_[x]);
    return fields_[x];
  }

  static std::size_t count_entries(const Model& model, bool fits) {
    if (!fits) return 0;
    std::size_t entries = 0;
    for (std::size_t i = 0; i < model.num_spins(); ++i) {
      const auto ii = static_cast<index_type>(i);
      model.for_each_neighbour(ii, [&entries, ii](index_type j, value_type) { entries += j != ii ? 1 : 0; });
    }
    return entries;
  }

  void begin_advance(std::uint64_t limit) noexcept {
    schedule_sweeps_ = limit;
    time_fraction_ = 0;
  }
  void before_sweep(double time_fraction) noexcept { time_fraction_ = time_fraction; }

  void init(std::uint64_t seed, std::uint64_t first_restart, std::size_t count) {
    unit_ = best_lane_unit();
    count_ = count == 0 ? 1 : (count > Width ? Width : count);
    if (!valid()) return;
    // The model as compressed rows of its own, in the field type (self pairs dropped).
    std::size_t k = 0;
    for (std::size_t i = 0; i < n_; ++i) {
      const auto ii = static_cast<index_type>(i);
      site_[i] = static_cast<field_type>(model_->site_term(ii));
      model_->for_each_neighbour(ii, [&](index_type j, value_type v) {
        if (j == ii) return;
        nb_[k] = static_cast<std::uint32_t>(j);
        val_[k] = static_cast<field_type>(v);
        ++k;
      });
      row_[i + 1] = k;
    }
    if constexpr (std::is_same_v<field_type, std::int32_t>) {
      unit_shift_ = detail::delta_shift(*model_);
      const std::uint64_t units = detail::max_flip_delta(*model_) >> unit_shift_;
      path_ = units < lane_levels ? path_select : units < lane_table_levels ? path_lookup : path_interpolate;
      best_path_ = path_;
      levels_used_ = path_ != path_interpolate ? static_cast<std::int32_t>(units) + 1 : 1;
    }
    if constexpr (std::is_integral_v<field_type>) {
      const std::uint64_t top = static_cast<std::uint64_t>(std::numeric_limits<field_type>::max());
      const std::uint64_t largest = detail::max_flip_delta(*model_);
      flush_every_ = largest == 0 ? std::size_t{1} << 30 : static_cast<std::size_t>(top / largest);
      if (flush_every_ == 0) flush_every_ = 1;
      if (flush_every_ > (std::size_t{1} << 30)) flush_every_ = std::size_t{1} << 30;
    } else {
      flush_every_ = 1;
    }
    schedule_sweeps_ = params_.sweeps;
    schedule_ = params_.schedule;
    if (schedule_.automatic()) {
      range_ = estimate_beta_span(*model_);
      schedule_.beta_start = range_.beta_start;
      schedule_.beta_end = range_.beta_end;
    } else {
      range_.beta_start = schedule_.beta_start;
      range_.beta_end = schedule_.beta_end;
    }
    if (params_.initial != nullptr) {
      warm_start(params_.initial, seed, first_restart);
    } else {
      reset(seed, first_restart);
    }
  }

  // Streams and the shared order stream; the spins are set by the caller.
  void begin(std::uint64_t seed, std::uint64_t first_restart) {
    first_ = first_restart;
    for (std::size_t l = 0; l < Width; ++l) seed_lane(l, seed, first_restart + l);
    // One site order for every lane and every block of lanes: from the seed alone.
    order_rng_ = Xoshiro256(seed ^ 0x6A09E667F3BCC909ULL);
  }

  // Lane l's stream is Xoshiro256::for_restart(seed, r), kept as four words per lane so the
  // sweep steps every lane at once: the same seeding, the same step (rng/xoshiro.hpp).
  void seed_lane(std::size_t l, std::uint64_t seed, std::uint64_t r) noexcept {
    std::uint64_t a = seed;
    std::uint64_t b = r ^ 0xD1B54A32D192ED03ULL;
    std::uint64_t sm = splitmix64(a) ^ (splitmix64(b) * 0xA24BAED4963EE407ULL);
    s0_[l] = splitmix64(sm);
    s1_[l] = splitmix64(sm);
    s2_[l] = splitmix64(sm);
    s3_[l] = splitmix64(sm);
  }

  // Every lane's local fields from its spins, in field_type, stored as S.
  template <class S>
  SPINWRIGHT_LANE_INLINE void fill_fields(S* out) noexcept {
    const field_type* val = val_.data();
    const field_type* site = site_.data();
    const std::size_t* row = row_.data();
    const std::uint32_t* nb = nb_.data();
    const std::int8_t* spins = spins_.data();
    for (std::size_t i = 0; i < n_; ++i) {
      field_type f[Width];
      SPINWRIGHT_LANE_LOOP for (std::size_t l = 0; l < Width; ++l) f[l] = site[i];
      for (std::size_t k = row[i]; k < row[i + 1]; ++k) {
        const std::int8_t* sj = spins + static_cast<std::size_t>(nb[k]) * Width;
        const field_type v = val[k];
        SPINWRIGHT_LANE_LOOP for (std::size_t l = 0; l < Width; ++l) {
          if constexpr (Model::form == Form::ising) {
            f[l] += sj[l] > 0 ? v : -v;
          } else {
            f[l] += sj[l] < 0 ? v : field_type{0};
          }
        }
      }
      S* o = out + i * Width;
      SPINWRIGHT_LANE_LOOP for (std::size_t l = 0; l < Width; ++l) o[l] = static_cast<S>(f[l]);
    }
  }

  // Lane l's spin i is the sign of its stream's i-th draw (as the Annealer's random start); all
  // lanes step together, site by site (each lane's draws in the same order as one by one).
  SPINWRIGHT_LANE_INLINE void random_spins() noexcept {
    std::uint64_t s0[Width], s1[Width], s2[Width], s3[Width];
    for (std::size_t l = 0; l < Width; ++l) {
      s0[l] = s0_[l];
      s1[l] = s1_[l];
      s2[l] = s2_[l];
      s3[l] = s3_[l];
    }
    std::int8_t* spins = spins_.data();
    for (std::size_t i = 0; i < n_; ++i) {
      std::int8_t* sp = spins + i * Width;
      SPINWRIGHT_LANE_LOOP for (std::size_t l = 0; l < Width; ++l) {
        const std::uint64_t a = s0[l], b = s1[l];
        std::uint64_t c = s2[l], d = s3[l];
        const std::uint64_t sum = a + d;
        const std::uint64_t draw = ((sum << 23) | (sum >> 41)) + a;
        const std::uint64_t t = b << 17;
        c ^= a;
        d ^= b;
        s1[l] = b ^ c;
        s0[l] = a ^ d;
        s2[l] = c ^ t;
        s3[l] = (d << 45) | (d >> 19);
        sp[l] = (draw >> 63) != 0 ? std::int8_t{1} : std::int8_t{-1};
      }
    }
    for (std::size_t l = 0; l < Width; ++l) {
      s0_[l] = s0[l];
      s1_[l] = s1[l];
      s2_[l] = s2[l];
      s3_[l] = s3[l];
    }
  }
  SPINWRIGHT_LANE_INLINE void fill_any() noexcept {
    if (field_bytes_ == 1) {
      fill_fields(fields8_.data());
    } else if (field_bytes_ == 2) {
      fill_fields(fields16_.data());
    } else {
      fill_fields(fields_.data());
    }
  }
#if SPINWRIGHT_LANE_DISPATCH
  __attribute__((target("avx2"))) void random_spins_avx2() noexcept { random_spins(); }
  __attribute__((target("avx2,avx512f,avx512bw,avx512vl,avx512dq"))) void random_spins_avx512() noexcept {
    random_spins();
  }
  __attribute__((target("avx2"))) void fill_avx2() noexcept { fill_any(); }
  __attribute__((target("avx2,avx512f,avx512bw,avx512vl,avx512dq"))) void fill_avx512() noexcept { fill_any(); }
#endif

  void start_from_spins() {
    switch (unit_) {
#if SPINWRIGHT_LANE_DISPATCH
      case LaneUnit::avx512:
        fill_avx512();
        break;
      case LaneUnit::avx2:
        fill_avx2();
        break;
#endif
      default:
        fill_any();
        break;
    }
    for (std::size_t l = 0; l < Width; ++l) {
      for (std::size_t i = 0; i < n_; ++i) lane_spins_[i] = spins_[i * Width + l];
      energy_[l] = model_->energy(lane_spins_.data());
      best_energy_[l] = energy_[l];
      best_sweep_[l] = 0;
      accepted_[l] = 0;
    }
    for (std::size_t x = 0; x < n_ * Width; ++x) best_spins_[x] = spins_[x];
    sweeps_ = 0;
    time_fraction_ = 0;
  }

  double beta_at_sweep(std::uint64_t k) const noexcept {
    const double f = schedule_sweeps_ > 1 ? static_cast<double>(k) / static_cast<double>(schedule_sweeps_ - 1) : 1.0;
    return schedule_.beta_at(f > time_fraction_ ? f : time_fraction_);
  }

  bool sweep_once() {
    const double beta = beta_at_sweep(sweeps_);
    SPINWRIGHT_ASSERT(beta >= 0 && beta - beta == 0, "beta must be finite and >= 0");
    const double scale = beta * detail::lane_beta_unit;
    const bool heat = params_.acceptance == Acceptance::heat_bath;
    const bool random = params_.order == SiteOrder::random;
    switch (unit_) {
#if SPINWRIGHT_LANE_DISPATCH
      case LaneUnit::avx512:
        sweep_avx512(heat, random, scale);
        break;
      case LaneUnit::avx2:
        sweep_avx2(heat, random, scale);
        break;
#endif
      default:
        sweep_plain(heat, random, scale);
        break;
    }
    ++sweeps_;
    std::int8_t improved[Width];  // -1: take this lane's spins as its new best
    bool any = false;
    bool some = false;
    for (std::size_t l = 0; l < Width; ++l) {
      improved[l] = energy_[l] < best_energy_[l] ? std::int8_t{-1} : std::int8_t{0};
      if (improved[l] != 0) {
        best_energy_[l] = energy_[l];
        best_sweep_[l] = sweeps_;
        any = any || l < count_;
        some = true;
      }
    }
    if (some) {
      switch (unit_) {
#if SPINWRIGHT_LANE_DISPATCH
        case LaneUnit::avx512:
          keep_best_avx512(improved);
          break;
        case LaneUnit::avx2:
          keep_best_avx2(improved);
          break;
#endif
        default:
          keep_best(improved);
          break;
      }
    }
    return any;
  }

  // Lanes whose mask is -1 take their current spins as their best.
  SPINWRIGHT_LANE_INLINE void keep_best(const std::int8_t* improved) noexcept {
    std::int8_t* b = best_spins_.data();
    const std::int8_t* s = spins_.data();
    for (std::size_t i = 0; i < n_; ++i) {
      SPINWRIGHT_LANE_LOOP for (std::size_t l = 0; l < Width; ++l) {
        const std::size_t x = i * Width + l;
        b[x] = static_cast<std::int8_t>((s[x] & improved[l]) | (b[x] & ~improved[l]));
      }
    }
  }

  void sweep_plain(bool heat, bool random, double scale) noexcept { sweep_any(heat, random, scale); }
#if SPINWRIGHT_LANE_DISPATCH
  __attribute__((target("avx2"))) void sweep_avx2(bool heat, bool random, double scale) noexcept {
    sweep_any(heat, random, scale);
  }
  __attribute__((target("avx2,avx512f,avx512bw,avx512vl,avx512dq"))) void sweep_avx512(bool heat, bool random,
                                                                                       double scale) noexcept {
    sweep_any(heat, random, scale);
  }
  __attribute__((target("avx2"))) void keep_best_avx2(const std::int8_t* improved) noexcept { keep_best(improved); }
  __attribute__((target("avx2,avx512f,avx512bw,avx512vl,avx512dq"))) void keep_best_avx512(
      const std::int8_t* improved) noexcept {
    keep_best(improved);
  }
#endif

  SPINWRIGHT_LANE_INLINE void sweep_any(bool heat, bool random, double scale) noexcept {
    if constexpr (std::is_same_v<field_type, std::int32_t>) {
      if (field_bytes_ == 1) {
        sweep_small<std::int8_t>(heat, random, scale);
      } else if (field_bytes_ == 2) {
        sweep_small<std::int16_t>(heat, random, scale);
      } else {
        sweep_small<field_type>(heat, random, scale);
      }
    } else {
      sweep_rule<path_interpolate, field_type>(heat, random, scale);
    }
  }
  template <class Store>
  SPINWRIGHT_LANE_INLINE void sweep_small(bool heat, bool random, double scale) noexcept {
    if (path_ == path_select) {
      sweep_rule<path_select, Store>(heat, random, scale);
    } else if (path_ == path_lookup) {
      sweep_rule<path_lookup, Store>(heat, random, scale);
    } else {
      sweep_rule<path_interpolate, Store>(heat, random, scale);
    }
  }
  template <int Path, class Store>
  SPINWRIGHT_LANE_INLINE void sweep_rule(bool heat, bool random, double scale) noexcept {
    if (heat) {
      if (random) {
        sweep_body<Acceptance::heat_bath, true, Path, Store>(scale);
      } else {
        sweep_body<Acceptance::heat_bath, false, Path, Store>(scale);
      }
    } else {
      if (random) {
        sweep_body<Acceptance::metropolis, true, Path, Store>(scale);
      } else {
        sweep_body<Acceptance::metropolis, false, Path, Store>(scale);
      }
    }
  }

  // One sweep over every lane. Each loop over l is one vector operation (or a few) per site:
  // no branch depends on a lane's data except the skip when no lane accepted.
  template <Acceptance Rule, bool Random, int Path, class Store>
  SPINWRIGHT_LANE_INLINE void sweep_body(double scale) noexcept {
    const detail::LaneMultiplier mult = detail::lane_multiplier(scale);
    const detail::LaneExpTable& table = detail::lane_exp_table;
    // This sweep's q for every delta size the model has (select and lookup paths): the
    // numbers the interpolation below computes for those deltas, so the answer is the same.
    std::int32_t levels[Path == path_lookup ? lane_table_levels : lane_levels];
    constexpr auto level_count = static_cast<std::int32_t>(Path == path_lookup ? lane_table_levels : lane_levels);
    for (std::int32_t m = 0; m < level_count; ++m) {
      levels[m] = m < levels_used_ || m == 0 ? detail::lane_exp_q(
                                                   detail::lane_y(static_cast<std::uint32_t>(m) << unit_shift_, mult), table)
                                             : 0;
    }
    const unsigned shift = unit_shift_;
    constexpr bool ising = Model::form == Form::ising;
    const std::size_t n = n_;
    std::int8_t* spins = spins_.data();
    Store* fields = field_data<Store>();
    const std::size_t* row = row_.data();
    const std::uint32_t* nb = nb_.data();
    const field_type* val = val_.data();

    std::uint64_t s0[Width], s1[Width], s2[Width], s3[Width], draw[Width];
    energy_type energy[Width];
    // Energy changes add up in the field type for flush_every_ attempts (they cannot overflow
    // it in that many), then into the energy type.
    field_type partial[Width];
    std::uint32_t accepted[Width];
    std::size_t since_flush = 0;
    SPINWRIGHT_LANE_LOOP for (std::size_t l = 0; l < Width; ++l) {
      s0[l] = s0_[l];
      s1[l] = s1_[l];
      s2[l] = s2_[l];
      s3[l] = s3_[l];
      draw[l] = 0;
      energy[l] = energy_[l];
      partial[l] = 0;
      accepted[l] = 0;
    }
    Xoshiro256 order = order_rng_;
    const auto n32 = static_cast<std::uint32_t>(n);
    // Random order: sites are drawn `ahead` attempts early and their rows fetched meanwhile
    // (the draws and their order are the same; only the memory traffic moves earlier).
    constexpr std::size_t ahead = 8;
    std::uint32_t upcoming[ahead]{};
    if constexpr (Random) {
      for (std::size_t a = 0; a < ahead && a < n; ++a) upcoming[a] = order.below(n32);
    }
    for (std::size_t k = 0; k < n; ++k) {
      std::size_t i = k;
      if constexpr (Random) {
        i = upcoming[k % ahead];
        if (k + ahead < n) {
          const std::uint32_t next = order.below(n32);
          upcoming[k % ahead] = next;
          lane_prefetch(fields + static_cast<std::size_t>(next) * Width, spins + static_cast<std::size_t>(next) * Width,
                        nb + row[next], row[next + 1] - row[next], fields);
        }
      }
      std::uint32_t u[Width];  // 30-bit uniforms: two per 64-bit draw of each lane's stream
      if ((k & 1) == 0) {
        SPINWRIGHT_LANE_LOOP for (std::size_t l = 0; l < Width; ++l) {
          const std::uint64_t a = s0[l], b = s1[l];
          std::uint64_t c = s2[l], d = s3[l];
          const std::uint64_t sum = a + d;
          draw[l] = ((sum << 23) | (sum >> 41)) + a;
          const std::uint64_t t = b << 17;
          c ^= a;
          d ^= b;
          s1[l] = b ^ c;
          s0[l] = a ^ d;
          s2[l] = c ^ t;
          s3[l] = (d << 45) | (d >> 19);
          u[l] = static_cast<std::uint32_t>(draw[l] >> 34);
        }
      } else {
        SPINWRIGHT_LANE_LOOP for (std::size_t l = 0; l < Width; ++l) u[l] = static_cast<std::uint32_t>(draw[l]) >> 2;
      }
      std::int8_t* sp = spins + i * Width;
      const Store* fp = fields + i * Width;
      // A neighbour's field changes by -2 s v (Ising) or s v (QUBO) in the lanes that flip:
      // with the weight w = 2 v (or v) that is ((w ^ neg) - neg) & taken, neg = -1 where s > 0
      // (Ising) or s < 0 (QUBO); no multiplication, and exact in the stored type.
      using Mask = std::conditional_t<std::is_integral_v<Store>, Store, std::int64_t>;
      [[maybe_unused]] Mask neg[Width];
      [[maybe_unused]] Mask taken[Width];
      [[maybe_unused]] field_type change[Width];  // floating fields: -2 s or s, 0 where the lane keeps its spin
      std::int32_t any = 0;
      // Selection and interpolation: q in loops of their own (they vectorise better that way).
      [[maybe_unused]] std::int32_t qv[Width];
      if constexpr (Path == path_select) {
        // Few delta sizes: q by selection from this sweep's values.
        std::int32_t level[Width];
        SPINWRIGHT_LANE_LOOP for (std::size_t l = 0; l < Width; ++l) {
          const std::int32_t f = static_cast<std::int32_t>(fp[l]);
          level[l] = ((f < 0 ? -f : f) << (ising ? 1 : 0)) >> shift;
          qv[l] = levels[0];
        }
        for (std::int32_t m = 1; m < levels_used_; ++m) {
          const std::int32_t value = levels[m];
          SPINWRIGHT_LANE_LOOP for (std::size_t l = 0; l < Width; ++l) qv[l] = level[l] == m ? value : qv[l];
        }
      } else if constexpr (Path == path_interpolate) {
        std::int32_t y[Width];  // |beta delta| in units of 2^-24 / log2 e, saturated
        SPINWRIGHT_LANE_LOOP for (std::size_t l = 0; l < Width; ++l) {
          const auto f = static_cast<field_type>(fp[l]);
          const field_type sf = sp[l] > 0 ? f : -f;
          const field_type delta = ising ? -2 * sf : sf;
          if constexpr (std::is_same_v<field_type, std::int32_t>) {
            y[l] = detail::lane_y(static_cast<std::uint32_t>(delta < 0 ? -delta : delta), mult);
          } else {
            const double d = static_cast<double>(delta);
            double a = (d < 0 ? -d : d) * scale;
            a = a < detail::lane_y_max ? a : detail::lane_y_max;
            y[l] = static_cast<std::int32_t>(a);
          }
        }
        SPINWRIGHT_LANE_LOOP for (std::size_t l = 0; l < Width; ++l) {
          const std::int32_t yi = y[l];
          const std::int32_t n_shift = yi >> 24;
          const std::int32_t idx = (yi >> 12) & 4095;
          const std::int32_t frac = yi & 4095;
          qv[l] = (table.e[idx] - ((table.d[idx] * frac) >> 12)) >> n_shift;
        }
      }
      // One pass over the lanes per attempt: delta, q = 2^30 exp(-beta |delta|)
      // (detail/lane_accept.hpp), the decision and its effects, with nothing kept in arrays
      // between steps. The new spins go to a local array first: stored straight into the site's
      // int8 spins (which may alias anything) the loop needs a run-time overlap check, which GCC
      // at -O2 will not add, and it then runs 2.5 times slower unvectorised.
      std::int8_t flipped[Width];
      SPINWRIGHT_LANE_LOOP for (std::size_t l = 0; l < Width; ++l) {
        const std::int8_t s8 = sp[l];
        const auto f = static_cast<field_type>(fp[l]);
        field_type delta;
        if constexpr (std::is_integral_v<field_type>) {
          const auto sm = static_cast<field_type>(s8 >> 7);  // 0 or -1: s f = (f ^ sm) - sm
          delta = ising ? -2 * ((f ^ sm) - sm) : (f ^ sm) - sm;
        } else if constexpr (ising) {
          delta = s8 > 0 ? -2 * f : 2 * f;
        } else {
          delta = s8 > 0 ? f : -f;
        }
        std::int32_t q;
        bool up;
        if constexpr (Path == path_lookup) {
          const std::int32_t d = static_cast<std::int32_t>(delta);
          q = levels[(d < 0 ? -d : d) >> shift];
          up = d > 0;
        } else {
          q = qv[l];  // select and interpolate: computed above
          up = delta > 0;
        }
        // tm = -1 where the lane flips, 0 where it keeps its spin; everything after is masks.
        std::int32_t tm;
        if constexpr (Rule == Acceptance::metropolis) {
          const std::int32_t qd = up ? q : (1 << 30);
          tm = -static_cast<std::int32_t>(u[l] < static_cast<std::uint32_t>(qd));
        } else {
          const std::uint64_t prod = static_cast<std::uint64_t>(u[l]) * (static_cast<std::uint32_t>(q) + (1u << 30));
          const std::uint64_t bound =
              up ? static_cast<std::uint64_t>(static_cast<std::uint32_t>(q)) << 30 : std::uint64_t{1} << 60;
          tm = -static_cast<std::int32_t>(prod < bound);
        }
        const std::int8_t sign = static_cast<std::int8_t>(s8 >> 7);  // -1 where s = -1
        if constexpr (std::is_integral_v<Store>) {
          neg[l] = static_cast<Mask>(ising ? ~sign : sign);
          taken[l] = static_cast<Mask>(tm);
        } else if constexpr (ising) {
          change[l] = tm != 0 ? static_cast<field_type>(-2 * s8) : field_type{0};
        } else {
          change[l] = tm != 0 ? static_cast<field_type>(s8) : field_type{0};
        }
        flipped[l] = static_cast<std::int8_t>(s8 ^ (tm & -2));  // +1 <-> -1
        if constexpr (std::is_integral_v<field_type>) {
          partial[l] += delta & static_cast<field_type>(tm);
        } else {
          partial[l] += tm != 0 ? delta : field_type{0};
        }
        accepted[l] += static_cast<std::uint32_t>(tm & 1);
        any |= tm;
      }
      SPINWRIGHT_LANE_LOOP for (std::size_t l = 0; l < Width; ++l) sp[l] = flipped[l];
      if (++since_flush == flush_every_) {
        since_flush = 0;
        SPINWRIGHT_LANE_LOOP for (std::size_t l = 0; l < Width; ++l) {
          energy[l] += static_cast<energy_type>(partial[l]);
          partial[l] = 0;
        }
      }
      if (any != 0) {
        for (std::size_t e = row[i]; e < row[i + 1]; ++e) {
          Store* fj = fields + static_cast<std::size_t>(nb[e]) * Width;
          if constexpr (std::is_integral_v<Store>) {
            const auto w = static_cast<Store>(ising ? 2 * val[e] : val[e]);
            SPINWRIGHT_LANE_LOOP for (std::size_t l = 0; l < Width; ++l) {
              fj[l] = static_cast<Store>(fj[l] + (((w ^ neg[l]) - neg[l]) & taken[l]));
            }
          } else {
            const field_type v = val[e];
            SPINWRIGHT_LANE_LOOP for (std::size_t l = 0; l < Width; ++l) fj[l] += change[l] * v;
          }
        }
      }
    }
    order_rng_ = order;
    SPINWRIGHT_LANE_LOOP for (std::size_t l = 0; l < Width; ++l) {
      s0_[l] = s0[l];
      s1_[l] = s1[l];
      s2_[l] = s2[l];
      s3_[l] = s3[l];
      energy_[l] = energy[l] + static_cast<energy_type>(partial[l]);
      accepted_[l] += accepted[l];
    }
  }

  // Hints that a site's rows (its own and its neighbours' fields) will be needed soon.
  template <class Store>
  static SPINWRIGHT_LANE_INLINE void lane_prefetch(const Store* own, const std::int8_t* spins,
                                                   const std::uint32_t* neighbours, std::size_t degree,
                                                   const Store* fields) noexcept {
#if defined(__GNUC__) || defined(__clang__)
    __builtin_prefetch(own);
    __builtin_prefetch(spins);
    for (std::size_t e = 0; e < degree && e < 8; ++e) __builtin_prefetch(fields + std::size_t{neighbours[e]} * Width);
#else
    static_cast<void>(own);
    static_cast<void>(spins);
    static_cast<void>(neighbours);
    static_cast<void>(degree);
    static_cast<void>(fields);
#endif
  }

  const Model* model_;
  AnnealParams params_;
  bool fits_;
  std::size_t n_;
  std::size_t field_bytes_;  // bytes per stored local field (field_bytes_for)
  detail::Buffer<std::size_t> row_;
  detail::Buffer<std::uint32_t> nb_;
  detail::Buffer<field_type> val_;
  detail::Buffer<field_type> site_;
  detail::Buffer<std::int8_t> spins_;       // [site][lane]
  detail::Buffer<std::int8_t> best_spins_;  // [site][lane]
  detail::Buffer<field_type> fields_;       // [site][lane] when field_bytes_ == sizeof(field_type)
  detail::Buffer<std::int16_t> fields16_;   // [site][lane] when field_bytes_ == 2
  detail::Buffer<std::int8_t> fields8_;     // [site][lane] when field_bytes_ == 1
  mutable detail::Buffer<std::int8_t> lane_spins_;
  std::uint64_t s0_[Width]{}, s1_[Width]{}, s2_[Width]{}, s3_[Width]{};
  Xoshiro256 order_rng_{};
  energy_type energy_[Width]{};
  energy_type best_energy_[Width]{};
  std::uint64_t best_sweep_[Width]{};
  std::uint64_t accepted_[Width]{};
  Schedule schedule_{};
  BetaSpan range_{};
  LaneUnit unit_ = LaneUnit::plain;
  unsigned unit_shift_ = 0;       // int32 models: every |delta| is a multiple of 2^unit_shift_
  // How q is found: by selection (int32 models whose |delta| takes fewer than lane_levels
  // units), by lookup (fewer than lane_table_levels) or by interpolation in the exp table.
  static constexpr int path_interpolate = 0;
  static constexpr int path_select = 1;
  static constexpr int path_lookup = 2;
  int path_ = path_interpolate;
  int best_path_ = path_interpolate;  // the path chosen at construction
  std::int32_t levels_used_ = 1;  // select and lookup: the largest |delta| in units, plus one
  std::size_t flush_every_ = 1;   // attempts whose energy changes surely fit the field type
  std::size_t count_ = Width;
  std::uint64_t first_ = 0;
  std::uint64_t sweeps_ = 0;
  std::uint64_t schedule_sweeps_ = 0;
  double time_fraction_ = 0;
};

template <class Model, std::size_t Width>
double LaneAnnealer<Model, Width>::field_error() const noexcept {
  double worst = 0;
  for (std::size_t i = 0; i < n_; ++i) {
    for (std::size_t l = 0; l < Width; ++l) {
      double f = static_cast<double>(site_[i]);
      for (std::size_t k = row_[i]; k < row_[i + 1]; ++k) {
        const std::int8_t sj = spins_[static_cast<std::size_t>(nb_[k]) * Width + l];
        if constexpr (Model::form == Form::ising) {
          f += sj > 0 ? static_cast<double>(val_[k]) : -static_cast<double>(val_[k]);
        } else {
          if (sj < 0) f += static_cast<double>(val_[k]);
        }
      }
      const double err = f - static_cast<double>(field_at(i * Width + l));
      worst = (err < 0 ? -err : err) > worst ? (err < 0 ? -err : err) : worst;
    }
  }
  return worst;
}

#if !SPINWRIGHT_NO_HEAP
/// Restarts 0..restarts-1 of (seed, r) in blocks of Width lanes on this thread, in restart
/// order. Each restart's result is that of LaneAnnealer lane r (independent of Width). Returns
/// an empty vector when the model does not fit the lanes kernel (LaneAnnealer::fits).
template <std::size_t Width = default_lane_width, class Model>
std::vector<Solution<typename Model::energy_type>> anneal_lanes(const Model& model, const AnnealParams& params,
                                                                std::uint64_t seed, std::uint64_t restarts,
                                                                const Budget& budget = Budget{}) {
  std::vector<Solution<typename Model::energy_type>> out;
  if (!LaneAnnealer<Model, Width>::fits(model)) return out;
  out.reserve(static_cast<std::size_t>(restarts));
  for (std::uint64_t first = 0; first < restarts; first += Width) {
    const auto count = static_cast<std::size_t>(restarts - first < Width ? restarts - first : Width);
    LaneAnnealer<Model, Width> lanes(model, params, seed, first, count);
    double seconds = 0;
    const StopReason why = lanes.advance(budget, &seconds);
    for (std::size_t l = 0; l < count; ++l) {
      out.push_back(lanes.solution(l));
      out.back().reason = why;
      out.back().seconds = seconds;
    }
  }
  return out;
}
#endif

}  // namespace spinwright

#endif  // SPINWRIGHT_KERNELS_LANES_HPP
