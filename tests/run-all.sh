#!/usr/bin/env bash
# Builds dwellmark and runs every test: unit, validation, command-line
# end-to-end and GUI screenshot tests (ctest). Installs missing Debian
# packages first (needs root for that step). Usage: bash tests/run-all.sh
set -euo pipefail
cd "$(dirname "$0")/.."
bash third_party/install-deps.sh
jobs=$(nproc 2>/dev/null || echo 2)
cmake -S . -B build -DCMAKE_BUILD_TYPE=Release
cmake --build build -j"$jobs"
ctest --test-dir build --output-on-failure -j"$jobs"
