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
mkdir again  # the PDF names itself, so the same name in another folder
expect_exit 0 "$SCALEPROOF" report "$SESSION" --key station.key --out again/report.pdf --signed-by "Marit Oddsdottir"
cmp -s report.pdf again/report.pdf || fail "same input and key gave different PDFs"
cmp -s report.pdf.sig again/report.pdf.sig || fail "same input and key gave different signatures"
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
# Its UTF-8 font's ToUnicode CMap is valid (issue 12: poppler warned "Invalid 'begincidrange'").
pdftotext -layout unicode.pdf unicode.txt 2>unicode.err
[ ! -s unicode.err ] || fail "pdftotext warned on the UTF-8 font: $(sort -u unicode.err)"
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
python3 -c 'import json,sys; r=json.load(open(sys.argv[1])); assert r["format"]=="scaleproof-record/2"' \
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

# The single PDF, no companion file: its in-file signature covers the pages (verify), and
# stock OpenSSL checks it by the recipe of reports/VERIFY.md ("With stock tools only").
mkdir single && cp report.pdf single/report.pdf && cp station.pub.pem single/STATION.pub.pem
expect_exit 0 "$SCALEPROOF" verify single/report.pdf --pubkey station.pub.pem
expect_in out "all checks hold: the printed pages and the weigh record are as the station key signed them"
expect_in out "printed pages: covered by the in-file signature"
(
  cd single
  set -- $(grep -a -o '/ByteRange *\[[ 0-9]*\]' report.pdf | tr -dc '0-9 ')
  head -c "$2" report.pdf > signed.bin
  tail -c +"$(($3 + 1))" report.pdf | head -c "$4" >> signed.bin
  tail -c +"$(($2 + 2))" report.pdf | head -c "$(($3 - $2 - 2))" | xxd -r -p > padded.der
  set -- $(openssl asn1parse -inform DER -in padded.der | head -1 | tr -c '0-9\n' ' ')
  head -c "$(($3 + $4))" padded.der > sig.der
  # OpenSSL's own CMS verification: the signed message digest is the SHA-512 of the signed bytes.
  openssl cms -verify -binary -inform DER -in sig.der -content signed.bin -noverify -no_attr_verify \
      -signer signer.pem -out /dev/null 2>cms.err || { cat cms.err; exit 1; }
  grep -q "Verification successful" cms.err
  openssl x509 -in signer.pem -pubkey -noout | cmp -s - STATION.pub.pem
  # The Ed25519 signature over the signed attributes (RFC 5652 §5.4), which OpenSSL 3.0's
  # `cms -verify` cannot check itself (it hands Ed25519 a digest name and fails).
  openssl asn1parse -inform DER -in sig.der > sig.txt
  set -- $(grep 'cont \[ 0 \]' sig.txt | tail -1 | tr -c '0-9\n' ' ')
  { printf '\061'; tail -c +"$(($1 + 2))" sig.der | head -c "$(($3 + $4 - 1))"; } > attrs.der
  tail -1 sig.txt | sed 's/.*://' | xxd -r -p > attrs.sig
  openssl pkeyutl -verify -pubin -inkey STATION.pub.pem -rawin -in attrs.der -sigfile attrs.sig
  # A changed byte inside the signed range: OpenSSL's digest check fails.
  printf 'X' | dd of=signed.bin bs=1 seek=100 conv=notrunc status=none
  if openssl cms -verify -binary -inform DER -in sig.der -content signed.bin -noverify -no_attr_verify \
      -out /dev/null 2>/dev/null; then exit 1; fi
) >stock.out 2>&1 || { cat stock.out; fail "stock OpenSSL check of the in-file signature failed"; }
expect_in stock.out "Signature Verified Successfully"
# Full `openssl cms -verify` on OpenSSL 3.0 stops at the Ed25519 signature (see above): if a
# later OpenSSL verifies it, so much the better; it must never accept a changed file.
# poppler's pdfsig reads the signature (field, signer, SHA-512, ranges, whole document); its
# NSS back end does not check Ed25519 (reports/VERIFY.md says what it prints).
if command -v pdfsig >/dev/null; then
  pdfsig single/report.pdf >pdfsig.out 2>&1 || true
  expect_in pdfsig.out "Signature Field Name: station signature"
  expect_in pdfsig.out "Signing Hash Algorithm: SHA-512"
  expect_in pdfsig.out "Total document signed"
fi

# Any valid arrangement of the report reads (issue 16 item 5): qpdf rewrites with object
# streams, in QDF form, and with streams compressed are still the station's report (the
# record signature holds), but their bytes changed, so the pages do not verify: exit 1, named.
for mode in "--object-streams=generate" "--qdf" "--compress-streams=y --recompress-flate" "--linearize"; do
  qpdf $mode report.pdf rewritten.pdf
  expect_exit 1 "$SCALEPROOF" verify rewritten.pdf --pubkey station.pub.pem
  expect_in out "record signature:   ok"
  expect_in out "in-file signature:  FAILED"
  expect_in out "VERIFICATION FAILED: in-file signature"
done
# Without --pubkey the verdict says the origin was not checked.
expect_exit 0 "$SCALEPROOF" verify single/report.pdf
expect_in out "all checks hold, but the origin was not checked"

# Tampered files, each with its exit code and the line it prints.
cp report.pdf base.pdf
tamper() {  # NAME EXIT LINE: verify NAME.pdf (its .sig only if present)
  expect_exit "$2" "$SCALEPROOF" verify "$1.pdf" --pubkey station.pub.pem
  expect_in out "$3"
}
cp base.pdf appended.pdf && printf '\n%% appended\n' >> appended.pdf
tamper appended 1 "were added after signing (an incremental update or appended data)"
python3 - base.pdf update.pdf <<'PY'
import sys
# An incremental update (ISO 32000-1 §7.5.6) redefining page 1's content stream object.
b = open(sys.argv[1], "rb").read()
import re
page_content = b'BT /F1 24 Tf 72 700 Td (WITHIN ALL RATINGS) Tj ET'
n = int(re.search(rb"/Contents (\d+) 0 R", b).group(1))          # page 1's content stream
root = re.search(rb"/Root (\d+ \d+ R)", b).group(1)
start = len(b)
obj = b"\n%d 0 obj\n<< /Length %d >>\nstream\n%s\nendstream\nendobj\n" % (n, len(page_content), page_content)
prev = int(b[b.rindex(b"startxref") + 9:].split()[0])
xref = b"xref\n%d 1\n%010d 00000 n \ntrailer\n<< /Size 9999 /Root %s /Prev %d >>\nstartxref\n%d\n%%%%EOF\n" % (n, start + 1, root, prev, start + len(obj))
open(sys.argv[2], "wb").write(b + obj + xref)
PY
tamper update 1 "were added after signing"
expect_exit 0 "$SCALEPROOF" report "$SESSION" --key other.key --out otherkey.pdf --signed-by "Marit Oddsdottir"
python3 - base.pdf otherkey.pdf swapped.pdf <<'PY'
import sys, re
a = open(sys.argv[1], "rb").read(); o = open(sys.argv[2], "rb").read()
# The other key's record and record signature put in place of ours (same lengths).

ra = a[a.index(b'{"format":"scaleproof-record/2"'):]; ra = ra[:ra.index(b"\nendstream")]
ro = o[o.index(b'{"format":"scaleproof-record/2"'):]; ro = ro[:ro.index(b"\nendstream")]
assert len(ra) == len(ro)
open(sys.argv[3], "wb").write(a.replace(ra, ro))
PY
tamper swapped 1 "in-file signature:  FAILED - the signed bytes changed after signing"
cp base.pdf nosig.pdf
tamper nosig 0 "printed pages: covered by the in-file signature"
head -c 30000 base.pdf > truncated.pdf
expect_exit 65 "$SCALEPROOF" verify truncated.pdf --pubkey station.pub.pem
expect_in err "truncated.pdf: not a readable PDF"
python3 - base.pdf shorter.pdf <<'PY'
import sys, re
b = open(sys.argv[1], "rb").read()
m = re.search(rb"/ByteRange \[ 0 (\d+) (\d+) (\d+)( *)\]", b)
new = b"[ 0 %s %s %d" % (m.group(1), m.group(2), int(m.group(3)) - 100)
old = m.group(0)[len(b"/ByteRange "):-1]
open(sys.argv[2], "wb").write(b.replace(old, new.ljust(len(old))))
PY
tamper shorter 1 "does not hold even over them"
# Neither signature: PAGES NOT VERIFIED (1); --record-only asks for the record check (0).
python3 -c 'import sys; b=open(sys.argv[1],"rb").read(); open(sys.argv[2],"wb").write(b.replace(b"/FT /Sig", b"/FT /Xyz"))' base.pdf unsigned.pdf
tamper unsigned 1 "PAGES NOT VERIFIED: no signature covers the printed pages"
expect_in err "the printed pages were not verified"
expect_exit 0 "$SCALEPROOF" verify unsigned.pdf --pubkey station.pub.pem --record-only
expect_in out "record checks hold (--record-only: the printed pages were not checked)"

# verify --trust: a trust file or a bare key.
{ echo 'format = "scaleproof-trust/1"'; echo '[[key]]'; echo "fingerprint = \"$fp_printed\""; echo 'station = "Test Station"'; echo 'valid_from = "2026-01-01T00:00:00Z"'; } > t.toml
expect_exit 0 "$SCALEPROOF" verify report.pdf --trust t.toml
expect_in out "station key:        ok - the key of Test Station (t.toml)"
expect_exit 0 "$SCALEPROOF" verify report.pdf --trust station.pub.pem
expect_exit 1 "$SCALEPROOF" verify report.pdf --trust other.pub.pem
expect_in out "is not in the trust list"
echo 'valid_until = "2027-01-01T00:00:00Z"' >> t.toml
expect_exit 65 "$SCALEPROOF" verify report.pdf --trust t.toml
expect_in err "unknown key 'valid_until'"

# Not a report: 65. Missing file: 66.
printf 'hello' > plain.pdf
expect_exit 65 "$SCALEPROOF" verify plain.pdf
expect_exit 66 "$SCALEPROOF" verify nowhere.pdf
echo "ok"
