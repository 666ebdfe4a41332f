// Host build of the firmware example: the same program, output on stdout.
#include <cstdio>

#include "platform.hpp"

void platform_write(const char* text) { std::fputs(text, stdout); }

int main() { return firmware_main(); }
