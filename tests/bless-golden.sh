#!/usr/bin/env bash
# Re-blesses the golden hashes: runs every entry of tests/golden/runs.txt
# with the given (default: build/app/dwellmark, Release) binary and writes
# tests/golden/NAME.sha256. Only when results changed on purpose; the
# commit says what changed and why (DEVELOPERS.md, "Golden runs").
# Usage: bash tests/bless-golden.sh [DWELLMARK]
set -euo pipefail
src=$(cd "$(dirname "$0")/.." && pwd)
bin=$(realpath "${1:-$src/build/app/dwellmark}")
work=$(mktemp -d); trap 'rm -rf "$work"' EXIT
. "$src/tests/golden/lib.sh"

while IFS='|' read -r name args; do
  golden_run "$bin" "$src" "$args" "$work/$name"
  golden_hashes "$work/$name" > "$work/$name.sha256"
  if cmp -s "$work/$name.sha256" "$src/tests/golden/$name.sha256"; then
    echo "bless-golden: $name unchanged"
  else
    mv "$work/$name.sha256" "$src/tests/golden/$name.sha256"
    echo "bless-golden: $name re-blessed; commit tests/golden/$name.sha256 with the reason"
  fi
done < <(golden_runs "$src")
