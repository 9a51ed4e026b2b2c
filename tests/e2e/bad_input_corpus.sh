#!/usr/bin/env bash
# Bad-input corpus (tests/bad-input/MANIFEST.tsv): every file is refused by `import` (and, for
# session files, by `reconcile`) with exit 65 and a short message that names the file and the
# place (JSON path or CSV line/column), and the store is left exactly as it was: same
# `check-store` output (row count and head hash) and the same bytes in an SQL dump.
source "$SOURCE_DIR/tests/e2e/lib.bash"
CORPUS="$SOURCE_DIR/tests/bad-input"

expect_exit 0 "$SCALEPROOF" init
# A store with something in it, so the head hash is not that of an empty chain.
expect_exit 0 "$SCALEPROOF" import "$SOURCE_DIR/tests/fuzz/corpus/session_json/valid_1.json"
if [ -f "$CORPUS/setup.sh" ]; then source "$CORPUS/setup.sh"; fi  # scales/rigs the CSVs name
snapshot() {
  "$SCALEPROOF" check-store >"$WORK/check" 2>&1 || { cat "$WORK/check"; fail "check-store: $1"; }
  sqlite3 "$SCALEPROOF_DB" .dump | sha256sum
}
before="$(snapshot "before the corpus")"
cp "$WORK/check" "$WORK/check.before"

# Every file is tried; the problems are listed together at the end.
problems=()
problem() { problems+=("$*"); echo "    PROBLEM: $*"; }

# check CMD FILE FRAGMENT WANT_EXIT: exit code, and stderr names the file and the place in a
# short message.
check() {
  local cmd="$1" path="$2" fragment="$3" want="$4" name got=0
  name="$(basename "$path")"
  "$SCALEPROOF" "$cmd" "$path" >"$WORK/out" 2>"$WORK/err" || got=$?
  echo "    $cmd (exit $got): $(head -c 240 "$WORK/err")"
  [ "$got" = "$want" ] || problem "$name: $cmd exited $got, expected $want"
  grep -qF -- "$name" "$WORK/err" || problem "$name: $cmd message does not name the file"
  grep -qF -- "$fragment" "$WORK/err" || problem "$name: $cmd message lacks '$fragment'"
  local bytes; bytes=$(wc -c <"$WORK/err")
  [ "$bytes" -le 1000 ] || problem "$name: $cmd message of $bytes bytes is not short"
  local lines; lines=$(wc -l <"$WORK/err")
  [ "$lines" -le 3 ] || problem "$name: $cmd message of $lines lines"
}

n=0
while IFS=$'\t' read -r file code fragment why; do
  case "$file" in ''|'#'*) continue ;; esac
  echo "--- $file ($why)"
  path="$CORPUS/$file"
  [ -f "$path" ] || fail "MANIFEST names a missing file: $file"
  check import "$path" "$fragment" "$code"
  if [[ "$file" == *.json ]]; then
    check reconcile "$path" "$fragment" "$code"
  fi
  n=$((n + 1))
done <"$CORPUS/MANIFEST.tsv"
[ "$n" -ge 40 ] || fail "the corpus has $n files; the issue asks for at least 40"

if [ "${#problems[@]}" -gt 0 ]; then
  printf '%s\n' "${problems[@]}" >&2
  fail "${#problems[@]} problems with the bad-input corpus"
fi
after="$(snapshot "after the corpus")"
diff "$WORK/check.before" "$WORK/check" || fail "check-store output changed"
[ "$before" = "$after" ] || fail "the store's contents changed"
echo "ok: $n bad files refused with exit 65, store unchanged"
