#!/usr/bin/env bash
# Installs, from Debian 12's archive only, every package dwellmark needs to
# build, test and run. Idempotent: packages already present are skipped.
# Run as root. Nothing is downloaded outside the Debian archive.
set -euo pipefail

packages=(
  # toolchain
  build-essential cmake ninja-build pkg-config git python3
  # core
  libeigen3-dev nlohmann-json3-dev libcli11-dev libtbb-dev
  # render (CPU) and images
  libpng-dev libstb-dev
  # GUI: window, GL loader, UI, maths
  libglfw3-dev libepoxy-dev libimgui-dev libglm-dev libx11-dev libxrandr-dev
  libegl-dev libegl1-mesa-dev libgl1-mesa-dri mesa-utils fonts-dejavu-core
  # tests, benchmarks, headless display, report checks
  catch2 libbenchmark-dev xvfb xauth tidy chromium
  # sanitiser and fuzzing stage
  clang libclang-rt-14-dev
)

missing=()
for p in "${packages[@]}"; do
  dpkg-query -W -f='${Status}' "$p" 2>/dev/null | grep -q 'install ok installed' || missing+=("$p")
done

if [ ${#missing[@]} -eq 0 ]; then
  echo "install-deps: all ${#packages[@]} packages present"
  exit 0
fi

if [ "$(id -u)" -ne 0 ]; then
  echo "install-deps: missing packages: ${missing[*]}" >&2
  echo "install-deps: run this script as root (or install them with apt-get)" >&2
  exit 1
fi

echo "install-deps: installing ${missing[*]}"
export DEBIAN_FRONTEND=noninteractive
apt-get update -qq
apt-get install -y -qq --no-install-recommends "${missing[@]}"
