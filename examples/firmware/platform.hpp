// The two things the firmware example needs from its platform.
#ifndef SPINWRIGHT_EXAMPLES_FIRMWARE_PLATFORM_HPP
#define SPINWRIGHT_EXAMPLES_FIRMWARE_PLATFORM_HPP

void platform_write(const char* text);  // a zero-terminated line fragment
int firmware_main();                    // the program; its result is the exit status

#endif
