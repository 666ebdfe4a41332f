// Test helper: the minimum of a QUBO computed by GLPK (GNU Linear Programming Kit, a general
// mixed-integer solver; test-only dependency, linked by tests/extra.cmake).
//
// Standard linearisation of each product (common practice; e.g. F. Glover, E. Woolsey,
// "Converting the 0-1 polynomial programming problem to a 0-1 linear program", Oper. Res. 22,
// 180-182, 1974): y_ij stands for x_i x_j with
//     y_ij <= x_i,   y_ij <= x_j,   y_ij >= x_i + x_j - 1,   0 <= y_ij <= 1,
// x binary, and the objective offset + sum Q_ii x_i + sum Q_ij y_ij is minimised.
#ifndef SPINWRIGHT_TEST_SUPPORT_GLPK_QUBO_HPP
#define SPINWRIGHT_TEST_SUPPORT_GLPK_QUBO_HPP

#include <glpk.h>

#include <cstdint>
#include <vector>

namespace test_support {

struct GlpkAnswer {
  bool optimal = false;
  double objective = 0;
  std::vector<std::uint8_t> bits;
};

// A QUBO as the raw terms a caller wrote, before any builder saw them: pairs in either order,
// repeated pairs, and (i, i) pairs (x_i x_i = x_i) all kept as given. The reference reads this,
// never a library-built model, so a builder that merges terms wrongly cannot agree with it.
struct RawQubo {
  struct Term {
    int i;
    int j;
    double v;
  };
  int n = 0;
  double offset = 0;
  std::vector<Term> unary;  // j unused
  std::vector<Term> pairs;

  // offset + sum unary v x_i + sum pairs v x_i x_j, term by term (common practice).
  double energy(const std::vector<std::uint8_t>& x) const {
    double e = offset;
    for (const auto& t : unary) e += t.v * x[static_cast<std::size_t>(t.i)];
    for (const auto& t : pairs) e += t.v * x[static_cast<std::size_t>(t.i)] * x[static_cast<std::size_t>(t.j)];
    return e;
  }
};

inline GlpkAnswer glpk_qubo_minimum(const RawQubo& q) {
  const int n = q.n;
  using Pair = RawQubo::Term;
  std::vector<double> linear(static_cast<std::size_t>(n), 0.0);
  for (const auto& t : q.unary) linear[static_cast<std::size_t>(t.i)] += t.v;
  std::vector<Pair> pairs;  // one product variable per raw term (repeats linearise separately)
  for (const auto& t : q.pairs) {
    if (t.i == t.j) {
      linear[static_cast<std::size_t>(t.i)] += t.v;
    } else {
      pairs.push_back(t);
    }
  }
  glp_term_out(GLP_OFF);
  glp_prob* lp = glp_create_prob();
  glp_set_obj_dir(lp, GLP_MIN);
  glp_set_obj_coef(lp, 0, q.offset);
  const int cols = n + static_cast<int>(pairs.size());
  if (cols > 0) glp_add_cols(lp, cols);
  for (int i = 0; i < n; ++i) {
    glp_set_col_kind(lp, i + 1, GLP_BV);
    glp_set_obj_coef(lp, i + 1, linear[static_cast<std::size_t>(i)]);
  }
  std::vector<int> ia{0};
  std::vector<int> ja{0};
  std::vector<double> ar{0};
  const int rows = 3 * static_cast<int>(pairs.size());
  if (rows > 0) glp_add_rows(lp, rows);
  for (std::size_t k = 0; k < pairs.size(); ++k) {
    const int y = n + static_cast<int>(k) + 1;
    const int xi = pairs[k].i + 1;
    const int xj = pairs[k].j + 1;
    glp_set_col_bnds(lp, y, GLP_DB, 0.0, 1.0);
    glp_set_obj_coef(lp, y, pairs[k].v);
    const int r = 3 * static_cast<int>(k) + 1;
    glp_set_row_bnds(lp, r, GLP_UP, 0.0, 0.0);       // y - x_i <= 0
    glp_set_row_bnds(lp, r + 1, GLP_UP, 0.0, 0.0);   // y - x_j <= 0
    glp_set_row_bnds(lp, r + 2, GLP_LO, -1.0, 0.0);  // y - x_i - x_j >= -1
    const int entries[7][2] = {{r, y}, {r, xi}, {r + 1, y}, {r + 1, xj}, {r + 2, y}, {r + 2, xi}, {r + 2, xj}};
    const double values[7] = {1, -1, 1, -1, 1, -1, -1};
    for (int e = 0; e < 7; ++e) {
      ia.push_back(entries[e][0]);
      ja.push_back(entries[e][1]);
      ar.push_back(values[e]);
    }
  }
  if (ia.size() > 1) glp_load_matrix(lp, static_cast<int>(ia.size()) - 1, ia.data(), ja.data(), ar.data());
  glp_iocp parm;
  glp_init_iocp(&parm);
  parm.presolve = GLP_ON;
  parm.msg_lev = GLP_MSG_OFF;
  GlpkAnswer answer;
  if (glp_intopt(lp, &parm) == 0 && glp_mip_status(lp) == GLP_OPT) {
    answer.optimal = true;
    answer.objective = glp_mip_obj_val(lp);
    answer.bits.resize(static_cast<std::size_t>(n));
    for (int i = 0; i < n; ++i) answer.bits[static_cast<std::size_t>(i)] = glp_mip_col_val(lp, i + 1) > 0.5 ? 1 : 0;
  }
  glp_delete_prob(lp);
  return answer;
}

}  // namespace test_support

#endif
