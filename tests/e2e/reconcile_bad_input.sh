#!/usr/bin/env bash
# Bad input to `scaleproof reconcile`: one line naming the file and JSON path (or line and
# column) and what was expected; exit 65 data, 66 missing, 2 usage; nothing on stdout.
source "$SOURCE_DIR/tests/e2e/lib.bash"
D="$SOURCE_DIR/tests/data/sessions"

check_bad() {  # FILE EXPECTED-SUBSTRING
  expect_exit 65 "$SCALEPROOF" reconcile "$D/$1"
  expect_in "$WORK/err" "$D/$1: $2"
  [ "$(wc -l <"$WORK/err")" = 1 ] || fail "$1: expected a one-line message"
  [ -s "$WORK/out" ] && fail "$1: nothing may reach stdout"
  return 0
}
check_bad bad-negative-steer.json '$.passes[2].steer: expected a weight between 0 and 200000 lb, got -40'
check_bad bad-unknown-key.json "\$.tow_vehicle.wheelbse: unknown key 'wheelbse'; did you mean 'wheelbase'?"
check_bad bad-duplicate-ticket.json '$.passes[2].ticket: ticket "2" is already used by passes[1]'
check_bad bad-unhitched-trailer.json '$.passes[0].trailer: expected no trailer reading (or 0) on an unhitched pass, got 40 lb'
check_bad bad-unknown-unit.json '$.units.length: unknown length unit "inch"; expected one of: in, ft, mm, cm, m'
check_bad bad-syntax.json 'line 2, column'

# Same through --json: errors do not change with the output form.
expect_exit 65 "$SCALEPROOF" reconcile --json "$D/bad-negative-steer.json"
expect_in "$WORK/err" '$.passes[2].steer'

# stdin is named as such.
expect_exit 65 "$SCALEPROOF" reconcile - <"$D/bad-unknown-unit.json"
expect_in "$WORK/err" '<stdin>: $.units.length'

expect_exit 66 "$SCALEPROOF" reconcile "$WORK/nope.json"
expect_in "$WORK/err" "nope.json: no such file"
expect_exit 66 "$SCALEPROOF" reconcile "$WORK"
expect_in "$WORK/err" "is a folder"

expect_exit 2 "$SCALEPROOF" reconcile
expect_exit 2 "$SCALEPROOF" reconcile --jsno "$D/good-minimal.json"
expect_exit 2 "$SCALEPROOF" reconcile - -
echo ok
