#!/usr/bin/env bash
# End to end: `dwellmark expose` writes exposure.png and spots.json for the
# exact steady spin and for a simulated run; bad flags name the field, exit
# 2 and write nothing. Usage: e2e_expose.sh DWELLMARK SOURCE_DIR
set -u
bin=$1; src=$2
work=$(mktemp -d); trap 'rm -rf "$work"' EXIT
fail() { echo "FAIL: $*"; exit 1; }
demo="$src/assets/scenarios/demo.json"

# The steady spin seen from above by a camera, small and fast, with the linear image.
"$bin" expose "$demo" --out "$work/steady" --steady-precession-rev-s 6 --mode camera --exposure-s 0.2 --size 96 \
  --set observer.view_span_mm=200 --pfm --threads 2 > "$work/log" || fail "steady expose exited $?"
for f in exposure.png exposure.pfm spots.json; do [ -s "$work/steady/$f" ] || fail "no $f"; done
head -c 8 "$work/steady/exposure.png" | od -An -tx1 | grep -q "89 50 4e 47" || fail "exposure.png is not a PNG"
head -1 "$work/steady/exposure.pfm" | grep -q '^PF$' || fail "exposure.pfm is not a PFM"
python3 - "$work/steady/spots.json" <<'PY' || fail "spots.json keys"
import json, sys
s = json.load(open(sys.argv[1]))
for k in ["spot_count", "spots", "visible_end", "ring_radius_mm", "exposure_s", "mode", "view", "steady_precession_rev_s"]:
    assert k in s, k
assert s["mode"] == "camera" and s["view"] == "top" and s["visible_end"] == "A", s
assert abs(s["exposure_s"] - 0.2) < 1e-12 and abs(s["steady_precession_rev_s"] - 6) < 1e-12
assert s["spot_count"] == len(s["spots"])
for spot in s["spots"]:
    for k in ["azimuth_deg", "radius_mm", "contrast", "width_deg"]:
        assert k in spot, k
assert s["sampling"]["largest_step_px"] <= 0.5
PY
grep -q "wrote .*spots.json" "$work/log" || fail "does not say where outputs went"

# The same spin with the centre circling 3 mm towards the floor contact: the
# raised end's top circles 6 mm further in (|b + rho| against |b - rho|).
"$bin" expose "$demo" --out "$work/orbit" --steady-precession-rev-s 6 --steady-orbit-mm -3 --mode camera \
  --exposure-s 0.2 --size 96 --set observer.view_span_mm=200 > /dev/null || fail "orbit expose exited $?"
python3 - "$work/steady/spots.json" "$work/orbit/spots.json" <<'PY' || fail "orbit spots.json"
import json, math, sys
still, orbit = (json.load(open(p)) for p in sys.argv[1:3])
assert still["steady_orbit_mm"] == 0 and still["top_speed_mm_s"] == 0, still
assert orbit["steady_orbit_mm"] == -3, orbit
assert abs(orbit["top_speed_mm_s"] - 2 * 2 * math.pi * 6 * 3) < 1e-9, orbit
assert orbit["ring_radius_mm"] < still["ring_radius_mm"] - 3, (orbit["ring_radius_mm"], still["ring_radius_mm"])
PY

# The same output at one thread and at two.
"$bin" expose "$demo" --out "$work/one" --steady-precession-rev-s 6 --mode camera --exposure-s 0.2 --size 96 \
  --set observer.view_span_mm=200 --threads 1 > /dev/null || fail "one-thread expose"
cmp -s "$work/one/exposure.png" "$work/steady/exposure.png" || fail "thread count changed the image"

# A simulated run from a visitor's eye, in the eye's mode.
"$bin" expose "$demo" --out "$work/run" --view visitor --eye-height-mm 1200 --eye-distance-mm 600 --mode eye \
  --start-s 1.0 --exposure-s 0.2 --size 64 --set run.duration_s=2 > /dev/null || fail "run expose exited $?"
python3 -c "import json,sys; s=json.load(open(sys.argv[1])); assert s['view']=='visitor' and s['mode']=='eye', s" \
  "$work/run/spots.json" || fail "visitor spots.json"

# A camera video: frames 1/60 s apart.
"$bin" expose "$demo" --out "$work/video" --steady-precession-rev-s 6 --mode camera --exposure-s 0.004 --size 48 \
  --set observer.frame_rate_hz=60 --set observer.frame_count=3 > /dev/null || fail "video expose exited $?"
[ -s "$work/video/frames/frame_0002.png" ] || fail "no third frame"
python3 -c "import json,sys; s=json.load(open(sys.argv[1])); assert len(s['frames'])==3 and s['frame_rate_hz']==60, s" \
  "$work/video/spots.json" || fail "frames in spots.json"

# Bad input: the message names the field and its range; exit 2; nothing written.
bad() {  # name, expected text, flags...
  local name=$1 text=$2; shift 2
  "$bin" expose "$demo" --out "$work/$name" "$@" > /dev/null 2> "$work/$name.err"
  [ $? -eq 2 ] || fail "$name: expected exit 2"
  grep -q -- "$text" "$work/$name.err" || fail "$name: message lacks '$text': $(cat "$work/$name.err")"
  [ ! -e "$work/$name" ] || [ -z "$(ls -A "$work/$name")" ] || fail "$name: wrote output"
}
bad size "observer.image_size_px" --size 5
bad view "observer.view" --view sideways
bad eye "observer.eye_height_mm" --view visitor --eye-height-mm 9000
bad window "observer.exposure_s" --mode eye --exposure-s 0.05
bad slow "observer.steady_precession_rev_s" --steady-precession-rev-s 1
bad orphan "observer.steady_orbit_mm" --steady-orbit-mm -3
bad far "observer.steady_orbit_mm" --steady-precession-rev-s 6 --steady-orbit-mm 5000
bad threads "threads" --threads 2000
echo "e2e_expose: ok"
