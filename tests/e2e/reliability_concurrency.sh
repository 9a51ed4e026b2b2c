#!/usr/bin/env bash
# Concurrency: four processes log passes at once (three `pass add` loops and one loop of small
# CSV imports, into two shared sessions and sessions of their own); afterwards nothing is
# lost (every acknowledged pass is stored exactly once, no other pass is), no writer failed
# or gave up busy, `check-store` passes and `PRAGMA integrity_check` is ok.
# The interleaving is up to the scheduler; RELIABILITY_SEED=N fixes the per-writer pauses.
source "$SOURCE_DIR/tests/e2e/lib.bash"
seed="${RELIABILITY_SEED:-$(( $(date +%s) % 100000 ))}"
echo "reliability_concurrency: seed $seed (rerun with RELIABILITY_SEED=$seed)"
PER="${RELIABILITY_PER_WRITER:-150}"
DB="$SCALEPROOF_DB"
python3 "$SOURCE_DIR/bench/gen_data.py" setup --bin "$SCALEPROOF" --db "$DB"
expect_exit 0 "$SCALEPROOF" session open --rig R-1 --scale ST-1 --ref shared-a
expect_exit 0 "$SCALEPROOF" session open --rig R-2 --scale ST-1 --ref shared-b
sql() { sqlite3 -cmd '.timeout 5000' "$DB" "$1"; }
sa=$(sql "SELECT id FROM sessions WHERE ref = 'shared-a';")
sb=$(sql "SELECT id FROM sessions WHERE ref = 'shared-b';")

# writer W: PER passes, alternately into the two shared sessions; logs each acknowledged one.
adder() {
  local w="$1" k sid
  RANDOM=$((seed + w))
  for k in $(seq 1 "$PER"); do
    if (( k % 2 )); then sid=$sa; else sid=$sb; fi
    "$SCALEPROOF" pass add --session "$sid" --kind tensioned --setting "$((k % 5))" \
      --ticket "W$w-$k" --weighed-at 2026-02-01T10:00:00-05:00 \
      --steer 4020 --drive 4700 --trailer 8220 </dev/null >/dev/null 2>"$WORK/w$w.err" ||
      { echo "writer $w pass $k: exit $?: $(cat "$WORK/w$w.err")" >>"$WORK/failures"; return; }
    echo "W$w-$k" >>"$WORK/acked.$w"
    (( RANDOM % 8 )) || sleep 0.01
  done
}
# writer 4: PER/4 imports of 4 passes each, every one a new session of its own.
importer() {
  local k
  for k in $(seq 1 $((PER / 4))); do
    printf 'session,scale,rig,kind,setting,ticket,weighed_at,steer,drive,trailer\n' >"$WORK/c$k.csv"
    printf 'C-%d,ST-1,R-3,unhitched,,X%d-1,2026-02-01T09:00:00-05:00,4180,3620,\n' "$k" "$k" >>"$WORK/c$k.csv"
    printf 'C-%d,ST-1,R-3,hitched,,X%d-2,2026-02-01T09:05:00-05:00,3880,4960,8120\n' "$k" "$k" >>"$WORK/c$k.csv"
    printf 'C-%d,ST-1,R-3,tensioned,3,X%d-3,2026-02-01T09:10:00-05:00,4020,4700,8220\n' "$k" "$k" >>"$WORK/c$k.csv"
    printf 'C-%d,ST-1,R-3,tensioned,4,X%d-4,2026-02-01T09:15:00-05:00,4060,4640,8240\n' "$k" "$k" >>"$WORK/c$k.csv"
    "$SCALEPROOF" import "$WORK/c$k.csv" >/dev/null 2>"$WORK/imp.err" ||
      { echo "importer file $k: exit $?: $(cat "$WORK/imp.err")" >>"$WORK/failures"; return; }
    for j in 1 2 3 4; do echo "X$k-$j" >>"$WORK/acked.4"; done
  done
}
t0=$(date +%s)
adder 1 & adder 2 & adder 3 & importer &
wait
echo "four writers done in $(( $(date +%s) - t0 )) s"
if [ -s "$WORK/failures" ]; then cat "$WORK/failures"; fail "a writer failed"; fi

cat "$WORK"/acked.* | sort >"$WORK/acked"
sql "SELECT ticket FROM passes;" | sort >"$WORK/stored"
want=$((3 * PER + 4 * (PER / 4)))
[ "$(wc -l <"$WORK/acked")" = "$want" ] || fail "expected $want acknowledged passes, got $(wc -l <"$WORK/acked")"
diff "$WORK/acked" "$WORK/stored" >"$WORK/diff" || { head "$WORK/diff"; fail "stored passes differ from acknowledged ones"; }
[ -z "$(uniq -d "$WORK/stored")" ] || fail "a ticket is stored twice"
expect_exit 0 "$SCALEPROOF" check-store
echo "check-store: $(cat "$WORK/out")"
[ "$(sqlite3 "$DB" 'PRAGMA integrity_check;')" = ok ] || fail "integrity_check is not ok"
echo "ok: $want passes from four concurrent writers, none lost, chain intact"
