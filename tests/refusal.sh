# Shared by the command-line end-to-end scripts (sourced, not a test of its
# own). expect_refusal NAME TEXT ARGS... runs "$bin" ARGS... --out
# "$work/NAME" and checks exit code 2, a message holding TEXT, and no output
# folder made. Needs $bin, $work and a fail function.
expect_refusal() {
  local name=$1 text=$2
  shift 2
  set +e
  "$bin" "$@" --out "$work/$name" 2>"$work/$name.err" >/dev/null
  local code=$?
  set -e
  [ "$code" -eq 2 ] || fail "$name: expected exit 2, got $code"
  grep -q -- "$text" "$work/$name.err" || fail "$name: message lacks '$text': $(cat "$work/$name.err")"
  [ ! -e "$work/$name" ] || fail "$name: made the output folder"
}
