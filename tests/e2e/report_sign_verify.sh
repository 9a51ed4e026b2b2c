# Keys, the signed weigh-report and `verify`, end to end with the real binary, plus the
# stock-tool recipes of reports/VERIFY.md (OpenSSL 3, poppler-utils, qpdf).
source "$SOURCE_DIR/tests/e2e/lib.bash"
SESSION="$SOURCE_DIR/tests/data/sessions/good-lb-three-settings.json"

# key new: two files, private one 0600, fingerprint printed in 4-character groups.
expect_exit 0 "$SCALEPROOF" key new --out station
[ -f station.key ] && [ -f station.pub.pem ] || fail "key files missing"
[ "$(stat -c %a station.key)" = 600 ] || fail "station.key mode is $(stat -c %a station.key), expected 600"
grep -Eq '^fingerprint: ([0-9a-f]{4} ){15}[0-9a-f]{4}$' out || fail "fingerprint line: $(cat out)"
fp_printed="$(sed -n 's/^fingerprint: //p' out | tr -d ' ')"
# Fingerprint = SHA-256 of the raw 32-byte key (the DER tail), as VERIFY.md says.
fp_stock="$(openssl pkey -pubin -in station.pub.pem -outform DER | tail -c 32 | sha256sum | cut -d' ' -f1)"
[ "$fp_printed" = "$fp_stock" ] || fail "fingerprint $fp_printed != stock $fp_stock"
# Refuses to overwrite (73), leaving the key as it was.
cp station.key before.key
expect_exit 73 "$SCALEPROOF" key new --out station
cmp -s station.key before.key || fail "station.key changed"
expect_in err "already exists"

# A private key that group or others can read is refused (65), naming the mode and the fix, as
# ssh does; nothing is written. key new writes 0600 even under umask 000.
for m in 640 644 604 660 666; do
  chmod "$m" station.key
  expect_exit 65 "$SCALEPROOF" report "$SESSION" --key station.key --out loose.pdf
  expect_in err "mode 0$m"
  expect_in err "chmod 600 station.key"
  [ ! -e loose.pdf ] || fail "a refused key still wrote a report (mode $m)"
done
chmod 600 station.key
(umask 000 && "$SCALEPROOF" key new --out umask0 >/dev/null) || fail "key new under umask 000"
[ "$(stat -c %a umask0.key)" = 600 ] || fail "umask 000: key mode $(stat -c %a umask0.key)"

# report: PDF + detached signature; deterministic.
expect_exit 0 "$SCALEPROOF" report "$SESSION" --key station.key --out report.pdf --signed-by "Marit Oddsdottir"
[ -f report.pdf.sig ] || fail "no report.pdf.sig"
[ "$(stat -c %s report.pdf.sig)" = 64 ] || fail "signature is not 64 bytes"
expect_exit 0 "$SCALEPROOF" report "$SESSION" --key station.key --out again.pdf --signed-by "Marit Oddsdottir"
cmp -s report.pdf again.pdf || fail "same input and key gave different PDFs"
cmp -s report.pdf.sig again.pdf.sig || fail "same input and key gave different signatures"
expect_exit 73 "$SCALEPROOF" report "$SESSION" --key station.key --out report.pdf
expect_exit 2 "$SCALEPROOF" report "$SESSION" --key station.key --out x.pdf --issued-at yesterday
[ ! -e x.pdf ] || fail "bad --issued-at left a file"
expect_exit 0 "$SCALEPROOF" report "$SESSION" --key station.key --out letter.pdf --paper letter \
    --issued-at 2026-10-14T10:30:00-05:00

# The PDF is structurally clean and its text is extractable.
qpdf --check report.pdf >qpdf.out 2>&1 || { cat qpdf.out; fail "qpdf --check failed"; }
qpdf --check letter.pdf >qpdf.out 2>&1 || { cat qpdf.out; fail "qpdf --check failed (letter)"; }
pdftotext -layout report.pdf report.txt 2>/dev/null
expect_in report.txt "Tongue load, bars slack"
for t in CJ-40811 CJ-40812 CJ-40813 CJ-40814 CJ-40815; do expect_in report.txt "$t"; done
expect_in report.txt "Cautions"
expect_in report.txt "qualified person"
expect_in report.txt "take precedence"
tongue="$("$SCALEPROOF" reconcile --json "$SESSION" | python3 -c 'import json,sys; print(round(json.load(sys.stdin)["tongue_load"]["value"]))')"
expect_in report.txt "$tongue"

# Fonts: text that fits WinAnsiEncoding uses the compiled-in WinAnsi subsets (simple TrueType
# fonts); a name outside it adds the full face as a UTF-8 (Type0) font, and both extract, as
# does the document info (regression: the info strings lost their UTF-8 encoder once).
pdffonts report.pdf >fonts.txt 2>/dev/null
expect_in fonts.txt "DejaVuSans-WinAnsi"
grep -q "Identity-H" fonts.txt && fail "an all-WinAnsi report embedded a Type0 font: $(cat fonts.txt)"
name="Zoë Ωmega-Łukasz"
expect_exit 0 "$SCALEPROOF" report "$SESSION" --key station.key --out unicode.pdf --signed-by "$name"
pdffonts unicode.pdf >fonts.txt 2>/dev/null
expect_in fonts.txt "Identity-H"
pdftotext -layout unicode.pdf unicode.txt 2>/dev/null
expect_in unicode.txt "$name"
expect_in unicode.txt "Cautions"
pdfinfo unicode.pdf >info.txt 2>/dev/null
expect_in info.txt "$name"
qpdf --check unicode.pdf >qpdf.out 2>&1 || { cat qpdf.out; fail "qpdf --check failed (unicode)"; }
expect_exit 0 "$SCALEPROOF" verify unicode.pdf --pubkey station.pub.pem

# verify: all hold, with and without the station key.
expect_exit 0 "$SCALEPROOF" verify report.pdf --pubkey station.pub.pem
expect_in out "all checks hold"
expect_in out "detached signature:"
expect_exit 0 "$SCALEPROOF" verify report.pdf

# Stock-tool recipes (reports/VERIFY.md).
openssl pkeyutl -verify -pubin -inkey station.pub.pem -rawin -in report.pdf -sigfile report.pdf.sig \
    >ossl.out 2>&1 || { cat ossl.out; fail "openssl recipe (PDF) failed"; }
mkdir detached && (cd detached && pdfdetach -saveall ../report.pdf)
[ -f detached/weigh-record.json ] && [ -f detached/weigh-record.sig ] || fail "pdfdetach found no record"
openssl pkeyutl -verify -pubin -inkey station.pub.pem -rawin -in detached/weigh-record.json \
    -sigfile detached/weigh-record.sig >ossl.out 2>&1 || { cat ossl.out; fail "openssl recipe (record) failed"; }
python3 -c 'import json,sys; r=json.load(open(sys.argv[1])); assert r["format"]=="scaleproof-record/1"' \
    detached/weigh-record.json || fail "record format"

# Another station's key: verify fails (1) naming the checks; openssl refuses too.
expect_exit 0 "$SCALEPROOF" key new --out other
expect_exit 1 "$SCALEPROOF" verify report.pdf --pubkey other.pub.pem
expect_in out "record signature:"
expect_in err "record signature failed"
if openssl pkeyutl -verify -pubin -inkey other.pub.pem -rawin -in report.pdf -sigfile report.pdf.sig >/dev/null 2>&1; then
  fail "openssl accepted the other key"
fi

# A report signed with the other key fails against the station's public key.
expect_exit 0 "$SCALEPROOF" report "$SESSION" --key other.key --out forged.pdf
expect_exit 1 "$SCALEPROOF" verify forged.pdf --pubkey station.pub.pem

# One changed byte: verify fails (the detached signature catches it), and so does openssl.
cp report.pdf bad.pdf && cp report.pdf.sig bad.pdf.sig
printf 'X' | dd of=bad.pdf bs=1 seek=200 conv=notrunc status=none
expect_exit 1 "$SCALEPROOF" verify bad.pdf --pubkey station.pub.pem
expect_in out "detached signature:"

# Not a report: 65. Missing file: 66.
printf 'hello' > plain.pdf
expect_exit 65 "$SCALEPROOF" verify plain.pdf
expect_exit 66 "$SCALEPROOF" verify nowhere.pdf
echo "ok"
