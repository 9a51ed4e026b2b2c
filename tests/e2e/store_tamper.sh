# Changes made behind the tool's back with the stock sqlite3 shell are caught by check-store,
# which names the first bad row (table, id, ticket) and exits 1.
source "$SOURCE_DIR/tests/e2e/lib.bash"
SP="$SCALEPROOF"
D="$TEST_DATA/csv"

setup() {
  rm -f "$SCALEPROOF_DB" "$SCALEPROOF_DB-wal" "$SCALEPROOF_DB-shm"
  "$SP" -q init >/dev/null
  "$SP" -q scale add --id ST-3 --division 20 --unit lb --inspected 2026-03-14
  "$SP" -q rig add --file "$D/rig.toml"
  "$SP" -q import "$D/two_sessions.csv"
  expect_exit 0 "$SP" check-store
}
# Rows in chain order: 1 scale, 2 inspection, 3 vehicle, 4 trailer, 5 rig, 6 session K-1,
# 7-9 passes A-1001..A-1003, 10 session K-2, 11-12 passes A-2001, A-2002.

# The triggers refuse edits while they exist.
setup
if sqlite3 "$SCALEPROOF_DB" "UPDATE passes SET drive = 4780 WHERE id = 8" 2>"$WORK/sqlerr"; then
  fail "UPDATE was not refused"
fi
expect_in "$WORK/sqlerr" "append-only"
if sqlite3 "$SCALEPROOF_DB" "INSERT OR REPLACE INTO passes SELECT * FROM passes WHERE id = 8" 2>"$WORK/sqlerr"; then
  fail "INSERT OR REPLACE was not refused"
fi

check_bad() {  # SQL, expected text in the report
  setup
  sqlite3 "$SCALEPROOF_DB" "DROP TRIGGER passes_no_update; DROP TRIGGER passes_no_delete; $1"
  expect_exit 1 "$SP" check-store
  expect_in out "$2"
}
check_bad "UPDATE passes SET drive = 4780 WHERE id = 8" "FAILED at passes id 8 (ticket A-1002), chain position 8"
check_bad "DELETE FROM passes WHERE id = 8" "FAILED at passes id 9 (ticket A-1003)"
check_bad "UPDATE passes SET hash = zeroblob(32) WHERE id = 11" "FAILED at passes id 11 (ticket A-2001)"
check_bad "UPDATE passes SET ticket = 'X' WHERE id = 7; UPDATE passes SET ticket = 'A-1001' WHERE id = 8; UPDATE passes SET ticket = 'A-1002' WHERE id = 7;" "FAILED at passes id 7 (ticket A-1002)"
# Cutting the tail is only visible against a head hash recorded earlier.
setup
head="$(sed -n 's/.*head \([0-9a-f]*\).*/\1/p' "$WORK/out")"
sqlite3 "$SCALEPROOF_DB" "DROP TRIGGER passes_no_delete; DELETE FROM passes WHERE id = 12"
expect_exit 1 "$SP" check-store --expect-head "$head"
expect_in out "is not the expected"
[ "$(sqlite3 "$SCALEPROOF_DB" 'PRAGMA integrity_check')" = "ok" ] || fail "integrity_check"
echo "store_tamper: ok"
