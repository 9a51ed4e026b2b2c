#!/usr/bin/env bash
# The field-fault table (tests/bad-input/fields.tsv) through every input path of the binary:
# each fault is written into a session file (`reconcile` and `import`), and, by the field's
# kind, into a rig TOML file, a rig JSON file and the `rig add` flags (tow_vehicle.*, trailer.*),
# a pass CSV and the `pass add` flags (passes[0].*), or the `scale add` flags (scale.*). Every
# path must exit 65 with one line "scaleproof: <its name for the field>: <the table's message>"
# (one validator, format/validate.h), and the store must be left as it was.
source "$SOURCE_DIR/tests/e2e/lib.bash"
TABLE="$SOURCE_DIR/tests/bad-input/fields.tsv"
BASE="$SOURCE_DIR/tests/fuzz/corpus/session_json/valid_1.json"

expect_exit 0 "$SCALEPROOF" init
expect_exit 0 "$SCALEPROOF" import "$BASE"  # scale ST-1 and rig 1
expect_exit 0 "$SCALEPROOF" -q session open --rig 1 --scale ST-1
SESSION="$(cat "$WORK/out")"
before="$(sqlite3 "$SCALEPROOF_DB" .dump | sha256sum)"

# One folder per table row: the inputs of each path and runs.tsv (path, expected name).
python3 - "$TABLE" "$BASE" "$WORK/cases" "$SESSION" <<'EOF'
import decimal, json, os, sys
table, base_path, out, session = sys.argv[1:5]
base = json.load(open(base_path))

def plain(v):  # the CSV and the flags take plain decimals
    if isinstance(v, str):
        return v
    return format(decimal.Decimal(repr(v)), "f")

def toml_value(v):
    return json.dumps(v) if isinstance(v, str) else repr(v) if isinstance(v, float) else str(v)

def put(doc, field, value):
    parts = field.replace("]", "").replace("[", ".").split(".")
    for p in parts[:-1]:
        doc = doc[int(p)] if p.isdigit() else doc[p]
    doc[parts[-1]] = value

def args_file(path, args):
    with open(path, "wb") as f:
        for a in args:
            f.write(a.encode("utf-8") + b"\0")

n = 0
for line in open(table, encoding="utf-8"):
    if not line.strip() or line.startswith("#"):
        continue
    field, flag, value, message = line.rstrip("\n").split("\t")
    value = json.loads(value)
    d = os.path.join(out, "%02d" % n)
    os.makedirs(d)
    n += 1
    runs = []
    doc = json.loads(json.dumps(base))
    put(doc, field, value)
    with open(os.path.join(d, "session.json"), "w", encoding="utf-8") as f:
        json.dump(doc, f, indent=2, ensure_ascii=False)
    runs += [("reconcile", "session.json: $." + field), ("import", "session.json: $." + field)]
    section = field.split(".")[0]
    if section in ("tow_vehicle", "trailer"):
        rig = {"name": "F-%d" % n, "units": base["units"],
               "tow_vehicle": dict(base["tow_vehicle"]), "trailer": dict(base["trailer"])}
        put(rig, field, value)
        with open(os.path.join(d, "rig.json"), "w", encoding="utf-8") as f:
            json.dump(rig, f, ensure_ascii=False)
        with open(os.path.join(d, "rig.toml"), "w", encoding="utf-8") as f:
            f.write('name = "%s"\n' % rig["name"])
            for t in ("units", "tow_vehicle", "trailer"):
                f.write("\n[%s]\n" % t)
                for k, v in rig[t].items():
                    f.write("%s = %s\n" % (k, toml_value(v)))
        v, t = base["tow_vehicle"], base["trailer"]
        flags = {"--name": "F-%d" % n, "--vehicle": v["label"], "--wheelbase": v["wheelbase"],
                 "--rear-axle-to-ball": v["rear_axle_to_ball"], "--gvwr": v["gvwr"],
                 "--front-gawr": v["front_gawr"], "--rear-gawr": v["rear_gawr"],
                 "--gcwr": v["gcwr"], "--hitch-tongue-rating": v["hitch_tongue_rating"],
                 "--hitch-trailer-rating": v["hitch_trailer_rating"],
                 "--falr-target": v["falr_target"], "--trailer": t["label"],
                 "--ball-to-axle": t["ball_to_axle"], "--trailer-gvwr": t["gvwr"],
                 "--trailer-axle-gawr": t["axle_gawr"]}
        flags[flag] = value
        args = ["rig", "add"]
        for k, x in flags.items():
            args += [k, plain(x)]
        args_file(os.path.join(d, "rig.args"), args)
        runs += [("rig-toml", "rig.toml: " + field), ("rig-json", "rig.json: $." + field),
                 ("rig-flags", flag)]
    elif section == "passes":
        p = base["passes"][0]
        column = field.split(".", 1)[1]
        row = {"session": "F-%d" % n, "scale": "ST-1", "rig": "1", "kind": p["kind"],
               "ticket": p["ticket"], "weighed_at": p["weighed_at"], "steer": plain(p["steer"]),
               "drive": plain(p["drive"]), "entered_by": "bench"}
        row[column] = plain(value)
        with open(os.path.join(d, "pass.csv"), "w", encoding="utf-8", newline="") as f:
            f.write(",".join(row) + "\n" + ",".join(row.values()) + "\n")
        flags = {"--session": session, "--kind": p["kind"], "--ticket": "F-%d" % n,
                 "--weighed-at": p["weighed_at"], "--steer": plain(p["steer"]),
                 "--drive": plain(p["drive"]), "--by": "bench"}
        flags[flag] = plain(value)
        args = ["pass", "add"]
        for k, x in flags.items():
            args += [k, x]
        args_file(os.path.join(d, "pass.args"), args)
        runs += [("csv", "pass.csv:2: " + column), ("pass-flags", flag)]
    elif section == "scale":
        flags = {"--id": "SF-%d" % n, "--division": "20", "--unit": "lb"}
        flags[flag] = plain(value)
        args = ["scale", "add"]
        for k, x in flags.items():
            args += [k, x]
        args_file(os.path.join(d, "scale.args"), args)
        runs += [("scale-flags", flag)]
    with open(os.path.join(d, "message"), "w", encoding="utf-8") as f:
        f.write(message)
    with open(os.path.join(d, "runs.tsv"), "w", encoding="utf-8") as f:
        for r in runs:
            f.write("\t".join(r) + "\n")
print("%d field faults" % n)
EOF

problems=()
problem() { problems+=("$*"); echo "    PROBLEM: $*"; }
runs=0
for dir in "$WORK"/cases/*/; do
  message="$(cat "$dir/message")"
  while IFS=$'\t' read -r path name; do
    args=()
    case "$path" in
      reconcile) args=(reconcile session.json) ;;
      import) args=(import session.json) ;;
      csv) args=(import pass.csv) ;;
      rig-toml) args=(rig add --file rig.toml) ;;
      rig-json) args=(rig add --file rig.json) ;;
      rig-flags) mapfile -d '' args <"$dir/rig.args" ;;
      pass-flags) mapfile -d '' args <"$dir/pass.args" ;;
      scale-flags) mapfile -d '' args <"$dir/scale.args" ;;
    esac
    got=0
    (cd "$dir" && "$SCALEPROOF" "${args[@]}") >"$WORK/out" 2>"$WORK/err" || got=$?
    runs=$((runs + 1))
    want="scaleproof: $name: $message"
    line="$(head -n 1 "$WORK/err")"
    echo "    $path (exit $got): $(head -c 200 "$WORK/err" | cat -v)"
    [ "$got" = 65 ] || problem "$dir $path: exit $got, expected 65"
    [ "$line" = "$want" ] || problem "$dir $path: got '$line', expected '$want'"
    [ "$(wc -l <"$WORK/err")" -le 1 ] || problem "$dir $path: more than one line"
  done <"$dir/runs.tsv"
done
[ "$runs" -ge 80 ] || fail "only $runs runs of the field-fault table"
if [ "${#problems[@]}" -gt 0 ]; then
  printf '%s\n' "${problems[@]}" | cat -v >&2
  fail "${#problems[@]} problems with the field-fault table"
fi
after="$(sqlite3 "$SCALEPROOF_DB" .dump | sha256sum)"
[ "$before" = "$after" ] || fail "the store's contents changed"
echo "ok: $runs runs of the field-fault table, one message a fault on every path, store unchanged"
