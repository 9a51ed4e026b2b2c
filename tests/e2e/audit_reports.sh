#!/usr/bin/env bash
# scaleproof audit of signed weigh-reports (made here with keys made on the spot; no private key
# is committed), of the store (--session N, --all), and the --pdf summary.
source "$SOURCE_DIR/tests/e2e/lib.bash"
C="$TEST_DATA/claims"
CLOCK=2026-12-01T12:00:00Z
CLAIM=2026-11-02
A=(--audit-time $CLOCK --claim-date $CLAIM)

source "$SOURCE_DIR/tests/e2e/audit_lib.bash"

expect_exit 0 "$SCALEPROOF" key new --out station
expect_exit 0 "$SCALEPROOF" key new --out stranger
mkdir -p keys && cp station.pub.pem keys/

# A clean report with its .sig, signed by the trusted station key: no finding.
mkdir -p good
expect_exit 0 "$SCALEPROOF" report "$C/clean/session.json" --key station.key --out good/report.pdf
check "good report" 0 "" good --trust station.pub.pem "${A[@]}"
# The same weighing's session file beside its report is one weighing, not a ticket reuse.
cp "$C/clean/session.json" good/session.json
check "report + its session file" 0 "" good --trust keys "${A[@]}"
# Without any --trust key the origin is unproven: a warning, not an error.
check "no trust list" 0 "key-untrusted" good/report.pdf "${A[@]}"

# A report signed by a key the insurer does not trust.
mkdir -p untrusted
expect_exit 0 "$SCALEPROOF" report "$C/clean/session.json" --key stranger.key --out untrusted/report.pdf
check "untrusted key" 1 "key-untrusted" untrusted --trust station.pub.pem "${A[@]}"
python3 - "$WORK/out" <<'PY' || fail "untrusted evidence"
import json, sys
d = json.load(open(sys.argv[1]))
f = d["items"][0]["findings"][0]
assert f["severity"] == "error" and f["evidence"][0]["name"] == "key fingerprint", f
PY

# An altered PDF: one byte of the file changed outside the embedded record -> file-altered.
mkdir -p altered
cp good/report.pdf good/report.pdf.sig altered/
python3 - altered/report.pdf <<'PY'
import sys
b = bytearray(open(sys.argv[1], "rb").read())
i = b.index(b"/Producer") if b"/Producer" in b else b.index(b"/Type")
b[i + 1] ^= 0x20          # /Type -> /tYPE-like change of one letter's case
open(sys.argv[1], "wb").write(bytes(b))
PY
check "altered pdf" 1 "file-altered" altered --trust station.pub.pem "${A[@]}"

# The embedded record edited (the owner's name, same length): its signature fails too.
mkdir -p forged
cp good/report.pdf good/report.pdf.sig forged/
python3 - forged/report.pdf <<'PY'
import sys
b = open(sys.argv[1], "rb").read()
assert b.count(b"Teodor Vance") >= 1
open(sys.argv[1], "wb").write(b.replace(b"Teodor Vance", b"Teodor Vanse"))
PY
check "forged record" 1 "file-altered signature-invalid" forged --trust station.pub.pem "${A[@]}"

# A report without its .sig: its in-file signature covers the pages, no finding.
mkdir -p nosig && cp good/report.pdf nosig/
check "no detached signature, in-file signature" 0 "" nosig --trust station.pub.pem "${A[@]}"
# A report from before in-file signatures (field type renamed: no signature field is found),
# without its .sig: no signature covers the pages, a warning.
mkdir -p unsigned
python3 - good/report.pdf unsigned/report.pdf <<'PY'
import sys
b = open(sys.argv[1], "rb").read()
assert b.count(b"/FT /Sig") == 1
open(sys.argv[2], "wb").write(b.replace(b"/FT /Sig", b"/FT /Xyz"))
PY
check "pages unsigned" 0 "pages-unsigned" unsigned --trust station.pub.pem "${A[@]}"
# Bytes appended after the signed range (an incremental update): an error naming the offset.
mkdir -p appended && cp good/report.pdf good/report.pdf.sig appended/
size=$(stat -c %s good/report.pdf)
printf '\n%% appended\n' >> appended/report.pdf
check "appended bytes" 1 "signature-incomplete" appended --trust station.pub.pem "${A[@]}"
expect_in "$WORK/out" "from offset $size on"

# The trust file: a report issued inside the key's validity is clean; after its end (key
# rotated), or after its revocation, an error.
{ echo 'format = "scaleproof-trust/1"'; echo; sed -n '/^\[\[key/,$p' <<<"$("$SCALEPROOF" key new --out rot1 --station "Quarry Road Scale" --valid-from 2026-01-01T00:00:00Z)"; } > stations.trust.toml
expect_exit 0 "$SCALEPROOF" key rotate --old rot1 --out rot2 --at 2026-11-01T00:00:00Z --trust stations.trust.toml
cp "$WORK/out" rotated.trust.toml
expect_in rotated.trust.toml 'valid_to = "2026-11-01T00:00:00Z"'
mkdir -p intime late
expect_exit 0 "$SCALEPROOF" report "$C/clean/session.json" --key rot1.key --out intime/report.pdf --issued-at 2026-10-20T09:00:00Z
expect_exit 0 "$SCALEPROOF" report "$C/clean/session.json" --key rot1.key --out late/report.pdf --issued-at 2026-11-20T09:00:00Z
check "issued within the key's validity" 0 "" intime --trust rotated.trust.toml "${A[@]}"
check "issued after the key's end" 1 "key-outside-validity" late --trust rotated.trust.toml "${A[@]}"
expect_exit 0 "$SCALEPROOF" key rotate --old rot1 --out rot3 --at 2026-10-01T00:00:00Z --revoke --trust stations.trust.toml
cp "$WORK/out" revoked.trust.toml
check "issued after revocation" 1 "key-outside-validity" intime --trust revoked.trust.toml "${A[@]}"
expect_in "$WORK/out" "revocation"

# The same weighing as a report in one claim and as a session file in another: reuse.
check "report reused in another claim" 1 "ticket-reuse" good/report.pdf "$C/reuse-a" --trust station.pub.pem "${A[@]}"

# The audit summary PDF: text extractable, valid, not overwritten.
expect_exit 1 "$SCALEPROOF" audit untrusted good --trust station.pub.pem "${A[@]}" --pdf audit.pdf
expect_in "$WORK/out" "Audit summary written to audit.pdf"
qpdf --check audit.pdf >/dev/null || fail "qpdf --check audit.pdf"
pdftotext audit.pdf audit.txt 2>/dev/null
expect_in audit.txt "Claim-file audit"
expect_in audit.txt "key-untrusted"
expect_in audit.txt "does not replace"
expect_exit 73 "$SCALEPROOF" audit good --trust station.pub.pem "${A[@]}" --pdf audit.pdf

# Bad --trust input is named.
echo "not a key" > bad.pub.pem
expect_exit 65 "$SCALEPROOF" audit good --trust bad.pub.pem "${A[@]}"
expect_in "$WORK/err" "bad.pub.pem"

# The store: --session N and --all.
expect_exit 0 "$SCALEPROOF" init
expect_exit 0 "$SCALEPROOF" import "$C/clean/session.json"
# (the store itself refuses off-division readings, so the second session shows a warning)
expect_exit 0 "$SCALEPROOF" import "$C/passes-span/session.json"
check "store --session 1" 0 "" --session 1 "${A[@]}"
# Session 2 repeats session 1's tickets at the same scale: both carry ticket-reuse.
check "store --all" 1 "passes-span ticket-reuse" --all "${A[@]}"
expect_exit 66 "$SCALEPROOF" audit --session 9 "${A[@]}"
echo "audit_reports: ok"
