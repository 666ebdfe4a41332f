// Link probe for the cortex-m4 preset: a program that allocates must fail to link, proving
// that the firmware link really refuses malloc (see firmware.malloc_link_refused).
#include "platform.hpp"

namespace {
int* volatile kept = nullptr;  // the allocation escapes, so the compiler cannot elide it
}

int firmware_main() {
  kept = new int(7);
  return *kept == 7 ? 0 : 1;
}
