# The store's commands end to end: init, scale, rig, session, pass add/void, export, reconcile
# from the store, check-store, and the stock sqlite3 shell's integrity check.
source "$SOURCE_DIR/tests/e2e/lib.bash"
SP="$SCALEPROOF"
D="$TEST_DATA/csv"

expect_exit 0 "$SP" init
expect_in out "schema version 3"
# --db is global: before or after the subcommand.
expect_exit 0 "$SP" --db "$WORK/other.db" init
expect_exit 0 "$SP" init --db "$WORK/third.db"
[ -f "$WORK/other.db" ] && [ -f "$WORK/third.db" ] || fail "--db not honoured"

expect_exit 0 "$SP" scale add --id ST-3 --division 20 --unit lb --class IIIL --capacity 60000 \
  --name "North lane" --location "Kettle Flats weigh station" --inspected 2026-03-14 --seal SEAL-0042 --by "R. Quill"
expect_exit 65 "$SP" scale add --id ST-3 --division 20
expect_in err "already in the store"
expect_exit 0 "$SP" rig add --file "$D/rig.toml" --by "R. Quill"
expect_exit 0 "$SP" rig add --name gull --vehicle "Gull 1500" --wheelbase 145 --rear-axle-to-ball 48 \
  --trailer "Tern 16" --ball-to-axle 150
expect_exit 0 "$SP" rig list
expect_in out "heron-wren"
expect_exit 0 "$SP" -q session open --rig heron-wren --scale ST-3 --operator "R. Quill"
[ "$(cat "$WORK/out")" = "1" ] || fail "first session id is not 1"

add() { "$SP" pass add --session 1 --weighed-at 2026-11-03T09:14:00-06:00 --by "R. Quill" "$@"; }
expect_exit 0 add --kind unhitched --ticket A-1001 --steer 4600 --drive 3900 --gross 8500
expect_exit 0 add --kind hitched --ticket A-1002 --steer 4340 --drive 4960 --trailer 6200
expect_exit 0 add --kind tensioned --setting 4 --ticket A-1003 --steer 4460 --drive 4760 --trailer 6280
# Refusals name the flag (the validator, format/validate.h); nothing is stored.
expect_exit 65 add --kind tensioned --setting 5 --ticket B-1042 --steer 4460 --drive 4705 --trailer 6280
expect_in err "--drive: reading 4705 lb is not a multiple of the scale division 20 lb"
expect_exit 65 add --kind unhitched --ticket A-1001 --steer 4600 --drive 3900
expect_in err "already in session 1"
# Missing field with stdin not a terminal: usage error naming the flag.
expect_exit 2 "$SP" pass add --session 1 --kind unhitched --ticket A-9 --weighed-at 2026-11-03T09:14:00Z --steer 4600 </dev/null
expect_in err "missing --drive"
# A fourth pass keyed wrong, then voided.
expect_exit 0 "$SP" -q pass add --session 1 --kind tensioned --setting 4b --ticket A-1004 \
  --weighed-at 2026-11-03T09:40:00-06:00 --steer 4460 --drive 4960 --trailer 6280
bad_id="$(cat "$WORK/out")"
expect_exit 0 "$SP" export --session 1 --format json -o "$WORK/before.json"
expect_exit 0 "$SP" pass void "$bad_id" --reason "drive keyed wrong" --by "R. Quill"
expect_exit 65 "$SP" pass void "$bad_id" --reason "again"
expect_in err "already voided"
expect_exit 0 "$SP" session show 1
expect_in out "VOIDED"
expect_in out "drive keyed wrong"
expect_in out "SEAL-0042"
expect_exit 0 "$SP" session list
expect_in out "heron-wren"

# Export JSON: reconcile accepts it; the voided pass is kept and marked.
expect_exit 0 "$SP" export --session 1 --format json -o "$WORK/s1.json"
expect_exit 73 "$SP" export --session 1 -o "$WORK/s1.json"
grep -q '"voided": true' "$WORK/s1.json" || fail "export lost the void"
expect_exit 0 "$SP" reconcile "$WORK/s1.json"
cp "$WORK/out" "$WORK/from_file.txt"
cmp -s "$WORK/before.json" "$WORK/s1.json" && fail "void did not change the exported session"

# Round trip: import into a fresh store and export again: identical file.
expect_exit 0 "$SP" --db "$WORK/rt.db" init
expect_exit 0 "$SP" --db "$WORK/rt.db" import "$WORK/s1.json"
expect_exit 0 "$SP" --db "$WORK/rt.db" export --session 1 -o "$WORK/rt.json"
# Row ids are the ledger's own and differ between stores; everything else must be identical.
strip_ids() { grep -v -E '^ *"(id|session_id)": [0-9]+,?$' "$1"; }
diff <(strip_ids "$WORK/s1.json") <(strip_ids "$WORK/rt.json") || fail "JSON round trip is not lossless"

# CSV export and round trip through a store that knows the scale and the rig.
expect_exit 0 "$SP" export --session 1 --format csv -o "$WORK/s1.csv"
expect_in "$WORK/s1.csv" "session-1,ST-3,heron-wren"
expect_exit 0 "$SP" --db "$WORK/csv.db" init
expect_exit 0 "$SP" --db "$WORK/csv.db" scale add --id ST-3 --division 20 --unit lb --class IIIL \
  --capacity 60000 --name "North lane" --location "Kettle Flats weigh station"
expect_exit 0 "$SP" --db "$WORK/csv.db" rig add --file "$D/rig.toml" --by "R. Quill"
expect_exit 0 "$SP" --db "$WORK/csv.db" import "$WORK/s1.csv"
expect_exit 0 "$SP" --db "$WORK/csv.db" export --session 1 --format csv -o "$WORK/rt.csv"
diff "$WORK/s1.csv" "$WORK/rt.csv" || fail "CSV round trip is not lossless"

# Close: no more passes.
expect_exit 0 "$SP" session close 1
expect_exit 65 add --kind unhitched --ticket A-1010 --steer 4600 --drive 3900
expect_in err "is closed"

expect_exit 0 "$SP" check-store
expect_in out "check-store: ok"
[ "$(sqlite3 "$SCALEPROOF_DB" 'PRAGMA integrity_check')" = "ok" ] || fail "integrity_check"
[ "$(sqlite3 "$WORK/rt.db" 'PRAGMA integrity_check')" = "ok" ] || fail "integrity_check (rt)"
echo "store_commands: ok"
