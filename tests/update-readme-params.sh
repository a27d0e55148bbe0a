#!/usr/bin/env bash
# Rewrites the README's parameter table from `dwellmark params` (run after
# adding or changing a scenario field; test_docs checks they agree).
set -euo pipefail
root=$(cd "$(dirname "$0")/.." && pwd)
bin=$(realpath "${1:-$root/build/app/dwellmark}")
cd "$root"
python3 - "$bin" <<'PY'
import re, subprocess, sys
table = subprocess.run([sys.argv[1], "params"], check=True, capture_output=True, text=True).stdout
readme = open("README.md").read()
new = re.sub(r"<!-- params:begin -->\n.*?<!-- params:end -->",
             lambda m: "<!-- params:begin -->\n" + table + "<!-- params:end -->", readme, flags=re.S)
open("README.md.tmp", "w").write(new)
PY
mv README.md.tmp README.md
