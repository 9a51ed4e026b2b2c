#!/usr/bin/env python3
"""Deterministic synthetic weigh data for the benchmarks and the reliability tests.

Every rig is invented. Readings follow the statics of a tow vehicle + conventional trailer with a
weight-distributing hitch (shared notes, "Statics of a tow vehicle and conventional trailer";
any statics text, e.g. Meriam & Kraige, Engineering Mechanics: Statics, ch. 3):
  ball load            Fv = T - M/L          (the trailer axles gain M/L)
  steer-axle change    dS = (M - Fv*o)/WB    (from unhitched)
  drive-axle change    Fv - dS
with WB the wheelbase, o rear axle to ball, L ball to trailer axle, T the slack tongue load and
M the bar moment (lb*in here: lengths in inches, weights in lb). Each platform reading is
rounded to the 20 lb scale division (typical vehicle-scale division: common practice).
Tongue load 10-15 % of the trailer weight (common practice).

Usage:
  gen_data.py setup --bin SCALEPROOF --db FILE [--seed S]  new store with the CSV's scale + rigs
  gen_data.py csv --sessions N [--seed S] [--out FILE]   passes CSV (4 passes a session)
  gen_data.py json [--seed S] [--out FILE]                one session file (scaleproof-session/1)
The same seed always gives the same bytes (Python's random.Random is a fixed Mersenne Twister).
"""
import argparse
import json
import random
import sys

DIVISION = 20  # lb; common practice for a vehicle scale
PASSES_PER_SESSION = 4  # unhitched, hitched (bars slack), two tensioned settings


def rnd(x, d=DIVISION):
    """Round a load to the nearest scale division (half away from zero)."""
    return int((x / d) + 0.5) * d if x >= 0 else -int((-x / d) + 0.5) * d


RIGS = 50  # rigs in the CSV data set; sessions cycle through them


def make_geometry(rng):
    """Geometry of one invented tow vehicle + conventional trailer (inches)."""
    return dict(wb=rng.choice(range(130, 176, 2)),      # wheelbase
                o=rng.choice(range(40, 58)),            # rear axle to ball, behind the axle
                L=rng.choice(range(150, 290, 2)))       # ball to trailer axle


def make_rig(rng, geometry=None):
    """Geometry plus the loads of one weighing (lb): own axle loads, trailer, tongue."""
    rig = dict(geometry or make_geometry(rng))
    rig["W"] = rng.randrange(4000, 9800, 10)           # trailer weight
    rig["T"] = rig["W"] * rng.uniform(0.10, 0.15)      # slack tongue load
    rig["S0"] = rng.randrange(3300, 4700, 5)           # tow vehicle steer, unhitched
    rig["D0"] = rng.randrange(2800, 4200, 5)           # tow vehicle drive, unhitched
    return rig


def axle_loads(rig, moment):
    """(steer, drive, trailer) for a hitched rig with bar moment `moment` (lb*in)."""
    fv = rig["T"] - moment / rig["L"]
    ds = (moment - fv * rig["o"]) / rig["wb"]
    return rig["S0"] + ds, rig["D0"] + fv - ds, rig["W"] - rig["T"] + moment / rig["L"]


def moment_for_falr(rig, f):
    """Bar moment restoring fraction f of the front-axle loss: M = f*T*o*L/(L+o)."""
    return f * rig["T"] * rig["o"] * rig["L"] / (rig["L"] + rig["o"])


def make_passes(rng, rig, ticket0, t0_minutes):
    """Four passes: unhitched, hitched with bars slack, two tensioned settings."""
    per_link = moment_for_falr(rig, rng.uniform(0.11, 0.15))  # moment of one chain link
    settings = [(None, 0.0, "unhitched"), (None, 0.0, "hitched")]
    first = rng.choice([3, 4])
    settings += [(str(first), first * per_link, "tensioned"),
                 (str(first + 1), (first + 1) * per_link, "tensioned")]
    out = []
    for i, (setting, moment, kind) in enumerate(settings):
        if kind == "unhitched":
            s, d, t = rig["S0"], rig["D0"], 0.0
        else:
            s, d, t = axle_loads(rig, moment)
        s, d, t = rnd(s), rnd(d), rnd(t)
        minute = t0_minutes + 6 * i
        out.append(dict(kind=kind, setting=setting, ticket="T-%07d" % (ticket0 + i),
                        weighed_at=iso_time(minute), steer=s, drive=d,
                        trailer=(t if kind != "unhitched" else None), gross=s + d + t))
    return out


def iso_time(minute):
    """ISO 8601 local time with offset, minutes counted from 2026-01-01 00:00 (invented)."""
    day, rest = divmod(minute, 24 * 60)
    month, mday = 1 + (day // 28) % 12, 1 + day % 28
    year = 2026 + day // (28 * 12)
    return "%04d-%02d-%02dT%02d:%02d:00-05:00" % (year, month, mday, rest // 60, rest % 60)


def session_json(rng):
    """One whole session file in format scaleproof-session/1 (invented names)."""
    rig = make_rig(rng)
    passes = make_passes(rng, rig, 1001, 9 * 60)
    for p in passes:
        if p["setting"] is None:
            del p["setting"]
        if p["trailer"] is None:
            del p["trailer"]
    return {
        "format": "scaleproof-session/1",
        "units": {"weight": "lb", "length": "in"},
        "scale": {"id": "ST-1", "division": DIVISION, "accuracy_class": "IIIL",
                  "last_inspected": "2026-03-02"},
        "tow_vehicle": {"label": "Bench pickup", "wheelbase": rig["wb"],
                        "rear_axle_to_ball": rig["o"], "gvwr": 9000, "front_gawr": 4800,
                        "rear_gawr": 6000, "gcwr": 20000, "hitch_tongue_rating": 1400,
                        "hitch_trailer_rating": 12000, "falr_target": 50},
        "trailer": {"label": "Bench camper", "type": "conventional", "ball_to_axle": rig["L"],
                    "gvwr": 10000, "axle_gawr": 9000},
        "passes": passes,
    }


def rig_geometries(seed):
    """The RIGS rig geometries of a data set (their own stream, so rigs.json matches the CSV)."""
    rng = random.Random(seed * 7919 + 1)
    return [make_geometry(rng) for _ in range(RIGS)]


RATINGS = dict(gvwr=10000, front_gawr=5000, rear_gawr=6500, gcwr=22000, tongue=1500,
               hitch_trailer=12000, trailer_gvwr=10500, trailer_axle_gawr=10000)  # lb, invented


def rig_add_args(i, g):
    """`scaleproof rig add` arguments registering rig R-<i> of the CSV data set."""
    r = RATINGS
    return ["rig", "add", "--name", "R-%d" % i, "--vehicle", "Bench pickup %d" % i,
            "--wheelbase", str(g["wb"]), "--rear-axle-to-ball", str(g["o"]),
            "--trailer", "Bench camper %d" % i, "--trailer-type", "conventional",
            "--ball-to-axle", str(g["L"]), "--weight-unit", "lb", "--length-unit", "in",
            "--gvwr", str(r["gvwr"]), "--front-gawr", str(r["front_gawr"]),
            "--rear-gawr", str(r["rear_gawr"]), "--gcwr", str(r["gcwr"]),
            "--hitch-tongue-rating", str(r["tongue"]),
            "--hitch-trailer-rating", str(r["hitch_trailer"]), "--falr-target", "50",
            "--trailer-gvwr", str(r["trailer_gvwr"]),
            "--trailer-axle-gawr", str(r["trailer_axle_gawr"])]


def setup_store(binary, db, seed):
    """A new store at `db` holding scale ST-1 and the RIGS rigs the CSV of `seed` names."""
    import subprocess
    env = dict(__import__("os").environ, NO_COLOR="1")
    base = [binary, "--db", db]
    quiet = dict(check=True, env=env, stdout=subprocess.DEVNULL)
    subprocess.run(base + ["init"], **quiet)
    subprocess.run(base + ["scale", "add", "--id", "ST-1", "--division", str(DIVISION),
                           "--unit", "lb", "--class", "IIIL", "--inspected", "2026-03-02"],
                   **quiet)
    for i, g in enumerate(rig_geometries(seed)):
        subprocess.run(base + rig_add_args(i, g), **quiet)


CSV_COLUMNS = ["session", "scale", "rig", "kind", "setting", "ticket", "weighed_at",
               "steer", "drive", "trailer", "gross", "entered_by"]


def write_csv(out, sessions, seed):
    rng = random.Random(seed)
    geometries = rig_geometries(seed)
    w = out.write
    w(",".join(CSV_COLUMNS) + "\n")
    for n in range(1, sessions + 1):
        rig = make_rig(rng, geometries[n % RIGS])
        for p in make_passes(rng, rig, n * PASSES_PER_SESSION, n * 30):
            w("S-%d,ST-1,R-%d,%s,%s,%s,%s,%d,%d,%s,%d,bench\n" % (
                n, n % RIGS, p["kind"], p["setting"] or "", p["ticket"], p["weighed_at"],
                p["steer"], p["drive"], "" if p["trailer"] is None else "%d" % p["trailer"],
                p["gross"]))


def main():
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("what", choices=["csv", "json", "setup"])
    ap.add_argument("--bin")
    ap.add_argument("--db")
    ap.add_argument("--sessions", type=int, default=250000)
    ap.add_argument("--seed", type=int, default=20261201)
    ap.add_argument("--out", default="-")
    a = ap.parse_args()
    if a.what == "setup":
        setup_store(a.bin, a.db, a.seed)
        return
    out = sys.stdout if a.out == "-" else open(a.out, "w", newline="\n")
    if a.what == "csv":
        write_csv(out, a.sessions, a.seed)
    else:
        json.dump(session_json(random.Random(a.seed)), out, indent=2)
        out.write("\n")
    if out is not sys.stdout:
        out.close()


if __name__ == "__main__":
    main()
