// The format-detecting reader: detection, value-type choice, conversions between formats, and
// every published max-cut instance in the shared data folder.
#include <doctest/doctest.h>
#include <spinwright/io/model_file.hpp>
#include <spinwright/model.hpp>
#include <spinwright/problems/max_cut.hpp>
#include <spinwright/rng/xoshiro.hpp>

#include <cstdint>
#include <fstream>
#include <map>
#include <sstream>
#include <string>
#include <vector>

#include "support/io_support.hpp"

using namespace spinwright;
using test_support::check_error;

TEST_CASE("format detection") {
  CHECK(io::detect_format("%%MatrixMarket matrix coordinate real general\n") == io::FileFormat::matrix_market);
  CHECK(io::detect_format("  %%matrixmarket matrix coordinate real general\r\n") == io::FileFormat::matrix_market);
  CHECK(io::detect_format("3 2\n1 2 1\n") == io::FileFormat::edge_list);
  CHECK(io::detect_format("% comment\n%%MatrixMarket\n") == io::FileFormat::edge_list);
  CHECK(io::detect_format("") == io::FileFormat::edge_list);
}

TEST_CASE("value type: Matrix Market follows its field; edge lists give int64 for integer literals") {
  auto a = io::parse_model_text("3 2\n1 2 1\n2 3 -4\n", "a.txt");
  REQUIRE(a.ok());
  CHECK(a->format == io::FileFormat::edge_list);
  CHECK(a->form == Form::ising);
  CHECK(a->integer);
  CHECK(a->ising_integer.coupling(1, 2) == -4);
  CHECK(a->num_spins() == 3);
  CHECK(a->num_pairs() == 2);

  auto b = io::parse_model_text("3 2\n1 2 1\n2 3 -4.5\n", "b.txt");
  REQUIRE(b.ok());
  CHECK_FALSE(b->integer);
  CHECK(b->ising_real.coupling(1, 2) == -4.5);

  const std::string mtx =
      "%%MatrixMarket matrix coordinate real general\n% spinwright offset 2\n2 2 2\n1 1 3\n1 2 -1\n";
  auto c = io::parse_model_text(mtx, "c.mtx");
  REQUIRE(c.ok());
  CHECK(c->format == io::FileFormat::matrix_market);
  CHECK(c->form == Form::qubo);  // the default form
  CHECK_FALSE(c->integer);       // the 'real' field decides, although every value is an integer literal
  CHECK(c->qubo_real.offset() == 2.0);
  CHECK(c->visit([](const auto& m) { return static_cast<double>(m.offset()); }) == 2.0);

  io::ReadOptions integer;
  integer.value_kind = io::ValueKind::integer;
  auto d = io::parse_model_text(mtx, "d.mtx", integer);
  REQUIRE(d.ok());
  CHECK(d->integer);
  CHECK(d->qubo_integer.unary(0) == 3);
  CHECK(d->qubo_integer.pair(0, 1) == -1);
  CHECK(d->qubo_integer.offset() == 2);

  io::ReadOptions real;
  real.value_kind = io::ValueKind::real;
  auto h = io::parse_model_text("3 2\n1 2 1\n2 3 -4\n", "h.txt", real);
  REQUIRE(h.ok());
  CHECK_FALSE(h->integer);
  CHECK(h->ising_real.coupling(1, 2) == -4.0);

  auto e = io::parse_model_text("3 2\n1 2 1\n2 3 0.5\n", "e.txt", integer);
  REQUIRE_FALSE(e.ok());
  check_error(e.status(), StatusCode::parse_error, "e.txt", 3);

  // An integer literal beyond int64 makes an edge list real (automatic) ...
  auto f = io::parse_model_text("3 1\n1 2 12345678901234567890\n", "f.txt");
  REQUIRE(f.ok());
  CHECK_FALSE(f->integer);
  CHECK(f->ising_real.coupling(0, 1) == 12345678901234567890.0);
  // ... and is refused when int64 is required, by the option or by an 'integer' banner.
  auto f2 = io::parse_model_text("3 1\n1 2 12345678901234567890\n", "f.txt", integer);
  REQUIRE_FALSE(f2.ok());
  check_error(f2.status(), StatusCode::value_out_of_range, "f.txt", 2);
  auto f3 = io::parse_model_text("%%MatrixMarket matrix coordinate integer general\n2 2 1\n1 2 12345678901234567890\n",
                                 "f3.mtx");
  REQUIRE_FALSE(f3.ok());
  check_error(f3.status(), StatusCode::value_out_of_range, "f3.mtx", 3);

  auto g = io::parse_model_text(
      "%%MatrixMarket matrix coordinate integer general\n% spinwright form ising\n2 2 1\n1 1 7\n", "g.mtx");
  REQUIRE(g.ok());
  CHECK(g->form == Form::ising);
  CHECK(g->ising_integer.field(0) == 7);
}

TEST_CASE("converting between formats through LoadedModel") {
  test_support::IoTempDir dir;
  const auto m = test_support::random_model<Form::ising, std::int64_t>(5, 60, 400, false, false);
  const std::string el = dir.file("g.txt");
  REQUIRE(io::write_edge_list(el, m).ok());
  auto loaded = io::read_model_file(el);
  REQUIRE_MESSAGE(loaded.ok(), loaded.message());
  const std::string mtx = dir.file("g.mtx");
  REQUIRE(io::write_model_file(mtx, loaded.value(), io::FileFormat::matrix_market).ok());
  auto again = io::read_model_file(mtx);
  REQUIRE(again.ok());
  CHECK(again->format == io::FileFormat::matrix_market);
  CHECK(again->form == Form::ising);
  REQUIRE(again->integer);
  test_support::check_same_model(m, again->ising_integer);
  auto text = io::format_model(again.value(), io::FileFormat::edge_list);
  REQUIRE(text.ok());
  auto original = io::format_edge_list(m);
  CHECK(text.value() == original.value());

  const auto q = test_support::random_model<Form::qubo, double>(6, 20, 50, true, true);
  auto qtext = io::format_matrix_market(q);
  auto ql = io::parse_model_text(qtext.value(), "q.mtx");
  REQUIRE(ql.ok());
  REQUIRE_FALSE(ql->integer);
  test_support::check_same_model(q, ql->qubo_real);
  auto refused = io::format_model(ql.value(), io::FileFormat::edge_list, "out.txt");
  REQUIRE_FALSE(refused.ok());
  check_error(refused.status(), StatusCode::invalid_argument, "out.txt", 0);

  // Real models keep their value type through the automatic reader, even when every value is
  // a whole number (the writer marks reals: "2.0", "1.2345678901234568e+20").
  IsingBuilder<double> rb(4);
  rb.add_coupling(0, 1, 2.0).add_coupling(1, 2, -123456789012345678901.0).add_coupling(2, 3, 1e300);
  auto rm = rb.build();
  REQUIRE(rm.ok());
  auto rtext = io::format_edge_list(rm.value());
  REQUIRE(rtext.ok());
  CHECK(rtext->find("1 2 2.0\n") != std::string::npos);
  auto rback = io::parse_model_text(rtext.value(), "r.txt");
  REQUIRE_MESSAGE(rback.ok(), rback.message());
  REQUIRE_FALSE(rback->integer);
  test_support::check_same_model(rm.value(), rback->ising_real);

  const std::string missing = dir.file("missing.mtx");
  auto r = io::read_model_file(missing);
  REQUIRE_FALSE(r.ok());
  check_error(r.status(), StatusCode::io_error, missing, 0);
  const std::string garbage = dir.write("garbage.bin", std::string("\x7f"
                                                                   "ELF\x01\x00\x00",
                                                                   7));
  auto gr = io::read_model_file(garbage);
  REQUIRE_FALSE(gr.ok());
  check_error(gr.status(), StatusCode::parse_error, garbage, 1);
}

namespace {

struct Reference {
  std::string family;
  std::uint64_t nodes = 0;
  std::uint64_t edges = 0;
};

std::map<std::string, Reference> read_reference_csv(const std::string& path) {
  std::map<std::string, Reference> out;
  std::ifstream in(path);
  std::string line;
  std::getline(in, line);  // column names
  while (std::getline(in, line)) {
    std::stringstream ss(line);
    std::string name, family, nodes, edges;
    std::getline(ss, name, ',');
    std::getline(ss, family, ',');
    std::getline(ss, nodes, ',');
    std::getline(ss, edges, ',');
    out[name] = Reference{family, std::stoull(nodes), std::stoull(edges)};
  }
  return out;
}

// An independent reading of an edge-list file with iostreams, for cross-checks.
struct PlainGraph {
  std::uint64_t n = 0;
  std::uint64_t m = 0;
  std::vector<std::uint64_t> u, v;
  std::vector<std::int64_t> w;
};

PlainGraph read_plain(const std::string& path) {
  PlainGraph g;
  std::ifstream in(path);
  std::string header;
  std::getline(in, header);
  std::stringstream hs(header);
  hs >> g.n >> g.m;
  std::uint64_t a = 0, b = 0;
  std::int64_t c = 0;
  while (in >> a >> b >> c) {
    g.u.push_back(a - 1);
    g.v.push_back(b - 1);
    g.w.push_back(c);
  }
  return g;
}

}  // namespace

// The instances and their sizes: G-set (Helmberg & Rendl, generated with Rinaldi's rudy),
// bqp (Beasley, OR-Library) and be (Billionnet & Elloumi, Math. Program. 109, 2007) in max-cut
// form with one extra node (see the data README); nodes and edges from reference.csv.
TEST_CASE("every max-cut instance in the shared data folder reads with the published sizes") {
  const std::string dir = std::string(SPINWRIGHT_DATA_DIR) + "/maxcut/";
  const auto refs = read_reference_csv(dir + "reference.csv");
  REQUIRE(refs.size() >= 30);
  for (const auto& entry : refs) {
    const std::string& name = entry.first;
    const Reference& ref = entry.second;
    INFO("instance " << name);
    const std::string path = dir + name + ".txt";
    auto r = io::read_model_file(path);
    REQUIRE_MESSAGE(r.ok(), r.message());
    const auto& lm = r.value();
    CHECK(lm.format == io::FileFormat::edge_list);
    CHECK(lm.form == Form::ising);
    REQUIRE(lm.integer);  // every weight in these files is an integer
    const auto plain = read_plain(path);
    CHECK(plain.n == ref.nodes);
    CHECK(plain.m == ref.edges);
    CHECK(plain.w.size() == ref.edges);
    CHECK(lm.num_spins() == ref.nodes);
    CHECK(lm.num_pairs() == ref.edges);  // no repeated edges, no zero weights, no self-loops
    CHECK(lm.ising_integer.offset() == 0);
    if (ref.family == "bqp" || ref.family == "be") {
      // bqp250-3 -> 250 variables, be120.8.1 -> 120: the graph has one extra node.
      const std::size_t start = name.find_first_of("0123456789");
      const std::uint64_t vars = std::stoull(name.substr(start));
      CHECK(lm.num_spins() == vars + 1);
    }
    // Every edge of the file is present with its weight.
    std::size_t mismatches = 0;
    for (std::size_t k = 0; k < plain.w.size(); ++k) {
      const auto u = static_cast<std::uint32_t>(plain.u[k]);
      const auto v = static_cast<std::uint32_t>(plain.v[k]);
      if (lm.ising_integer.coupling(u, v) != plain.w[k]) ++mismatches;
    }
    CHECK(mismatches == 0);
  }
}

// cut(s) = (W - E(s)) / 2 for the max-cut Ising model J = w (common practice; e.g. Barahona,
// Groetschel, Juenger, Reinelt, Oper. Res. 36, 1988), with the cut counted edge by edge from
// the file's own lines.
TEST_CASE("cut formula on G-set files") {
  const std::string dir = std::string(SPINWRIGHT_DATA_DIR) + "/maxcut/";
  Xoshiro256 rng(11);
  for (const char* name : {"G1", "G11", "G14", "G22", "G43"}) {
    INFO("instance " << name);
    const std::string path = dir + name + ".txt";
    auto r = io::read_edge_list<std::int64_t>(path);
    REQUIRE_MESSAGE(r.ok(), r.message());
    const auto& m = r.value();
    const auto plain = read_plain(path);
    std::int64_t W = 0;
    for (const auto w : plain.w) W += w;
    CHECK(total_weight(m) == W);
    for (int k = 0; k < 10; ++k) {
      const auto s = test_support::random_spins(rng, m);
      std::int64_t cut = 0;
      for (std::size_t e = 0; e < plain.w.size(); ++e) {
        if (s[plain.u[e]] != s[plain.v[e]]) cut += plain.w[e];
      }
      CHECK(cut_value(m, s.data()) == cut);
      CHECK((W - m.energy(s.data())) % 2 == 0);
      CHECK((W - m.energy(s.data())) / 2 == cut);
    }
  }
}
