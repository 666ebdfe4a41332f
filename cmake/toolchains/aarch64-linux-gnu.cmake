# Cross toolchain for 64-bit ARM Linux (Debian g++-aarch64-linux-gnu); tests run under
# qemu-aarch64 (Debian qemu-user) through CMAKE_CROSSCOMPILING_EMULATOR.
set(CMAKE_SYSTEM_NAME Linux)
set(CMAKE_SYSTEM_PROCESSOR aarch64)
set(CMAKE_C_COMPILER aarch64-linux-gnu-gcc)
set(CMAKE_CXX_COMPILER aarch64-linux-gnu-g++)
set(CMAKE_FIND_ROOT_PATH /usr/aarch64-linux-gnu)
set(CMAKE_CROSSCOMPILING_EMULATOR qemu-aarch64;-L;/usr/aarch64-linux-gnu)
set(CMAKE_FIND_ROOT_PATH_MODE_PROGRAM NEVER)
set(CMAKE_FIND_ROOT_PATH_MODE_LIBRARY ONLY)
set(CMAKE_FIND_ROOT_PATH_MODE_INCLUDE ONLY)
# Header-only test dependencies (doctest) are found on the build machine.
set(CMAKE_FIND_ROOT_PATH_MODE_PACKAGE BOTH)
# GCC fuses a*b+c into one rounding on aarch64 by default; x86-64 (without -mfma) does not.
# Turn fusion off so floating-point schedules round the same way on both.
set(CMAKE_CXX_FLAGS_INIT "-ffp-contract=off")
