// The test helpers that benchmarks share (tests/support/: graph readers and builders) check
// their reads with doctest's REQUIRE; this unit gives the benchmarks doctest's implementation
// (no test runner) and a context for checks outside test cases: a failed check prints where it
// failed and ends the program.
#define DOCTEST_CONFIG_IMPLEMENT
#include <doctest/doctest.h>

#include <cstdio>
#include <cstdlib>

namespace {

void on_failed_check(const doctest::AssertData& a) {
  std::fprintf(stderr, "%s:%d: check failed: %s\n", a.m_file, a.m_line, a.m_expr);
  std::abort();
}

struct ChecksOutsideTests {
  doctest::Context context;
  ChecksOutsideTests() {
    context.setAsDefaultForAssertsOutOfTestCases();
    context.setAssertHandler(on_failed_check);
  }
};

ChecksOutsideTests checks;

}  // namespace
