#!/usr/bin/env bash
# dwellmark snapshot: the GUI's 3D view drawn without any display (EGL on
# Mesa's surfaceless platform), so DISPLAY is unset throughout. Checks the
# picture's size, that it shows the table and the body, that the same
# command gives the same bytes, and that bad input is refused with nothing
# written.
# Usage: bash tests/e2e_snapshot.sh path/to/dwellmark source-dir
# Exit 77 (skipped) in a build without OpenGL.
set -euo pipefail
bin=$1
src=$2
unset DISPLAY WAYLAND_DISPLAY
work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT
fail() { echo "FAIL: $*"; exit 1; }
demo="$src/assets/scenarios/demo.json"

set +e
"$bin" snapshot "$demo" --out "$work/shot.png" --size 400x250 --time-s 1.5 >"$work/stdout" 2>"$work/stderr"
code=$?
set -e
if grep -q "this build has no OpenGL" "$work/stderr"; then
  echo "skip: this build has no OpenGL"
  exit 77
fi
[ "$code" -eq 0 ] || fail "snapshot exited $code: $(cat "$work/stderr")"
grep -q "wrote $work/shot.png (400 x 250 px, t = 1.5 s)" "$work/stdout" || fail "does not say what it wrote: $(cat "$work/stdout")"

# The picture: the asked size, the table's colour over much of it, and
# body-coloured pixels (the demo's off-white tube, brighter than the table).
python3 - "$work/shot.png" "$src/tests" <<'PY'
import sys
sys.path.insert(0, sys.argv[2])
from check_gui_screenshot import read_png
width, height, rows = read_png(sys.argv[1])
assert (width, height) == (400, 250), f"size {width} x {height}, expected 400 x 250"
pixels = [px for row in rows for px in row]
assert len(set(pixels)) > 200, f"only {len(set(pixels))} colours: the picture looks blank"
# The demo table is #c8a27a birch: lit, its pixels are warm (red > green > blue).
warm = sum(1 for r, g, b in pixels if r > g + 12 and g > b + 12)
assert warm > len(pixels) // 5, f"only {warm} table-coloured pixels of {len(pixels)}"
# The tube is #f4f1e8, near grey: light pixels with little colour.
body = sum(1 for r, g, b in pixels if min(r, g, b) > 150 and max(r, g, b) - min(r, g, b) < 30)
assert body > 300, f"only {body} body-coloured pixels"
print(f"snapshot 400 x 250: {warm} table pixels, {body} body pixels")
PY

# The same command, the same bytes.
"$bin" snapshot "$demo" --out "$work/again.png" --size 400x250 --time-s 1.5 >/dev/null
cmp "$work/shot.png" "$work/again.png" || fail "two runs of the same snapshot differ"

# Bad input: exit 2, a message naming the option and its range, nothing written.
expect_refusal() {
  local what=$1 needle=$2
  shift 2
  set +e
  "$bin" snapshot "$@" >/dev/null 2>"$work/refused.err"
  local got=$?
  set -e
  [ "$got" -eq 2 ] || fail "$what: expected exit 2, got $got"
  grep -q -- "$needle" "$work/refused.err" || fail "$what: message lacks '$needle': $(cat "$work/refused.err")"
  [ ! -e "$work/refused.png" ] || fail "$what: a file was written"
}
expect_refusal "time past the run" "allowed 0 to 15 s" "$demo" --out "$work/refused.png" --time-s 99
expect_refusal "tiny size" "allowed 16x16 to 8192x8192" "$demo" --out "$work/refused.png" --size 8x8
expect_refusal "not a png" "is not a .png file" "$demo" --out "$work/refused.txt"
expect_refusal "field" "launch.tilt_deg" "$demo" --out "$work/refused.png" --set launch.tilt_deg=120
before=$(cksum <"$work/shot.png")
expect_refusal "existing file" "--force" "$demo" --out "$work/shot.png" --time-s 2
[ "$(cksum <"$work/shot.png")" = "$before" ] || fail "existing file: it was touched"
"$bin" snapshot "$demo" --out "$work/shot.png" --time-s 2 --size 64x40 --force >/dev/null || fail "--force did not replace"
echo "e2e_snapshot: ok"
