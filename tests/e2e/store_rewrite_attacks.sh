# The attack table of issue 16 against the ledger proof (check-store, audit --ledger): each case
# with its exit code and the line it prints. The rewrite is tests/e2e/rewrite_ledger.py: drop the
# triggers, change a value, recompute every hash in chain order (what ~40 lines of Python do).
source "$SOURCE_DIR/tests/e2e/lib.bash"
SP="$SCALEPROOF"
D="$TEST_DATA/csv"
REWRITE="$SOURCE_DIR/tests/e2e/rewrite_ledger.py"
expect_exit 0 "$SP" key new --out station
expect_exit 0 "$SP" key new --out other

# Rows in chain order: 1 scale, 2 inspection, 3 vehicle, 4 trailer, 5 rig, 6 session K-1,
# 7-9 passes A-1001..A-1003, 10 session K-2, 11-12 passes A-2001, A-2002; 13 checkpoint 1.
setup() {
  rm -f "$SCALEPROOF_DB" "$SCALEPROOF_DB-wal" "$SCALEPROOF_DB-shm"
  "$SP" -q init >/dev/null
  "$SP" -q scale add --id ST-3 --division 20 --unit lb --inspected 2026-03-14
  "$SP" -q rig add --file "$D/rig.toml"
  "$SP" -q import "$D/two_sessions.csv"
  expect_exit 0 "$SP" check-store --sign-checkpoint --key station.key --signed-by "Ines Varga"
  expect_in out "check-store: checkpoint 1 signed: rows 1 to 12, head "
}
head_of() { sed -n 's/^check-store: ok, \([0-9]*\) rows, head \([0-9a-f]*\)$/\1:\2/p' "$WORK/out"; }

# 1. The full rewrite: triggers dropped, a steer reading changed, every hash recomputed.
setup
python3 "$REWRITE" "$SCALEPROOF_DB" "UPDATE passes SET steer = 3100 WHERE id = 8"
expect_exit 1 "$SP" check-store
expect_in out "check-store: FAILED: schema: trigger passes_no_update is missing: migrations 1 to 3 make it (an append-only guard was dropped)"
expect_in out "check-store: FAILED: checkpoint 1 (chain position 13, signed "
expect_in out "signs rows 1 to 12 with head "
expect_in out "the chain was rewritten in rows 1 to 12"
expect_in out "check-store: the chain itself links, 13 rows"
# ... and with the triggers put back exactly, the schema holds but the checkpoint still names it.
setup
python3 "$REWRITE" "$SCALEPROOF_DB" "UPDATE passes SET steer = 3100 WHERE id = 8" --restore-triggers
expect_exit 1 "$SP" check-store
if grep -q "schema:" out; then fail "restored triggers reported as a schema change: $(cat out)"; fi
expect_in out "check-store: FAILED: checkpoint 1 (chain position 13"
# A rewrite after the first checkpoint is located between the two checkpoints.
setup
"$SP" -q scale add --id ST-4 --division 20 --unit lb
expect_exit 0 "$SP" check-store --sign-checkpoint --key station.key
python3 "$REWRITE" "$SCALEPROOF_DB" "UPDATE scales SET name = 'East lane' WHERE code = 'ST-4'" --restore-triggers
expect_exit 1 "$SP" check-store
expect_in out "check-store: FAILED: checkpoint 2 (chain position 15"
expect_in out "the chain was rewritten in rows 13 to 14"
expect_in out "check-store: 1 of 2 signed checkpoint(s) hold; latest: rows 1 to 12"

# 2. A dropped tail. A report issued from the store names the anchor (printed and signed); the
# station then cuts the rows after it, triggers put back. The chain alone still links (what the
# chain cannot prove without an outside anchor); the report's anchor and the exported
# checkpoints name the cut.
setup
expect_exit 0 "$SP" report --session 1 --key station.key --out r.pdf
pdftotext r.pdf r.txt
anchor="$(sed -n 's/.*scaleproof check-store --expect \([0-9]*:[0-9a-f]*\).*/\1/p' r.txt)"
[ "$anchor" = "13:$(sqlite3 "$SCALEPROOF_DB" "SELECT lower(hex(hash)) FROM checkpoints WHERE seq = 13")" ] \
  || fail "the report's anchor is not the chain head when issued: '$anchor'"
expect_in r.txt "Latest checkpoint"
expect_exit 0 "$SP" check-store --json
cp out exported.json
expect_exit 0 "$SP" check-store --expect "$anchor"
expect_in out "check-store: anchor 13:"
expect_in out "(--expect) holds: rows 1 to 13 are unchanged"
python3 "$REWRITE" "$SCALEPROOF_DB" "DELETE FROM issued_reports; DELETE FROM checkpoints; DELETE FROM passes WHERE id = 12" --restore-triggers
expect_exit 0 "$SP" check-store
expect_in out "check-store: ok, 11 rows"
expect_in out "no signed checkpoint in the store"
expect_exit 1 "$SP" check-store --expect "$anchor"
expect_in out "check-store: FAILED: anchor 13:"
expect_in out "(--expect) is not a prefix of the chain: the chain has only 11 rows: rows 12 to 13 were removed from the end"
expect_exit 1 "$SP" check-store --anchors exported.json
expect_in out "(checkpoint 1 in exported.json) is not a prefix of the chain: the chain has only 11 rows: rows 12 to 12 were removed from the end"
expect_exit 1 "$SP" audit r.pdf --ledger "$SCALEPROOF_DB" --trust station.pub.pem --json
expect_in out '"code": "anchor-not-in-store"'
expect_in out "was issued when the ledger held 13 rows with head"
expect_in out "the chain has only 11 rows: rows 12 to 13 were removed from the end"
# The untouched copy contains it: no anchor finding.
setup
expect_exit 0 "$SP" report --session 1 --key station.key --out r2.pdf
"$SP" -q scale add --id ST-9 --division 20 --unit lb
"$SP" audit r2.pdf --ledger "$SCALEPROOF_DB" --trust station.pub.pem >audit.out || true
if grep -q "anchor-not-in-store" audit.out; then fail "an honest store fails the anchor: $(cat audit.out)"; fi
# A report from a bare session file says it has no anchor.
"$SP" export --session 1 -o s1.json >/dev/null
expect_exit 0 "$SP" report s1.json --key station.key --out bare.pdf
pdftotext bare.pdf bare.txt
expect_in bare.txt "none: issued from a session file"
"$SP" audit bare.pdf --ledger "$SCALEPROOF_DB" --trust station.pub.pem --json >audit.out || true
expect_in audit.out '"code": "no-ledger-anchor"'

# 3. Dropped triggers alone: the schema check names them.
setup
sqlite3 "$SCALEPROOF_DB" "DROP TRIGGER passes_no_delete; DROP TRIGGER checkpoints_no_update"
expect_exit 1 "$SP" check-store
expect_in out "check-store: FAILED: schema: trigger checkpoints_no_update is missing"
expect_in out "check-store: FAILED: schema: trigger passes_no_delete is missing"
# An object added behind the tool's back, or a trigger's text changed, is named too.
setup
sqlite3 "$SCALEPROOF_DB" "CREATE VIEW v AS SELECT 1"
expect_exit 1 "$SP" check-store
expect_in out "check-store: FAILED: schema: view v was not made by migrations 1 to 3"

# 4. A forged checkpoint: its signature altered (the chain recomputed so it links).
setup
python3 "$REWRITE" "$SCALEPROOF_DB" "UPDATE checkpoints SET rows = 11 WHERE id = 1" --restore-triggers
expect_exit 1 "$SP" check-store
expect_in out "check-store: FAILED: checkpoint 1 (chain position 13, signed "
expect_in out "the signature does not match the rows and head it states (forged or altered)"
# ... or signed by another key: only --pubkey can tell.
setup
expect_exit 0 "$SP" check-store --sign-checkpoint --key other.key
expect_exit 0 "$SP" check-store
expect_in out "check-store: note: checkpoint keys not compared with the station's (no --pubkey)"
expect_exit 1 "$SP" check-store --pubkey station.pub.pem
expect_in out "check-store: FAILED: checkpoint 2 (chain position 14, signed "
expect_in out "signed by a key that is not the station key given with --pubkey"
# A broken proof signs nothing.
setup
sqlite3 "$SCALEPROOF_DB" "DROP TRIGGER scales_no_update"
expect_exit 1 "$SP" check-store --sign-checkpoint --key station.key
expect_in out "check-store: no checkpoint signed: the proof does not hold"
[ "$(sqlite3 "$SCALEPROOF_DB" 'SELECT count(*) FROM checkpoints')" = 1 ] || fail "signed a broken chain"

# 5. An honest append after a checkpoint and after an anchor passes.
setup
expect_exit 0 "$SP" check-store
old="$(head_of)"
"$SP" -q scale add --id ST-5 --division 20 --unit lb
expect_exit 0 "$SP" check-store --pubkey station.pub.pem --expect "$old"
expect_in out "check-store: ok, 14 rows"
expect_in out "check-store: 1 of 1 signed checkpoint(s) hold; latest: rows 1 to 12"
expect_in out "(--expect) holds: rows 1 to 13 are unchanged"
# The head as a report prints it, in groups of 8 with spaces, is accepted too.
grouped="${old%%:*}:$(echo "${old#*:}" | sed 's/\(........\)/\1 /g')"
expect_exit 0 "$SP" check-store --expect "$grouped"
# --expect-head (deprecated) still compares with today's head only.
expect_exit 1 "$SP" check-store --expect-head "${old#*:}"
expect_in out "is not the expected"
expect_in err "--expect-head is deprecated"
# A malformed anchor is a usage error naming the flag.
expect_exit 2 "$SP" check-store --expect "12"
expect_in err "--expect: expected ROWS:HASH"
echo "store_rewrite_attacks: ok"
