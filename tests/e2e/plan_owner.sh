#!/usr/bin/env bash
# `scaleproof plan`: an owner's table of axle loads across bar moments, the moment for the FALR
# target, where each rating is exceeded, a chart, --json, --units, and clear refusals.
source "$SOURCE_DIR/tests/e2e/lib.bash"
DEMO="$SOURCE_DIR/data-demo/sessions"

# From a weighing: the demo's clean session (unhitched + hitched reconciled).
expect_exit 0 "$SCALEPROOF" plan "$DEMO/01-pickup-travel-trailer.json"
for want in "bar moment" "lbf·ft" "Target: 50 % FALR (the rig's figure)" "Full restoration" \
            "Steer axle vs front GAWR" "Tow vehicle vs GVWR" "% rating" "S steer" "D drive" \
            "does not replace the vehicle and hitch makers' instructions"; do
  expect_in "$WORK/out" "$want"
done
grep -q $'\033\[' "$WORK/out" && fail "colour codes in non-terminal output"

# Worked example of issue #2 (common practice, no source): WB 145 in, rear axle to ball 54 in,
# ball to axle 14 ft; tongue 996 lb; hitching takes 371 lb off the steer axle and puts 1 367 lb
# on the drive axle; 50 % FALR needs about 1 696 lbf·ft. --quiet prints only that moment.
EX=(--wheelbase 145 --rear-axle-to-ball 54 --ball-to-axle 168 --unhitched 4000,5000
    --hitched 3629,6367,7304)
expect_exit 0 "$SCALEPROOF" plan "${EX[@]}" --falr 50 --quiet
[ "$(cat "$WORK/out")" = "1696 lbf·ft" ] || fail "50 % FALR moment: got '$(cat "$WORK/out")', want 1696 lbf·ft"
# The same from the hitched pass and a tongue-scale reading instead of the unhitched pass.
expect_exit 0 "$SCALEPROOF" plan --wheelbase 145 --rear-axle-to-ball 54 --ball-to-axle 168 \
  --hitched 3629,6367,7304 --tongue 996 --falr 50 --quiet
[ "$(cat "$WORK/out")" = "1696 lbf·ft" ] || fail "hitched + tongue: got '$(cat "$WORK/out")'"

# --json: the documented keys; the 7 000 lbf·ft row leaves 496 lb on the ball (worked example).
expect_exit 0 "$SCALEPROOF" plan "${EX[@]}" --max-moment 7000 --steps 1 --front-gawr 3900 --json
python3 - "$WORK/out" <<'PY'
import json, sys
j = json.load(open(sys.argv[1]))
assert list(j) == ["verdict", "verdict_reason", "units", "moment_unit", "tow_vehicle", "trailer", "trailer_type", "geometry",
                   "baseline", "trailer_weight", "tongue_percent", "falr_target", "falr_from_rig",
                   "full_restoration", "target", "rows", "ratings", "notes"], list(j)
assert j["moment_unit"] == "lbf·ft"
assert j["verdict"] == "not-proven", j["verdict"]  # a plan before weighing proves nothing
assert len(j["rows"]) == 2
last = j["rows"][1]
assert last["bar_moment"] == 7000
assert abs(last["ball_load"] - 496) < 1, last            # issue #2 worked example
assert abs(last["steer"] - 4000 - 395) < 1, last         # +395 lb steer from unhitched
assert abs(last["drive"] - 5000 - 101) < 1.5, last       # +101 lb drive from unhitched
assert abs(j["target"]["bar_moment"] - 1696) < 1, j["target"]
r = j["ratings"][0]
assert r["rating"] == "front_gawr" and r["exceeded"] == "above", r
assert last["over"] == ["front_gawr"], last
PY

# --units metric: kg, mm and N·m (1 696 lbf·ft x 1.355 817 948, NIST SP 811 B.8 = 2 299 N·m).
expect_exit 0 "$SCALEPROOF" --units metric plan "${EX[@]}" --falr 50 --quiet
[ "$(cat "$WORK/out")" = "2299 N·m" ] || fail "metric moment: got '$(cat "$WORK/out")'"
expect_exit 0 "$SCALEPROOF" plan "$DEMO/01-pickup-travel-trailer.json" --units metric
expect_in "$WORK/out" "N·m"
expect_in "$WORK/out" " kg"

# A fifth wheel takes no bars: one row and a note.
expect_exit 0 "$SCALEPROOF" plan "$DEMO/02-fifth-wheel-heavy-truck.json"
expect_in "$WORK/out" "takes no weight-distributing bars"
expect_in "$WORK/out" "Drive axle vs rear GAWR"

# Refusals: what is missing or malformed is named; usage errors exit 2, bad data 65, no file 66.
expect_exit 2 "$SCALEPROOF" plan --wheelbase 145 --rear-axle-to-ball 54 --ball-to-axle 168 --unhitched 4000,5000
expect_in "$WORK/err" "not enough loads"
expect_exit 2 "$SCALEPROOF" plan "${EX[@]/3629,6367,7304/3629,6367}"
expect_in "$WORK/err" "--hitched: expected STEER,DRIVE,TRAILER"
expect_exit 2 "$SCALEPROOF" plan --unhitched 4000,5000 --tongue 900 --trailer-weight 8000
expect_in "$WORK/err" "--wheelbase"
expect_exit 65 "$SCALEPROOF" plan --wheelbase 145 --rear-axle-to-ball 0 --ball-to-axle 168 --unhitched 4000,5000 --hitched 3629,6367,7304
expect_in "$WORK/err" "tow_vehicle.rear_axle_to_ball"
expect_exit 66 "$SCALEPROOF" plan "$WORK/no-such-session.json"
expect_in "$WORK/err" "no-such-session.json"
echo '{"format": "scaleproof-session/1"}' >"$WORK/bad.json"
expect_exit 65 "$SCALEPROOF" plan "$WORK/bad.json"
expect_in "$WORK/err" "bad.json"

# From a weighed session (issue #12): headed as such, led by the weighing's verdict, ratings
# in words, and the same target moment as reconcile (same model, same back-solved lengths).
expect_exit 0 "$SCALEPROOF" plan "$SOURCE_DIR/data-demo/sessions/01-pickup-travel-trailer.json"
head -1 "$WORK/out" | grep -qx "Verdict of the weighing: compliant" || fail "plan: verdict line"
expect_in "$WORK/out" "Plan from the weighing"
expect_in "$WORK/out" "needs 1540 lbf·ft"
cp "$WORK/out" "$WORK/plan.txt"
expect_exit 0 "$SCALEPROOF" reconcile "$SOURCE_DIR/data-demo/sessions/01-pickup-travel-trailer.json"
expect_in "$WORK/out" "Bar moment for the target: 1540 ± 41 lbf·ft"
expect_exit 0 "$SCALEPROOF" plan "$SOURCE_DIR/data-demo/sessions/02-fifth-wheel-heavy-truck.json"
expect_in "$WORK/out" "Verdict of the weighing: over"
expect_in "$WORK/out" "rear GAWR"
expect_in "$WORK/out" "drive axle to kingpin"
if grep -q "rear_gawr" "$WORK/out"; then fail "plan shows the internal key rear_gawr"; fi

echo "plan_owner: ok"
