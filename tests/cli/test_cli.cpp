// Behaviour tests of the `spinwright` command-line program: the executable is run on files in a
// temporary folder, and its exit codes, stdout and stderr are checked. Energies and cuts in the
// reports are recomputed here, independently, from the files the test wrote and the spins the
// program reported. Every run uses sweep budgets and fixed seeds; the only clock-driven parts
// are the Ctrl-C test (SIGINT after ~0.7 s) and a --time-limit run, which check behaviour
// (exit code, a state printed), never a duration; a run is declared hung only after 60 s.
#include <doctest/doctest.h>

#include "support/cli_json.hpp"
#include "support/cli_process.hpp"

#include <algorithm>  // std::sort
#include <cmath>      // std::isfinite
#include <cstdint>    // std::int64_t
#include <map>        // std::map
#include <random>     // std::mt19937_64 (fixed seeds: the same stream on every platform)
#include <sstream>    // std::istringstream, std::ostringstream
#include <string>     // std::string
#include <tuple>      // std::tuple
#include <utility>    // std::pair
#include <vector>     // std::vector

#include <fcntl.h>   // fcntl, O_NONBLOCK
#include <pty.h>     // openpty
#include <unistd.h>  // read, close

#ifndef SPINWRIGHT_CLI_PATH
#define SPINWRIGHT_CLI_PATH ""  // tests/extra.cmake defines it when the program is built
#endif

namespace {

using cli_test::Json;
using cli_test::RunOutput;
using cli_test::TempDir;

const std::string exe = SPINWRIGHT_CLI_PATH;

RunOutput run(TempDir& dir, const std::vector<std::string>& args) { return cli_test::run_process(exe, args, dir); }

struct Edge {
  int i, j;  // 1-based, as in the file
  std::int64_t w;
};

// The 0-based position of a 1-based vertex number read from a file.
std::size_t vertex_index(int one_based) { return static_cast<std::size_t>(one_based - 1); }

struct Graph {
  int n = 0;
  std::vector<Edge> edges;

  std::string edge_list() const {
    std::ostringstream s;
    s << "# test graph\n" << n << " " << edges.size() << "\n";
    for (const auto& e : edges) s << e.i << " " << e.j << " " << e.w << "\n";
    return s.str();
  }
  // Max-cut convention: E(s) = sum w_ij s_i s_j, cut(s) = sum over edges with s_i != s_j of w.
  std::int64_t energy(const std::vector<int>& s) const {
    std::int64_t e = 0;
    for (const auto& x : edges) e += x.w * s[vertex_index(x.i)] * s[vertex_index(x.j)];
    return e;
  }
  std::int64_t cut(const std::vector<int>& s) const {
    std::int64_t c = 0;
    for (const auto& x : edges) c += s[vertex_index(x.i)] != s[vertex_index(x.j)] ? x.w : 0;
    return c;
  }
};

// A random simple graph with integer weights in [lo, hi] \ {0}, from a fixed seed.
Graph random_graph(int n, int m, int lo, int hi, std::uint64_t seed) {
  std::mt19937_64 rng(seed);
  Graph g;
  g.n = n;
  std::map<std::pair<int, int>, bool> seen;
  while (static_cast<int>(g.edges.size()) < m) {
    int i = static_cast<int>(rng() % static_cast<std::uint64_t>(n)) + 1;
    int j = static_cast<int>(rng() % static_cast<std::uint64_t>(n)) + 1;
    if (i == j) continue;
    if (i > j) std::swap(i, j);
    if (seen[{i, j}]) continue;
    seen[{i, j}] = true;
    std::int64_t w = 0;
    while (w == 0) w = lo + static_cast<std::int64_t>(rng() % static_cast<std::uint64_t>(hi - lo + 1));
    g.edges.push_back({i, j, w});
  }
  return g;
}

// The L x L periodic square lattice (node x + L y + 1) with +-1 weights from a seeded coin.
Graph plus_minus_torus(int L, std::uint64_t seed) {
  std::mt19937_64 rng(seed);
  Graph g;
  g.n = L * L;
  for (int y = 0; y < L; ++y) {
    for (int x = 0; x < L; ++x) {
      const int i = L * y + x + 1;
      g.edges.push_back({i, L * y + (x + 1) % L + 1, rng() % 2 ? 1 : -1});
      g.edges.push_back({i, L * ((y + 1) % L) + x + 1, rng() % 2 ? 1 : -1});
    }
  }
  return g;
}

Graph cycle(int n) {
  Graph g;
  g.n = n;
  for (int k = 1; k <= n; ++k) g.edges.push_back({k, k % n + 1, 1});
  return g;
}

// No single flip lowers E(s) = sum w s_i s_j (flip delta of spin k: -2 s_k sum_j w_kj s_j).
bool local_minimum(const Graph& g, const std::vector<int>& s) {
  std::vector<std::int64_t> field(s.size(), 0);
  for (const auto& e : g.edges) {
    field[vertex_index(e.i)] += e.w * s[vertex_index(e.j)];
    field[vertex_index(e.j)] += e.w * s[vertex_index(e.i)];
  }
  for (std::size_t k = 0; k < s.size(); ++k) {
    if (-2 * s[k] * field[k] < 0) return false;
  }
  return true;
}

Json parse_ok(const RunOutput& r) {
  Json j;
  const bool ok = cli_test::parse_json(r.out, j);
  INFO("stdout: " << r.out.substr(0, 400));
  REQUIRE(ok);
  REQUIRE(j.kind == Json::Kind::object);
  return j;
}

std::vector<int> spins_of(const Json& j) {
  std::vector<int> s;
  for (const auto& v : j["spins"].items) s.push_back(static_cast<int>(v.num));
  return s;
}

std::size_t count_lines(const std::string& s) {
  std::size_t k = 0;
  for (const char c : s) k += c == '\n';
  return k;
}

void check_usage_error(const RunOutput& r) {
  INFO("stderr: " << r.err);
  CHECK_FALSE(r.hung);
  CHECK(r.code == 2);
  CHECK(r.out.empty());
  CHECK(r.err.rfind("spinwright: ", 0) == 0);
  CHECK(r.err.find("\nhint: ") != std::string::npos);
  CHECK(count_lines(r.err) == 2);
}

void check_input_error(const RunOutput& r, const std::string& prefix) {
  INFO("stderr: " << r.err);
  CHECK_FALSE(r.hung);
  CHECK(r.code == 1);
  CHECK(r.out.empty());
  CHECK(r.err.rfind(prefix, 0) == 0);
  CHECK(count_lines(r.err) == 1);
}

}  // namespace

TEST_CASE("cli: the program was built and answers --help and --version") {
  REQUIRE_FALSE(exe.empty());
  TempDir dir;
  REQUIRE(dir.ok());
  const RunOutput top = run(dir, {"--help"});
  CHECK(top.code == 0);
  for (const char* cmd : {"solve", "exact", "inspect", "convert", "verify", "bench"}) {
    CHECK(top.out.find(cmd) != std::string::npos);
    const RunOutput h = run(dir, {cmd, "--help"});
    CHECK(h.code == 0);
    CHECK(h.out.rfind(std::string("usage: spinwright ") + cmd, 0) == 0);
  }
  const RunOutput v = run(dir, {"--version"});
  CHECK(v.code == 0);
  CHECK(v.out.rfind("spinwright ", 0) == 0);
}

TEST_CASE("cli: usage errors exit 2 with one message line and one hint line") {
  TempDir dir;
  REQUIRE(dir.ok());
  const std::string g = dir.write("g.txt", cycle(5).edge_list());
  check_usage_error(run(dir, {}));
  check_usage_error(run(dir, {"solv", g}));
  check_usage_error(run(dir, {"solve"}));
  check_usage_error(run(dir, {"solve", g, "extra"}));
  check_usage_error(run(dir, {"solve", g, "--sweps", "10"}));
  check_usage_error(run(dir, {"solve", g, "-s", "10"}));
  check_usage_error(run(dir, {"solve", g, "--seed", "12x"}));
  check_usage_error(run(dir, {"solve", g, "--seed", "-1"}));
  check_usage_error(run(dir, {"solve", g, "--restarts", "0"}));
  check_usage_error(run(dir, {"solve", g, "--restarts"}));
  check_usage_error(run(dir, {"solve", g, "--time-limit", "0"}));
  check_usage_error(run(dir, {"solve", g, "--time-limit", "nan"}));
  check_usage_error(run(dir, {"solve", g, "--target", "inf"}));
  check_usage_error(run(dir, {"solve", g, "--kernel", "quick"}));
  check_usage_error(run(dir, {"solve", g, "--report", "xml"}));
  check_usage_error(run(dir, {"solve", g, "--format", "csv"}));
  check_usage_error(run(dir, {"solve", g, "--seed", "1", "--seed", "2"}));
  check_usage_error(run(dir, {"solve", g, "--quiet=yes"}));
  check_usage_error(run(dir, {"convert", g, dir.file("o.mtx")}));
  check_usage_error(run(dir, {"convert", g, dir.file("o.mtx"), "--to", "spins"}));
  check_usage_error(run(dir, {"convert", g, dir.file("o.txt"), "--to", "qubo"}));
  check_usage_error(run(dir, {"verify", g}));
  check_usage_error(run(dir, {"bench", g, "--kernel", "anneal,slow"}));
  // The suggestion names the closest option.
  const RunOutput r = run(dir, {"solve", g, "--time-limt", "3"});
  CHECK(r.err.find("--time-limit") != std::string::npos);
}

TEST_CASE("cli: every bad input exits 1 with file:line: reason and no output") {
  TempDir dir;
  REQUIRE(dir.ok());
  // (file name, content, expected "name:line:" prefix after the folder)
  const std::vector<std::tuple<std::string, std::string, std::string>> cases = {
      {"empty.txt", "", "empty.txt:1:"},
      {"blank.txt", "\n\n  \n", "blank.txt:"},
      {"truncated.txt", "3 3\n1 2 1\n2 3 1\n", "truncated.txt:4:"},
      {"index0.txt", "3 2\n0 2 1\n2 3 1\n", "index0.txt:2:"},
      {"beyond.txt", "3 2\n1 2 1\n2 4 1\n", "beyond.txt:3:"},
      {"word.txt", "3 2\n1 2 one\n2 3 1\n", "word.txt:2:"},
      {"wordindex.txt", "3 2\n1 b 1\n2 3 1\n", "wordindex.txt:2:"},
      {"header.txt", "three 2\n1 2 1\n2 3 1\n", "header.txt:1:"},
      {"nan.txt", "3 2\n1 2 nan\n2 3 1\n", "nan.txt:2:"},
      {"inf.txt", "3 2\n1 2 1\n2 3 -inf\n", "inf.txt:3:"},
      {"overflow_real.txt", "3 2\n1 2 1e999\n2 3 1\n", "overflow_real.txt:2:"},
      // An integer Matrix Market file: the value type is int64_t, and this entry does not fit it.
      {"overflow_int.mtx", "%%MatrixMarket matrix coordinate integer general\n2 2 1\n1 2 99999999999999999999999\n",
       "overflow_int.mtx:3:"},
      // Fits int64_t, but the energy range passes the library's integer_energy_limit
      // (INT64_MAX / 4): refused, never run with overflowing energies. (2^54 now runs as int64.)
      {"beyond_limit.txt", "3 2\n1 2 4611686018427387904\n2 3 1\n", "beyond_limit.txt:"},
      {"absurd.txt", "1000000000000 1\n1 2 1\n", "absurd.txt:1:"},
      {"absurd_edges.txt", "4 1000000000000\n1 2 1\n", "absurd_edges.txt:"},
      {"array.mtx", "%%MatrixMarket matrix array real general\n2 2\n1\n2\n3\n4\n", "array.mtx:1:"},
      {"complex.mtx", "%%MatrixMarket matrix coordinate complex general\n2 2 1\n1 2 1 0\n", "complex.mtx:1:"},
      {"nonsquare.mtx", "%%MatrixMarket matrix coordinate real general\n2 3 1\n1 2 1\n", "nonsquare.mtx:2:"},
      {"absurd.mtx", "%%MatrixMarket matrix coordinate real general\n1000000000000 1000000000000 1\n1 2 1\n",
       "absurd.mtx:2:"},
      {"mtx_nan.mtx", "%%MatrixMarket matrix coordinate real general\n2 2 1\n1 2 NaN\n", "mtx_nan.mtx:3:"},
      {"mtx_short.mtx", "%%MatrixMarket matrix coordinate real general\n3 3 2\n1 2 1\n", "mtx_short.mtx:"},
  };
  for (const auto& c : cases) {
    const std::string path = dir.write(std::get<0>(c), std::get<1>(c));
    const std::string prefix = path.substr(0, path.size() - std::get<0>(c).size()) + std::get<2>(c);
    INFO("case " << std::get<0>(c));
    check_input_error(run(dir, {"solve", path, "--quiet"}), prefix);
    check_input_error(run(dir, {"inspect", path}), prefix);
    check_input_error(run(dir, {"exact", path}), prefix);
  }
  // Files that cannot be read at all: a missing file and a folder.
  const std::string missing = dir.file("missing.txt");
  check_input_error(run(dir, {"solve", missing}), missing + ":");
  check_input_error(run(dir, {"inspect", "/"}), "/:");
  // A Matrix Market file forced as such when it is an edge list.
  const std::string g = dir.write("g.txt", cycle(5).edge_list());
  check_input_error(run(dir, {"solve", g, "--format", "mtx"}), g + ":1:");
}

TEST_CASE("cli: many annealing restarts run in lockstep lanes, and the report says so") {
  // kernels/lanes.hpp: at least default_lane_width / 2 restarts of --kernel anneal run W at a
  // time; the spins must not depend on the thread count (common practice: (seed, r) streams).
  TempDir dir;
  REQUIRE(dir.ok());
  const std::string path = dir.write("g.txt", random_graph(80, 300, -2, 2, 5).edge_list());
  std::vector<Json> runs;
  for (const char* threads : {"1", "2"}) {
    const RunOutput r = run(dir, {"solve", path, "--kernel", "anneal", "--restarts", "20", "--sweeps", "60", "--seed",
                                  "9", "--threads", threads, "--report", "json"});
    REQUIRE(r.code == 0);
    runs.push_back(parse_ok(r));
  }
  CHECK(runs[0]["lanes"].num == 32);
  CHECK(spins_of(runs[1]) == spins_of(runs[0]));
  CHECK(runs[1]["tally"]["mean"].text == runs[0]["tally"]["mean"].text);
  const RunOutput text = run(dir, {"solve", path, "--kernel", "anneal", "--restarts", "20", "--sweeps", "60"});
  CHECK(text.out.find("lockstep") != std::string::npos);
  const RunOutput few = run(dir, {"solve", path, "--kernel", "anneal", "--restarts", "3", "--report", "json"});
  REQUIRE(few.code == 0);
  CHECK(parse_ok(few)["lanes"].num == 0);
}

TEST_CASE("cli: many annealing restarts of a +-1 model run bit-sliced, and the report says so") {
  // kernels/bit_sliced.hpp takes couplings of one magnitude and degree <= 15: a 10 x 10 torus
  // with +-1 weights from a fixed seed. 100 restarts = one full word of 64 and a partial one.
  const Graph g = plus_minus_torus(10, 77);
  TempDir dir;
  REQUIRE(dir.ok());
  const std::string path = dir.write("pm.txt", g.edge_list());
  std::vector<Json> runs;
  for (const char* threads : {"1", "2"}) {
    const RunOutput r = run(dir, {"solve", path, "--kernel", "anneal", "--restarts", "100", "--sweeps", "200", "--seed",
                                  "4", "--threads", threads, "--report", "json"});
    REQUIRE(r.code == 0);
    runs.push_back(parse_ok(r));
  }
  CHECK(runs[0]["bit_sliced"].b);
  CHECK(runs[0]["shared_draws"].b);
  CHECK(runs[0]["lanes"].num == 0);
  CHECK(runs[0]["restarts"].num == 100);
  // The same answer on one and two threads, and the reported energy is the state's.
  CHECK(spins_of(runs[1]) == spins_of(runs[0]));
  CHECK(runs[1]["tally"]["mean"].text == runs[0]["tally"]["mean"].text);
  const std::vector<int> s = spins_of(runs[0]);
  REQUIRE(s.size() == 100);
  CHECK(static_cast<std::int64_t>(runs[0]["energy"].num) == g.energy(s));
  // A 10 x 10 +-J torus has a ground energy per spin near -1.40 (REFERENCES section 4 gives
  // -1.402 for large 2D +-J lattices); 100 restarts of 200 sweeps come within 10 % of it.
  CHECK(runs[0]["energy"].num <= -0.9 * 1.40 * 100);
  const RunOutput text = run(dir, {"solve", path, "--kernel", "anneal", "--restarts", "100", "--sweeps", "50"});
  CHECK(text.out.find("bit-sliced") != std::string::npos);
  // bench counts restarts as independent trials: independent random bits per restart.
  const RunOutput b = run(dir, {"bench", path, "--kernel", "anneal", "--restarts", "64", "--sweeps", "50", "--report",
                                "json", "--quiet"});
  REQUIRE(b.code == 0);
  const Json bj = parse_ok(b);
  REQUIRE(bj["kernels"].items.size() == 1);
  CHECK(bj["kernels"].items[0]["bit_sliced"].b);
  CHECK_FALSE(bj["kernels"].items[0]["shared_draws"].b);
  // Too few restarts, or a weight of another magnitude: the ordinary path.
  const RunOutput few = run(dir, {"solve", path, "--kernel", "anneal", "--restarts", "8", "--report", "json"});
  REQUIRE(few.code == 0);
  CHECK_FALSE(parse_ok(few)["bit_sliced"].b);
}

TEST_CASE("cli: solve --report json holds the documented keys, and its cut and energy are right") {
  TempDir dir;
  REQUIRE(dir.ok());
  const Graph g = random_graph(60, 240, -3, 5, 11);
  const std::string path = dir.write("g.txt", g.edge_list());
  const RunOutput r = run(dir, {"solve", path, "--kernel", "anneal", "--restarts", "3", "--threads", "2", "--seed",
                                "42", "--sweeps", "300", "--report", "json"});
  CHECK(r.code == 0);
  CHECK(r.err.empty());
  const Json j = parse_ok(r);
  for (const char* key : {"energy", "cut", "spins", "seconds", "sweeps", "restarts", "threads", "kernel", "seed",
                          "tally", "nodes", "pairs", "format", "form", "interrupted"}) {
    CHECK_MESSAGE(j.has(key), key);
  }
  CHECK_FALSE(j.has("bits"));  // Ising input: spins only
  CHECK(j["kernel"].text == "anneal");
  CHECK(j["format"].text == "edges");
  CHECK(j["form"].text == "ising");
  CHECK(j["seed"].num == 42);
  CHECK(j["restarts"].num == 3);
  CHECK(j["threads"].num == 2);
  CHECK(j["nodes"].num == 60);
  CHECK(j["pairs"].num == 240);
  CHECK(j["sweeps"].is_integer_literal());
  CHECK(j["sweeps"].num >= 900);  // 3 restarts of 300 sweeps, plus the descent passes of the polish
  CHECK(j["interrupted"].kind == Json::Kind::boolean);
  CHECK_FALSE(j["interrupted"].b);
  CHECK(j["seconds"].kind == Json::Kind::number);
  CHECK(j["seconds"].num >= 0);
  const std::vector<int> s = spins_of(j);
  REQUIRE(s.size() == 60);
  for (const int v : s) CHECK((v == 1 || v == -1));
  // Integer model: the energy and the cut are written as integers and match a recount.
  CHECK(j["energy"].is_integer_literal());
  CHECK(j["cut"].is_integer_literal());
  CHECK(static_cast<std::int64_t>(j["energy"].num) == g.energy(s));
  CHECK(static_cast<std::int64_t>(j["cut"].num) == g.cut(s));
  const Json& t = j["tally"];
  CHECK(t["best"].num == j["energy"].num);
  CHECK(t["mean"].num >= t["best"].num);
  CHECK(t["worst"].num >= t["mean"].num);
  CHECK(t["target"].kind == Json::Kind::null);
}

TEST_CASE("cli: JSON strings are escaped (a file name with a quote, a backslash and a tab)") {
  TempDir dir;
  REQUIRE(dir.ok());
  const std::string path = dir.write("odd \"name\\\twith.txt", cycle(5).edge_list());
  for (const char* cmd : {"solve", "exact", "inspect"}) {
    const RunOutput r = run(dir, {cmd, path, "--report", "json"});
    REQUIRE(r.code == 0);
    const Json j = parse_ok(r);
    CHECK(j["file"].text == path);
  }
}

TEST_CASE("cli: real weights are written as real numbers that read back exactly") {
  TempDir dir;
  REQUIRE(dir.ok());
  // Dyadic weights: every partial sum is exact in double, so the recount below is exact too.
  const std::string path = dir.write("r.txt", "4 5\n1 2 0.5\n2 3 -1.25\n3 4 0.75\n4 1 2.5\n1 3 -0.125\n");
  const double w[5] = {0.5, -1.25, 0.75, 2.5, -0.125};
  const std::size_t ends[5][2] = {{0, 1}, {1, 2}, {2, 3}, {3, 0}, {0, 2}};
  const RunOutput r = run(dir, {"solve", path, "--report", "json"});
  REQUIRE(r.code == 0);
  const Json j = parse_ok(r);
  const std::vector<int> s = spins_of(j);
  REQUIRE(s.size() == 4);
  double energy = 0, cut = 0;
  for (std::size_t k = 0; k < 5; ++k) {
    energy += w[k] * s[ends[k][0]] * s[ends[k][1]];
    cut += s[ends[k][0]] != s[ends[k][1]] ? w[k] : 0;
  }
  CHECK(j["energy"].num == energy);
  CHECK(j["cut"].num == cut);
  CHECK_FALSE(j["energy"].is_integer_literal());
}

TEST_CASE("cli: solve with a target reports the success probability; text report is aligned") {
  TempDir dir;
  REQUIRE(dir.ok());
  const Graph g = cycle(9);  // odd cycle: the maximum cut is n - 1 = 8 (common practice)
  const std::string path = dir.write("c9.txt", g.edge_list());
  // E = W - 2 cut = 9 - 16 = -7 at the optimum.
  const RunOutput r = run(dir, {"solve", path, "--kernel", "tabu", "--restarts", "4", "--sweeps", "50", "--target",
                                "-7", "--report", "json"});
  REQUIRE(r.code == 0);
  const Json j = parse_ok(r);
  CHECK(j["energy"].num == -7);
  CHECK(j["cut"].num == 8);
  CHECK(j["tally"]["target"].num == -7);
  CHECK(j["tally"]["success_probability"].num == 1.0);
  CHECK(j["tally"].has("tts99_seconds"));
  const RunOutput text = run(dir, {"solve", path, "--kernel", "tabu", "--restarts", "4", "--sweeps", "50"});
  REQUIRE(text.code == 0);
  // Every line is "label<spaces>value" with the values starting in the same column.
  std::istringstream lines(text.out);
  std::string line;
  std::size_t column = 0;
  int count = 0;
  while (std::getline(lines, line)) {
    const std::size_t gap = line.find("   ");
    REQUIRE(gap != std::string::npos);
    const std::size_t value = line.find_first_not_of(' ', gap);
    if (count++ == 0) column = value;
    CHECK(value == column);
  }
  CHECK(count >= 6);
  CHECK(text.out.find("\ncut ") != std::string::npos);
  // The time carries its unit (s, ms or us).
  const std::size_t time_at = text.out.find("\ntime ");
  REQUIRE(time_at != std::string::npos);
  const std::string time_line = text.out.substr(time_at + 1, text.out.find('\n', time_at + 1) - time_at - 1);
  const bool has_unit = time_line.size() > 3 && (time_line.compare(time_line.size() - 2, 2, " s") == 0 ||
                                                 time_line.compare(time_line.size() - 3, 3, " ms") == 0 ||
                                                 time_line.compare(time_line.size() - 3, 3, " us") == 0);
  CHECK_MESSAGE(has_unit, time_line);
}

TEST_CASE("cli: the same seed gives the same answer for any thread count") {
  TempDir dir;
  REQUIRE(dir.ok());
  const std::string path = dir.write("g.txt", random_graph(80, 300, -2, 2, 5).edge_list());
  for (const char* kernel : {"anneal", "tabu", "temper", "descent"}) {
    INFO("kernel " << kernel);
    std::vector<Json> runs;
    for (const char* threads : {"1", "2", "3"}) {
      const RunOutput r = run(dir, {"solve", path, "--kernel", kernel, "--restarts", "5", "--sweeps", "60", "--seed",
                                    "9", "--threads", threads, "--report", "json"});
      REQUIRE(r.code == 0);
      runs.push_back(parse_ok(r));
    }
    for (std::size_t k = 1; k < runs.size(); ++k) {
      CHECK(runs[k]["energy"].text == runs[0]["energy"].text);
      CHECK(spins_of(runs[k]) == spins_of(runs[0]));
      CHECK(runs[k]["sweeps"].text == runs[0]["sweeps"].text);
      CHECK(runs[k]["tally"]["best_restart"].text == runs[0]["tally"]["best_restart"].text);
      CHECK(runs[k]["tally"]["mean"].text == runs[0]["tally"]["mean"].text);
    }
  }
  // A different seed is a different run (the spins differ for this model and these seeds).
  const RunOutput a =
      run(dir, {"solve", path, "--kernel", "descent", "--restarts", "1", "--seed", "1", "--report", "json"});
  const RunOutput b =
      run(dir, {"solve", path, "--kernel", "descent", "--restarts", "1", "--seed", "2", "--report", "json"});
  CHECK(spins_of(parse_ok(a)) != spins_of(parse_ok(b)));
}

TEST_CASE("cli: QUBO input reports bits = (1 - s) / 2 and the energy of the file's own form") {
  TempDir dir;
  REQUIRE(dir.ok());
  // Upper-triangle general storage lists Q itself; the offset directive adds c.
  const int n = 12;
  std::mt19937_64 rng(77);
  std::map<std::pair<int, int>, std::int64_t> q;
  for (int i = 1; i <= n; ++i) {
    for (int k = i; k <= n; ++k) {
      if (rng() % 3 == 0) q[{i, k}] = static_cast<std::int64_t>(rng() % 11) - 5;
    }
  }
  for (auto it = q.begin(); it != q.end();) it = it->second == 0 ? q.erase(it) : std::next(it);
  std::ostringstream s;
  s << "%%MatrixMarket matrix coordinate integer general\n% spinwright form qubo\n% spinwright offset 3\n"
    << n << " " << n << " " << q.size() << "\n";
  for (const auto& e : q) s << e.first.first << " " << e.first.second << " " << e.second << "\n";
  const std::string path = dir.write("q.mtx", s.str());
  auto energy = [&](const std::vector<int>& x) {
    std::int64_t e = 3;
    for (const auto& t : q) e += t.second * x[vertex_index(t.first.first)] * x[vertex_index(t.first.second)];
    return e;
  };
  // Independent ground energy by enumeration of all 2^12 assignments.
  std::int64_t ground = 0;
  std::int64_t ground_count = 0;
  for (int mask = 0; mask < (1 << n); ++mask) {
    std::vector<int> x(n);
    for (std::size_t i = 0; i < x.size(); ++i) x[i] = (mask >> i) & 1;
    const std::int64_t e = energy(x);
    if (mask == 0 || e < ground) {
      ground = e;
      ground_count = 1;
    } else if (e == ground) {
      ++ground_count;
    }
  }
  for (const char* kernel : {"tabu", "exact"}) {
    const RunOutput r = run(dir, {"solve", path, "--kernel", kernel, "--report", "json", "--restarts", "4"});
    REQUIRE(r.code == 0);
    const Json j = parse_ok(r);
    CHECK(j["form"].text == "qubo");
    CHECK_FALSE(j.has("cut"));
    REQUIRE(j["bits"].items.size() == static_cast<std::size_t>(n));
    std::vector<int> x;
    const std::vector<int> sp = spins_of(j);
    for (std::size_t i = 0; i < j["bits"].items.size(); ++i) {
      x.push_back(static_cast<int>(j["bits"].items[i].num));
      CHECK(x.back() == (1 - sp[i]) / 2);
    }
    CHECK(static_cast<std::int64_t>(j["energy"].num) == energy(x));
    CHECK(static_cast<std::int64_t>(j["energy"].num) == ground);  // 12 variables: tabu finds it too
  }
  const RunOutput e = run(dir, {"exact", path, "--report", "json"});
  REQUIRE(e.code == 0);
  const Json j = parse_ok(e);
  CHECK(static_cast<std::int64_t>(j["energy"].num) == ground);
  CHECK(static_cast<std::int64_t>(j["ground_states"].num) == ground_count);
}

TEST_CASE("cli: exact gives ground energy, state and count, and refuses sizes beyond its limit") {
  TempDir dir;
  REQUIRE(dir.ok());
  // Odd cycle C_n with unit weights: maximum cut n - 1, reached with exactly one uncut edge;
  // n choices of that edge times 2 global flips = 2n ground states (common practice, counted by hand).
  const std::string c7 = dir.write("c7.txt", cycle(7).edge_list());
  const RunOutput r = run(dir, {"exact", c7, "--report", "json", "--threads", "2"});
  REQUIRE(r.code == 0);
  const Json j = parse_ok(r);
  CHECK(j["cut"].num == 6);
  CHECK(j["energy"].num == 7 - 2 * 6);
  CHECK(j["ground_states"].num == 14);
  CHECK(cycle(7).cut(spins_of(j)) == 6);
  // Petersen graph: maximum cut 12 (it needs 3 edges removed to become bipartite; from memory,
  // e.g. Bondy & Murty, Graph Theory, Springer 2008).
  Graph p;
  p.n = 10;
  for (int k = 0; k < 5; ++k) {
    p.edges.push_back({k + 1, (k + 1) % 5 + 1, 1});  // outer cycle
    p.edges.push_back({k + 6, (k + 2) % 5 + 6, 1});  // inner pentagram
    p.edges.push_back({k + 1, k + 6, 1});            // spokes
  }
  const RunOutput pr = run(dir, {"exact", dir.write("petersen.txt", p.edge_list()), "--report", "json"});
  REQUIRE(pr.code == 0);
  CHECK(parse_ok(pr)["cut"].num == 12);
  // 31 nodes is beyond the limit of 30; the message names it.
  const std::string big = dir.write("c31.txt", cycle(31).edge_list());
  const RunOutput refused = run(dir, {"exact", big});
  check_input_error(refused, big + ":");
  CHECK(refused.err.find("30") != std::string::npos);
  const RunOutput refused2 = run(dir, {"solve", big, "--kernel", "exact"});
  CHECK(refused2.code == 1);
  CHECK(refused2.err.find("30") != std::string::npos);
}

TEST_CASE("cli: inspect counts components and degrees") {
  TempDir dir;
  REQUIRE(dir.ok());
  // Two paths of 3 nodes and one isolated node.
  const std::string path = dir.write("g.txt", "7 4\n1 2 1\n2 3 -2\n4 5 3\n5 6 1\n");
  const RunOutput r = run(dir, {"inspect", path, "--report", "json"});
  REQUIRE(r.code == 0);
  const Json j = parse_ok(r);
  CHECK(j["nodes"].num == 7);
  CHECK(j["pairs"].num == 4);
  CHECK(j["components"].num == 3);
  CHECK(j["largest_component"].num == 3);
  CHECK(j["min_degree"].num == 0);
  CHECK(j["max_degree"].num == 2);
  CHECK(j["pair_min"].num == -2);
  CHECK(j["pair_max"].num == 3);
  CHECK(j["model_bytes"].num > 0);
  const RunOutput t = run(dir, {"inspect", path});
  REQUIRE(t.code == 0);
  CHECK(t.out.find("components") != std::string::npos);
  CHECK(t.out.find("memory") != std::string::npos);
}

TEST_CASE("cli: convert round trip edges -> qubo mtx -> ising mtx -> edges keeps every energy") {
  TempDir dir;
  REQUIRE(dir.ok());
  const Graph g = random_graph(25, 70, -4, 6, 3);
  const std::string in = dir.write("g.txt", g.edge_list());
  const std::string q = dir.file("g_qubo.mtx");
  const std::string i = dir.file("g_ising.mtx");
  const std::string back = dir.file("g_back.txt");
  REQUIRE(run(dir, {"convert", in, q, "--to", "qubo"}).code == 0);
  REQUIRE(run(dir, {"convert", q, i, "--to", "ising"}).code == 0);
  REQUIRE(run(dir, {"convert", i, back, "--to", "ising"}).code == 0);
  // The edge list that comes back has the same edges and weights.
  std::istringstream text(cli_test::read_file(back));
  std::string line;
  std::vector<std::tuple<int, int, std::int64_t>> read_back, original;
  int header_n = -1;
  while (std::getline(text, line)) {
    if (line.empty() || line[0] == '#' || line[0] == '%') continue;
    std::istringstream ls(line);
    if (header_n < 0) {
      ls >> header_n;
      continue;
    }
    int a = 0, b = 0;
    double w = 0;
    ls >> a >> b >> w;
    read_back.emplace_back(std::min(a, b), std::max(a, b), static_cast<std::int64_t>(w));
  }
  for (const auto& e : g.edges) original.emplace_back(std::min(e.i, e.j), std::max(e.i, e.j), e.w);
  std::sort(read_back.begin(), read_back.end());
  std::sort(original.begin(), original.end());
  CHECK(header_n == 25);
  CHECK(read_back == original);
  // verify gives the same energy on all four files for random states.
  std::mt19937_64 rng(8);
  for (int trial = 0; trial < 3; ++trial) {
    std::vector<int> s(25);
    std::string state;
    for (auto& v : s) {
      v = rng() % 2 ? 1 : -1;
      state += v > 0 ? "+\n" : "-\n";
    }
    const std::string st = dir.write("s" + std::to_string(trial) + ".txt", state);
    for (const std::string& f : {in, q, i, back}) {
      const RunOutput r = run(dir, {"verify", f, st, "--report", "json"});
      REQUIRE(r.code == 0);
      const Json j = parse_ok(r);
      CHECK(static_cast<std::int64_t>(j["energy"].num) == g.energy(s));
      if (f == in || f == back) CHECK(static_cast<std::int64_t>(j["cut"].num) == g.cut(s));
    }
  }
}

TEST_CASE("cli: verify, warm starts and state files") {
  TempDir dir;
  REQUIRE(dir.ok());
  const Graph g = random_graph(16, 40, -3, 3, 21);
  const std::string path = dir.write("g.txt", g.edge_list());
  const std::string ground = dir.file("ground.txt");
  const RunOutput e = run(dir, {"solve", path, "--kernel", "exact", "--state-out", ground, "--report", "json"});
  REQUIRE(e.code == 0);
  const Json ej = parse_ok(e);
  // The state file holds the reported spins.
  const RunOutput v = run(dir, {"verify", path, ground, "--report", "json"});
  REQUIRE(v.code == 0);
  CHECK(parse_ok(v)["energy"].num == ej["energy"].num);
  // Descent from a ground state stays there (a ground state is a local minimum).
  const RunOutput d =
      run(dir, {"solve", path, "--kernel", "descent", "--restarts", "1", "--warm-start", ground, "--report", "json"});
  REQUIRE(d.code == 0);
  const Json dj = parse_ok(d);
  CHECK(dj["energy"].num == ej["energy"].num);
  CHECK(spins_of(dj) == spins_of(ej));
  // A state of the wrong size, and a state file with a bad line, are input errors.
  const std::string short_state = dir.write("short.txt", "+\n-\n+\n");
  check_input_error(run(dir, {"verify", path, short_state}), short_state + ":");
  check_input_error(run(dir, {"solve", path, "--warm-start", short_state}), short_state + ":");
  const std::string bad_state = dir.write("bad.txt", "+\n-\n2\n");
  check_input_error(run(dir, {"verify", path, bad_state}), bad_state + ":3:");
  // An output that cannot be written: exit 1, no report.
  const std::string nowhere = dir.file("no-such-folder") + "/state.txt";
  const RunOutput w = run(dir, {"solve", path, "--kernel", "descent", "--state-out", nowhere});
  check_input_error(w, nowhere + ":");
}

TEST_CASE("cli: bench over a set of instances gives one combined report") {
  TempDir dir;
  REQUIRE(dir.ok());
  dir.write("c11.txt", cycle(11).edge_list());
  dir.write("c8.txt", cycle(8).edge_list());
  // Optima by hand: an odd cycle C_11 cuts 10 of 11 edges (E = 11 - 20 = -9), an even cycle
  // C_8 cuts all 8 (E = 8 - 16 = -8). Paths in the list are relative to the list's folder.
  const std::string list = dir.write("set.txt", "# a set\nc11.txt -9\n\nc8.txt   # no target: the best found\n");
  const RunOutput r = run(dir, {"bench", "--list", list, "--restarts", "4", "--kernel", "tabu", "--sweeps", "40",
                                "--threads", "1", "--report", "json"});
  REQUIRE(r.code == 0);
  const Json j = parse_ok(r);
  REQUIRE(j["instances"].items.size() == 2);
  const Json& a = j["instances"].items[0];
  const Json& b = j["instances"].items[1];
  CHECK(a["file"].text.find("c11.txt") != std::string::npos);
  CHECK(a["target"].num == -9);
  CHECK(a["target_given"].b);
  CHECK(a["kernels"].items[0]["best"].num == -9);
  CHECK(a["kernels"].items[0]["success_probability"].num == 1.0);
  CHECK(b["target"].num == -8);
  CHECK_FALSE(b["target_given"].b);
  CHECK(b["nodes"].num == 8);
  CHECK(j["ranks"].num == 1);
  // The same set as FILE arguments, text report: every block, then the summary.
  const RunOutput t = run(dir, {"bench", dir.file("c11.txt"), dir.file("c8.txt"), "--restarts", "2", "--kernel",
                                "descent", "--threads", "1"});
  REQUIRE(t.code == 0);
  CHECK(t.out.find("summary of 2 instances") != std::string::npos);
  CHECK(t.out.find("c8.txt") != std::string::npos);
  // Misuse: one --target for several files, FILE and --list together, a bad list line.
  check_usage_error(run(dir, {"bench", dir.file("c11.txt"), dir.file("c8.txt"), "--target", "-9"}));
  check_usage_error(run(dir, {"bench", dir.file("c11.txt"), "--list", list}));
  const std::string bad = dir.write("bad.txt", "c11.txt -9\nc8.txt minus-eight\n");
  const RunOutput e = run(dir, {"bench", "--list", bad});
  CHECK(e.code == 1);
  CHECK(e.err.find("bad.txt:2") != std::string::npos);
  CHECK(e.err.find("minus-eight") != std::string::npos);
}

TEST_CASE("cli: bench reports success probability, residual energy and TTS99 per kernel") {
  TempDir dir;
  REQUIRE(dir.ok());
  const std::string path = dir.write("c11.txt", cycle(11).edge_list());
  // Optimum of C_11: cut 10, E = 11 - 20 = -9.
  const RunOutput r = run(dir, {"bench", path, "--target", "-9", "--restarts", "6", "--kernel", "tabu,descent",
                                "--sweeps", "40", "--report", "json"});
  REQUIRE(r.code == 0);
  const Json j = parse_ok(r);
  REQUIRE(j["kernels"].items.size() == 2);
  const Json& tabu = j["kernels"].items[0];
  CHECK(tabu["kernel"].text == "tabu");
  CHECK(tabu["restarts"].num == 6);
  CHECK(tabu["success_probability"].num == 1.0);
  CHECK(tabu["residual_energy"].num == 0.0);
  // Descent from random starts on C_11: every energy is 11 - 2 cut with an odd number of uncut
  // edges, so E is in {-9, -5, -1, ...}. Hence P(success) is hits / 6, the residual (mean E + 9)
  // is a multiple of 4 / 6 and at least 4 (1 - P), and TTS99 = t ln(0.01) / ln(1 - P) for
  // 0 < P < 0.99 (time to solution: T. F. Ronnow et al., Science 345, 420 (2014)).
  const Json& descent = j["kernels"].items[1];
  const double p = descent["success_probability"].num;
  const double residual = descent["residual_energy"].num;
  CHECK(p * 6 == doctest::Approx(std::round(p * 6)));
  CHECK(residual * 6 / 4 == doctest::Approx(std::round(residual * 6 / 4)));
  CHECK(residual >= 4 * (1 - p) - 1e-9);
  CHECK(descent["best"].num == -9);  // six restarts: one of them ends in a maximum cut
  if (p > 0 && p < 0.99) {
    const double t = descent["median_restart_seconds"].num;
    CHECK(descent["tts99_seconds"].num == doctest::Approx(t * std::log(0.01) / std::log(1 - p)));
  }
  // An unreachable target: probability 0 and an infinite TTS99, written as null.
  const RunOutput never =
      run(dir, {"bench", path, "--target", "-1000", "--restarts", "3", "--kernel", "descent", "--report", "json"});
  REQUIRE(never.code == 0);
  const Json nj = parse_ok(never);
  CHECK(nj["kernels"].items[0]["success_probability"].num == 0.0);
  CHECK(nj["kernels"].items[0]["tts99_seconds"].kind == Json::Kind::null);
  const RunOutput table = run(dir, {"bench", path, "--restarts", "3", "--kernel", "all", "--sweeps", "20"});
  REQUIRE(table.code == 0);
  CHECK(table.out.find("TTS99") != std::string::npos);
  CHECK(table.out.find("temper") != std::string::npos);
}

TEST_CASE("cli: Ctrl-C stops a long run, prints the best state so far and exits 130") {
  TempDir dir;
  REQUIRE(dir.ok());
  const Graph g = random_graph(3000, 9000, -1, 1, 99);
  const std::string path = dir.write("big.txt", g.edge_list());
  const RunOutput r = cli_test::run_process(exe,
                                            {"solve", path, "--kernel", "anneal", "--sweeps", "1000000000",
                                             "--restarts", "2", "--threads", "2", "--report", "json"},
                                            dir, 0.7, 60);
  CHECK_FALSE(r.hung);
  CHECK(r.code == 130);
  const Json j = parse_ok(r);
  CHECK(j["interrupted"].b);
  const std::vector<int> s = spins_of(j);
  REQUIRE(s.size() == 3000);
  CHECK(static_cast<std::int64_t>(j["energy"].num) == g.energy(s));
  CHECK(static_cast<std::int64_t>(j["cut"].num) == g.cut(s));
  // The run was stopped hot (0.7 s of a 10^9-sweep schedule): the bounded closing descent
  // after Ctrl-C still reports a single-flip local minimum.
  CHECK(local_minimum(g, s));
  // Text report: the best state is printed too.
  const RunOutput t = cli_test::run_process(
      exe, {"solve", path, "--kernel", "tabu", "--sweeps", "1000000000", "--restarts", "1"}, dir, 0.7, 60);
  CHECK_FALSE(t.hung);
  CHECK(t.code == 130);
  CHECK(t.out.find("interrupted") != std::string::npos);
  CHECK(t.out.find("\nspins ") != std::string::npos);
}

TEST_CASE("cli: Ctrl-C stops a bit-sliced run too: every restart polished from its own state") {
  // A 20 x 20 torus with +-1 weights (the checkerboard path), 64 restarts of a 10^9-sweep
  // schedule, SIGINT after 0.7 s: the best state so far, consistent and a local minimum.
  const Graph g = plus_minus_torus(20, 31);
  TempDir dir;
  REQUIRE(dir.ok());
  const std::string path = dir.write("pm20.txt", g.edge_list());
  const RunOutput r = cli_test::run_process(exe,
                                            {"solve", path, "--kernel", "anneal", "--sweeps", "1000000000",
                                             "--restarts", "64", "--threads", "2", "--report", "json"},
                                            dir, 0.7, 60);
  CHECK_FALSE(r.hung);
  CHECK(r.code == 130);
  const Json j = parse_ok(r);
  CHECK(j["interrupted"].b);
  CHECK(j["bit_sliced"].b);
  const std::vector<int> s = spins_of(j);
  REQUIRE(s.size() == 400);
  CHECK(static_cast<std::int64_t>(j["energy"].num) == g.energy(s));
  CHECK(local_minimum(g, s));
}

TEST_CASE("cli: Ctrl-C ends an exact enumeration without an answer: exit 130, a message, no report") {
  TempDir dir;
  REQUIRE(dir.ok());
  // 30 nodes, no fields: 2^29 states after the flip symmetry, seconds of work or more.
  const Graph g = random_graph(30, 80, -3, 5, 12);
  const std::string path = dir.write("g30.txt", g.edge_list());
  for (const char* command : {"exact", "solve"}) {
    CAPTURE(command);
    std::vector<std::string> args = {command, path, "--threads", "2"};
    if (std::string(command) == "solve") {
      args.push_back("--kernel");
      args.push_back("exact");
    }
    const RunOutput r = cli_test::run_process(exe, args, dir, 0.5, 60);
    CHECK_FALSE(r.hung);
    CHECK(r.code == 130);
    CHECK(r.out.empty());
    CHECK(r.err.find("interrupted") != std::string::npos);
  }
}

TEST_CASE("cli: a time limit ends a run that its sweep budget would not; no progress line off a terminal") {
  TempDir dir;
  REQUIRE(dir.ok());
  const std::string path = dir.write("g.txt", random_graph(500, 1500, -1, 1, 4).edge_list());
  // Longer than the second after which a terminal would show the progress line.
  const RunOutput r = cli_test::run_process(exe,
                                            {"solve", path, "--kernel", "anneal", "--sweeps", "1000000000",
                                             "--restarts", "2", "--time-limit", "1.3", "--report", "json"},
                                            dir, 0, 60);
  CHECK_FALSE(r.hung);
  CHECK(r.code == 0);
  CHECK(r.err.empty());  // stderr is a file here, not a terminal
  const Json j = parse_ok(r);
  CHECK(j["cut_short"].num == 2);
  CHECK_FALSE(j["interrupted"].b);
  CHECK(spins_of(j).size() == 500);
}

TEST_CASE("cli: auto with a time limit and no sweep count fills the limit (kernels/auto.hpp time-filling mode)") {
  TempDir dir;
  REQUIRE(dir.ok());
  const Graph g = random_graph(300, 900, -2, 3, 6);
  const std::string path = dir.write("g.txt", g.edge_list());
  const RunOutput r = cli_test::run_process(
      exe, {"solve", path, "--time-limit", "0.4", "--threads", "2", "--report", "json"}, dir, 0, 60);
  CHECK_FALSE(r.hung);
  CHECK(r.code == 0);
  const Json j = parse_ok(r);
  CHECK(j["time_filling"].b);
  CHECK(j["kernel_requested"].text == "auto");
  CHECK(j["kernel"].text == "anneal");  // a random graph: not square-lattice-like
  CHECK(j["restarts"].num == 2);   // one restart per thread by default
  CHECK(j["cut_short"].num == 0);  // ending at the deadline is this mode's normal end
  // Couplings of several magnitudes, 0.4 s: each restart anneals groups of 32 lanes
  // (auto_fill_group_for; the bit-sliced kernel takes +-J only).
  CHECK(j["fill_group"].text == "lanes");
  CHECK(j["lanes"].num == 32);
  CHECK_FALSE(j["bit_sliced"].b);
  const std::vector<int> s = spins_of(j);
  REQUIRE(s.size() == 300);
  CHECK(static_cast<std::int64_t>(j["energy"].num) == g.energy(s));
  CHECK(static_cast<std::int64_t>(j["cut"].num) == g.cut(s));
  // A sweep count keeps the fixed runs of the rule.
  const RunOutput fixed =
      run(dir, {"solve", path, "--time-limit", "30", "--sweeps", "50", "--restarts", "3", "--report", "json"});
  CHECK(fixed.code == 0);
  const Json k = parse_ok(fixed);
  CHECK_FALSE(k["time_filling"].b);
  CHECK(k["fill_group"].text.empty());
  CHECK(k["restarts"].num == 3);
  // The text report says how each restart ran.
  const RunOutput text = run(dir, {"solve", path, "--time-limit", "0.2", "--threads", "1"});
  CHECK(text.code == 0);
  CHECK(text.out.find("groups          each restart anneals groups of 32 (lanes)") != std::string::npos);
}

namespace {
// Everything a pseudo-terminal's master side holds (non-blocking reads until empty).
std::string drain(int fd) {
  std::string all;
  char buf[4096];
  for (;;) {
    const ssize_t n = ::read(fd, buf, sizeof buf);
    if (n <= 0) break;
    all.append(buf, static_cast<std::size_t>(n));
  }
  return all;
}
}  // namespace

TEST_CASE("cli: on a terminal a long run shows the progress line on stderr, unless --quiet") {
  TempDir dir;
  REQUIRE(dir.ok());
  const std::string path = dir.write("g.txt", random_graph(500, 1500, -1, 1, 4).edge_list());
  for (const bool quiet : {false, true}) {
    int master = -1, slave = -1;
    REQUIRE(::openpty(&master, &slave, nullptr, nullptr, nullptr) == 0);
    ::fcntl(master, F_SETFL, ::fcntl(master, F_GETFL) | O_NONBLOCK);
    ::fcntl(master, F_SETFD, FD_CLOEXEC);
    std::vector<std::string> args = {"solve",      path,         "--kernel", "anneal",       "--sweeps",
                                     "1000000000", "--restarts", "2",        "--time-limit", "1.6"};
    if (quiet) args.push_back("--quiet");
    const RunOutput r = cli_test::run_process(exe, args, dir, 0, 60, slave);
    ::close(slave);
    const std::string tty = drain(master);
    ::close(master);
    CHECK_FALSE(r.hung);
    CHECK(r.code == 0);
    CHECK(r.out.find("\nspins ") != std::string::npos);  // the report itself goes to stdout
    INFO("terminal: " << tty);
    if (quiet) {
      CHECK(tty.empty());
    } else {
      CHECK(tty.find("elapsed") != std::string::npos);
      CHECK(tty.find("restarts") != std::string::npos);
      // The best energy so far is shown while both restarts are still running (0/2 done).
      CHECK(tty.find("restarts 0/2   best energy ") != std::string::npos);
      CHECK(tty.find('\r') != std::string::npos);  // redrawn in place
      CHECK(tty.find('\n') == std::string::npos);  // a single line, never scrolled
    }
  }
}

TEST_CASE("cli: integer files run on int32 or int64 values, real files on double; the report names the type") {
  // The rule of docs/cli.md: all-integer values with an energy range (sum of |coefficients|)
  // up to 2^31 - 1 -> int32; other all-integer files -> int64; real values -> double. Integer
  // kernels use the same random stream for int32 and int64 (common practice: the value type
  // changes the arithmetic width, never the chain), so both give the same spins.
  TempDir dir;
  REQUIRE(dir.ok());
  const Graph g = random_graph(50, 200, -4, 6, 5);
  const std::string small = dir.write("small.txt", g.edge_list());
  const std::vector<std::string> common = {"--kernel", "anneal", "--restarts", "3",   "--threads", "1",
                                           "--seed",   "9",      "--sweeps",   "200", "--report",  "json"};
  auto solve = [&](const std::string& path, std::vector<std::string> extra) {
    std::vector<std::string> a = {"solve", path};
    a.insert(a.end(), common.begin(), common.end());
    a.insert(a.end(), extra.begin(), extra.end());
    return run(dir, a);
  };
  const RunOutput r32 = solve(small, {});
  REQUIRE(r32.code == 0);
  const Json j32 = parse_ok(r32);
  CHECK(j32["value_type"].text == "int32");
  const RunOutput r64 = solve(small, {"--value-type", "int64"});
  REQUIRE(r64.code == 0);
  const Json j64 = parse_ok(r64);
  CHECK(j64["value_type"].text == "int64");
  CHECK(spins_of(j32) == spins_of(j64));
  CHECK(j32["energy"].num == j64["energy"].num);
  CHECK(static_cast<std::int64_t>(j32["energy"].num) == g.energy(spins_of(j32)));
  const RunOutput text = run(dir, {"solve", small, "--sweeps", "50", "--restarts", "1", "--quiet"});
  CHECK(text.out.find("\nvalues ") != std::string::npos);
  CHECK(text.out.find("int32\n") != std::string::npos);

  // Weights of 10^9: the energy range passes 2^31 - 1, so int64; int32 is refused by name.
  Graph big = g;
  for (auto& e : big.edges) e.w *= 1000000000;
  const std::string wide = dir.write("wide.txt", big.edge_list());
  const RunOutput rb = solve(wide, {});
  REQUIRE(rb.code == 0);
  const Json jb = parse_ok(rb);
  CHECK(jb["value_type"].text == "int64");
  CHECK(static_cast<std::int64_t>(jb["energy"].num) == big.energy(spins_of(jb)));
  const RunOutput refused = solve(wide, {"--value-type", "int32"});
  check_input_error(refused, wide + ": --value-type int32");

  // A real weight anywhere: double.
  const std::string real = dir.write("real.txt", "3 2\n1 2 1.5\n2 3 -2\n");
  const RunOutput rr = solve(real, {});
  REQUIRE(rr.code == 0);
  CHECK(parse_ok(rr)["value_type"].text == "double");
  check_usage_error(solve(small, {"--value-type", "int16"}));
}

TEST_CASE("cli: help texts give the sweep default auto uses and describe the state-file format") {
  TempDir dir;
  REQUIRE(dir.ok());
  const RunOutput solve = run(dir, {"solve", "--help"});
  CHECK(solve.code == 0);
  // The library's rule (kernels/auto.hpp): 4000 sweeps up to 10^4 spins; inspect shows the same.
  CHECK(solve.out.find("4000 / 2000 / 1000") != std::string::npos);
  const std::string path = dir.write("g.txt", random_graph(300, 900, -1, 1, 2).edge_list());
  const Json in = parse_ok(run(dir, {"inspect", path, "--report", "json"}));
  CHECK(in["auto_sweeps"].num == 4000);
  for (const char* command : {"solve", "verify"}) {
    CAPTURE(command);
    const RunOutput h = run(dir, {command, "--help"});
    CHECK(h.code == 0);
    CHECK(h.out.find("State files") != std::string::npos);
    CHECK(h.out.find("'+' or '-' for spins") != std::string::npos);
    CHECK(h.out.find("'0' / '1' for bits") != std::string::npos);
  }
}

TEST_CASE("cli: the text report leaves out the spins line beyond 100 spins; JSON and --state-out keep the state") {
  TempDir dir;
  REQUIRE(dir.ok());
  const std::string small = dir.write("small.txt", random_graph(100, 300, -1, 1, 3).edge_list());
  const std::string big = dir.write("big.txt", random_graph(101, 300, -1, 1, 3).edge_list());
  const std::vector<std::string> opts = {"--kernel", "anneal", "--sweeps", "50", "--restarts", "1", "--quiet"};
  auto solve = [&](const std::string& path, std::vector<std::string> extra) {
    std::vector<std::string> a = {"solve", path};
    a.insert(a.end(), opts.begin(), opts.end());
    a.insert(a.end(), extra.begin(), extra.end());
    return run(dir, a);
  };
  const RunOutput s100 = solve(small, {});
  REQUIRE(s100.code == 0);
  const std::size_t at = s100.out.find("\nspins ");
  REQUIRE(at != std::string::npos);
  const std::string line = s100.out.substr(at + 1, s100.out.find('\n', at + 1) - at - 1);
  CHECK(line.size() > 100);  // "spins" label and 100 characters
  const std::string best_path = dir.file("best.txt");
  const RunOutput s101 = solve(big, {"--state-out", best_path});
  REQUIRE(s101.code == 0);
  CHECK(s101.out.find("not shown for more than 100 spins") != std::string::npos);
  CHECK(s101.out.find("++") == std::string::npos);
  CHECK(s101.out.find("--+") == std::string::npos);
  std::size_t values = 0;
  std::istringstream state(cli_test::read_file(best_path));
  for (std::string l; std::getline(state, l);) values += l == "+" || l == "-";
  CHECK(values == 101);
  const Json j = parse_ok(solve(big, {"--report", "json"}));
  CHECK(spins_of(j).size() == 101);
}

TEST_CASE("cli: real numbers print with the shortest digits; a convert error gives its advice once") {
  TempDir dir;
  REQUIRE(dir.ok());
  // 0.1 + 0.2 is 0.30000000000000004 in binary64 (IEEE 754-2008; Goldberg, ACM Computing
  // Surveys 23, 1991): JSON keeps the shortest text that reads back to the same double, the text
  // report the shortest within the rounding of the model's arithmetic.
  const std::string path = dir.write("real.txt", "3 2\n1 2 0.1\n2 3 0.2\n");
  const RunOutput j = run(dir, {"inspect", path, "--report", "json"});
  REQUIRE(j.code == 0);
  CHECK(j.out.find("\"pair_min\": 0.1,") != std::string::npos);
  CHECK(j.out.find("0.10000000000000001") == std::string::npos);
  const RunOutput t = run(dir, {"solve", path, "--kernel", "anneal", "--sweeps", "20", "--restarts", "1", "--quiet"});
  REQUIRE(t.code == 0);
  INFO(t.out);
  CHECK(t.out.find("\nenergy ") != std::string::npos);
  CHECK(t.out.find("-0.3\n") != std::string::npos);
  CHECK(t.out.find("0.30000000000000004") == std::string::npos);
  // Integers stay plain digits, however few significant digits would read back.
  const std::string heavy = dir.write("heavy.txt", "2 1\n1 2 19990\n");
  const RunOutput h = run(dir, {"solve", heavy, "--report", "json"});
  REQUIRE(h.code == 0);
  CHECK(h.out.find("\"total_weight\": 19990,") != std::string::npos);
  CHECK(h.out.find("\"cut\": 19990,") != std::string::npos);
  const RunOutput ht = run(dir, {"solve", heavy});
  CHECK(ht.out.find("19990 (total weight 19990)") != std::string::npos);
  // A model with a field written as an edge list: the reason and its advice, once.
  const std::string mtx = dir.write(
      "f.mtx", "%%MatrixMarket matrix coordinate integer general\n% spinwright form ising\n2 2 2\n1 1 3\n1 2 1\n");
  const RunOutput c = run(dir, {"convert", mtx, dir.file("out.txt"), "--to", "ising"});
  CHECK(c.code == 1);
  CHECK(count_lines(c.err) == 1);
  const auto first = c.err.find("Matrix Market");
  REQUIRE(first != std::string::npos);
  CHECK(c.err.find("Matrix Market", first + 1) == std::string::npos);
  CHECK(c.err.find("--out-format mtx") != std::string::npos);
}

TEST_CASE("cli: a kernel named with a time limit fills it; annealing with a huge sweep count still ends cold") {
  TempDir dir;
  REQUIRE(dir.ok());
  const Graph g = random_graph(50, 150, -2, 3, 8);
  const std::string path = dir.write("g.txt", g.edge_list());
  const RunOutput r = cli_test::run_process(
      exe, {"solve", path, "--kernel", "anneal", "--time-limit", "0.6", "--restarts", "1", "--report", "json"}, dir, 0,
      60);
  REQUIRE(r.code == 0);
  const Json j = parse_ok(r);
  CHECK(j["time_driven"].b);
  CHECK(j["cut_short"].num == 0);  // ending at the deadline is the plan, not a cut
  // The default of 1000 sweeps no longer ends the run: a 50-spin sweep takes microseconds.
  CHECK(j["sweeps"].num > 5000);
  CHECK(local_minimum(g, spins_of(j)));
  // 10^9 planned sweeps under a time limit: the schedule follows the elapsed fraction of the
  // limit (kernels/anneal.hpp), so the run is cut short but ends cold.
  const Graph h = random_graph(1000, 3000, -1, 1, 21);
  const std::string big = dir.write("h.txt", h.edge_list());
  const RunOutput cold = cli_test::run_process(exe,
                                               {"solve", big, "--kernel", "anneal", "--sweeps", "1000000000",
                                                "--time-limit", "0.8", "--restarts", "1", "--report", "json"},
                                               dir, 0, 60);
  REQUIRE(cold.code == 0);
  const Json jc = parse_ok(cold);
  CHECK(jc["cut_short"].num == 1);
  CHECK_FALSE(jc["time_driven"].b);
  // Descent from random states is what a run cut off hot amounts to (hot state + descent):
  // the cold end must beat the best of 16 such descents by a clear margin.
  const Json jd = parse_ok(run(dir, {"solve", big, "--kernel", "descent", "--restarts", "16", "--report", "json"}));
  INFO("cold " << jc["energy"].num << ", best descent " << jd["energy"].num);
  CHECK(jc["energy"].num < jd["energy"].num - 0.05 * static_cast<double>(h.edges.size()));
}

TEST_CASE("cli: schedule options set the ends of annealing and tempering; misuse is a usage error") {
  TempDir dir;
  REQUIRE(dir.ok());
  const Graph g = random_graph(80, 240, -1, 1, 13);
  const std::string path = dir.write("g.txt", g.edge_list());
  auto solve = [&](std::vector<std::string> extra) {
    std::vector<std::string> a = {"solve", path, "--sweeps", "100", "--restarts", "2", "--report", "json"};
    a.insert(a.end(), extra.begin(), extra.end());
    return run(dir, a);
  };
  const Json b = parse_ok(solve({"--kernel", "anneal", "--beta-start", "0.25", "--beta-end", "3"}));
  CHECK(b["beta_start"].num == 0.25);
  CHECK(b["beta_end"].num == 3);
  CHECK(static_cast<std::int64_t>(b["energy"].num) == g.energy(spins_of(b)));
  // Acceptance ends: beta = -ln(p) / delta, with the cold delta 2 min |J| = 2 for +-1 couplings
  // (the beta span rule of kernels/beta_span.hpp; Metropolis acceptance exp(-beta delta),
  // Metropolis et al., J. Chem. Phys. 21, 1953).
  const Json a = parse_ok(solve({"--kernel", "temper", "--accept-end", "0.01", "--beta-start", "0.1"}));
  CHECK(a["beta_end"].num == doctest::Approx(std::log(100.0) / 2).epsilon(1e-12));
  CHECK(a["beta_start"].num == 0.1);
  // The default start is the span's: a typical uphill flip accepted with probability 1/2.
  const Json d = parse_ok(solve({"--kernel", "anneal"}));
  const Json h = parse_ok(solve({"--kernel", "anneal", "--accept-start", "0.5"}));
  CHECK(h["beta_start"].num == doctest::Approx(d["beta_start"].num).epsilon(1e-12));
  // A warm start with a cold schedule (not re-heated) begins from the given state.
  const std::vector<int> best = spins_of(b);
  std::string state;
  for (const int v : best) state += v > 0 ? "+\n" : "-\n";
  const std::string warm = dir.write("warm.txt", state);
  const Json w = parse_ok(solve({"--kernel", "anneal", "--warm-start", warm, "--beta-start", "2", "--beta-end", "4"}));
  CHECK(w["energy"].num <= b["energy"].num);
  check_usage_error(solve({"--kernel", "anneal", "--beta-start", "1", "--accept-start", "0.5"}));
  check_usage_error(solve({"--kernel", "anneal", "--accept-end", "1.5"}));
  check_usage_error(solve({"--kernel", "anneal", "--beta-start", "5", "--beta-end", "1"}));
  check_usage_error(solve({"--kernel", "tabu", "--beta-end", "3"}));
}

TEST_CASE("cli: unweighted edge lists read with weight 1; a file without its header is told so") {
  TempDir dir;
  REQUIRE(dir.ok());
  // The 6-cycle is bipartite: its maximum cut is all 6 edges, E = -6 (common practice).
  const std::string ring = dir.write("ring.txt", "6 6\n1 2\n2 3\n3 4\n4 5\n5 6\n6 1\n");
  const Json j = parse_ok(run(dir, {"solve", ring, "--report", "json"}));
  CHECK(j["energy"].num == -6);
  CHECK(j["cut"].num == 6);
  CHECK(j["value_type"].text == "int32");
  const std::string headless = dir.write("headless.txt", "1 2 1\n2 3 1\n3 1 1\n");
  const RunOutput r = run(dir, {"solve", headless});
  check_input_error(r, headless + ":2: ");
  CHECK(r.err.find("header line missing") != std::string::npos);
}

namespace {

// The SVG's elements as name and attributes, checking that every tag is closed in order
// (a small XML reader: enough for the program's own output; W3C XML 1.0 well-formedness).
struct SvgElement {
  std::string name;
  std::map<std::string, std::string> attr;
};

bool read_svg(const std::string& text, std::vector<SvgElement>& out) {
  std::vector<std::string> open;
  std::size_t at = 0;
  while ((at = text.find('<', at)) != std::string::npos) {
    const std::size_t end = text.find('>', at);
    if (end == std::string::npos) return false;
    std::string tag = text.substr(at + 1, end - at - 1);
    at = end + 1;
    if (tag.empty() || tag[0] == '?') continue;
    if (tag[0] == '/') {
      if (open.empty() || open.back() != tag.substr(1)) return false;
      open.pop_back();
      continue;
    }
    const bool self_closing = tag.back() == '/';
    if (self_closing) tag.pop_back();
    SvgElement e;
    std::size_t k = tag.find_first_of(" \n");
    e.name = tag.substr(0, k);
    while (k != std::string::npos && k < tag.size()) {
      const std::size_t eq = tag.find('=', k);
      if (eq == std::string::npos) break;
      std::string key = tag.substr(k, eq - k);
      key.erase(0, key.find_first_not_of(" \n"));
      if (eq + 1 >= tag.size() || tag[eq + 1] != '"') return false;
      const std::size_t close = tag.find('"', eq + 2);
      if (close == std::string::npos) return false;
      e.attr[key] = tag.substr(eq + 2, close - eq - 2);
      k = close + 1;
    }
    if (!self_closing) open.push_back(e.name);
    out.push_back(e);
  }
  return open.empty() && !out.empty() && out.front().name == "svg";
}

}  // namespace

TEST_CASE("cli: solve --plot and bench --plot write SVG figures whose numbers match the report") {
  TempDir dir;
  REQUIRE(dir.ok());
  const Graph g = random_graph(120, 360, -1, 1, 17);
  const std::string path = dir.write("g.txt", g.edge_list());
  const std::string svg = dir.file("solve.svg");
  const Json j = parse_ok(run(dir, {"solve", path, "--kernel", "anneal", "--sweeps", "300", "--restarts", "12",
                                    "--report", "json", "--plot", svg}));
  std::vector<SvgElement> el;
  REQUIRE(read_svg(cli_test::read_file(svg), el));
  // Histogram: one bar per bin, the counts add up to the restarts; every energy in some bin.
  std::uint64_t total = 0;
  double lowest_bin = 1e300;
  std::size_t curves = 0;
  for (const auto& e : el) {
    if (e.name == "rect" && e.attr.count("data-count") != 0) {
      total += std::stoull(e.attr.at("data-count"));
      lowest_bin = std::min(lowest_bin, std::stod(e.attr.at("data-lo")));
    }
    if (e.name == "path" && e.attr.count("data-last") != 0) {
      ++curves;
      // The best-energy curves over all restarts end at the reported best energy.
      if (e.attr.at("data-name") == "all restarts") CHECK(std::stod(e.attr.at("data-last")) == j["energy"].num);
    }
  }
  CHECK(total == 12);
  CHECK(lowest_bin == j["energy"].num);
  CHECK(curves == 3);  // against sweeps (all restarts, restart 0) and against time

  const std::string bsvg = dir.file("bench.svg");
  const RunOutput b = run(dir, {"bench", path, "--kernel", "anneal,descent", "--sweeps", "300", "--restarts", "8",
                                "--report", "json", "--quiet", "--plot", bsvg});
  REQUIRE(b.code == 0);
  const Json jb = parse_ok(b);
  std::vector<SvgElement> be;
  REQUIRE(read_svg(cli_test::read_file(bsvg), be));
  std::map<std::string, double> last_success;
  for (const auto& e : be) {
    if (e.name == "path" && e.attr.count("data-last") != 0 && last_success.count(e.attr.at("data-name")) == 0) {
      last_success[e.attr.at("data-name")] = std::stod(e.attr.at("data-last"));  // first panel: P(success)
    }
  }
  // The success curve ends at the success probability of the table (common practice: the
  // empirical fraction of restarts at or below the target).
  for (const auto& k : jb["kernels"].items) {
    CAPTURE(k["kernel"].text);
    REQUIRE(last_success.count(k["kernel"].text) == 1);
    CHECK(last_success[k["kernel"].text] == doctest::Approx(k["success_probability"].num));
  }
  // An unwritable figure is an input error naming the file.
  check_input_error(run(dir, {"solve", path, "--sweeps", "10", "--plot", "/nonexistent-folder/f.svg"}),
                    "/nonexistent-folder/f.svg");
}
