#!/usr/bin/env bash
# Output files, for every run of tests/golden/runs.txt (one per subcommand
# that writes results): a new folder gets complete files and no temporary
# ones; a folder with files is refused without --force and left untouched;
# a plain file is never taken for a folder; a reader that reads while the
# run rewrites its outputs with --force only ever sees complete files; a
# write that cannot finish leaves no temporary file.
# Usage: e2e_files.sh DWELLMARK SOURCE_DIR
set -u
bin=$(realpath "$1"); src=$(realpath "$2")
work=$(mktemp -d); trap 'kill $writer 2>/dev/null; rm -rf "$work"' EXIT
writer=
fail() { echo "FAIL: $*"; exit 1; }
. "$src/tests/golden/lib.sh"

no_temporaries() {  # DIR
  [ -z "$(find "$1" -name '.tmp-*')" ] || fail "temporary files left in $1: $(find "$1" -name '.tmp-*')"
}

count=0
while IFS='|' read -r name args; do
  out=$work/$name
  # A new folder: complete files, nothing temporary.
  golden_run "$bin" "$src" "$args" "$out" || fail "$name did not run"
  [ -n "$(ls "$out")" ] || fail "$name wrote nothing"
  no_temporaries "$out"
  golden_hashes "$out" > "$work/$name.ref"

  # Reused without --force: refused (exit 2), the files untouched.
  (cd "$src" && "$bin" $args --out "$out" > /dev/null 2> "$work/err"); code=$?
  [ "$code" -eq 2 ] || fail "$name: reused folder gave exit $code, expected 2"
  grep -q -- "--force" "$work/err" || fail "$name: refusal does not mention --force"
  golden_hashes "$out" | cmp -s - "$work/$name.ref" || fail "$name: refused run changed the folder"

  # A plain file where the folder should be: refused even with --force.
  echo keep > "$work/plain"
  (cd "$src" && "$bin" $args --out "$work/plain" --force > /dev/null 2>&1); code=$?
  [ "$code" -eq 2 ] || fail "$name: a plain file as --out gave exit $code, expected 2"
  [ "$(cat "$work/plain")" = keep ] || fail "$name: the plain file was changed"

  # Rewrites with --force while a reader reads: every read is a whole file.
  ( for _ in $(seq 1 15); do (cd "$src" && "$bin" $args --out "$out" --force > /dev/null 2>&1) || exit 1; done ) &
  writer=$!
  python3 - "$out" "$work/$name.ref" "$writer" <<'PY' || fail "$name: a reader saw a partial or missing file"
import hashlib, os, sys
out, ref, writer = sys.argv[1], sys.argv[2], int(sys.argv[3])
expected = {}
for line in open(ref):
    digest, path = line.split(None, 1)
    expected[path.strip()[2:]] = digest
reads = 0
def writer_alive():
    try:
        os.kill(writer, 0)
        return True
    except OSError:
        return False
while writer_alive():
    for name, digest in expected.items():
        with open(os.path.join(out, name), "rb") as f:
            got = hashlib.sha256(f.read()).hexdigest()
        if got != digest:
            sys.exit("%s: read %s, expected %s" % (name, got, digest))
        reads += 1
print("reads during rewrites:", reads)
PY
  wait "$writer" || fail "$name: a --force rewrite failed"
  writer=
  no_temporaries "$out"

  # A write that cannot finish (a folder where a file goes): an error, and
  # no temporary file left behind.
  first=$(head -1 "$work/$name.ref" | awk '{print $2}')
  rm -f "$out/$first" && mkdir "$out/$first"
  (cd "$src" && "$bin" $args --out "$out" --force > /dev/null 2> "$work/err"); code=$?
  [ "$code" -ne 0 ] || fail "$name: writing over a folder succeeded"
  grep -q "cannot" "$work/err" || fail "$name: no clear message: $(cat "$work/err")"
  no_temporaries "$out"
  count=$((count + 1))
done < <(golden_runs "$src")
[ "$count" -gt 0 ] || fail "no runs in tests/golden/runs.txt"
echo "e2e_files: $count subcommands write atomically and never mix folders"
