# Two operators' processes log 500 passes each into one store at the same time: all 1000
# rows arrive and the chain is intact (BEGIN IMMEDIATE + busy timeout serialise the writers).
source "$SOURCE_DIR/tests/e2e/lib.bash"
SP="$SCALEPROOF"
"$SP" -q init >/dev/null
"$SP" -q scale add --id ST-3 --division 20 --unit lb
"$SP" -q rig add --file "$TEST_DATA/csv/rig.toml"
"$SP" -q session open --rig heron-wren --scale ST-3 >/dev/null
"$SP" -q session open --rig heron-wren --scale ST-3 >/dev/null
writer() {  # session, ticket prefix
  for i in $(seq 1 500); do
    "$SP" -q pass add --session "$1" --kind unhitched --ticket "$2-$i" \
      --weighed-at 2026-11-03T09:14:00-06:00 --steer 4600 --drive 3900 >/dev/null \
      || { echo "writer $2 failed at $i" >&2; return 1; }
  done
}
writer 1 A & p1=$!
writer 2 B & p2=$!
wait $p1 || fail "writer A"
wait $p2 || fail "writer B"
n="$(sqlite3 "$SCALEPROOF_DB" 'SELECT count(*) FROM passes')"
[ "$n" = "1000" ] || fail "expected 1000 passes, got $n"
expect_exit 0 "$SP" check-store
expect_in out "check-store: ok"
[ "$(sqlite3 "$SCALEPROOF_DB" 'PRAGMA integrity_check')" = "ok" ] || fail "integrity_check"
echo "store_concurrent: ok"
