#!/usr/bin/env bash
# The test command (README "Test"): makes sure the Debian packages the check preset needs are
# installed, then runs every test with `cmake --workflow --preset check` (compiler from $CXX,
# default c++). Run as root, it installs what is missing with apt-get; run as anyone else, it
# prints the one apt-get line to run and stops. Debian 12 package names.
set -euo pipefail
cd "$(dirname "$0")/.."

# cmake and a C++17 compiler; Catch2 2, Eigen 3, Boost (Odeint, header-only) and GSL for the
# tests' outside references; xmllint and rsvg-convert check the tools' SVG charts; python3 with
# numpy for the scripted checks; the Arm cross toolchain, newlib and qemu build the Cortex-M
# images and run them (without those four, configure with -DHALFSPIN_TARGET_TESTS=OFF yourself);
# gcc and clang build the C interface's test as strict C99 with each compiler.
packages=(cmake g++ gcc clang catch2 libeigen3-dev libboost-dev libgsl-dev libxml2-utils librsvg2-bin
          python3 python3-numpy gcc-arm-none-eabi libnewlib-arm-none-eabi
          libstdc++-arm-none-eabi-newlib qemu-system-arm)

missing=()
for p in "${packages[@]}"; do
  dpkg-query -W -f='${Status}' "$p" 2>/dev/null | grep -q 'install ok installed' || missing+=("$p")
done
if ((${#missing[@]})); then
  if [[ $(id -u) -ne 0 ]]; then
    echo "halfspin tests need Debian packages that are not installed; as root, run:" >&2
    echo "  apt-get install -y --no-install-recommends ${missing[*]}" >&2
    exit 1
  fi
  echo "== installing: ${missing[*]} =="
  apt-get update -qq
  DEBIAN_FRONTEND=noninteractive apt-get install -y -qq --no-install-recommends "${missing[@]}"
fi

exec cmake --workflow --preset check
