#!/usr/bin/env bash
# dwellmark simulate writes traces.csv and stops.csv beside trajectory.csv,
# and summary.json carries the spot pattern per time window; a bad trace
# point is refused with exit code 2 and nothing written.
# Usage: bash e2e_pattern.sh <path-to-dwellmark> <source-dir>
set -euo pipefail
bin=$1
src=$2
work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT

# The demo scenario with one extra trace point on end B.
python3 - "$src/assets/scenarios/demo.json" "$work/scenario.json" <<'PY'
import json, sys
doc = json.load(open(sys.argv[1]))
doc["analysis"] = {"window_s": 0.5, "window_step_s": 0.25,
                   "trace_points": [{"end": "B", "angle_deg": 90, "size_mm": 2}]}
json.dump(doc, open(sys.argv[2], "w"), indent=2)
PY

"$bin" simulate "$work/scenario.json" --out "$work/run" --duration-s 1.5 >"$work/stdout"
grep -q "wrote $work/run/traces.csv" "$work/stdout"
grep -Eq "last pattern|no end raised" "$work/stdout"

python3 - "$work/run" <<'PY'
import csv, json, sys
run = sys.argv[1]
traces = list(csv.reader(open(run + "/traces.csv")))
header = traces[0]
expected = ["t_s"] + [f"{n}_{c}_mm" for n in ("floor", "ceiling", "rim_patch0_A", "rim_patch1_B", "point0_B")
                      for c in "xyz"]
assert header == expected, header
trajectory = list(csv.reader(open(run + "/trajectory.csv")))
assert len(traces) == len(trajectory), (len(traces), len(trajectory))  # the same rows in time
assert all(len(row) == len(header) for row in traces[1:])
assert traces[1][0] == trajectory[1][0]
stops = list(csv.reader(open(run + "/stops.csv")))
assert stops[0] == ["t_s", "point", "end", "x_mm", "y_mm", "z_mm", "horizontal_speed_mm_s", "dwell_ms"], stops[0]
assert len(stops) > 1, "no stop events in a spinning run"
summary = json.load(open(run + "/summary.json"))
windows = summary["pattern"]
assert len(windows) == 5, len(windows)  # 0.5 s windows every 0.25 s over 1.5 s
keys = {"start_s", "end_s", "visible_end", "spot_count", "spot_azimuths_deg", "drift_deg_s", "spots_per_rev", "kind"}
for w in windows:
    assert keys <= set(w), w
    assert w["kind"] in ("stationary", "creeping", "ring", "none")
    assert w["spot_count"] == len(w["spot_azimuths_deg"]) == len(w["drift_deg_s"])
    assert all(0 <= a < 360 for a in w["spot_azimuths_deg"])
PY

# The same run twice gives the same bytes.
"$bin" simulate "$work/scenario.json" --out "$work/again" --duration-s 1.5 >/dev/null
for f in traces.csv stops.csv summary.json; do cmp "$work/run/$f" "$work/again/$f"; done

# A trace point off the allowed range: exit 2, a message naming the field, no files.
set +e
"$bin" simulate "$work/scenario.json" --out "$work/bad" --set analysis.trace_points.0.angle_deg=720 2>"$work/stderr"
code=$?
set -e
[ "$code" -eq 2 ] || { echo "expected exit 2, got $code"; exit 1; }
grep -q "analysis.trace_points.0.angle_deg" "$work/stderr"
[ ! -e "$work/bad" ] || [ -z "$(ls -A "$work/bad")" ]
echo "e2e_pattern: ok"
