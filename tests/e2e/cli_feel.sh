#!/usr/bin/env bash
# How the command line feels: --version; --help with a worked example on every command and
# subcommand; unknown commands and options suggest the nearest; colour only on a terminal and
# never with NO_COLOR; the generated man page and bash completion cover every command.
source "$SOURCE_DIR/tests/e2e/lib.bash"

expect_exit 0 "$SCALEPROOF" --version
grep -qE '^scaleproof [0-9]+\.[0-9]+\.[0-9]+$' "$WORK/out" || fail "--version: $(cat "$WORK/out")"

# Every visible command, and every subcommand under it, has --help with an example.
expect_exit 0 "$SCALEPROOF" --help
commands=$(awk '/^Subcommands:/{on=1; next} on && /^  [a-z]/{print $1}' "$WORK/out")
[ -n "$commands" ] || fail "no commands listed by --help"
for c in $commands; do
  expect_exit 0 "$SCALEPROOF" "$c" --help
  grep -qi "example" "$WORK/out" || fail "'scaleproof $c --help' shows no example"
  subs=$(awk '/^Subcommands:/{on=1; next} on && /^  [a-z]/{print $1}' "$WORK/out")
  for s in $subs; do
    expect_exit 0 "$SCALEPROOF" "$c" "$s" --help
    grep -qi "example" "$WORK/out" || fail "'scaleproof $c $s --help' shows no example"
  done
done
# The hidden generators are not listed.
grep -qE '^  (man|completion) ' <("$SCALEPROOF" --help) && fail "hidden commands listed in --help"

# Typos get the nearest valid name, with the usage exit code.
expect_exit 2 "$SCALEPROOF" reconcle x.json
expect_in "$WORK/err" "did you mean 'reconcile'?"
expect_exit 2 "$SCALEPROOF" plan --wheelbse 145
expect_in "$WORK/err" "did you mean --wheelbase?"
expect_exit 2 "$SCALEPROOF" --unit metric plan
expect_in "$WORK/err" "did you mean --units?"

# Colour: never into a pipe; on a terminal (script(1) gives one) unless NO_COLOR is set.
PLAN=(plan "$SOURCE_DIR/data-demo/sessions/01-pickup-travel-trailer.json")
expect_exit 0 "$SCALEPROOF" "${PLAN[@]}"
grep -q $'\033\[' "$WORK/out" && fail "colour codes in piped output"
if command -v script >/dev/null; then
  cmd="$(printf '%q ' "$SCALEPROOF" "${PLAN[@]}")"
  env -u NO_COLOR script -qec "$cmd" /dev/null >"$WORK/tty" 2>&1 || fail "plan on a terminal"
  grep -q $'\033\[3[12]m' "$WORK/tty" || fail "no colour on a terminal"
  NO_COLOR=1 script -qec "$cmd" /dev/null >"$WORK/tty" 2>&1 || fail "plan with NO_COLOR"
  grep -q $'\033\[3' "$WORK/tty" && fail "colour on a terminal although NO_COLOR is set"
fi

# Man page and bash completion generated from the command definitions.
expect_exit 0 "$SCALEPROOF" man
expect_in "$WORK/out" ".TH SCALEPROOF 1"
for c in $commands; do expect_in "$WORK/out" ".SS \"scaleproof ${c//-/\\-}\""; done  # roff escapes -
expect_in "$WORK/out" "NO_COLOR"
if command -v groff >/dev/null; then
  groff -man -Tutf8 -ww -z "$WORK/out" 2>"$WORK/groff" || fail "groff rejects the man page"
  [ ! -s "$WORK/groff" ] || { cat "$WORK/groff"; fail "groff warnings"; }
fi
expect_exit 0 "$SCALEPROOF" completion bash
cp "$WORK/out" "$WORK/completion.bash"
bash -n "$WORK/completion.bash" || fail "completion script does not parse"
complete_words() {  # complete_words WORD...: what TAB offers after these words
  bash -c 'source "$1"; shift; COMP_WORDS=(scaleproof "$@"); COMP_CWORD=$#; _scaleproof;
           printf "%s\n" "${COMPREPLY[@]}"' _ "$WORK/completion.bash" "$@"
}
complete_words rec | grep -qx reconcile || fail "completion: 'rec' does not offer reconcile"
complete_words plan --wheel | grep -qx -- --wheelbase || fail "completion: plan --wheel"
complete_words --units "" | grep -qx metric || fail "completion: --units values"
for c in $commands; do
  complete_words "$c" "" >/dev/null || fail "completion after '$c'"
done
# Help shows no placeholder as if it were a value (issue #12 item 5): no "=[]", no CLI11 range
# text, no "=0" for an id that starts at 1; the man page gives flags no VALUE.
for c in report audit reconcile; do
  expect_exit 0 "$SCALEPROOF" "$c" --help
  if grep -E '=\[\]|9007199254740992|--session [^ ]*=0' "$WORK/out"; then fail "$c --help shows a placeholder default"; fi
done
expect_exit 0 "$SCALEPROOF" man
for flag in json all version quiet; do
  if grep -F "\\-\\-$flag\\fR \\fIVALUE" "$WORK/out"; then fail "man page gives the flag --$flag a VALUE"; fi
done
echo "cli_feel: ok"
