#!/usr/bin/env bash
# `scaleproof demo`: builds the whole invented scenario in a fresh folder, names the two
# planted errors, writes reports that verify (with scaleproof and with stock openssl), audits
# them, and refuses to reuse a folder that is not empty.
source "$SOURCE_DIR/tests/e2e/lib.bash"

expect_exit 0 "$SCALEPROOF" demo --out "$WORK/d"
for want in "1. scenario files" "2. ticket store" "3. station key" "4. reconciled and signed" \
            "5. verified" "6. audit" "store hash chain intact" "Open first:" "Then try:"; do
  expect_in "$WORK/out" "$want"
done
# The planted errors are named where they were planted (data-demo/demo.json "expect").
grep -E "03-mis-keyed-reading.json .*inconsistent-reading \(QX-4390 drive\)" "$WORK/out" >/dev/null \
  || fail "the mis-keyed reading QX-4390 drive was not named"
grep -E "04-wrong-tape-length.json .*geometry-mismatch \(ball_to_axle\)" "$WORK/out" >/dev/null \
  || fail "the wrong ball-to-axle length was not named"
grep -E "01-pickup-travel-trailer.json .*fit passed" "$WORK/out" >/dev/null || fail "the clean session did not pass its fit"

# What it wrote.
for f in store.db keys/station.key keys/station.pub.pem keys/insurer.trust.toml audit.txt audit-summary.pdf \
         data-demo/demo.json data-demo/passes/05-return-visit.csv; do
  [ -s "$WORK/d/$f" ] || fail "demo did not write $f"
done
[ "$(stat -c %a "$WORK/d/keys/station.key")" = 600 ] || fail "private key is not mode 0600"
n=$(ls "$WORK/d/reports/"*.pdf | wc -l)
[ "$n" = 6 ] || fail "expected 6 reports, got $n"

# Every report verifies with scaleproof and with the stock openssl recipe (issue #4).
for pdf in "$WORK/d/reports/"*.pdf; do
  expect_exit 0 "$SCALEPROOF" verify "$pdf" --pubkey "$WORK/d/keys/station.pub.pem"
  openssl pkeyutl -verify -pubin -inkey "$WORK/d/keys/station.pub.pem" -rawin -in "$pdf" \
    -sigfile "$pdf.sig" >/dev/null || fail "openssl does not verify $pdf"
done
# The store it built is intact and lists the five sessions.
expect_exit 0 "$SCALEPROOF" --db "$WORK/d/store.db" check-store
expect_exit 0 "$SCALEPROOF" --db "$WORK/d/store.db" session list
[ "$(grep -c "QX-1" "$WORK/out")" -ge 5 ] || fail "session list: $(cat "$WORK/out")"
# The audit found the planted errors and the overloaded rear axle of the fifth-wheel truck.
for want in inconsistent-reading geometry-mismatch rear_gawr; do expect_in "$WORK/d/audit.txt" "$want"; done
# The audit trusts the station's key through the insurer's trust file (issue 15): the file names
# the station and the key's validity, and a report verifies against it with its bounds shown.
expect_in "$WORK/d/keys/insurer.trust.toml" 'format = "scaleproof-trust/1"'
expect_in "$WORK/d/keys/insurer.trust.toml" 'station = "Quillmere Crossing Public Scale"'
expect_exit 0 "$SCALEPROOF" verify "$WORK/d/reports/report-1-RA-1.pdf" --trust "$WORK/d/keys/insurer.trust.toml"
expect_in "$WORK/out" "station key:        ok - the key of Quillmere Crossing Public Scale"

# A folder that is not empty is refused (73) and left as it was.
before=$(find "$WORK/d" -type f | sort | xargs sha256sum | sha256sum)
expect_exit 73 "$SCALEPROOF" demo --out "$WORK/d"
expect_in "$WORK/err" "not empty"
after=$(find "$WORK/d" -type f | sort | xargs sha256sum | sha256sum)
[ "$before" = "$after" ] || fail "a refused demo changed the folder"

# --quiet prints nothing on success.
expect_exit 0 "$SCALEPROOF" --quiet demo --out "$WORK/q"
[ ! -s "$WORK/out" ] || fail "--quiet demo printed: $(cat "$WORK/out")"
echo "demo_run: ok"
