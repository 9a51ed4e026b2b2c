# `report --session N M ... --out-dir DIR`: one process writes one signed report per session,
# each byte-identical to `report --session N --out ...` alone (reference: the single run), all
# recorded in the store; a batch is all or nothing (an existing output, an unknown session or a
# session that fails midway leaves no file and records nothing).
source "$SOURCE_DIR/tests/e2e/lib.bash"
DB="$SCALEPROOF_DB"
python3 "$SOURCE_DIR/bench/gen_data.py" setup --bin "$SCALEPROOF" --db "$DB"
python3 "$SOURCE_DIR/bench/gen_data.py" csv --sessions 6 --out "$WORK/passes.csv"
expect_exit 0 "$SCALEPROOF" import "$WORK/passes.csv"
expect_exit 0 "$SCALEPROOF" key new --out station

mkdir batch single
# The single runs each start from the store as it was before the batch: a report records the
# ledger's head when issued, and each recorded report moves that head.
sqlite3 "$DB" ".backup '$WORK/before-batch.db'"
expect_exit 0 "$SCALEPROOF" report --session 1 2 3 --key station.key --out-dir batch --signed-by "Ilse Varga"
for n in 1 2 3; do
  expect_in out "written to batch/report-$n.pdf (signature batch/report-$n.pdf.sig)"
done
[ "$(grep -c '^signed with key ' out)" = 1 ] || fail "expected one key line: $(cat out)"
cp out batch.out
for n in 1 2 3; do
  # Same file name as the batch gives it (the PDF prints its own name and its .sig's), on the
  # store as it was before the batch (the report carries the ledger anchor).
  cp "$WORK/before-batch.db" "$WORK/single-$n.db"
  expect_exit 0 "$SCALEPROOF" --db "$WORK/single-$n.db" report --session "$n" --key station.key --out "single/report-$n.pdf" --signed-by "Ilse Varga"
  cmp -s "batch/report-$n.pdf" "single/report-$n.pdf" || fail "session $n: batch PDF differs from the single run"
  cmp -s "batch/report-$n.pdf.sig" "single/report-$n.pdf.sig" || fail "session $n: batch signature differs"
  expect_exit 0 "$SCALEPROOF" verify "batch/report-$n.pdf" --pubkey station.pub.pem
  id="$(sed -n "s|^report \(SP-[0-9a-f]*\) written to batch/report-$n.pdf .*|\1|p" batch.out)"
  [ -n "$id" ] || fail "no report id for session $n in: $(cat batch.out)"
  expect_exit 0 "$SCALEPROOF" session show "$n"
  expect_in out "report $id issued"
done

# All or nothing. An output that exists: 73 before anything is written.
mkdir b2
touch b2/report-5.pdf
expect_exit 73 "$SCALEPROOF" report --session 4 5 --key station.key --out-dir b2
expect_in err "b2/report-5.pdf: already exists"
[ "$(ls b2)" = "report-5.pdf" ] || fail "a refused batch wrote: $(ls b2)"
# An unknown session: 66, nothing written.
rm b2/report-5.pdf
expect_exit 66 "$SCALEPROOF" report --session 4 999 --key station.key --out-dir b2
[ -z "$(ls b2)" ] || fail "a batch with an unknown session wrote: $(ls b2)"
# A session the engine refuses, after one that was written: the written one is removed and
# nothing is recorded. Session 7 is planted behind the ledger's back with the stock sqlite3
# shell (an infinite tape uncertainty passes the column's CHECK but not the engine).
sqlite3 "$DB" "INSERT INTO sessions(id, seq, hash, ref, rig_id, scale_id, length_uncertainty, opened_at)
               VALUES (7, 1000000000, zeroblob(32), 'bad-length', 1, 1, 9e999, '2026-01-01T00:00:00Z');"
before="$(sqlite3 "$DB" 'SELECT count(*) FROM issued_reports;')"
expect_exit 65 "$SCALEPROOF" report --session 4 7 --key station.key --out-dir b2
[ -z "$(ls b2)" ] || fail "a failed batch left files: $(ls b2)"
[ "$(sqlite3 "$DB" 'SELECT count(*) FROM issued_reports;')" = "$before" ] || fail "a failed batch recorded reports"

# Usage: several sessions need --out-dir; --out and --out-dir exclude each other; no repeats.
expect_exit 2 "$SCALEPROOF" report --session 4 5 --key station.key --out x.pdf
expect_in err "several sessions need --out-dir"
expect_exit 2 "$SCALEPROOF" report --session 4 --key station.key --out x.pdf --out-dir b2
expect_exit 2 "$SCALEPROOF" report --session 4 4 --key station.key --out-dir b2
expect_in err "session 4 is given twice"
expect_exit 73 "$SCALEPROOF" report --session 4 --key station.key --out-dir no-such-folder
[ ! -e x.pdf ] || fail "a usage error wrote x.pdf"
echo "report_batch: ok"
