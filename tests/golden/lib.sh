# Shared by e2e_golden.sh, e2e_determinism.sh and bless-golden.sh: reads
# runs.txt and runs one entry into a folder.

# Prints the runs as NAME|ARGUMENTS lines, comments and blank lines dropped.
golden_runs() {  # SOURCE_DIR
  grep -v -e '^#' -e '^[[:space:]]*$' "$1/tests/golden/runs.txt"
}

# Runs one entry's arguments with --out DIR (and any extra options), from
# the source folder so its relative paths resolve. Quiet unless it fails.
golden_run() {  # DWELLMARK SOURCE_DIR "ARGUMENTS" OUT_DIR [EXTRA...]
  local bin=$1 src=$2 args=$3 out=$4
  shift 4
  # shellcheck disable=SC2086  # the arguments are words by design
  (cd "$src" && "$bin" $args --out "$out" "$@" > "$out.log" 2>&1) || { cat "$out.log"; return 1; }
}

# Hash list of every file in a folder, sha256sum format, sorted by name.
golden_hashes() {  # DIR
  (cd "$1" && find . -type f -print0 | sort -z | xargs -0 sha256sum)
}

# True when the subcommand of an entry accepts --threads.
golden_has_threads() {  # DWELLMARK "ARGUMENTS"
  local sub=${2%% *}
  "$1" "$sub" --help 2>/dev/null | grep -q -- '--threads'
}
