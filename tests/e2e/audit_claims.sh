#!/usr/bin/env bash
# scaleproof audit over the claim-folder fixtures (tests/data/claims/, generate.py): each folder
# is built to show exactly one finding, the clean one none; each configurable limit at its
# boundary; ticket-reuse across two claims; a folder mixing good and bad items; unreadable
# inputs named with exit 65.
source "$SOURCE_DIR/tests/e2e/lib.bash"
C="$TEST_DATA/claims"
CLOCK=2026-12-01T12:00:00Z
CLAIM=2026-11-02

source "$SOURCE_DIR/tests/e2e/audit_lib.bash"

# One finding per folder (the rule's source is in generate.py and in src/audit/*.cpp).
while read -r name exit_code want clock claim; do
  [ -z "$name" ] && continue
  [ "$want" = "-" ] && want=""
  check "$name" "$exit_code" "$want" "$C/$name" --audit-time "${clock:-$CLOCK}" --claim-date "${claim:-$CLAIM}"
done <<'TABLE'
clean                0 -
off-division         1 off-division
gross-mismatch       1 gross-mismatch
mixed-scale          1 mixed-scale
passes-span          0 passes-span
future-time          1 future-time            2026-10-14T15:25:00Z
stale-weighing       0 stale-weighing         2026-12-01T12:00:00Z 2027-06-01
duplicate-pass       1 duplicate-pass
inspection-lapsed    0 inspection-lapsed
division-implausible 0 division-implausible
weight-drift         1 weight-drift
geometry-mismatch    1 geometry-mismatch
over-restored        0 over-restored
compliance-over      1 compliance-over
compliance-undecided 0 compliance-undecided
TABLE

# Limits at their boundaries: exactly at the limit no finding, one unit past a finding.
# passes-span: the fixture spans 61 min (09:12 to 10:13).
check "span 61 = limit" 0 "" "$C/passes-span" --audit-time $CLOCK --claim-date $CLAIM --max-span-minutes 61
check "span 61 > 60" 0 "passes-span" "$C/passes-span" --audit-time $CLOCK --claim-date $CLAIM --max-span-minutes 60
# stale-days: weighed 2026-10-14; 2027-06-01 is 230 days later (Python datetime).
check "stale 230 = limit" 0 "" "$C/stale-weighing" --audit-time $CLOCK --claim-date 2027-06-01 --stale-days 230
check "stale 230 > 229" 0 "stale-weighing" "$C/stale-weighing" --audit-time $CLOCK --claim-date 2027-06-01 --stale-days 229
# inspection-months: inspected 2025-10-13, weighed 2026-10-14: 12 months + 1 day; 13 is enough.
check "inspection 13 months" 0 "" "$C/inspection-lapsed" --audit-time $CLOCK --claim-date $CLAIM --inspection-months 13
check "inspection 12 months" 0 "inspection-lapsed" "$C/inspection-lapsed" --audit-time $CLOCK --claim-date $CLAIM --inspection-months 12
# The clean weighing was inspected 2026-05-06, 5 months and 8 days before: 5 months is too short.
check "inspection 6 months" 0 "" "$C/clean" --audit-time $CLOCK --claim-date $CLAIM --inspection-months 6
check "inspection 5 months" 0 "inspection-lapsed" "$C/clean" --audit-time $CLOCK --claim-date $CLAIM --inspection-months 5

# The inspection finding says that jurisdictions differ.
expect_exit 0 "$SCALEPROOF" audit "$C/inspection-lapsed" --audit-time $CLOCK --claim-date $CLAIM
expect_in "$WORK/out" "inspection-lapsed"
expect_in "$WORK/out" "jurisdictions"
expect_in "$WORK/out" "does not replace"

# ticket-reuse: the same weighing filed in two claims, audited together.
check "reuse across claims" 1 "ticket-reuse" "$C/reuse-a" "$C/reuse-b" --audit-time $CLOCK --claim-date $CLAIM
python3 - "$WORK/out" <<'PY' || fail "ticket-reuse evidence"
import json, sys
d = json.load(open(sys.argv[1]))
assert d["summary"]["items"] == 2 and d["summary"]["errors"] == 2, d["summary"]
for item in d["items"]:
    [f] = item["findings"]          # one finding per pair of items, listing every ticket
    assert f["evidence"][0]["text"] == "HF-5101, HF-5102, HF-5103, HF-5104", f
    other = "reuse-b" if "reuse-a" in item["source"] else "reuse-a"
    assert other in f["message"], f
PY
# Each claim alone is clean.
check "reuse-a alone" 0 "" "$C/reuse-a" --audit-time $CLOCK --claim-date $CLAIM

# A folder mixing good and bad items: both are listed, worst first; exit 1.
mkdir -p mixed
cp "$C/clean/session.json" mixed/a-clean.json
cp "$C/off-division/session.json" mixed/b-off-division.json
python3 - mixed/b-off-division.json <<'PY'
import json, sys
d = json.load(open(sys.argv[1]))
for p in d["passes"]:
    p["ticket"] = p["ticket"].replace("HF-51", "HF-61")   # its own tickets: no reuse
json.dump(d, open(sys.argv[1], "w"), indent=2)
PY
echo "photo of the rig" > mixed/photo.txt
check "mixed folder" 1 "off-division" mixed --audit-time $CLOCK --claim-date $CLAIM
python3 - "$WORK/out" <<'PY' || fail "mixed folder order"
import json, sys
d = json.load(open(sys.argv[1]))
assert [i["source"].split("/")[-1] for i in d["items"]] == ["b-off-division.json", "a-clean.json"], d["items"]
assert d["items"][0]["worst"] == "error" and d["items"][1]["worst"] is None
assert d["summary"] == {"items": 2, "errors": 1, "warnings": 0, "notes": 0, "clean": 1, "unreadable": 0}, d["summary"]
PY
expect_in "$WORK/err" "skipped mixed/photo.txt"

# Text output: grouped by item with the evidence and the rule.
expect_exit 1 "$SCALEPROOF" audit mixed --audit-time $CLOCK --claim-date $CLAIM
expect_in "$WORK/out" "== mixed/b-off-division.json (session)"
expect_in "$WORK/out" "evidence: reading 3345 lb; division 20 lb"
expect_in "$WORK/out" "rule: "
expect_in "$WORK/out" "No findings (1):"

# Unreadable inputs: each named, exit 65, the readable ones still audited.
mkdir -p broken
cp "$C/clean/session.json" broken/good.json
echo '{"format": "scaleproof-session/1", "units": 7}' > broken/bad.json
echo "not a pdf" > broken/fake.pdf
expect_exit 65 "$SCALEPROOF" audit broken missing-folder --audit-time $CLOCK --claim-date $CLAIM
expect_in "$WORK/err" "broken/bad.json"
expect_in "$WORK/err" "broken/fake.pdf"
expect_in "$WORK/err" "missing-folder: no such file or folder"
expect_in "$WORK/out" "Could not read 3 inputs"
expect_in "$WORK/out" "No findings (1):"

# Usage errors.
expect_exit 2 "$SCALEPROOF" audit
expect_exit 2 "$SCALEPROOF" audit "$C/clean" --claim-date 2026-13-01
expect_exit 2 "$SCALEPROOF" audit "$C/clean" --all
echo "audit_claims: ok"
