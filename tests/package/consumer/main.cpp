// A minimal user program: builds a 3-spin frustrated triangle and checks its energy.
#include <spinwright/spinwright.hpp>

int main() {
  spinwright::IsingBuilder<int> b;
  b.add_coupling(0, 1, 1).add_coupling(1, 2, 1).add_coupling(0, 2, 1);
  auto m = b.build();
  if (!m) return 1;
  const std::int8_t s[3] = {1, -1, 1};
  return m->energy(s) == -1 ? 0 : 2;
}
