# Helpers shared by the audit end-to-end scripts (source after lib.bash).

# codes FILE: the distinct finding codes of an audit --json document, sorted, space-separated.
codes() {
  python3 -c 'import json,sys
d=json.load(open(sys.argv[1]))
print(" ".join(sorted({f["code"] for i in d["items"] for f in i["findings"]})))' "$1"
}

# check NAME EXIT "CODES" ARGS...: audit ARGS (--json), expect EXIT and exactly CODES.
check() {
  local name="$1" want_exit="$2" want="$3"; shift 3
  expect_exit "$want_exit" "$SCALEPROOF" audit --json "$@"
  local got; got="$(codes "$WORK/out")"
  [ "$got" = "$want" ] || { cat "$WORK/out"; fail "$name: expected findings '$want', got '$got'"; }
}
