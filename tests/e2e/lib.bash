# Helpers for end-to-end scripts: source it, then call the real binary as "$SCALEPROOF".
# Each script runs in its own temporary folder, removed on exit.
set -euo pipefail
: "${SCALEPROOF:?SCALEPROOF must point to the binary}"
: "${SOURCE_DIR:?SOURCE_DIR must point to the source tree}"
WORK="$(mktemp -d)"
trap 'rm -rf "$WORK"' EXIT
cd "$WORK"
export NO_COLOR=1
export SCALEPROOF_DB="$WORK/store.db"

fail() { echo "FAIL: $*" >&2; exit 1; }

# expect_exit CODE CMD...: runs CMD, captures stdout/stderr into $WORK/out and $WORK/err.
expect_exit() {
  local want="$1"; shift
  local got=0
  "$@" >"$WORK/out" 2>"$WORK/err" || got=$?
  if [ "$got" != "$want" ]; then
    echo "--- stdout"; cat "$WORK/out"; echo "--- stderr"; cat "$WORK/err"
    fail "expected exit $want, got $got: $*"
  fi
}

# expect_in FILE TEXT: FILE contains TEXT (fixed string).
expect_in() {
  grep -qF -- "$2" "$1" || { echo "--- $1"; cat "$1"; fail "expected '$2' in $1"; }
}
