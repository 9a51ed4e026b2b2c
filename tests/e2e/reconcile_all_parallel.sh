#!/usr/bin/env bash
# `reconcile --all` on worker threads (cli/reconcile_store.cpp, cli/ordered_batches.h) against
# its reference, the one-thread run (--jobs 1): the same stdout bytes, the same stderr bytes,
# the same exit code, and the same interleaving of the two when they share one stream, in JSON
# and in text, on a generated store of 612 sessions (three batches of 256) holding
#  - session 301 (second batch), which the engine refuses: reported, and the run goes on;
#  - session 602 (third batch), whose tickets are not UTF-8, so the JSON writer throws an
#    internal error: the JSON run must stop there, with nothing of 602..612 written.
# Both rows are written with the stock sqlite3 shell behind the ledger's back (their hashes
# are fake; check-store would reject them): the store's own commands refuse such data.
source "$SOURCE_DIR/tests/e2e/lib.bash"
DB="$SCALEPROOF_DB"
sql() { sqlite3 "$DB" "$1"; }
python3 "$SOURCE_DIR/bench/gen_data.py" setup --bin "$SCALEPROOF" --db "$DB"
python3 "$SOURCE_DIR/bench/gen_data.py" csv --sessions 300 --out "$WORK/base.csv"
expect_exit 0 "$SCALEPROOF" import "$WORK/base.csv"
# Session 301: an infinite tape uncertainty passes the column's CHECK (> 0) but not the engine.
sql "INSERT INTO sessions(id, seq, hash, ref, rig_id, scale_id, length_uncertainty, opened_at)
     VALUES (301, 1000000000, zeroblob(32), 'bad-length', 1, 1, 9e999, '2026-01-01T00:00:00Z');"
sed 's/^S-/T-/' "$WORK/base.csv" >"$WORK/second.csv"
expect_exit 0 "$SCALEPROOF" import "$WORK/second.csv"
# Session 602: session 1's passes again, with tickets that are not UTF-8.
sql "INSERT INTO sessions(id, seq, hash, ref, rig_id, scale_id, opened_at)
     SELECT 602, 2000000000, zeroblob(32), 'bad-text', rig_id, scale_id, opened_at
     FROM sessions WHERE id = 1;
     INSERT INTO passes(id, hash, session_id, kind, setting, ticket, weighed_at, steer, drive,
                        trailer, gross, entered_at)
     SELECT 3000000000 + id, zeroblob(32), 602, kind, setting, CAST(X'C328' AS TEXT) || id,
            weighed_at, steer, drive, trailer, gross, entered_at
     FROM passes WHERE session_id = 1;"
head -n 41 "$WORK/base.csv" | sed 's/^S-/U-/' >"$WORK/third.csv"  # header + 10 sessions
expect_exit 0 "$SCALEPROOF" import "$WORK/third.csv"
[ "$(sql 'SELECT count(*) FROM sessions;')" = "612" ] || fail "expected 612 sessions"

# run NAME ARGS...: stdout, stderr, both in one stream, and the exit code under $WORK/NAME.*
run() {
  local name="$1"; shift
  local rc=0
  "$SCALEPROOF" reconcile --all "$@" >"$WORK/$name.out" 2>"$WORK/$name.err" || rc=$?
  echo "$rc" >"$WORK/$name.rc"
  "$SCALEPROOF" reconcile --all "$@" >"$WORK/$name.both" 2>&1 || true
}
same() {  # same A B: every file of run A equals run B's
  for ext in out err both rc; do
    cmp "$WORK/$1.$ext" "$WORK/$2.$ext" || fail "reconcile --all: $1.$ext differs from $2.$ext"
  done
}
for mode in json text; do
  flag=(); [ "$mode" = json ] && flag=(--json)
  run "$mode-1" "${flag[@]}" --jobs 1
  run "$mode-2" "${flag[@]}" --jobs 2
  run "$mode-3" "${flag[@]}" --jobs 3
  run "$mode-auto" "${flag[@]}"
  same "$mode-1" "$mode-2"
  same "$mode-1" "$mode-3"
  same "$mode-1" "$mode-auto"
  expect_in "$WORK/$mode-1.err" \
    "scaleproof: session 301: length_uncertainty: expected a length > 0, got inf"
done
# The reference itself. JSON: sessions 1..601 in order (301 as an error line), then the
# internal error, exit 70. Text: every session but 301, exit 65.
[ "$(cat "$WORK/json-1.rc")" = "70" ] || fail "json: expected exit 70, got $(cat "$WORK/json-1.rc")"
expect_in "$WORK/json-1.err" "scaleproof: internal error: "
[ "$(wc -l <"$WORK/json-1.err")" = "2" ] || fail "json: expected two messages"
python3 - "$WORK/json-1.out" <<'PY'
import json, sys
lines = [json.loads(line) for line in open(sys.argv[1])]
assert [d["session"] for d in lines] == list(range(1, 602)), "json: not sessions 1..601 in order"
assert "error" in lines[300] and all("result" in d for i, d in enumerate(lines) if i != 300)
PY
[ "$(cat "$WORK/text-1.rc")" = "65" ] || fail "text: expected exit 65, got $(cat "$WORK/text-1.rc")"
[ "$(wc -l <"$WORK/text-1.out")" = "611" ] || fail "text: expected 611 lines"
[ "$(wc -l <"$WORK/text-1.err")" = "1" ] || fail "text: expected one message"

# A store smaller than one batch (no thread is started) prints the same as well.
export SCALEPROOF_DB="$WORK/small.db"
python3 "$SOURCE_DIR/bench/gen_data.py" setup --bin "$SCALEPROOF" --db "$SCALEPROOF_DB"
expect_exit 0 "$SCALEPROOF" import "$WORK/third.csv"
run small-1 --json --jobs 1
run small-2 --json --jobs 2
same small-1 small-2
[ "$(wc -l <"$WORK/small-1.out")" = "10" ] || fail "small: expected 10 lines"
expect_exit 2 "$SCALEPROOF" reconcile --all --jobs -1
# --jobs belongs to --all: elsewhere it is a usage error (2), not silently ignored.
expect_exit 2 "$SCALEPROOF" reconcile --session 1 --jobs 2
expect_in err "--jobs applies to --all only"
echo "reconcile_all_parallel: ok"
