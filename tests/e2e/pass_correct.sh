# `pass correct` end to end: a correction keeps the ticket, shows in the history next to the
# old values, feeds reconcile and export, is chained, survives an export/import round trip,
# and every refusal is named with the right exit code. Readings: invented demo values
# (tests/data/csv), multiples of the 20 lb division.
source "$SOURCE_DIR/tests/e2e/lib.bash"
SP="$SCALEPROOF"
D="$TEST_DATA/csv"
export SCALEPROOF_OPERATOR="R. Quill"

"$SP" -q init >/dev/null
"$SP" -q scale add --id ST-3 --division 20 --unit lb --inspected 2026-03-14
"$SP" -q rig add --file "$D/rig.toml"
"$SP" -q import "$D/two_sessions.csv"
# Chain: 1 scale, 2 inspection, 3 vehicle, 4 trailer, 5 rig, 6 session K-1, 7-9 passes
# A-1001..A-1003, 10 session K-2, 11-12 passes A-2001, A-2002.
expect_exit 0 "$SP" reconcile --session 1 --json
cp "$WORK/out" "$WORK/before.json"

# The stored gross no longer adds up: asked for, nothing stored.
expect_exit 2 "$SP" pass correct 9 --drive 4780 --reason "drive keyed 4760, ticket shows 4780"
expect_in err "the stored gross 15500 is no longer the sum of the platforms (15520)"
expect_exit 0 "$SP" pass correct 9 --drive 4780 --gross 15520 --reason "drive keyed 4760, ticket shows 4780"
expect_in out "pass 9 corrected (ticket A-1003; correction 1)"
expect_exit 0 "$SP" session show 1
expect_in out "A-1003"
expect_in out "CORRECTED"
expect_in out "correct pass 9 (ticket A-1003): drive 4760 -> 4780, gross 15500 -> 15520: drive keyed 4760, ticket shows 4780 - by R. Quill"
# Reconcile (one session and --all) and the JSON export use the corrected values.
expect_exit 0 "$SP" reconcile --session 1 --json
cmp -s "$WORK/out" "$WORK/before.json" && fail "reconcile did not use the correction"
cp "$WORK/out" "$WORK/after.json"
expect_exit 0 "$SP" export --session 1 -o "$WORK/s1.json"
grep -q '"drive": 4780' "$WORK/s1.json" || fail "export lost the correction"
expect_exit 0 "$SP" reconcile --all --json
grep -c . "$WORK/out" >/dev/null
# Corrected again: the latest counts.
expect_exit 0 "$SP" -q pass correct 9 --session 1 --setting 5 --reason "bar setting was 5"
[ "$(cat "$WORK/out")" = "2" ] || fail "second correction id"
expect_exit 0 "$SP" session show 1
expect_in out "setting 4 -> 5"

# Refusals.
expect_exit 65 "$SP" pass correct 9 --session 2 --drive 4800 --gross 15540 --reason x
expect_in err "pass 9 (ticket A-1003): it is in session 1, not session 2"
expect_exit 0 "$SP" pass void 8 --reason "keyed twice"
expect_exit 65 "$SP" pass correct 8 --drive 4980 --reason x
expect_in err "pass 8 (ticket A-1002): it is voided (keyed twice); a voided pass cannot be corrected"
expect_exit 65 "$SP" pass correct 7 --reason "nothing"
expect_in err "the correction changes nothing"
expect_exit 65 "$SP" pass correct 7 --drive 3910 --no-gross --reason x
expect_in err "drive: reading 3910 lb is not a multiple of the scale division 20 lb"
expect_exit 0 "$SP" session close 2
expect_exit 65 "$SP" pass correct 11 --drive 3900 --no-gross --reason x
expect_in err "session 2 is closed"
expect_exit 66 "$SP" pass correct 99 --drive 3900 --reason x
expect_in err "pass 99: not in the store"
expect_exit 2 "$SP" pass correct 7 --drive 3920
expect_exit 2 "$SP" pass correct 7 --gross 1 --no-gross --reason x
expect_exit 0 "$SP" check-store
expect_in out "ok, 16 rows"

# The stock shell cannot change or replace a correction.
if sqlite3 "$SCALEPROOF_DB" "UPDATE pass_corrections SET drive = 4800" 2>"$WORK/sqlerr"; then
  fail "UPDATE of a correction was not refused"
fi
expect_in "$WORK/sqlerr" "append-only"
if sqlite3 "$SCALEPROOF_DB" "INSERT OR REPLACE INTO pass_corrections SELECT * FROM pass_corrections LIMIT 1" 2>"$WORK/sqlerr"; then
  fail "INSERT OR REPLACE of a correction was not refused"
fi
expect_in "$WORK/sqlerr" "append-only"

# CSV round trip: export, import into a new store, export again: the same file.
expect_exit 0 "$SP" export --session 1 --format csv -o "$WORK/s1.csv"
expect_in "$WORK/s1.csv" "correction_reason"
expect_in "$WORK/s1.csv" "drive keyed 4760"
export SCALEPROOF_DB="$WORK/second.db"
"$SP" -q init >/dev/null
"$SP" -q scale add --id ST-3 --division 20 --unit lb --inspected 2026-03-14
"$SP" -q rig add --file "$D/rig.toml"
expect_exit 0 "$SP" import "$WORK/s1.csv"
expect_in out "3 passes (1 voided, 2 corrected)"
expect_exit 0 "$SP" export --session 1 --format csv -o "$WORK/s1-again.csv"
cmp "$WORK/s1.csv" "$WORK/s1-again.csv" || { diff "$WORK/s1.csv" "$WORK/s1-again.csv"; fail "CSV round trip"; }
expect_exit 0 "$SP" check-store
echo "pass_correct: ok"
