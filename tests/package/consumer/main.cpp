// A minimal user program: builds a 3-spin frustrated triangle and checks its energy
// (E = -1 for s = (+1, -1, +1): one satisfied bond of three; common practice). Through the
// parent project of tests/package/exporter it also calls that project's own function.
#include <spinwright/spinwright.hpp>

#if defined(SPINWRIGHT_CONSUMER_PLANNER)
int planner_triangle_energy();
#endif

int main() {
  spinwright::IsingBuilder<int> b;
  b.add_coupling(0, 1, 1).add_coupling(1, 2, 1).add_coupling(0, 2, 1);
  auto m = b.build();
  if (!m) return 1;
  const std::int8_t s[3] = {1, -1, 1};
  if (m->energy(s) != -1) return 2;
#if defined(SPINWRIGHT_CONSUMER_PLANNER)
  if (planner_triangle_energy() != -1) return 3;
#endif
  return 0;
}
