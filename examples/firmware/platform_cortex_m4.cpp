// Bare-metal start-up and output for the Cortex-M4 build of the firmware example: a vector
// table, a reset handler that copies .data and clears .bss, and ARM semihosting calls for
// output and exit (qemu-system-arm -semihosting-config enable=on,target=native).
#include <cstdint>

#include "platform.hpp"

extern "C" {
extern std::uint32_t _data_start, _data_end, _data_load, _bss_start, _bss_end, _stack_top;
void reset_handler();
}

namespace {

int semihost(int operation, const void* argument) {
  register int r0 __asm__("r0") = operation;
  register const void* r1 __asm__("r1") = argument;
  __asm__ volatile("bkpt 0xAB" : "+r"(r0) : "r"(r1) : "memory");
  return r0;
}

constexpr int sys_write0 = 0x04;
constexpr int sys_exit = 0x18;
constexpr std::uintptr_t application_exit = 0x20026;  // ADP_Stopped_ApplicationExit
constexpr std::uintptr_t runtime_error = 0x20023;     // ADP_Stopped_RunTimeErrorUnknown

[[noreturn]] void halt(int status) {
  semihost(sys_exit, reinterpret_cast<const void*>(status == 0 ? application_exit : runtime_error));
  for (;;) {
  }
}

void default_handler() { halt(3); }

}  // namespace

void platform_write(const char* text) { semihost(sys_write0, text); }

extern "C" void reset_handler() {
  std::uint32_t* src = &_data_load;
  for (std::uint32_t* dst = &_data_start; dst < &_data_end;) *dst++ = *src++;
  for (std::uint32_t* dst = &_bss_start; dst < &_bss_end;) *dst++ = 0;
  halt(firmware_main());
}

// Initial stack pointer, reset, and the fault handlers (NMI, HardFault, MemManage, BusFault,
// UsageFault) that end the run with an error.
__attribute__((section(".vectors"), used)) void (*const vector_table[8])() = {reinterpret_cast<void (*)()>(&_stack_top),
                                                                              reset_handler,
                                                                              default_handler,
                                                                              default_handler,
                                                                              default_handler,
                                                                              default_handler,
                                                                              default_handler,
                                                                              nullptr};
