#!/usr/bin/env bash
# The whole test suite: installs what the tests need when it is missing (Debian packages),
# then runs every test workflow through ctest. README.md and .ci/run call exactly this.
set -euo pipefail
cd "$(dirname "$0")/.."

packages=(cmake g++ doctest-dev libbenchmark-dev clang libclang-rt-14-dev glpk-utils libglpk-dev)
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

workflows=(${SPINWRIGHT_TEST_WORKFLOWS:-test test-clang})
for w in "${workflows[@]}"; do
  if grep -q "\"name\": \"$w\"" CMakePresets.json; then
    echo "=== cmake --workflow --preset $w"
    cmake --workflow --preset "$w"
  fi
done
