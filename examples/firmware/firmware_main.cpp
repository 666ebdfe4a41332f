// Firmware-style control loop: an integer QUBO held in static storage, annealed through the
// stepping API with a fixed sweep budget per tick, with no heap, no exceptions and no RTTI.
// The same source runs on a Cortex-M4 (platform_cortex_m4.cpp, under qemu-system-arm) and on
// the host (platform_host.cpp); both must print exactly the same answer.
//
// Scenario of our own, invented data: an irrigation controller chooses which of 32 valves to
// open this cycle. Opening valve i earns its zone's dryness (unary -d_i); two open valves on
// the same supply segment lower the pressure for both (pair +p_ij).
#include <spinwright/kernels/anneal.hpp>
#include <spinwright/model/sparse_view.hpp>

#include <cstddef>
#include <cstdint>

#include "platform.hpp"

namespace {

constexpr std::size_t valves = 32;

struct Segment {
  std::uint16_t a, b;
  std::int32_t pressure;
};

// Ring main (neighbours share a segment), plus two sets of cross-links.
constexpr auto make_segments() {
  struct List {
    Segment s[3 * valves];
  } list{};
  for (std::uint16_t i = 0; i < valves; ++i) {
    list.s[i] = {i, static_cast<std::uint16_t>((i + 1) % valves), 6};
    list.s[valves + i] = {i, static_cast<std::uint16_t>((i + 4) % valves), 4};
    list.s[2 * valves + i] = {i, static_cast<std::uint16_t>((i + 10) % valves), 3};
  }
  return list;
}

// Compressed rows (both directions, rows sorted), computed by the compiler into flash.
struct Tables {
  std::int32_t unary[valves];
  std::size_t rows[valves + 1];
  std::uint16_t neighbours[6 * valves];
  std::int32_t pressure[6 * valves];
};

constexpr Tables make_tables() {
  constexpr auto segments = make_segments();
  Tables t{};
  for (std::size_t i = 0; i < valves; ++i) t.unary[i] = -static_cast<std::int32_t>(5 + (i * 7) % 9);
  std::size_t k = 0;
  for (std::size_t i = 0; i < valves; ++i) {
    t.rows[i] = k;
    for (std::size_t j = 0; j < valves; ++j) {
      for (const Segment& s : segments.s) {
        if ((s.a == i && s.b == j) || (s.b == i && s.a == j)) {
          t.neighbours[k] = static_cast<std::uint16_t>(j);
          t.pressure[k++] = s.pressure;
        }
      }
    }
  }
  t.rows[valves] = k;
  return t;
}

constexpr Tables tables = make_tables();

using Model = spinwright::QuboModelView<std::int32_t, std::uint16_t>;
using Annealer = spinwright::Annealer<Model>;

alignas(8) unsigned char workspace[1024];  // every byte the solver uses, fixed at build time

char* put_int(char* out, std::int64_t v) {
  char digits[24];
  int n = 0;
  const bool negative = v < 0;
  std::uint64_t u = negative ? 0 - static_cast<std::uint64_t>(v) : static_cast<std::uint64_t>(v);
  do {
    digits[n++] = static_cast<char>('0' + u % 10);
    u /= 10;
  } while (u != 0);
  if (negative) *out++ = '-';
  while (n > 0) *out++ = digits[--n];
  return out;
}

}  // namespace

int firmware_main() {
  auto made = Model::over(valves, tables.unary, tables.rows, tables.neighbours, tables.pressure);
  if (!made.ok()) {
    platform_write("model refused\n");
    return 1;
  }
  const Model& model = made.value();
  spinwright::Arena arena(workspace, sizeof workspace);
  spinwright::AnnealParams params;
  params.sweeps = 400;  // the schedule spans 20 ticks of 20 sweeps
  Annealer annealer(model, params, arena, /*seed=*/2026, /*restart=*/0);
  if (!annealer.valid()) {
    platform_write("workspace too small\n");
    return 1;
  }
  for (int tick = 0; tick < 20; ++tick) {
    annealer.step(20);  // fixed budget per control tick; actuate best() here in a real device
  }
  const auto best = annealer.best();
  char line[160];
  char* p = line;
  for (const char* s = "energy "; *s; ++s) *p++ = *s;
  p = put_int(p, best.energy);
  for (const char* s = " open "; *s; ++s) *p++ = *s;
  for (std::size_t i = 0; i < best.size; ++i) *p++ = best.spins[i] < 0 ? '1' : '0';
  for (const char* s = " arena "; *s; ++s) *p++ = *s;
  p = put_int(p, static_cast<std::int64_t>(arena.used()));
  *p++ = '\n';
  *p = '\0';
  platform_write(line);
  return model.energy(best.spins) == best.energy ? 0 : 2;
}
