#!/usr/bin/env bash
# End-to-end test of `dwellmark steady`: the --json keys and values, the
# human-readable text, the CSV sweep, and bad input (exit 2, a message
# naming the flag, the value and the allowed range, nothing on stdout).
# Usage: bash tests/e2e_steady.sh path/to/dwellmark source-dir
set -euo pipefail
bin=$1
src=$2
tmp=$(mktemp -d)
trap 'rm -rf "$tmp"' EXIT
fail() { echo "e2e_steady: FAIL: $*" >&2; exit 1; }
tube=(--length-mm 64 --outer-diameter-mm 16 --wall-mm 1)

# --- JSON: the pattern state at 8 rev/s (physics.md section 3 worked table:
# 16.0 deg, N 3.569 with g = 9.81; the CLI uses standard gravity, 16.011 deg).
"$bin" steady "${tube[@]}" --precession-rev-s 8 --json >"$tmp/p8.json" || fail "steady --json exited $?"
python3 - "$tmp/p8.json" <<'EOF' || fail "steady --json content"
import json, sys
j = json.load(open(sys.argv[1]))
for key in ["tilt_deg", "spots_per_rev", "min_precession_rev_s", "drift_deg_s", "contact_radius_mm",
            "ceiling_height_mm", "solution", "relative_spin_rev_s", "centre_height_mm", "drift_deg_per_rev",
            "nearest_spots", "branches"]:
    assert key in j, key
assert j["solution"] == "pattern", j["solution"]
assert abs(j["tilt_deg"] - 16.011) < 0.001, j["tilt_deg"]
assert abs(j["spots_per_rev"] - 3.569) < 0.001, j["spots_per_rev"]
assert j["nearest_spots"] == 4
# N = 3.569 is near no p/q with at most 4 revolutions between visits: 4 spots creeping.
assert j["n_ratio"] is None and j["revs_per_visit"] is None and j["ratio_drift_deg_per_rev"] is None, j
assert abs(j["min_precession_rev_s"] - 5.93) < 0.01
assert abs(j["drift_deg_s"] - 8 * j["drift_deg_per_rev"]) < 1e-9 * abs(j["drift_deg_s"])
assert abs(j["ceiling_height_mm"] - 2 * j["centre_height_mm"]) < 1e-12
assert j["body"]["length_mm"] == 64 and j["body"]["outer_diameter_mm"] == 16 and j["body"]["wall_mm"] == 1
b = j["branches"]
assert len(b) == 2 and b[0]["pattern"] and not b[1]["pattern"], b
assert 83 < b[1]["tilt_deg"] < 88
EOF

# --- JSON on a centre orbit (our derivation, core/steady.cpp): the keys, the
# orbit echoed, N = (b - rho)/R, the friction Omega^2 |rho| / g and the top's
# speed 2 Omega |rho|; with the default orbit 0 every old figure is unchanged.
"$bin" steady "${tube[@]}" --precession-rev-s 8 --orbit-mm -2.5 --json >"$tmp/o8.json" || fail "steady --orbit-mm exited $?"
python3 - "$tmp/o8.json" "$tmp/p8.json" <<'EOF' || fail "steady --orbit-mm content"
import json, math, sys
j = json.load(open(sys.argv[1]))
still = json.load(open(sys.argv[2]))
for key in ["orbit_mm", "friction_needed", "ring_radius_mm", "top_speed_mm_s"]:
    assert key in j and key in still, key
assert j["input"]["orbit_mm"] == -2.5 and j["orbit_mm"] == -2.5, j["input"]
assert j["solution"] == "pattern"
w = 8 * 2 * math.pi
a = math.radians(j["tilt_deg"])
b = 32 * math.cos(a) - 8 * math.sin(a)
assert abs(j["spots_per_rev"] - (b + 2.5) / 8) < 1e-9, j["spots_per_rev"]
assert abs(j["friction_needed"] - w * w * 2.5e-3 / j["gravity_m_s2"]) < 1e-12
assert abs(j["top_speed_mm_s"] - 2 * w * 2.5) < 1e-9
assert abs(j["ring_radius_mm"] - (b - 2.5)) < 1e-9 and abs(j["contact_radius_mm"] - (b + 2.5)) < 1e-9
assert j["tilt_deg"] > still["tilt_deg"] + 1, (j["tilt_deg"], still["tilt_deg"])
assert still["orbit_mm"] == 0 and still["friction_needed"] == 0 and still["top_speed_mm_s"] == 0
assert still["ring_radius_mm"] == still["contact_radius_mm"]
EOF
"$bin" steady "${tube[@]}" --precession-rev-s 8 --orbit-mm -2.5 | grep -q "centre orbit -2.5 mm needs a friction coefficient of at least" ||
  fail "text for an orbit"
"$bin" steady "${tube[@]}" --precession-rev-s 5 --orbit-mm 30 --json | grep -q '"reason": ".*orbiting 30 mm' ||
  fail "no pattern on an orbit gives no reason naming it"

# --- JSON: below the lowest precession there is no pattern: an answer, exit 0.
"$bin" steady "${tube[@]}" --precession-rev-s 5 --json >"$tmp/p5.json" || fail "steady below the minimum exited $?"
python3 - "$tmp/p5.json" <<'EOF' || fail "steady none content"
import json, sys
j = json.load(open(sys.argv[1]))
assert j["solution"] == "none"
assert "below the lowest" in j["reason"], j["reason"]
assert j["tilt_deg"] is None and j["spots_per_rev"] is None and j["drift_deg_s"] is None
assert abs(j["min_precession_rev_s"] - 5.93) < 0.01
EOF

# --- JSON by tilt, and a scenario with a flag overriding it.
"$bin" steady "$src/assets/scenarios/demo.json" --length-mm 64 --tilt-deg 10 --json >"$tmp/t10.json" ||
  fail "steady scenario --tilt-deg exited $?"
python3 - "$tmp/t10.json" "$src/assets/scenarios/demo.json" <<'EOF' || fail "steady by tilt content"
import json, sys
j = json.load(open(sys.argv[1]))
demo = json.load(open(sys.argv[2]))
assert j["solution"] == "pattern"
assert j["tilt_deg"] == 10
assert j["body"]["length_mm"] == 64 and j["body"]["outer_diameter_mm"] == demo["body"]["outer_diameter_mm"], j["body"]
assert j["precession_rev_s"] > j["min_precession_rev_s"]
EOF
"$bin" steady --tilt-deg 50 "${tube[@]}" --json | grep -q '"solution": "none"' || fail "tilt in the gap is not none"

# --- Human-readable text carries units.
"$bin" steady "${tube[@]}" --precession-rev-s 8 >"$tmp/p8.txt" || fail "steady text exited $?"
for want in "pattern state: tilt 16.011 deg" "spots per revolution N = 3.569" "rev/s" "deg/s" "mm" \
  "lowest precession that keeps the end up: 5.9306 rev/s" "other steady state"; do
  grep -qF "$want" "$tmp/p8.txt" || fail "text lacks \"$want\""
done
"$bin" steady "${tube[@]}" --precession-rev-s 5 | grep -q "no pattern state: precession 5 rev/s is below" ||
  fail "text for no pattern"

# --- CSV sweep: units in the header, one row per step, TO included.
"$bin" steady "${tube[@]}" --sweep-precession-rev-s 5:10:0.5 >"$tmp/sweep.csv" || fail "sweep exited $?"
python3 - "$tmp/sweep.csv" <<'EOF' || fail "sweep content"
import csv, sys
rows = list(csv.DictReader(open(sys.argv[1])))
header = open(sys.argv[1]).readline().strip().split(",")
for col in ["precession_rev_s", "tilt_deg", "spots_per_rev", "drift_deg_s", "contact_radius_mm", "ceiling_height_mm",
            "orbit_mm", "friction_needed", "ring_radius_mm", "top_speed_mm_s", "n_ratio", "revs_per_visit",
            "ratio_drift_deg_per_rev"]:
    assert col in header, col
# A fraction p/q is given where every p-th stop comes back within an eighth of the spacing.
for r in rows:
    if r["n_ratio"]:
        p, q = map(int, r["n_ratio"].split("/"))
        n = float(r["spots_per_rev"])
        assert int(r["revs_per_visit"]) == q and 1 <= q <= 4, r
        assert abs(360 * (p / n - q)) < 360 / p / 8, r
assert len(rows) == 11, len(rows)
assert float(rows[0]["precession_rev_s"]) == 5 and float(rows[-1]["precession_rev_s"]) == 10
assert rows[0]["solution"] == "none" and rows[0]["tilt_deg"] == ""
assert rows[6]["solution"] == "pattern" and abs(float(rows[6]["tilt_deg"]) - 16.011) < 0.001  # 8 rev/s
tilts = [float(r["tilt_deg"]) for r in rows if r["solution"] == "pattern"]
assert tilts == sorted(tilts) and len(tilts) == 9
EOF
[ "$("$bin" steady "${tube[@]}" --sweep-precession-rev-s 7:7:1 | wc -l)" -eq 2 ] || fail "one-row sweep"
"$bin" steady "${tube[@]}" --sweep-precession-rev-s 8:8:1 --orbit-mm -2.5 >"$tmp/osweep.csv" || fail "orbit sweep exited $?"
python3 - "$tmp/osweep.csv" "$tmp/o8.json" <<'EOF' || fail "orbit sweep content"
import csv, json, sys
row = list(csv.DictReader(open(sys.argv[1])))[0]
j = json.load(open(sys.argv[2]))
assert float(row["orbit_mm"]) == -2.5
for col in ["tilt_deg", "spots_per_rev", "friction_needed", "ring_radius_mm", "top_speed_mm_s"]:
    assert abs(float(row[col]) - j[col]) < 1e-8 * max(1, abs(j[col])), col
EOF

# --- Bad input: exit 2, a message naming the flag, value and range, no stdout.
bad() {
  local want=$1
  shift
  set +e
  "$bin" steady "$@" >"$tmp/out" 2>"$tmp/err"
  local rc=$?
  set -e
  [ "$rc" -eq 2 ] || fail "steady $* exited $rc, expected 2"
  grep -qF -- "$want" "$tmp/err" || fail "steady $*: message lacks \"$want\": $(cat "$tmp/err")"
  [ ! -s "$tmp/out" ] || fail "steady $* wrote to stdout"
}
bad "--precession-rev-s: value -1 is out of range; allowed 0 to 100 rev/s" "${tube[@]}" --precession-rev-s=-1
bad "--precession-rev-s: value 250 is out of range; allowed 0 to 100 rev/s" "${tube[@]}" --precession-rev-s 250
bad "--tilt-deg: value 95 is out of range; allowed 0 to 90 deg" "${tube[@]}" --tilt-deg 95
bad "--tilt-deg: value -3 is out of range; allowed 0 to 90 deg" "${tube[@]}" --tilt-deg=-3
bad "--orbit-mm: value 1500 is out of range; allowed -1000 to 1000 mm" "${tube[@]}" --precession-rev-s 8 --orbit-mm 1500
bad "--orbit-mm: value -2000 is out of range; allowed -1000 to 1000 mm" "${tube[@]}" --sweep-precession-rev-s 6:8:1 --orbit-mm=-2000
bad "--sweep-precession-rev-s: FROM 10 is above TO 6" "${tube[@]}" --sweep-precession-rev-s 10:6:1
bad "--sweep-precession-rev-s: STEP 0 is out of range" "${tube[@]}" --sweep-precession-rev-s 6:10:0
bad "--sweep-precession-rev-s: expected FROM:TO:STEP in rev/s, got \"6-10\"" "${tube[@]}" --sweep-precession-rev-s 6-10
bad "--sweep-precession-rev-s: FROM -2 is out of range; allowed 0 to 100 rev/s" "${tube[@]}" --sweep-precession-rev-s=-2:6:1
# geometry that is not a cylinder, through the scenario's field table
bad "--wall-mm (body.wall_mm): value 9 must be less than the outer radius 8 mm" --length-mm 64 --outer-diameter-mm 16 --wall-mm 9 --precession-rev-s 8
bad "--length-mm (body.length_mm): value -5 is out of range; allowed 0.2 to 1000 mm" --length-mm=-5 --precession-rev-s 8
bad "--outer-diameter-mm (body.outer_diameter_mm): value 0 is out of range; allowed 1 to 500 mm" --outer-diameter-mm 0 --precession-rev-s 8
bad "is longer than its diameter" --length-mm 10 --outer-diameter-mm 16 --precession-rev-s 8
bad "give --precession-rev-s, --tilt-deg or --sweep-precession-rev-s" "${tube[@]}"
bad "excludes" "${tube[@]}" --precession-rev-s 8 --tilt-deg 10
bad "cannot read" "$tmp/missing.json" --precession-rev-s 8
bad "Could not convert" "${tube[@]}" --precession-rev-s fast

echo "e2e_steady: ok"
