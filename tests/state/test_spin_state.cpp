// Incremental state: every delta equals the recomputed energy change, on every model type.
#include <doctest/doctest.h>
#include <spinwright/kernels/detail/flip_loop.hpp>
#include <spinwright/spinwright.hpp>

#include <cstdint>
#include <type_traits>
#include <vector>

using namespace spinwright;

namespace {

template <class Model>
struct Random {
  static Model make(std::uint64_t seed, std::uint32_t n, int pairs) {
    using V = typename Model::value_type;
    Xoshiro256 rng(seed);
    auto draw = [&]() -> V {
      if constexpr (std::is_integral_v<V>) {
        return static_cast<V>(static_cast<int>(rng.below(41)) - 20);
      } else {
        return static_cast<V>(rng.uniform() * 4.0 - 2.0);
      }
    };
    if constexpr (Model::form == Form::ising) {
      IsingBuilder<V, typename Model::index_type> b(n);
      for (int k = 0; k < pairs; ++k) b.add_coupling(rng.below(n), rng.below(n), draw());
      for (std::uint32_t i = 0; i < n; ++i) b.add_field(i, draw());
      b.add_offset(3);
      return std::move(b.build().value());
    } else {
      QuboBuilder<V, typename Model::index_type> b(n);
      for (int k = 0; k < pairs; ++k) b.add_pair(rng.below(n), rng.below(n), draw());
      for (std::uint32_t i = 0; i < n; ++i) b.add_unary(i, draw());
      b.add_offset(-2);
      return std::move(b.build().value());
    }
  }
};

template <class Model>
void check_close(typename Model::energy_type a, typename Model::energy_type b) {
  if constexpr (std::is_integral_v<typename Model::energy_type>) {
    CHECK(a == b);
  } else {
    CHECK(a == doctest::Approx(b).epsilon(1e-9).scale(100));
  }
}

template <class Model>
void exercise(const Model& m, std::uint64_t seed) {
  using I = typename Model::index_type;
  const auto n = static_cast<std::uint32_t>(m.num_spins());
  Xoshiro256 rng(seed);
  SpinState<Model> st(m);
  st.randomize(rng);
  check_close<Model>(st.energy(), m.energy(st.spins()));
  std::vector<std::int8_t> s(st.spins(), st.spins() + n);
  for (int step = 0; step < 300; ++step) {
    const auto i = static_cast<I>(rng.below(n));
    const auto before = m.energy(s.data());
    const auto d = st.delta(i);
    s[i] = static_cast<std::int8_t>(-s[i]);
    const auto after = m.energy(s.data());
    check_close<Model>(d, after - before);
    st.flip(i);
    check_close<Model>(st.energy(), after);
  }
  // Groups: distinct indices, couplings inside the group counted once.
  for (int trial = 0; trial < 50; ++trial) {
    std::vector<I> group;
    std::vector<std::int8_t> in(n, 0);
    const std::uint32_t k = 1 + rng.below(n < 6 ? n : 6);
    while (group.size() < k) {
      const auto i = static_cast<I>(rng.below(n));
      if (!in[i]) {
        in[i] = 1;
        group.push_back(i);
      }
    }
    std::vector<std::int8_t> t(st.spins(), st.spins() + n);
    const auto before = m.energy(t.data());
    for (const I i : group) t[i] = static_cast<std::int8_t>(-t[i]);
    check_close<Model>(st.delta_group(group.data(), group.size()), m.energy(t.data()) - before);
    st.flip_group(group.data(), group.size());
    check_close<Model>(st.energy(), m.energy(t.data()));
  }
  // Exchanges of two opposite spins keep the number of +1 spins.
  for (int trial = 0; trial < 50; ++trial) {
    const auto i = static_cast<I>(rng.below(n));
    const auto j = static_cast<I>(rng.below(n));
    if (st.spin(i) == st.spin(j)) continue;
    std::vector<std::int8_t> t(st.spins(), st.spins() + n);
    const auto before = m.energy(t.data());
    t[i] = static_cast<std::int8_t>(-t[i]);
    t[j] = static_cast<std::int8_t>(-t[j]);
    check_close<Model>(st.delta_swap(i, j), m.energy(t.data()) - before);
    st.apply_swap(i, j);
  }
  const auto c = st.check();
  if constexpr (std::is_integral_v<typename Model::value_type>) CHECK(c.exact);
  CHECK(c.max_field_error < 1e-9);
  st.resync();
  CHECK(st.check().exact);
}

}  // namespace

TEST_CASE_TEMPLATE("delta, group delta and exchange delta equal recomputed energy changes", Model,
                   IsingModel<std::int32_t>, IsingModel<std::int64_t, std::uint16_t>, IsingModel<float>,
                   IsingModel<double, std::uint16_t>, QuboModel<std::int32_t>, QuboModel<std::int64_t>,
                   QuboModel<float, std::uint16_t>, QuboModel<double>) {
  for (std::uint64_t seed = 1; seed <= 4; ++seed) {
    const auto m = Random<Model>::make(seed, 12 + static_cast<std::uint32_t>(seed) * 5, 80);
    exercise(m, seed * 31);
  }
}

TEST_CASE_TEMPLATE("dense models: same state behaviour", Value, std::int32_t, double) {
  const auto sparse = Random<IsingModel<Value>>::make(5, 15, 200);
  exercise(DenseIsingModel<Value>::from(sparse).value(), 77);
  const auto qs = Random<QuboModel<Value>>::make(6, 14, 200);
  exercise(DenseQuboModel<Value>::from(qs).value(), 78);
}

TEST_CASE_TEMPLATE("in-place edits keep local fields and energy exact", Model, IsingModel<std::int64_t>,
                   QuboModel<std::int32_t>, IsingModel<double>) {
  using V = typename Model::value_type;
  using I = typename Model::index_type;
  Model m = Random<Model>::make(11, 30, 120);
  Xoshiro256 rng(5);
  SpinState<Model> st(m);
  st.randomize(rng);
  for (int step = 0; step < 400; ++step) {
    const auto i = static_cast<I>(rng.below(30));
    switch (rng.below(4)) {
      case 0:
        REQUIRE(edit_site_term(m, st, i, static_cast<V>(static_cast<int>(rng.below(21)) - 10)).ok());
        break;
      case 1: {
        const auto nb = m.neighbours(i);
        if (nb.empty()) break;
        const I j = nb[rng.below(static_cast<std::uint32_t>(nb.size()))];
        REQUIRE(edit_pair(m, st, i, j, static_cast<V>(static_cast<int>(rng.below(21)) - 10)).ok());
        CHECK(m.pair(j, i) == m.pair(i, j));
        break;
      }
      case 2:
        REQUIRE(edit_offset(m, st, static_cast<typename Model::energy_type>(rng.below(9))).ok());
        break;
      default:
        st.flip(i);
        break;
    }
    check_close<Model>(st.energy(), m.energy(st.spins()));
  }
  const auto c = st.check();
  if constexpr (std::is_integral_v<V>) CHECK(c.exact);
  CHECK(c.max_field_error < 1e-9);
  // An edit of a pair the pattern does not hold is refused and changes nothing.
  const auto e = st.energy();
  I far = 0;
  while (far < 30 && (far == 0 || m.find(0, far) != Model::npos)) ++far;
  if (far < 30) {
    CHECK(edit_pair(m, st, 0, far, V{1}).code == StatusCode::missing_term);
    CHECK(st.energy() == e);
  }
}

TEST_CASE("floating models: resync restores the exact value after a long run of flips") {
  // Couplings with many significant bits make every flip round.
  const auto m = Random<IsingModel<float>>::make(21, 64, 400);
  SpinState<IsingModel<float>> st(m);
  Xoshiro256 rng(3);
  st.randomize(rng);
  for (int k = 0; k < 2000000; ++k) st.flip(static_cast<std::uint32_t>(rng.below(64)));
  const auto drifted = st.check();
  CHECK(drifted.energy_error < 1e-6);  // double accumulators: drift stays tiny (see DEVELOPERS.md)
  st.resync();
  const auto clean = st.check();
  CHECK(clean.exact);
  CHECK(st.energy() == m.energy(st.spins()));
}

TEST_CASE("integer models never drift") {
  const auto m = Random<IsingModel<std::int32_t>>::make(22, 64, 400);
  SpinState<IsingModel<std::int32_t>> st(m);
  Xoshiro256 rng(4);
  st.randomize(rng);
  for (int k = 0; k < 1000000; ++k) st.flip(static_cast<std::uint32_t>(rng.below(64)));
  CHECK(st.check().exact);
}

// The flips of a built-in single-flip sweep (kernels/detail/flip_loop.hpp) must leave exactly
// the state flip_with_delta leaves: same spins, same fields bit for bit (floating fields round
// in the same order), same energy once finish() hands it back. Sparse models take the path
// with the rows in locals; dense ones the state's own flip.
TEST_CASE_TEMPLATE("a sweep's flip loop flips exactly as flip_with_delta", Model, IsingModel<std::int32_t>,
                   IsingModel<double, std::uint16_t>, QuboModel<std::int64_t>, QuboModel<float, std::uint16_t>,
                   DenseIsingModel<std::int32_t>) {
  using Sparse = std::conditional_t<Model::form == Form::ising, IsingModel<typename Model::value_type>,
                                    QuboModel<typename Model::value_type>>;
  const auto random = Random<Sparse>::make(9, 40, 300);
  Model m = [&] {
    if constexpr (Model::is_dense) {
      return std::move(Model::from(random).value());
    } else {
      return Random<Model>::make(9, 40, 300);
    }
  }();
  CHECK(detail::has_row_arrays<Model>::value == !Model::is_dense);
  SpinState<Model> plain(m);
  SpinState<Model> looped(m);
  Xoshiro256 coins(5);
  plain.randomize(coins);
  looped.set_spins(plain.spins());
  Xoshiro256 rng(6);
  for (int sweep = 0; sweep < 3; ++sweep) {
    detail::FlipLoop<Model> flips(looped);
    for (int k = 0; k < 400; ++k) {
      const auto i = static_cast<typename Model::index_type>(rng.below(40));
      const auto d = plain.delta(i);
      REQUIRE(looped.delta(i) == d);
      plain.flip_with_delta(i, d);
      flips.flip(i, d);
    }
    flips.finish();
    for (std::uint32_t i = 0; i < 40; ++i) {
      const auto ii = static_cast<typename Model::index_type>(i);
      CHECK(looped.spin(ii) == plain.spin(ii));
      CHECK(looped.local_field(ii) == plain.local_field(ii));
    }
    CHECK(looped.energy() == plain.energy());
  }
  if constexpr (std::is_integral_v<typename Model::value_type>) CHECK(looped.check().exact);
}
