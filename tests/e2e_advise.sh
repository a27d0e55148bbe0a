#!/usr/bin/env bash
# End-to-end test of `dwellmark advise`: the --json keys, the recommended
# length fed back into `dwellmark steady` (same drift at both ends of the
# range), the reverse question, and bad input (exit 2, a message naming the
# flag, the value and the allowed range, nothing on stdout).
# Usage: bash tests/e2e_advise.sh path/to/dwellmark source-dir
set -euo pipefail
bin=$1
src=$2
tmp=$(mktemp -d)
trap 'rm -rf "$tmp"' EXIT
fail() { echo "e2e_advise: FAIL: $*" >&2; exit 1; }
section=(--outer-diameter-mm 16 --wall-mm 1)

# --- Forward: the length for 4 spots over 6.5 to 9 rev/s, with 3 and 5 beside it.
"$bin" advise --spots 4 "${section[@]}" --precession-rev-s 6.5:9 --json >"$tmp/adv.json" ||
  fail "advise --json exited $?"
python3 - "$tmp/adv.json" <<'EOF' || fail "advise --json content"
import json, sys
j = json.load(open(sys.argv[1]))
assert j["mode"] == "length" and j["solution"] == "length"
assert j["spots"] == 4 and j["precession_rev_s"] == {"from": 6.5, "to": 9}
assert abs(j["drift_limit_deg_s"] - 9) < 1e-12  # one spot spacing (90 deg) in 10 s
r, f, m = j["recommended"], j["fewer"], j["more"]
assert (f["spots"], r["spots"], m["spots"]) == (3, 4, 5)
assert f["length_mm"] < r["length_mm"] < m["length_mm"]
for a in (f, r, m):
    assert a["found"]
    for end in ("from", "to"):
        for key in ("precession_rev_s", "tilt_deg", "spots_per_rev", "drift_deg_per_rev", "drift_deg_s"):
            assert key in a[end], key
    assert a["worst_drift_deg_s"] >= max(abs(a["from"]["drift_deg_s"]), abs(a["to"]["drift_deg_s"]))
assert 4 < r["length_over_diameter"] < 5
w = r["window"]
assert len(w["bands"]) == 1 and 6.5 < w["bands"][0]["from_rev_s"] < w["bands"][0]["to_rev_s"] < 9
open(sys.argv[1] + ".length", "w").write(repr(r["length_mm"]))
EOF

# --- Fed back into the solver, the recommended length gives the drift reported.
length=$(cat "$tmp/adv.json.length")
for end in from to; do
  rate=$(python3 -c "import json,sys; print(json.load(open(sys.argv[1]))['recommended']['$end']['precession_rev_s'])" "$tmp/adv.json")
  "$bin" steady --length-mm "$length" "${section[@]}" --precession-rev-s "$rate" --json >"$tmp/back_$end.json" ||
    fail "steady at the recommended length exited $?"
  python3 - "$tmp/adv.json" "$tmp/back_$end.json" "$end" <<'EOF' || fail "fed-back drift at $end"
import json, sys
adv = json.load(open(sys.argv[1]))["recommended"][sys.argv[3]]
st = json.load(open(sys.argv[2]))
assert st["solution"] == "pattern" and st["nearest_spots"] == 4
assert abs(st["drift_deg_s"] - adv["drift_deg_s"]) <= 1e-9 * abs(adv["drift_deg_s"]), (st["drift_deg_s"], adv["drift_deg_s"])
assert abs(st["tilt_deg"] - adv["tilt_deg"]) <= 1e-9 * adv["tilt_deg"]
EOF
done

# --- Human-readable text.
"$bin" advise --spots 4 "${section[@]}" --precession-rev-s 6.5:9 >"$tmp/adv.txt" || fail "advise text exited $?"
for want in "length advice for 4 spots" "3 spots: length" "4 spots (asked): length" "5 spots: length" "deg/s" \
  "recommended length" "(one spot spacing in 10 s)"; do
  grep -qF "$want" "$tmp/adv.txt" || fail "text lacks \"$want\""
done

# --- A range starting below the lowest precession: an answer, not an error.
"$bin" advise --spots 4 "${section[@]}" --precession-rev-s 3:9 --json >"$tmp/low.json" || fail "low range exited $?"
python3 - "$tmp/low.json" <<'EOF' || fail "low range content"
import json, sys
j = json.load(open(sys.argv[1]))
assert j["solution"] == "none" and "below the lowest precession" in j["reason"]
EOF

# --- Reverse: the precession range of a given length.
"$bin" advise --spots 4 "${section[@]}" --length-mm "$length" --json >"$tmp/win.json" || fail "reverse exited $?"
python3 - "$tmp/win.json" "$tmp/adv.json" <<'EOF' || fail "reverse content"
import json, sys
j = json.load(open(sys.argv[1]))
fwd = json.load(open(sys.argv[2]))["recommended"]["window"]
assert j["mode"] == "window" and j["solution"] == "window"
assert j["search_rev_s"] == {"from": 0, "to": 50}
assert len(j["bands"]) == 1
assert abs(j["bands"][0]["from_rev_s"] - fwd["bands"][0]["from_rev_s"]) < 1e-9
assert abs(j["bands"][0]["to_rev_s"] - fwd["bands"][0]["to_rev_s"]) < 1e-9
assert abs(j["best"]["drift_deg_s"]) < 1e-6
EOF
"$bin" advise --spots 4 "${section[@]}" --length-mm 64 --max-drift-deg-s 0.001 --precession-rev-s 9:10 --json |
  grep -q '"solution": "none"' || fail "reverse with an unreachable limit is not none"
"$bin" advise --spots 4 "${section[@]}" --length-mm 64 | grep -q "drift of the 4-spot pattern under 9 deg/s" ||
  fail "reverse text"
# A scenario works too (its length is ignored going forward).
"$bin" advise "$src/assets/scenarios/demo.json" --spots 4 --precession-rev-s 7:8 --json | grep -q '"solution": "length"' ||
  fail "advise with a scenario"

# --- With an expected centre orbit (our derivation, core/steady.cpp) the
# advice is for that orbit: the length moves (the orbit raises N by -rho/R at a
# given tilt but also tilts the body further, which lowers it; for this section
# the length grows by about 1.6 mm), and steady at the same orbit reads back
# the advised drift.
"$bin" advise --spots 4 "${section[@]}" --precession-rev-s 6.5:9 --orbit-mm -3 --json >"$tmp/orb.json" ||
  fail "advise --orbit-mm exited $?"
python3 - "$tmp/orb.json" "$tmp/adv.json" <<'EOF' || fail "advise --orbit-mm content"
import json, sys
j = json.load(open(sys.argv[1]))
still = json.load(open(sys.argv[2]))
assert j["orbit_mm"] == -3 and still["orbit_mm"] == 0
assert j["recommended"]["found"]
assert abs(j["recommended"]["length_mm"] - still["recommended"]["length_mm"]) > 0.5, (j["recommended"]["length_mm"], still["recommended"]["length_mm"])
open(sys.argv[1] + ".length", "w").write(repr(j["recommended"]["length_mm"]))
EOF
"$bin" steady --length-mm "$(cat "$tmp/orb.json.length")" "${section[@]}" --precession-rev-s 9 --orbit-mm -3 --json >"$tmp/orb9.json" ||
  fail "steady at the advised orbit exited $?"
python3 - "$tmp/orb.json" "$tmp/orb9.json" <<'EOF' || fail "fed-back drift on the orbit"
import json, sys
adv = json.load(open(sys.argv[1]))["recommended"]["to"]
st = json.load(open(sys.argv[2]))
assert abs(adv["drift_deg_s"] - st["drift_deg_s"]) < 1e-6 * max(1, abs(st["drift_deg_s"])), (adv, st["drift_deg_s"])
EOF

# --- Bad input: exit 2, a message naming the flag, value and range, no stdout.
bad() {
  local want=$1
  shift
  set +e
  "$bin" advise "$@" >"$tmp/out" 2>"$tmp/err"
  local rc=$?
  set -e
  [ "$rc" -eq 2 ] || fail "advise $* exited $rc, expected 2"
  grep -qF -- "$want" "$tmp/err" || fail "advise $*: message lacks \"$want\": $(cat "$tmp/err")"
  [ ! -s "$tmp/out" ] || fail "advise $* wrote to stdout"
}
bad "--spots: value 1 is out of range; allowed 2 to 20" --spots 1 "${section[@]}" --precession-rev-s 6:9
bad "--orbit-mm: value 1001 is out of range; allowed -1000 to 1000 mm" --spots 4 "${section[@]}" --precession-rev-s 6:9 --orbit-mm 1001
bad "--spots: value 40 is out of range; allowed 2 to 20" --spots 40 "${section[@]}" --precession-rev-s 6:9
bad "--spots is required" "${section[@]}" --precession-rev-s 6:9
bad "--precession-rev-s: FROM 9 is above TO 6" --spots 4 "${section[@]}" --precession-rev-s 9:6
bad "--precession-rev-s: FROM -1 is out of range; allowed 0 to 100 rev/s" --spots 4 "${section[@]}" --precession-rev-s=-1:6
bad "--precession-rev-s: expected FROM:TO in rev/s, got \"6:9:1\"" --spots 4 "${section[@]}" --precession-rev-s 6:9:1
bad "--precession-rev-s: missing" --spots 4 "${section[@]}"
bad "--max-drift-deg-s: value 0 is out of range; allowed 0.001 to 3600 deg/s" --spots 4 "${section[@]}" --precession-rev-s 6:9 --max-drift-deg-s 0
bad "--wall-mm (body.wall_mm): value 8 must be less than the outer radius 8 mm" --spots 4 --outer-diameter-mm 16 --wall-mm 8 --precession-rev-s 6:9

echo "e2e_advise: ok"
