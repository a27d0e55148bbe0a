#!/usr/bin/env bash
# The outputs of the fixed runs in tests/golden/runs.txt hash to the values
# checked in beside it (NAME.sha256). A change here means the results
# changed: if the physics or a format changed on purpose, re-bless with
# `bash tests/bless-golden.sh` and say why in the commit (DEVELOPERS.md).
# Usage: e2e_golden.sh DWELLMARK SOURCE_DIR
set -u
bin=$(realpath "$1"); src=$(realpath "$2")
work=$(mktemp -d); trap 'rm -rf "$work"' EXIT
fail() { echo "FAIL: $*"; exit 1; }
. "$src/tests/golden/lib.sh"

count=0
while IFS='|' read -r name args; do
  expected="$src/tests/golden/$name.sha256"
  [ -f "$expected" ] || fail "$name: no $expected; create it with tests/bless-golden.sh"
  golden_run "$bin" "$src" "$args" "$work/$name" || fail "$name did not run"
  golden_hashes "$work/$name" > "$work/$name.sha256"
  if ! diff "$expected" "$work/$name.sha256" > "$work/diff"; then
    cat "$work/diff"
    fail "$name: output bytes changed; if on purpose, run tests/bless-golden.sh (see DEVELOPERS.md)"
  fi
  count=$((count + 1))
done < <(golden_runs "$src")
[ "$count" -gt 0 ] || fail "no runs in tests/golden/runs.txt"
echo "e2e_golden: $count runs match their checked-in hashes"
