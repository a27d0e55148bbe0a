#!/usr/bin/env bash
# End to end: `dwellmark simulate` on the demo writes both files; broken
# scenarios get a clear message naming the field, exit code 2, and nothing
# written. Usage: e2e_simulate.sh DWELLMARK SOURCE_DIR
set -u
bin=$1; src=$2
work=$(mktemp -d); trap 'rm -rf "$work"' EXIT
fail() { echo "FAIL: $*"; exit 1; }

# The demo run writes trajectory.csv and summary.json.
"$bin" simulate "$src/assets/scenarios/demo.json" --out "$work/demo" --duration-s 2 > "$work/log" || fail "demo run exited $?"
[ -s "$work/demo/trajectory.csv" ] || fail "no trajectory.csv"
[ -s "$work/demo/summary.json" ] || fail "no summary.json"
head -1 "$work/demo/trajectory.csv" | grep -q '^t_s,x_mm,y_mm,z_mm,qw,qx,qy,qz,wx_rad_s,wy_rad_s,wz_rad_s,tilt_deg,precession_rev_s,spots_per_rev,raised_end,phase,slip_mm_s' || fail "trajectory header"
rows=$(($(wc -l < "$work/demo/trajectory.csv") - 1))
[ "$rows" -eq 2001 ] || fail "expected 2001 rows at 1 ms over 2 s, got $rows"
python3 - "$work/demo/summary.json" <<'PY' || fail "summary keys"
import json, sys
s = json.load(open(sys.argv[1]))
for k in ["pressed_end", "raised_end", "settle_time_s", "rest_time_s", "phases", "max_excursion_mm", "max_speed_m_s",
          "energy_initial_mJ", "energy_final_mJ", "creep_bound"]:
    assert k in s, k
assert s["pressed_end"] == "A" and s["raised_end"] == "A", s["raised_end"]
assert s["energy_final_mJ"] < s["energy_initial_mJ"]
PY
grep -q "wrote .*trajectory.csv" "$work/log" || fail "does not say where outputs went"

# The same folder again is refused without --force, accepted with it.
"$bin" simulate "$src/assets/scenarios/demo.json" --out "$work/demo" --duration-s 0.1 2> "$work/err" > /dev/null
[ $? -eq 2 ] || fail "reused folder not refused"
grep -q -- "--force" "$work/err" || fail "refusal does not mention --force"
"$bin" simulate "$src/assets/scenarios/demo.json" --out "$work/demo" --duration-s 0.1 --force > /dev/null || fail "--force refused"

# Broken scenarios: message names the field; exit 2; nothing written.
broken() {  # name, python edit of the document d, expected field
  python3 - "$src/assets/scenarios/demo.json" "$work/$1.json" "$2" <<'PY'
import json, sys
d = json.load(open(sys.argv[1]))
exec(sys.argv[3])
open(sys.argv[2], "w").write(json.dumps(d))
PY
  "$bin" simulate "$work/$1.json" --out "$work/out-$1" 2> "$work/err-$1" > /dev/null
  code=$?
  [ $code -eq 2 ] || fail "$1: exit $code, expected 2"
  grep -q "$3" "$work/err-$1" || fail "$1: message does not name $3: $(cat "$work/err-$1")"
  [ ! -e "$work/out-$1" ] || fail "$1: wrote output"
}
# Each message names the field, the value (a missing field has none) and
# what is allowed (for an unknown key, the keys its group holds).
broken missing 'del d["body"]["length_mm"]' 'body.length_mm: missing required field; allowed 0.2 to 1000 mm'
broken negative 'd["body"]["length_mm"] = -3' 'body.length_mm: value -3 is out of range; allowed 0.2 to 1000 mm'
broken wall 'd["body"]["wall_mm"] = 17' 'body.wall_mm: value 17 must be less than the outer radius 16 mm'
broken friction 'd["surface"]["friction_kinetic"] = -0.2' 'surface.friction_kinetic: value -0.2 is out of range; allowed 0 to 2'
broken unknown 'd["launch"]["speedy"] = 1' 'launch.speedy: unknown key; allowed in launch: pressed_end, revolution_rev_s,'
printf '{"dwellmark_scenario": 1, "body": {' > "$work/malformed.json"
"$bin" simulate "$work/malformed.json" --out "$work/out-malformed" 2> "$work/err-malformed" > /dev/null
[ $? -eq 2 ] || fail "malformed JSON not exit 2"
grep -q "malformed.json is not valid JSON: .* line 1, column" "$work/err-malformed" || fail "malformed JSON message"
[ ! -e "$work/out-malformed" ] || fail "malformed: wrote output"
"$bin" simulate "$src/assets/scenarios/demo.json" --out "$work/out-range" --set launch.tilt_deg=95 2> "$work/err-range" > /dev/null
[ $? -eq 2 ] || fail "--set out of range not exit 2"
grep -q "launch.tilt_deg: value 95 is out of range; allowed 0 to 90 deg" "$work/err-range" || fail "range message: $(cat "$work/err-range")"
echo "e2e_simulate: all checks passed"
