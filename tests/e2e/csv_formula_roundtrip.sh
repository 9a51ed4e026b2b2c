#!/usr/bin/env bash
# CSV export is spreadsheet-safe and lossless (issue 16; docs/csv.md): text cells that start
# with = + - @ are written as "'=...", a cell with a stored leading quote keeps it, and importing
# the export into a fresh store and exporting again gives the same bytes and the same texts.
# Guard from OWASP "CSV Injection" (from memory).
source "$SOURCE_DIR/tests/e2e/lib.bash"
BASE="$SOURCE_DIR/tests/fuzz/corpus/session_json/valid_1.json"

expect_exit 0 "$SCALEPROOF" init
expect_exit 0 "$SCALEPROOF" import "$BASE"  # scale ST-1 and rig 1
cat >"$WORK/in.csv" <<'CSV'
session,scale,rig,operator,kind,setting,ticket,weighed_at,steer,drive,trailer,gross,entered_by,void_reason
"=HYPERLINK(""http://example.invalid"",""x"")",ST-1,1,@ops,unhitched,,-T1,2026-01-01T09:00:00-05:00,4460,4000,,8460,+clerk,
"=HYPERLINK(""http://example.invalid"",""x"")",,,,hitched,,'Bert,2026-01-01T09:06:00-05:00,4260,4860,4560,13680,"'=typed",
"=HYPERLINK(""http://example.invalid"",""x"")",,,,tensioned,-3,T3,2026-01-01T09:12:00-05:00,4340,4720,4600,13660,"''=x",=void
CSV
expect_exit 0 "$SCALEPROOF" import "$WORK/in.csv"
sid="$(sqlite3 "$SCALEPROOF_DB" "SELECT id FROM sessions WHERE ref LIKE '=HYPERLINK%'")"
[ -n "$sid" ] || fail "the session key was not stored as written"
expect_exit 0 "$SCALEPROOF" export --session "$sid" --format csv
cp "$WORK/out" "$WORK/first.csv"
cat "$WORK/first.csv"
# Every text cell a spreadsheet would evaluate is guarded; no cell starts with a trigger.
q="'"
for cell in "\"${q}=HYPERLINK(\"\"http://example.invalid\"\",\"\"x\"\")\"" "\"${q}@ops\"" \
  "\"${q}-T1\"" "\"${q}+clerk\"" "\"${q}=typed\"" "\"${q}${q}=x\"" "\"${q}-3\"" "\"${q}=void\"" \
  ",${q}Bert,"; do
  grep -qF -- "$cell" "$WORK/first.csv" || fail "export lacks the cell $cell"
done
if grep -qE '(^|,)[=+@-]' "$WORK/first.csv"; then fail "a cell starts with a formula character"; fi
# Stored texts are what the file meant: '=typed is =typed, ''=x is '=x, 'Bert is 'Bert.
[ "$(sqlite3 "$SCALEPROOF_DB" "SELECT entered_by FROM passes WHERE ticket = '''Bert'")" = "=typed" ] ||
  fail "'=typed was not read as =typed (or 'Bert lost its quote)"
[ "$(sqlite3 "$SCALEPROOF_DB" "SELECT entered_by FROM passes WHERE ticket = 'T3'")" = "'=x" ] ||
  fail "''=x was not read as '=x"
# Import the export into a fresh store and export again: the same bytes.
export SCALEPROOF_DB="$WORK/second.db"
expect_exit 0 "$SCALEPROOF" init
expect_exit 0 "$SCALEPROOF" import "$BASE"
expect_exit 0 "$SCALEPROOF" import "$WORK/first.csv"
sid2="$(sqlite3 "$SCALEPROOF_DB" "SELECT id FROM sessions WHERE ref LIKE '=HYPERLINK%'")"
expect_exit 0 "$SCALEPROOF" export --session "$sid2" --format csv
diff "$WORK/first.csv" "$WORK/out" || fail "export -> import -> export changed the file"
echo "ok: formula-like cells guarded on export and read back losslessly"
