// Floating models: NaN and infinity never enter a model or a state through a public entry point
// (builders, in-place edits of sparse and dense models, edits through a state, conversions,
// file readers), and a model whose range could push a flip delta to infinity is refused.
#include <doctest/doctest.h>

#include <spinwright/io/edge_list.hpp>
#include <spinwright/io/matrix_market.hpp>
#include <spinwright/io/model_file.hpp>
#include <spinwright/model/builder.hpp>
#include <spinwright/model/convert.hpp>
#include <spinwright/model/dense_model.hpp>
#include <spinwright/rng/xoshiro.hpp>
#include <spinwright/state/spin_state.hpp>

#include <cstdint>  // std::uint32_t
#include <limits>   // std::numeric_limits
#include <string>   // std::string

namespace sw = spinwright;

namespace {

template <class T>
bool finite(T v) {
  return sw::detail::is_finite(v);
}

template <class Value>
const Value bad_values[] = {std::numeric_limits<Value>::quiet_NaN(), -std::numeric_limits<Value>::quiet_NaN(),
                            std::numeric_limits<Value>::infinity(), -std::numeric_limits<Value>::infinity()};

template <class Model>
void require_finite_state(const sw::SpinState<Model>& st) {
  REQUIRE(finite(st.energy()));
  for (std::uint32_t i = 0; i < st.size(); ++i) {
    REQUIRE(finite(st.local_field(i)));
    REQUIRE(finite(st.delta(i)));
  }
}

}  // namespace

TEST_CASE_TEMPLATE("builders refuse NaN and infinity, naming the term", Value, double, float) {
  for (const Value bad : bad_values<Value>) {
    sw::IsingBuilder<Value> a;
    a.add_field(0, 1).add_coupling(0, 1, bad).add_field(1, 2);
    const auto ra = a.build();
    REQUIRE_FALSE(ra.ok());
    CHECK(ra.status().code == sw::StatusCode::non_finite_value);
    CHECK(ra.status().term == 1);
    CHECK(ra.status().i == 0);
    CHECK(ra.status().j == 1);

    sw::IsingBuilder<Value> f;
    f.add_field(3, bad);
    CHECK(f.build().status().code == sw::StatusCode::non_finite_value);

    sw::QuboBuilder<Value> q;
    q.add_pair(0, 1, 1).add_unary(2, bad);
    const auto rq = q.build();
    CHECK(rq.status().code == sw::StatusCode::non_finite_value);
    CHECK(rq.status().term == 1);

    sw::QuboBuilder<Value> p;
    p.add_pair(2, 2, bad);  // a self-pair is a unary term, still refused
    CHECK(p.build().status().code == sw::StatusCode::non_finite_value);

    sw::QuboBuilder<Value> o;
    o.add_offset(static_cast<double>(bad));
    CHECK(o.build().status().code == sw::StatusCode::non_finite_value);
  }
  // Finite terms whose sum overflows are refused too (never stored as infinity).
  const Value top = std::numeric_limits<Value>::max();
  sw::IsingBuilder<Value> s;
  s.add_coupling(0, 1, top).add_coupling(1, 0, top);
  CHECK_FALSE(s.build().ok());
  sw::IsingBuilder<Value> h;
  h.add_field(0, top).add_field(0, top);
  CHECK_FALSE(h.build().ok());
  sw::IsingBuilder<Value> c;
  c.add_coupling(0, 0, top)
      .add_offset(std::numeric_limits<double>::max())
      .add_offset(std::numeric_limits<double>::max());
  CHECK_FALSE(c.build().ok());
}

TEST_CASE("floating models whose flip deltas could reach infinity are refused") {
  // An Ising flip delta is -2 s_i f_i, so a local field above DBL_MAX / 2 would give an infinite
  // delta; the builder keeps the range within float_energy_limit = DBL_MAX / 4.
  const double big = std::numeric_limits<double>::max() / 3;
  sw::IsingBuilder<double> b;
  b.add_coupling(0, 1, big);
  const auto r = b.build();
  REQUIRE_FALSE(r.ok());
  CHECK(r.status().code == sw::StatusCode::energy_overflow);

  sw::IsingBuilder<double> ok;
  ok.add_coupling(0, 1, sw::float_energy_limit / 2).add_field(1, sw::float_energy_limit / 2);
  auto m = ok.build();
  REQUIRE(m.ok());
  sw::SpinState<sw::IsingModel<double>> st(m.value());
  for (int k = 0; k < 8; ++k) {
    require_finite_state(st);
    st.flip(static_cast<std::uint32_t>(k % 2));
  }
  // Edits that would pass the limit are refused and leave the model as it was.
  CHECK(m->set_offset(1e300).code == sw::StatusCode::energy_overflow);
  CHECK(m->offset() == 0);
  CHECK(m->set_site_term(0, sw::float_energy_limit / 2).code == sw::StatusCode::energy_overflow);
  CHECK(m->site_term(0) == 0);
  CHECK(m->set_pair(0, 1, sw::float_energy_limit).code == sw::StatusCode::energy_overflow);
  CHECK(m->pair(0, 1) == sw::float_energy_limit / 2);
  CHECK(m->energy_bound() == sw::float_energy_limit);

  auto dm = sw::DenseIsingModel<double>::from(m.value());
  REQUIRE(dm.ok());
  CHECK(dm->set_offset(1e300).code == sw::StatusCode::energy_overflow);
  CHECK(dm->set_site_term(0, 1e300).code == sw::StatusCode::energy_overflow);
  CHECK(dm->offset() == 0);
}

TEST_CASE_TEMPLATE("in-place edits refuse NaN and infinity and leave model and state unchanged", Value, double, float) {
  sw::IsingBuilder<Value> b;
  b.add_field(0, 1).add_coupling(0, 1, -2).add_coupling(1, 2, 3).add_offset(0.5);
  auto built = b.build();
  REQUIRE(built.ok());
  auto& m = built.value();
  sw::SpinState<sw::IsingModel<Value>> st(m);
  sw::Xoshiro256 rng(3);
  st.randomize(rng);
  const double energy = st.energy();
  for (const Value bad : bad_values<Value>) {
    CHECK(m.set_site_term(0, bad).code == sw::StatusCode::non_finite_value);
    CHECK(m.set_pair(0, 1, bad).code == sw::StatusCode::non_finite_value);
    CHECK(m.set_offset(static_cast<double>(bad)).code == sw::StatusCode::non_finite_value);
    CHECK(sw::edit_site_term(m, st, 2, bad).code == sw::StatusCode::non_finite_value);
    CHECK(sw::edit_pair(m, st, 2, 1, bad).code == sw::StatusCode::non_finite_value);
    CHECK(sw::edit_offset(m, st, static_cast<double>(bad)).code == sw::StatusCode::non_finite_value);
  }
  CHECK(m.site_term(0) == 1);
  CHECK(m.pair(1, 0) == -2);
  CHECK(m.pair(2, 1) == 3);
  CHECK(m.offset() == 0.5);
  CHECK(st.energy() == energy);
  CHECK(st.check().exact);
  require_finite_state(st);

  auto dm = sw::DenseModel<sw::Form::ising, Value>::from(m);
  REQUIRE(dm.ok());
  for (const Value bad : bad_values<Value>) {
    CHECK(dm->set_site_term(1, bad).code == sw::StatusCode::non_finite_value);
    CHECK(dm->set_pair(0, 2, bad).code == sw::StatusCode::non_finite_value);
    CHECK(dm->set_offset(static_cast<double>(bad)).code == sw::StatusCode::non_finite_value);
  }
  CHECK(dm->site_term(1) == 0);
  CHECK(dm->pair(2, 0) == 0);
}

TEST_CASE("conversions of floating models never produce NaN or infinity") {
  // qubo_from multiplies couplings by 4: at the range limit that would overflow nothing, but the
  // result's range can pass the limit, which must be refused rather than stored.
  sw::IsingBuilder<double> b;
  b.add_coupling(0, 1, sw::float_energy_limit / 2).add_field(0, -sw::float_energy_limit / 4);
  auto m = b.build();
  REQUIRE(m.ok());
  const auto q = sw::qubo_from(m.value());
  REQUIRE_FALSE(q.ok());

  sw::QuboBuilder<float> qb;
  qb.add_pair(0, 1, std::numeric_limits<float>::max()).add_unary(0, -std::numeric_limits<float>::max());
  auto qm = qb.build();
  REQUIRE(qm.ok());
  const auto im = sw::ising_from(qm.value());
  REQUIRE(im.ok());
  for (std::uint32_t i = 0; i < 2; ++i) CHECK(finite(im->site_term(i)));
  CHECK(finite(im->pair(0, 1)));
  CHECK(finite(im->offset()));
}

TEST_CASE("file readers refuse NaN, infinity and values that overflow the value type, naming file and line") {
  const char* const bad_weights[] = {"nan", "NaN", "inf", "-inf", "Infinity", "1e400", "-1e999"};
  for (const char* w : bad_weights) {
    CAPTURE(w);
    const std::string edges = std::string("3 2\n1 2 1.5\n2 3 ") + w + "\n";
    const auto d = sw::io::parse_edge_list<double>(edges, "weights.txt");
    REQUIRE_FALSE(d.ok());
    CHECK(d.status().line == 3);
    CHECK(d.message().rfind("weights.txt:3: ", 0) == 0);
    const auto f = sw::io::parse_edge_list<float>(edges, "weights.txt");
    REQUIRE_FALSE(f.ok());
    CHECK(f.status().line == 3);

    const std::string mm = std::string("%%MatrixMarket matrix coordinate real general\n% spinwright form ising\n") +
                           "% spinwright offset 0\n2 2 2\n1 1 0.5\n1 2 " + w + "\n";
    const auto r = sw::io::parse_matrix_market<sw::IsingModel<double>>(mm, "model.mtx");
    REQUIRE_FALSE(r.ok());
    CHECK(r.status().line == 6);
    const std::string mo = std::string("%%MatrixMarket matrix coordinate real general\n% spinwright form qubo\n") +
                           "% spinwright offset " + w + "\n2 2 1\n1 2 1\n";
    const auto o = sw::io::parse_matrix_market<sw::QuboModel<double>>(mo, "model.mtx");
    REQUIRE_FALSE(o.ok());
    CHECK(o.status().line == 3);
    const auto any = sw::io::parse_model_text(edges, "weights.txt");
    REQUIRE_FALSE(any.ok());
  }
  // A finite double that does not fit a float model is refused, not turned into infinity.
  const auto f = sw::io::parse_edge_list<float>("2 1\n1 2 1e39\n", "weights.txt");
  REQUIRE_FALSE(f.ok());
  CHECK(f.status().line == 2);
  // So is a double model whose range would let a flip delta overflow.
  const auto g = sw::io::parse_edge_list<double>("3 2\n1 2 1e308\n2 3 1e308\n", "weights.txt");
  REQUIRE_FALSE(g.ok());
  CHECK(g.status().code == sw::StatusCode::energy_overflow);
}
