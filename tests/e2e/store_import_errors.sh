# A bad import writes nothing: the head hash before and after is the same, the message names
# file, line and column, and the exit code is 65 (66 for a missing file).
source "$SOURCE_DIR/tests/e2e/lib.bash"
SP="$SCALEPROOF"
D="$TEST_DATA/csv"
"$SP" -q init >/dev/null
"$SP" -q scale add --id ST-3 --division 20 --unit lb
"$SP" -q rig add --file "$D/rig.toml"
expect_exit 0 "$SP" check-store
before="$(cat "$WORK/out")"
# Two files in one command: the good one is not kept when the second is bad.
expect_exit 65 "$SP" import "$D/two_sessions.csv" "$D/bad_division.csv"
expect_in err "bad_division.csv:3: ticket B-1042, pass tensioned: drive: reading 4705 lb is not a multiple of the scale division 20 lb"
printf 'session,kind,ticket\n' > "$WORK/short.csv"
expect_exit 65 "$SP" import "$WORK/short.csv"
expect_in err "short.csv:1: header: missing column weighed_at"
printf '{"format": "scaleproof-session/1", "passes": 3}' > "$WORK/bad.json"
expect_exit 65 "$SP" import "$WORK/bad.json"
expect_exit 66 "$SP" import "$WORK/none.csv"
expect_exit 0 "$SP" check-store
[ "$(cat "$WORK/out")" = "$before" ] || fail "a failed import changed the store"
# The good file alone imports.
expect_exit 0 "$SP" import "$D/two_sessions.csv"
expect_in out "5 passes (0 voided), 2 sessions opened"
echo "store_import_errors: ok"
