# The import's progress line: drawn on a terminal (here a pseudo-terminal made by script(1)),
# never when stderr is not a terminal or with --quiet. SCALEPROOF_PROGRESS_DELAY=0 makes it
# appear on this short import (its default waits 2 s, cli/progress_line.h).
source "$SOURCE_DIR/tests/e2e/lib.bash"
SP="$SCALEPROOF"
D="$TEST_DATA/csv"
export SCALEPROOF_PROGRESS_DELAY=0
fresh() {  # a new store holding the scale and rig the CSV names
  export SCALEPROOF_DB="$WORK/$1.db"
  "$SP" -q init >/dev/null
  "$SP" -q scale add --id ST-3 --division 20 --unit lb
  "$SP" -q rig add --file "$D/rig.toml"
}

# stderr not a terminal: nothing but the result on stdout.
fresh plain
expect_exit 0 "$SP" import "$D/two_sessions.csv"
[ ! -s "$WORK/err" ] || { cat "$WORK/err"; fail "progress written to a non-terminal stderr"; }
expect_in out "imported"

# A terminal: the line, then its erasure.
fresh tty
script -qec "\"$SP\" import \"$D/two_sessions.csv\"" /dev/null </dev/null >"$WORK/pty" ||
  fail "import under a pseudo-terminal failed"
expect_in "$WORK/pty" "two_sessions.csv: 5 rows, "
expect_in "$WORK/pty" " rows/s, 100 % read, ETA 0 s"
grep -q $'\r\033\[K' "$WORK/pty" || fail "the progress line was not erased"

# A terminal with --quiet: nothing.
fresh quiet
script -qec "\"$SP\" -q import \"$D/two_sessions.csv\"" /dev/null </dev/null >"$WORK/pty-q" ||
  fail "quiet import under a pseudo-terminal failed"
if grep -q "rows/s" "$WORK/pty-q"; then fail "progress shown with --quiet"; fi
echo "import_progress: ok"
