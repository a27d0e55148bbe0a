#!/usr/bin/env bash
# Same scenario and seed, same bytes: every run of tests/golden/runs.txt is
# made twice, at 1 and at 2 threads when its subcommand has --threads, and
# the two output folders must be identical byte for byte.
# Usage: e2e_determinism.sh DWELLMARK SOURCE_DIR
set -u
bin=$(realpath "$1"); src=$(realpath "$2")
work=$(mktemp -d); trap 'rm -rf "$work"' EXIT
fail() { echo "FAIL: $*"; exit 1; }
. "$src/tests/golden/lib.sh"

count=0
while IFS='|' read -r name args; do
  if golden_has_threads "$bin" "$args"; then
    golden_run "$bin" "$src" "$args" "$work/$name-1" --threads 1 || fail "$name at 1 thread"
    golden_run "$bin" "$src" "$args" "$work/$name-2" --threads 2 || fail "$name at 2 threads"
  else
    golden_run "$bin" "$src" "$args" "$work/$name-1" || fail "$name, first run"
    golden_run "$bin" "$src" "$args" "$work/$name-2" || fail "$name, second run"
  fi
  [ -n "$(ls "$work/$name-1")" ] || fail "$name wrote nothing"
  diff -r "$work/$name-1" "$work/$name-2" > "$work/diff" || fail "$name: outputs differ: $(head -5 "$work/diff")"
  count=$((count + 1))
done < <(golden_runs "$src")
[ "$count" -gt 0 ] || fail "no runs in tests/golden/runs.txt"
echo "e2e_determinism: $count runs repeat byte for byte"
