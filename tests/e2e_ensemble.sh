#!/usr/bin/env bash
# dwellmark ensemble writes launches.csv and ensemble.json, gives the same
# bytes at any thread count, stays silent with --quiet, and refuses bad
# input with exit code 2 and nothing written.
# Usage: bash e2e_ensemble.sh <path-to-dwellmark> <source-dir>
set -euo pipefail
bin=$1
src=$2
work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT
demo="$src/assets/scenarios/demo.json"
fail() { echo "FAIL: $*"; exit 1; }

# A small ensemble: 6 launches of 2 s on one and on two threads.
"$bin" ensemble "$demo" --launches 6 --duration-s 2 --seed 5 --threads 1 --out "$work/one" >"$work/stdout"
"$bin" ensemble "$demo" --launches 6 --duration-s 2 --seed 5 --threads 2 --out "$work/two" --quiet >"$work/quiet"
for f in launches.csv ensemble.json; do cmp "$work/one/$f" "$work/two/$f" || fail "$f differs between 1 and 2 threads"; done
grep -q "wrote $work/one/ensemble.json" "$work/stdout" || fail "does not say where outputs went"
[ ! -s "$work/quiet" ] || fail "--quiet printed something"

python3 - "$work/one" <<'PY'
import csv, json, sys
run = sys.argv[1]
rows = list(csv.DictReader(open(run + "/launches.csv")))
assert len(rows) == 6, len(rows)
for key in ["launch", "pressed_end", "revolution_rev_s", "visible_end", "settle_time_s", "show_s", "spin_time_s", "rest_time_s",
            "spots_at_settle", "max_excursion_mm", "max_surface_speed_m_s", "leaves_table"]:
    assert key in rows[0], key
e = json.load(open(run + "/ensemble.json"))
assert e["launches"] == 6 and e["seed"] == 5 and e["duration_s"] == 2
for key in ["visible_end_share", "pressed_end_visible_share", "spots_at_settle", "spots_over_time", "settle_time_s",
            "show_s", "spin_time_s", "rest_time_s", "max_excursion_mm", "max_surface_speed_m_s", "table", "launch_spread"]:
    assert key in e, key
shares = e["visible_end_share"]
assert abs(shares["A"] + shares["B"] + shares["none"] - 1) < 1e-12
for key in ["p10", "median", "p90"]:
    assert e["settle_time_s"][key] >= 0
windows = e["spots_over_time"]["windows"]
assert len(windows) == 3, len(windows)  # 1 s windows every 0.5 s over 2 s
assert all(sum(h["launches"] for h in w["histogram"]) == 6 for w in windows)
PY

# Bad input: exit 2, a message naming what is wrong, nothing written.
source "$src/tests/refusal.sh"
expect_refusal zero "--launches" ensemble "$demo" --launches 0
expect_refusal spread "launch_spread.revolution.max_rev_s" ensemble "$demo" --set launch_spread.revolution.max_rev_s=2
expect_refusal duration "run.duration_s" ensemble "$demo" --duration-s -1
expect_refusal missing "cannot read" ensemble "$work/no-such.json"
echo "e2e_ensemble: ok"
