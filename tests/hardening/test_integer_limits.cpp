// Integer models near the accumulator's limit (model/form.hpp: integer_energy_limit = INT64_MAX/4):
// models, edits and conversions whose energy range would pass the limit are refused rather than
// wrapped, and flips and edits at the limit stay exact (SpinState::check() and an independent
// recomputation in 128-bit arithmetic).
#include <doctest/doctest.h>

#include <spinwright/model/builder.hpp>
#include <spinwright/model/convert.hpp>
#include <spinwright/model/dense_model.hpp>
#include <spinwright/rng/xoshiro.hpp>
#include <spinwright/state/spin_state.hpp>

#include "support/enumerate.hpp"

#include <cstdint>  // std::int64_t, std::uint64_t
#include <limits>   // std::numeric_limits
#include <utility>  // std::move
#include <vector>   // std::vector

namespace sw = spinwright;

namespace {

__extension__ typedef __int128 Wide;  // exact reference arithmetic (GCC and Clang)

constexpr std::int64_t L = static_cast<std::int64_t>(sw::integer_energy_limit);
constexpr std::int64_t i64_min = std::numeric_limits<std::int64_t>::min();
constexpr std::int64_t i64_max = std::numeric_limits<std::int64_t>::max();

Wide mag(Wide v) { return v < 0 ? -v : v; }

// Energy recomputed in 128 bits from the model's coefficients (no use of model.energy()).
template <class Model>
Wide wide_energy(const Model& m, const std::int8_t* s) {
  Wide e = m.offset();
  for (std::uint32_t i = 0; i < m.num_spins(); ++i) {
    const auto ii = static_cast<typename Model::index_type>(i);
    if constexpr (Model::form == sw::Form::ising) {
      e += static_cast<Wide>(m.site_term(ii)) * s[i];
    } else if (s[i] < 0) {
      e += m.site_term(ii);
    }
    m.for_each_neighbour(ii, [&](typename Model::index_type j, typename Model::value_type v) {
      if (j <= ii) return;
      if constexpr (Model::form == sw::Form::ising) {
        e += static_cast<Wide>(v) * s[i] * s[j];
      } else if (s[i] < 0 && s[j] < 0) {
        e += v;
      }
    });
  }
  return e;
}

template <class Model>
Wide wide_range(const Model& m) {
  Wide r = mag(m.offset());
  for (std::uint32_t i = 0; i < m.num_spins(); ++i) {
    const auto ii = static_cast<typename Model::index_type>(i);
    r += mag(m.site_term(ii));
    m.for_each_neighbour(ii, [&](typename Model::index_type j, typename Model::value_type v) {
      if (j > ii) r += mag(v);
    });
  }
  return r;
}

template <class Model>
void require_exact(const sw::SpinState<Model>& st) {
  const auto c = st.check();
  REQUIRE(c.exact);
  REQUIRE(static_cast<Wide>(st.energy()) == wide_energy(st.model(), st.spins()));
  const Wide bound = wide_range(st.model());
  REQUIRE(bound <= static_cast<Wide>(sw::integer_energy_limit));
  REQUIRE(mag(st.energy()) <= bound);
  for (std::uint32_t i = 0; i < st.size(); ++i) REQUIRE(mag(st.local_field(i)) <= bound);
}

// A random integer model whose energy range is exactly `range` (<= L): random terms, then the
// remainder put on the offset with a random sign.
template <class Builder>
auto model_with_range(std::uint32_t n, Wide range, sw::Xoshiro256& rng) {
  Builder b(n);
  Wide left = range;
  for (std::uint32_t i = 0; i < n; ++i) {
    for (std::uint32_t j = i + 1; j < n; ++j) {
      if (!rng.coin()) continue;
      const auto v = static_cast<std::int64_t>(static_cast<Wide>(rng.next() >> 4) % (left / (n * n) + 1)) + 1;
      left -= v;
      if constexpr (std::is_same_v<Builder, sw::IsingBuilder<std::int64_t>>) {
        b.add_coupling(i, j, rng.coin() ? v : -v);
      } else {
        b.add_pair(i, j, rng.coin() ? v : -v);
      }
    }
    const auto h = static_cast<std::int64_t>(static_cast<Wide>(rng.next() >> 4) % (left / (2 * n) + 1));
    left -= h;
    if constexpr (std::is_same_v<Builder, sw::IsingBuilder<std::int64_t>>) {
      b.add_field(i, rng.coin() ? h : -h);
    } else {
      b.add_unary(i, rng.coin() ? h : -h);
    }
  }
  b.add_offset(rng.coin() ? static_cast<std::int64_t>(left) : -static_cast<std::int64_t>(left));
  return b.build();
}

}  // namespace

TEST_CASE("builders accept an energy range of exactly integer_energy_limit and refuse one more") {
  CHECK(L == (std::int64_t{1} << 61) - 1);  // INT64_MAX / 4 = 2^61 - 1
  for (int where = 0; where < 3; ++where) {
    CAPTURE(where);
    auto make_ising = [&](std::int64_t extra) {
      sw::IsingBuilder<std::int64_t> b;
      // L + extra split over a field, a coupling and the offset; `where` gets the remainder.
      const std::int64_t part = L / 3;
      const std::int64_t rest = L - 2 * part + extra;
      b.add_field(0, where == 0 ? -rest : -part);
      b.add_coupling(0, 1, where == 1 ? rest : part);
      b.add_offset(where == 2 ? -rest : -part);
      return b.build();
    };
    auto at = make_ising(0);
    REQUIRE(at.ok());
    CHECK(wide_range(at.value()) == L);
    CHECK(at->energy_bound() == static_cast<double>(L));
    auto over = make_ising(1);
    REQUIRE_FALSE(over.ok());
    CHECK(over.status().code == sw::StatusCode::energy_overflow);

    sw::QuboBuilder<std::int64_t> q;
    q.add_unary(0, where == 0 ? L : 1).add_pair(0, 1, where == 1 ? L : 1).add_offset(where == 2 ? -L : -1);
    auto qo = q.build();
    REQUIRE_FALSE(qo.ok());
    CHECK(qo.status().code == sw::StatusCode::energy_overflow);
  }
  // Extremes of int64 itself: |INT64_MIN| does not fit the signed type and is far beyond the limit.
  sw::IsingBuilder<std::int64_t> b;
  b.add_field(0, i64_min);
  CHECK(b.build().status().code == sw::StatusCode::energy_overflow);
  sw::IsingBuilder<std::int64_t> c;
  c.add_coupling(0, 1, i64_max).add_coupling(1, 0, 1);  // merged pair overflows int64 itself
  const auto merged = c.build();
  REQUIRE_FALSE(merged.ok());
  CHECK(merged.status().code == sw::StatusCode::value_out_of_range);
  sw::IsingBuilder<std::int64_t> d;
  d.add_offset(i64_max).add_offset(1);  // offset accumulation overflows int64: refused at that term
  const auto off = d.build();
  REQUIRE_FALSE(off.ok());
  CHECK(off.status().code == sw::StatusCode::energy_overflow);
  CHECK(off.status().term == 1);
  // 32-bit values: merged terms that leave int32 are refused, never truncated.
  sw::QuboBuilder<std::int32_t> e;
  e.add_pair(0, 1, std::numeric_limits<std::int32_t>::max()).add_pair(1, 0, 1);
  CHECK(e.build().status().code == sw::StatusCode::value_out_of_range);
}

TEST_CASE("set_site_term, set_pair and set_offset refuse edits past the limit and leave the model unchanged") {
  sw::IsingBuilder<std::int64_t> b;
  b.add_field(0, L - 100).add_coupling(0, 1, 50).add_field(1, -10).add_offset(-40);
  auto built = b.build();
  REQUIRE(built.ok());
  auto& m = built.value();
  REQUIRE(wide_range(m) == L);

  CHECK(m.set_site_term(1, -11).code == sw::StatusCode::energy_overflow);
  CHECK(m.site_term(1) == -10);
  CHECK(m.set_pair(0, 1, -51).code == sw::StatusCode::energy_overflow);
  CHECK(m.pair(0, 1) == 50);
  CHECK(m.pair(1, 0) == 50);
  CHECK(m.set_offset(41).code == sw::StatusCode::energy_overflow);
  CHECK(m.offset() == -40);
  CHECK(m.set_site_term(0, i64_min).code == sw::StatusCode::energy_overflow);
  CHECK(m.set_offset(i64_min).code == sw::StatusCode::energy_overflow);
  CHECK(wide_range(m) == L);
  CHECK(m.energy_bound() == static_cast<double>(L));

  // Moving magnitude from one term to another at the limit is allowed.
  CHECK(m.set_site_term(1, 0).ok());
  CHECK(m.set_pair(0, 1, -60).ok());
  CHECK(m.set_offset(40).ok());
  CHECK(wide_range(m) == L);
  CHECK(m.set_site_term(0, -(L - 100)).ok());
  CHECK(wide_range(m) == L);
  // Refusals name the term.
  const auto st = m.set_pair(1, 0, 61);
  CHECK(st.code == sw::StatusCode::energy_overflow);
  CHECK(st.i == 1);
  CHECK(st.j == 0);
}

TEST_CASE("edit_site_term, edit_pair and edit_offset at the limit keep a state exact; refused edits change nothing") {
  sw::Xoshiro256 rng(2024);
  for (int trial = 0; trial < 40; ++trial) {
    const std::uint32_t n = 2 + static_cast<std::uint32_t>(rng.below(9));
    const Wide range = static_cast<Wide>(L) - static_cast<Wide>(rng.below(1000));
    auto built = model_with_range<sw::IsingBuilder<std::int64_t>>(n, range, rng);
    REQUIRE(built.ok());
    auto& m = built.value();
    REQUIRE(wide_range(m) == range);
    sw::SpinState<sw::IsingModel<std::int64_t>> st(m);
    st.randomize(rng);
    require_exact(st);
    for (int step = 0; step < 200; ++step) {
      const auto i = static_cast<std::uint32_t>(rng.below(n));
      const std::int64_t before_energy = st.energy();
      const Wide now = wide_range(m);
      const Wide room = static_cast<Wide>(L) - now;
      switch (rng.below(4)) {
        case 0: {  // flip
          const auto d = st.delta(i);
          st.flip(i);
          REQUIRE(static_cast<Wide>(st.energy()) == static_cast<Wide>(before_energy) + d);
          break;
        }
        case 1: {  // field edit: either exactly fills the room or passes it by one
          const Wide old = m.site_term(i);
          const bool over = rng.coin();
          const Wide target = mag(old) + room + (over ? 1 : 0);
          if (target > static_cast<Wide>(i64_max)) break;
          const auto v = static_cast<std::int64_t>(rng.coin() ? target : -target);
          const sw::Status s = sw::edit_site_term(m, st, i, v);
          if (over) {
            REQUIRE(s.code == sw::StatusCode::energy_overflow);
            REQUIRE(static_cast<Wide>(m.site_term(i)) == old);
            REQUIRE(st.energy() == before_energy);
          } else {
            REQUIRE(s.ok());
            REQUIRE(wide_range(m) == static_cast<Wide>(L));
          }
          break;
        }
        case 2: {  // pair edit
          if (m.degree(i) == 0) break;
          const auto j = m.neighbours(i)[rng.below(static_cast<std::uint32_t>(m.degree(i)))];
          const Wide old = m.pair(i, j);
          const bool over = rng.coin();
          const Wide target = mag(old) + room + (over ? 1 : 0);
          if (target > static_cast<Wide>(i64_max)) break;
          const auto v = static_cast<std::int64_t>(rng.coin() ? target : -target);
          const sw::Status s = sw::edit_pair(m, st, i, j, v);
          if (over) {
            REQUIRE(s.code == sw::StatusCode::energy_overflow);
            REQUIRE(static_cast<Wide>(m.pair(i, j)) == old);
            REQUIRE(static_cast<Wide>(m.pair(j, i)) == old);
            REQUIRE(st.energy() == before_energy);
          } else {
            REQUIRE(s.ok());
            REQUIRE(m.pair(j, i) == v);
          }
          break;
        }
        default: {  // offset edit, sometimes to a small value (frees room for the others)
          const Wide old = m.offset();
          const bool over = rng.coin();
          const Wide target = rng.below(4) == 0 ? Wide(rng.below(100)) : mag(old) + room + (over ? 1 : 0);
          const bool refuse = mag(target) - mag(old) > room;
          const auto c = static_cast<std::int64_t>(rng.coin() ? target : -target);
          const sw::Status s = sw::edit_offset(m, st, c);
          REQUIRE(s.ok() == !refuse);
          if (refuse) {
            REQUIRE(static_cast<Wide>(m.offset()) == old);
            REQUIRE(st.energy() == before_energy);
          }
          break;
        }
      }
      require_exact(st);
    }
  }
}

TEST_CASE("QUBO models at the limit: flips and edits stay exact") {
  sw::Xoshiro256 rng(77);
  for (int trial = 0; trial < 20; ++trial) {
    const std::uint32_t n = 2 + static_cast<std::uint32_t>(rng.below(7));
    auto built = model_with_range<sw::QuboBuilder<std::int64_t>>(n, static_cast<Wide>(L), rng);
    REQUIRE(built.ok());
    auto& m = built.value();
    sw::SpinState<sw::QuboModel<std::int64_t>> st(m);
    st.randomize(rng);
    for (int step = 0; step < 300; ++step) {
      const auto i = static_cast<std::uint32_t>(rng.below(n));
      if (rng.below(3) != 0) {
        st.flip(i);
      } else {
        // Swap the sign of a unary term: same range, large change of every affected field.
        REQUIRE(sw::edit_site_term(m, st, i, -m.site_term(i)).ok());
      }
      require_exact(st);
    }
  }
}

TEST_CASE("qubo_from refuses Ising models whose QUBO form does not fit, and is exact at the edge") {
  // 4 J must fit the value type.
  sw::IsingBuilder<std::int64_t> big;
  big.add_coupling(0, 1, i64_max / 4 + 1);
  auto bm = big.build();
  REQUIRE_FALSE(bm.ok());  // already beyond the range limit
  sw::IsingBuilder<std::int32_t> b32;
  b32.add_coupling(0, 1, std::numeric_limits<std::int32_t>::max() / 4 + 1);
  auto m32 = b32.build();
  REQUIRE(m32.ok());
  const auto q32 = sw::qubo_from(m32.value());
  REQUIRE_FALSE(q32.ok());
  CHECK(q32.status().code == sw::StatusCode::value_out_of_range);

  // The QUBO range of J s0 s1 is |4J| + 2|2J| + |J| = 9|J| (Q01 = 4J, Q00 = Q11 = -2J, c = J):
  // an Ising model of range |J| far below the limit can still have a QUBO form beyond it.
  sw::IsingBuilder<std::int64_t> edge;
  edge.add_coupling(0, 1, L / 9 + 1);
  auto em = edge.build();
  REQUIRE(em.ok());
  const auto eq = sw::qubo_from(em.value());
  REQUIRE_FALSE(eq.ok());

  sw::IsingBuilder<std::int64_t> fits;
  fits.add_coupling(0, 1, L / 9);
  auto fm = fits.build();
  REQUIRE(fm.ok());
  const auto fq = sw::qubo_from(fm.value());
  REQUIRE(fq.ok());
  test_support::for_each_assignment(2, [&](const std::int8_t* s) {
    CHECK(fq->energy(s) == fm->energy(s));
    CHECK(static_cast<Wide>(fq->energy(s)) == wide_energy(fm.value(), s));
  });

  // Random Ising models with large coefficients: qubo_from either refuses (and then the exact
  // QUBO range really passes the limit) or converts with every energy exact.
  sw::Xoshiro256 rng(5);
  for (int trial = 0; trial < 60; ++trial) {
    const std::uint32_t n = 2 + static_cast<std::uint32_t>(rng.below(6));
    const Wide range = static_cast<Wide>(L) / (1 + rng.below(12));
    auto built = model_with_range<sw::IsingBuilder<std::int64_t>>(n, range, rng);
    REQUIRE(built.ok());
    const auto& m = built.value();
    Wide qrange = 0, c = m.offset();
    for (std::uint32_t i = 0; i < n; ++i) {
      Wide qii = -2 * static_cast<Wide>(m.site_term(i));
      c += m.site_term(i);
      m.for_each_neighbour(i, [&](std::uint32_t j, std::int64_t v) {
        qii -= 2 * static_cast<Wide>(v);
        if (j > i) {
          c += v;
          qrange += mag(4 * static_cast<Wide>(v));
        }
      });
      qrange += mag(qii);
    }
    qrange += mag(c);
    const auto q = sw::qubo_from(m);
    CHECK(q.ok() == (qrange <= static_cast<Wide>(L)));
    if (q.ok()) {
      test_support::for_each_assignment(n, [&](const std::int8_t* s) { REQUIRE(q->energy(s) == m.energy(s)); });
    }
  }
}

TEST_CASE("dense copies of integer models at the limit keep the exact range") {
  // The range 2^61 - 1 is not a double; the dense copy must not round it (a no-op edit was
  // refused before DenseModel::from summed the magnitudes exactly).
  sw::IsingBuilder<std::int64_t> b;
  b.add_field(0, L - 200).add_field(1, 1).add_coupling(0, 1, 199);
  auto sm = b.build();
  REQUIRE(sm.ok());
  auto dm = sw::DenseIsingModel<std::int64_t>::from(sm.value());
  REQUIRE(dm.ok());
  auto& d = dm.value();
  CHECK(d.set_site_term(0, L - 200).ok());  // no-op edit at the limit
  CHECK(d.set_site_term(1, 2).code == sw::StatusCode::energy_overflow);
  CHECK(d.set_pair(0, 1, -200).code == sw::StatusCode::energy_overflow);
  CHECK(d.set_pair(0, 1, -199).ok());
  CHECK(d.set_offset(1).code == sw::StatusCode::energy_overflow);
  CHECK(d.set_site_term(1, 0).ok());
  CHECK(d.set_offset(-1).ok());
  sw::SpinState<sw::DenseIsingModel<std::int64_t>> st(d);
  for (int k = 0; k < 20; ++k) {
    st.flip(static_cast<std::uint32_t>(k % 2));
    REQUIRE(st.check().exact);
  }
}
