# `scaleproof serve` end to end: the real binary on a free loopback port (PORT 0) over the
# demo store, a few /api/ calls with curl (a pass stored, a refusal naming the field, a
# duplicate ticket, an unknown session), SIGINT, a clean exit 0, and check-store clean after.
# Also: a non-loopback address refuses to start without --operators; `operator add`.
source "$SOURCE_DIR/tests/e2e/lib.bash"
SP="$SCALEPROOF"
command -v curl >/dev/null || fail "curl is needed (scripts/setup-debian installs it)"

expect_exit 0 "$SP" demo --out "$WORK/d"
DB="$WORK/d/store.db"

# Reachable from other machines: refused without --operators (usage, 2), naming the flag.
expect_exit 2 "$SP" serve --db "$DB" --listen 0.0.0.0:0
expect_in err "--operators"
expect_exit 2 "$SP" serve --db "$DB" --listen nonsense
expect_in err "--listen"

# Operators: the password from stdin, a salted PBKDF2 hash in the file, a name only once.
echo "correct horse" | "$SP" operator add --file "$WORK/ops" --name "Ines Varga" >/dev/null
grep -q '^Ines Varga:pbkdf2-sha256:600000:[0-9a-f]\{32\}:[0-9a-f]\{64\}$' "$WORK/ops" ||
  fail "operators file line: $(cat "$WORK/ops")"
grep -q "correct horse" "$WORK/ops" && fail "the password is in the file"
echo "x" > "$WORK/pw"
expect_exit 65 "$SP" operator add --file "$WORK/ops" --name "Ines Varga" < "$WORK/pw"
expect_in err "already there"

"$SP" serve --db "$DB" --key "$WORK/d/keys/station.key" --listen 127.0.0.1:0 \
  >"$WORK/serve.out" 2>"$WORK/serve.err" &
PID=$!
for _ in $(seq 1 100); do
  [ -s "$WORK/serve.out" ] && break
  sleep 0.05
done
LINE="$(head -n 1 "$WORK/serve.out")"
case "$LINE" in
  "scaleproof console: http://127.0.0.1:"*/) ;;
  *) kill "$PID"; fail "start-up line: '$LINE' (stderr: $(cat "$WORK/serve.err"))" ;;
esac
URL="${LINE#scaleproof console: }"

# call METHOD PATH [JSON]: body to $WORK/body, status to $WORK/status.
call() {
  local args=(-s -o "$WORK/body" -w '%{http_code}' -X "$1")
  [ $# -ge 3 ] && args+=(-H 'Content-Type: application/json' --data-binary "$3")
  curl "${args[@]}" "${URL}api$2" >"$WORK/status"
}
expect_status() {
  [ "$(cat "$WORK/status")" = "$1" ] || { cat "$WORK/body"; kill "$PID"; fail "expected HTTP $1, got $(cat "$WORK/status")"; }
}

call GET /sessions
expect_status 200
expect_in "$WORK/body" '"verdict"'
call POST /sessions '{"rig":"RA-1","scale":"QX-1","label":"E2E-1"}'
expect_status 201
SID="$(python3 -c 'import json,sys; print(json.load(open(sys.argv[1]))["id"])' "$WORK/body")"
P='"kind":"unhitched","ticket":"E2E-1","weighed_at":"2026-12-04T09:00:00Z","steer":3480'
call POST "/sessions/$SID/passes" "{$P,\"drive\":\"27x0\"}"
expect_status 400
expect_in "$WORK/body" '"field":"drive"'
expect_in "$WORK/body" 'expected a number'
call POST "/sessions/$SID/passes" "{$P,\"drive\":2700}"
expect_status 201
call POST "/sessions/$SID/passes" "{$P,\"drive\":2700}"
expect_status 409
call GET /sessions/999
expect_status 404
call GET "/sessions/$SID"
expect_status 200
head -c 20 "$WORK/body" | grep -q '"verdict"' || fail "the result does not lead with the verdict"
call GET /ledger
expect_status 200
# A form post without the token is refused; the headers are there.
curl -s -D "$WORK/headers" -o /dev/null "${URL}sessions"
expect_in "$WORK/headers" "Content-Security-Policy: default-src 'self'"
expect_in "$WORK/headers" "X-Content-Type-Options: nosniff"
code="$(curl -s -o /dev/null -w '%{http_code}' -d 'reason=x' "${URL}sessions/$SID/close")"
[ "$code" = 403 ] || fail "form post without CSRF token: HTTP $code"
# Over the size limit: 413 before any handler.
head -c 3000000 /dev/zero | tr '\0' ' ' > "$WORK/big"
code="$(curl -s -o /dev/null -w '%{http_code}' -H 'Content-Type: application/json' \
  --data-binary @"$WORK/big" "${URL}api/sessions/$SID/passes")"
[ "$code" = 413 ] || fail "oversized body: HTTP $code"

kill -INT "$PID"
rc=0
wait "$PID" || rc=$?
[ "$rc" = 0 ] || fail "serve exited $rc after SIGINT (stderr: $(cat "$WORK/serve.err"))"
[ "$(wc -l < "$WORK/serve.out")" = 1 ] || fail "serve printed more than its start-up line"

# One pass stored, nothing from the refused requests; the chain is whole.
expect_exit 0 "$SP" --db "$DB" session show "$SID"
expect_in out "E2E-1"
[ "$(grep -c 'E2E-1  ' "$WORK/out")" = 1 ] || fail "pass stored more than once"
expect_exit 0 "$SP" --db "$DB" check-store
expect_in out "check-store: ok"
