#!/usr/bin/env bash
# Runs the scenario fuzzer for a bounded time and says how many inputs it
# tried. Usage: bash tests/fuzz/run-fuzz.sh BUILD_DIR SECONDS
# BUILD_DIR is a build configured with -DDWELLMARK_FUZZ=ON (clang). Seeds:
# assets/scenarios and tests/fuzz/seeds; the growing corpus, the dictionary
# and any crashing input stay in BUILD_DIR/fuzz/. A crash exits non-zero:
# copy the input to tests/fuzz/regressions/ (test_scenario replays it), fix.
set -euo pipefail
root=$(cd "$(dirname "$0")/../.." && pwd)
build=$(cd "$1" && pwd)
seconds=$2
work=$build/fuzz
mkdir -p "$work/corpus" "$work/artifacts"

# Dictionary: every key and choice of the field table, as quoted JSON strings.
"$build/app/dwellmark" params > "$work/params.md"
python3 - "$work/params.md" > "$work/scenario.dict" <<'PY'
import sys
tokens = {"dwellmark_scenario", "markings"}
for line in open(sys.argv[1]):
    cells = [c.strip() for c in line.replace("\\|", "\0").split("|")]
    if len(cells) < 5 or not cells[1].startswith("`"):
        continue
    tokens.update(p for p in cells[1].strip("`").replace("[]", "").split(".") if p)
    if "\0" in cells[3]:
        tokens.update(c.strip() for c in cells[3].split("\0"))
for t in sorted(tokens):
    print('"\\"%s\\""' % t)
print('"\\x0A%%\\x0A"')
PY

log=$work/last-run.log
status=0
"$build/tests/fuzz/fuzz_scenario" "$work/corpus" "$root/assets/scenarios" "$root/tests/fuzz/seeds" \
  -dict="$work/scenario.dict" -max_total_time="$seconds" -max_len=8192 -timeout=10 -rss_limit_mb=2048 \
  -artifact_prefix="$work/artifacts/" -print_final_stats=1 > "$log" 2>&1 || status=$?
runs=$(sed -n 's/^stat::number_of_executed_units: *//p' "$log")
if [ "$status" -ne 0 ]; then
  tail -40 "$log"
  echo "fuzz: FAILED after ${runs:-?} inputs; the crashing input is in $work/artifacts/" >&2
  exit 1
fi
echo "fuzz: ${runs:-0} inputs in ${seconds} s, no crash, corpus $(ls "$work/corpus" | wc -l) files"
