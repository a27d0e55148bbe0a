#!/usr/bin/env bash
# dwellmark calibrate writes calibration.json and a valid calibrated
# scenario; bad measurements are refused with exit code 2, a message naming
# them, and nothing written.
# Usage: bash e2e_calibrate.sh <path-to-dwellmark> <source-dir>
set -euo pipefail
bin=$1
src=$2
work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT
demo="$src/assets/scenarios/demo.json"
fail() { echo "FAIL: $*"; exit 1; }

# Two launches of the demo keep this quick; the fit itself is tested in test_calibrate.
"$bin" calibrate "$demo" --settle-s 0.5 --spin-s 2 --spots 4 --launches 2 --out "$work/cal" >"$work/stdout"
grep -q "rolling resistance" "$work/stdout" || fail "no fitted rolling resistance printed"
grep -q "wrote $work/cal/calibrated_scenario.json" "$work/stdout" || fail "does not say where outputs went"
python3 - "$work/cal/calibration.json" <<'PY'
import json, sys
c = json.load(open(sys.argv[1]))
assert c["measured"] == {"settle_time_s": 0.5, "spin_time_s": 2, "spots": 4, "timing_s": 0.2}, c["measured"]
for name in ["friction_kinetic", "rolling_resistance"]:
    f = c["fitted"][name]
    assert f["search_min"] <= f["value"] <= f["search_max"], f
assert set(c["residual"]) == {"settle_time_s", "spin_time_s", "spots", "chi_square"}
PY
# The calibrated scenario is a valid scenario with the fitted values.
"$bin" simulate "$work/cal/calibrated_scenario.json" --out "$work/run" --duration-s 0.05 >/dev/null || fail "calibrated scenario does not run"
python3 - "$work/cal/calibration.json" "$work/cal/calibrated_scenario.json" <<'PY'
import json, sys
c = json.load(open(sys.argv[1])); s = json.load(open(sys.argv[2]))
assert abs(s["surface"]["rolling_resistance"] - c["fitted"]["rolling_resistance"]["value"]) < 1e-12
PY

# Bad measurements: exit 2, the measurement named, nothing written.
source "$src/tests/refusal.sh"
expect_refusal order "spin_time_s" calibrate "$demo" --launches 1 --settle-s 3 --spin-s 2
expect_refusal negative "settle_time_s" calibrate "$demo" --launches 1 --settle-s -1 --spin-s 2
expect_refusal spots "spots" calibrate "$demo" --launches 1 --settle-s 0.5 --spin-s 2 --spots 99
expect_refusal missing "--spin-s" calibrate "$demo" --launches 1 --settle-s 0.5
echo "e2e_calibrate: ok"
