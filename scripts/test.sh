#!/usr/bin/env bash
# The whole test suite: installs what the tests need when it is missing (Debian packages),
# then runs every test workflow through ctest. README.md and .ci/run call exactly this.
set -euo pipefail
cd "$(dirname "$0")/.."

packages=(cmake g++ doctest-dev libbenchmark-dev clang libclang-rt-14-dev glpk-utils libglpk-dev libeigen3-dev
          gcc-arm-none-eabi libstdc++-arm-none-eabi-newlib libnewlib-arm-none-eabi qemu-system-arm
          g++-aarch64-linux-gnu qemu-user libopenmpi-dev openmpi-bin)
missing=()
for p in "${packages[@]}"; do
  dpkg-query -W -f='${Status}' "$p" 2>/dev/null | grep -q "install ok installed" || missing+=("$p")
done
if [ ${#missing[@]} -gt 0 ]; then
  echo "installing: ${missing[*]}"
  sudo_cmd=""
  [ "$(id -u)" -ne 0 ] && sudo_cmd="sudo"
  $sudo_cmd apt-get update -qq
  DEBIAN_FRONTEND=noninteractive $sudo_cmd apt-get install -y -qq "${missing[@]}"
fi

# test: GCC, C++17; no-heap: every header's compile check and the no-heap test with
# SPINWRIGHT_NO_HEAP=1; sanitize: Clang, C++20, -fno-exceptions -fno-rtti, under ASan+UBSan (the
# test-clang preset is the same build without sanitizers, for local use); fuzz: each libFuzzer
# target for a bounded time; cortex-m4: the firmware example under qemu-system-arm; aarch64:
# the suite cross-compiled and run under qemu-aarch64.
workflows=(${SPINWRIGHT_TEST_WORKFLOWS:-test no-heap sanitize fuzz cortex-m4 aarch64})
for w in "${workflows[@]}"; do
  echo "=== cmake --workflow --preset $w"
  start=$(date +%s)
  cmake --workflow --preset "$w" --fresh
  echo "=== $w: $(( $(date +%s) - start )) s"
done
