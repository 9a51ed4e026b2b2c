#!/usr/bin/env bash
# The demo scenario against its own statics (data-demo/generate.py, formulas of any statics
# text, e.g. Meriam & Kraige ch. 3, as in /work/shared/notes/references.md): the committed files
# are exactly what the generator gives, and the engine recovers the true tongue load, bar
# moments and lengths within the uncertainty it states (k = 2, GUM §6.3) for the clean sessions,
# and names the planted error in the two others.
source "$SOURCE_DIR/tests/e2e/lib.bash"
DATA="$SOURCE_DIR/data-demo"
python3 "$DATA/generate.py" --check || fail "data-demo/ differs from what generate.py gives"

for name in 01-pickup-travel-trailer 02-fifth-wheel-heavy-truck 03-mis-keyed-reading 04-wrong-tape-length 06-metric-suv-caravan; do
  expect_exit 0 "$SCALEPROOF" reconcile --json "$DATA/sessions/$name.json"
  python3 - "$WORK/out" "$DATA/truth/$name.json" "$name" <<'PY'
import json, sys
r = json.load(open(sys.argv[1])); t = json.load(open(sys.argv[2])); name = sys.argv[3]
def near(what, est, true):
    assert abs(est["value"] - true) <= 2 * est["u"] + 1e-9, (name, what, est, true)
codes = [(f["code"], f.get("ticket"), f.get("platform"), f.get("field")) for f in r["flags"]]
planted = t["planted"]
if planted is None:
    assert r["fit"]["passed"], (name, r["fit"], codes)
    near("tongue load", r["tongue_load"], t["tongue_load"])
    near("trailer weight", r["trailer_weight"], t["trailer_weight"])
    near("rear axle to ball", r["rear_axle_to_ball"], t["rear_axle_to_ball"])
    near("ball to axle", r["ball_to_axle"], t["ball_to_axle"])
    moments = [p["bar_moment"] for p in t["passes"] if p["bar_moment"] is not None]
    assert len(moments) == len(r["tensioned"]), name
    for m, est in zip(moments, r["tensioned"]):
        near("bar moment " + est["ticket"], est["bar_moment"], m)
elif "platform" in planted:
    assert not r["fit"]["passed"], (name, r["fit"])
    assert ("inconsistent-reading", "QX-4390", "drive", None) in codes, (name, codes)
else:
    assert not r["fit"]["passed"], (name, r["fit"])
    assert ("geometry-mismatch", None, None, "ball_to_axle") in codes, (name, codes)
print(name, "ok")
PY
done
echo "demo_data_truth: ok"
