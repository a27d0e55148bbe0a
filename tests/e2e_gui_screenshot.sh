#!/usr/bin/env bash
# The GUI under a virtual X display (Mesa's llvmpipe): opens the demo
# scenario, renders 90 frames (1.5 s of simulated time at the fixed
# scripted frame clock), writes a screenshot and checks it.
# Usage: bash tests/e2e_gui_screenshot.sh path/to/dwellmark source-dir
# Exit 77 (skipped) without xvfb-run or in a build without the GUI.
set -euo pipefail
bin=$1
src=$2
if ! command -v xvfb-run >/dev/null 2>&1; then
  echo "skip: xvfb-run is not installed (third_party/install-deps.sh installs it)"
  exit 77
fi
out=$(mktemp -d)
trap 'rm -rf "$out"' EXIT

# Without a display the command says so and points at the alternatives.
if DISPLAY= "$bin" gui "$src/assets/scenarios/demo.json" >"$out/nodisplay.txt" 2>&1; then
  echo "FAIL: gui without a display exited 0"
  exit 1
fi
if grep -q "this build has no GUI" "$out/nodisplay.txt"; then
  echo "skip: this build has no GUI"
  exit 77
fi
grep -q "xvfb-run" "$out/nodisplay.txt" || { echo "FAIL: no-display message lacks the xvfb-run hint"; cat "$out/nodisplay.txt"; exit 1; }

# A bad size is refused as bad input.
set +e
xvfb-run -a -s '-screen 0 1280x800x24' "$bin" gui "$src/assets/scenarios/demo.json" --size 12x8 >/dev/null 2>&1
code=$?
set -e
[ "$code" -eq 2 ] || { echo "FAIL: --size 12x8 gave exit $code, expected 2"; exit 1; }

xvfb-run -a -s '-screen 0 1280x800x24' "$bin" gui "$src/assets/scenarios/demo.json" \
  --screenshot "$out/shot.png" --frames 90 --size 1280x800
python3 "$src/tests/check_gui_screenshot.py" "$out/shot.png" "$src/assets/scenarios/demo.json" 1280 800
