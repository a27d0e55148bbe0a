#!/usr/bin/env bash
# dwellmark review of two variants: one self-contained review.html that
# validates as HTML (tidy and python3's html.parser), holds every section and
# every image, opens in headless Chromium to a screenshot that is not blank;
# review.json beside it; the same bytes at any thread count; bad input gets
# exit code 2 and nothing written.
# Usage: bash e2e_review.sh <path-to-dwellmark> <source-dir>
set -euo pipefail
bin=$1
src=$2
work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT
fail() { echo "FAIL: $*"; exit 1; }

# Two variants: the demo and a shorter tube. Few launches, short runs, small
# images keep this quick; the figures themselves are tested elsewhere.
python3 - "$src/assets/scenarios/demo.json" "$work/short.json" <<'PY'
import json, sys
d = json.load(open(sys.argv[1]))
d["name"] = "short tube <100 mm> & co"
d["body"]["length_mm"] = 100.0
json.dump(d, open(sys.argv[2], "w"), indent=2)
PY
args=(--launches 4 --duration-s 5 --image-px 96 --viewer-image-px 64)
"$bin" review "$src/assets/scenarios/demo.json" "$work/short.json" "${args[@]}" --threads 2 --out "$work/r" >"$work/stdout"
grep -q "wrote $work/r/review.html" "$work/stdout" || fail "does not say where the report went"

# Valid HTML by tidy: no errors and no warnings.
tidy -q -e "$work/r/review.html" || fail "tidy reports problems (exit $?)"

# Structure: balanced tags, every section, every image embedded, nothing fetched.
python3 - "$work/r/review.html" "$work/r/review.json" <<'PY'
import base64, json, sys
from html.parser import HTMLParser
void = {"meta", "img", "br", "hr", "link", "input", "rect", "line", "polyline"}
class Check(HTMLParser):
    def __init__(self):
        super().__init__()
        self.stack, self.ids, self.images, self.svgs, self.text = [], set(), [], 0, []
    def handle_starttag(self, tag, attrs):
        a = dict(attrs)
        if "id" in a: self.ids.add(a["id"])
        if tag == "img": self.images.append(a)
        if tag == "svg": self.svgs += 1
        for key in ("src", "href"):
            v = a.get(key, "")
            assert not v.startswith(("http:", "https:", "//")), "fetches " + v
        if tag not in void: self.stack.append(tag)
    def handle_startendtag(self, tag, attrs):
        self.handle_starttag(tag, attrs)
        if tag not in void: self.stack.pop()
    def handle_endtag(self, tag):
        if tag in void: return
        assert self.stack and self.stack[-1] == tag, "unbalanced </%s> after %s" % (tag, self.stack[-3:])
        self.stack.pop()
    def handle_data(self, data): self.text.append(data)
html = open(sys.argv[1], encoding="utf-8").read()
c = Check(); c.feed(html); c.close()
assert not c.stack, "unclosed " + str(c.stack)
for section in ["parameters", "steady", "ensemble", "observer", "viewing", "lighting", "advice", "cautions"]:
    assert section in c.ids, "missing section " + section
review = json.load(open(sys.argv[2]))
variants = review["variants"]
assert [v["name"] for v in variants] == ["demo: acrylic tube on lacquered birch", "short tube <100 mm> & co"]
text = "".join(c.text)
for v in variants: assert v["name"] in text, v["name"]  # escaped in the page, read back as text
expected = sum(2 + sum(1 for w in v["viewing"] if w["eye_above_table_mm"] >= 10) for v in variants)
assert len(c.images) == expected, (len(c.images), expected)
for img in c.images:
    assert img["src"].startswith("data:image/png;base64,"), img["src"][:40]
    assert base64.b64decode(img["src"].split(",", 1)[1])[:8] == b"\x89PNG\r\n\x1a\n"
    assert img.get("alt")
assert c.svgs >= 4 * len(variants), c.svgs
for phrase in ["16 CFR 1501", "2.3.1", "section 308", "safety officer", "CIE TN 006:2016", "IEEE Std 1789"]:
    assert phrase in text, phrase
for v in variants:
    for key in ["scenario", "steady", "ensemble", "observer", "viewing", "lighting", "advice", "cautions"]:
        assert key in v, key
    assert v["ensemble"]["launches"] == 4
    # Each steady row says how its N reads: "p/q" (p spots, each every q revolutions) or null (creeping).
    for row in v["steady"]["rows"]:
        if row["found"]:
            assert "n_ratio" in row, row
            if row["n_ratio"] is not None:
                p, q = map(int, row["n_ratio"].split("/"))
                assert 1 <= q <= 4 and abs(360 * (p / row["spots_per_rev"] - q)) < 360 / p / 8, row
    assert [c["topic"] for c in v["cautions"]][0].startswith("a spinning piece")
assert "safety officer" in review["safety_authority"]
PY

# The same bytes on one thread.
"$bin" review "$src/assets/scenarios/demo.json" "$work/short.json" "${args[@]}" --threads 1 --out "$work/one" --quiet
for f in review.html review.json; do cmp "$work/r/$f" "$work/one/$f" || fail "$f differs between thread counts"; done

# Headless Chromium opens it to a screenshot that is not blank.
profile=$(mktemp -d -p "$work")
timeout 120 chromium --headless --no-sandbox --disable-gpu --disable-quic --no-first-run --disable-background-networking \
  --disable-component-update --disable-sync --user-data-dir="$profile" --screenshot="$work/shot.png" \
  --window-size=1280,2000 "file://$work/r/review.html" >"$work/chromium.log" 2>&1 || fail "chromium: $(tail -3 "$work/chromium.log")"
python3 - "$work/shot.png" <<'PY'
import struct, sys, zlib
data = open(sys.argv[1], "rb").read()
assert data[:8] == b"\x89PNG\r\n\x1a\n", "not a PNG"
pos, idat = 8, b""
while pos < len(data):
    n, kind = struct.unpack(">I4s", data[pos:pos + 8])
    body = data[pos + 8:pos + 8 + n]
    if kind == b"IHDR": width, height, depth, colour = struct.unpack(">IIBB", body[:10])
    if kind == b"IDAT": idat += body
    pos += 12 + n
assert depth == 8 and colour in (2, 6), (depth, colour)
channels = 4 if colour == 6 else 3
raw, stride = zlib.decompress(idat), width * channels
rows, previous, i = [], bytearray(stride), 0
for _ in range(height):  # undo the PNG row filters (None, Sub, Up, Average, Paeth)
    kind, line = raw[i], bytearray(raw[i + 1:i + 1 + stride]); i += 1 + stride
    for x in range(stride):
        a = line[x - channels] if x >= channels else 0
        b, c = previous[x], previous[x - channels] if x >= channels else 0
        if kind == 1: line[x] = (line[x] + a) & 255
        elif kind == 2: line[x] = (line[x] + b) & 255
        elif kind == 3: line[x] = (line[x] + (a + b) // 2) & 255
        elif kind == 4:
            p = a + b - c
            pa, pb, pc = abs(p - a), abs(p - b), abs(p - c)
            line[x] = (line[x] + (a if pa <= pb and pa <= pc else b if pb <= pc else c)) & 255
    rows.append(line); previous = line
colours = {bytes(r[x:x + 3]) for r in rows[::7] for x in range(0, stride, channels * 5)}
dark = sum(1 for r in rows[::7] for x in range(0, stride, channels * 5) if sum(r[x:x + 3]) < 300)
assert len(colours) > 50, "screenshot nearly uniform: %d colours" % len(colours)
assert dark > 100, "no text or drawing: %d dark samples" % dark
PY

# Bad input: exit 2, a message naming what is wrong, nothing written.
source "$src/tests/refusal.sh"
expect_refusal missing "cannot read" review "$work/no-such.json"
expect_refusal launches "--launches" review "$src/assets/scenarios/demo.json" --launches 0
expect_refusal field "launch.tilt_deg" review "$src/assets/scenarios/demo.json" "$work/short.json" --set launch.tilt_deg=120
# A folder that already holds a report is refused before any run, and left as it was.
before=$(cksum "$work/r/review.html")
set +e
"$bin" review "$src/assets/scenarios/demo.json" --launches 1 --duration-s 1 --out "$work/r" 2>"$work/used.err" >/dev/null
code=$?
set -e
[ "$code" -eq 2 ] || fail "reused folder: expected exit 2, got $code"
grep -q -- "--force" "$work/used.err" || fail "reused folder: message does not mention --force"
[ "$(cksum "$work/r/review.html")" = "$before" ] || fail "reused folder: the report was touched"
echo "e2e_review: ok"
