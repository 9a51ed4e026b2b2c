#!/usr/bin/env python3
"""Writes the audit's claim-folder fixtures (tests/data/claims/<case>/session.json).

Every case starts from one clean weighing, generated from the statics in
shared notes/references.md (ball load Fv = T - M/L, steer change (M - Fv*o)/WB, trailer axles
gain M/L) and rounded to the 20 lb division, then changes one thing so that the audit shows
exactly one finding. Invented station, people and rig; no real names.
Run it again after changing it: python3 tests/data/claims/generate.py
"""
import copy
import json
import os

HERE = os.path.dirname(os.path.abspath(__file__))
D = 20  # scale division, lb (typical vehicle-scale division: common practice)

# Rig (lb, in): wheelbase, rear axle to ball, ball to trailer axle.
WB, O, L = 145.0, 50.0, 204.0
S0, D0 = 3480.0, 2700.0          # tow vehicle alone
W = 7000.0                        # trailer weight
T = 0.12 * W                      # tongue load, 12 % (common practice: 10-15 %)
A0 = W - T


def rnd(x):
    return int(round(x / D) * D)


def loads(m):
    """Axle loads hitched with bar moment m (lb*in); m = 0 is bars slack."""
    fv = T - m / L
    steer = S0 + (m - fv * O) / WB
    trailer = A0 + m / L
    drive = D0 + fv - (steer - S0)
    return steer, drive, trailer


def moment(falr):
    return falr / 100.0 * T * O * L / (L + O)


def pass_(kind, ticket, time, m=None, setting=None):
    p = {"kind": kind, "ticket": ticket, "weighed_at": "2026-10-14T" + time + "-06:00"}
    if setting is not None:
        p["setting"] = setting
    if kind == "unhitched":
        p["steer"], p["drive"] = rnd(S0), rnd(D0)
    else:
        s, d, t = loads(m)
        p["steer"], p["drive"], p["trailer"] = rnd(s), rnd(d), rnd(t)
    return p


def clean():
    return {
        "format": "scaleproof-session/1",
        "station": "Harrow Fen Public Scale",
        "operator": "Ilse Moravec",
        "owner": "Teodor Vance",
        "units": {"weight": "lb", "length": "in"},
        "scale": {"id": "HF-2", "division": D, "accuracy_class": "IIIL",
                  "last_inspected": "2026-05-06", "capacity": 120000},
        "tow_vehicle": {"label": "Half-ton crew-cab pickup (owner's unit TV-7)",
                        "wheelbase": WB, "rear_axle_to_ball": O, "gvwr": 8000,
                        "front_gawr": 4200, "rear_gawr": 4600, "gcwr": 16000,
                        "hitch_tongue_rating": 1200, "hitch_trailer_rating": 12000,
                        "falr_target": 50},
        "trailer": {"label": "24 ft tandem-axle travel trailer (owner's unit TT-7)",
                    "type": "conventional", "ball_to_axle": L, "gvwr": 8000,
                    "axle_gawr": 7500},
        "passes": [
            pass_("unhitched", "HF-5101", "09:12:00"),
            pass_("hitched", "HF-5102", "09:20:00", 0.0),
            pass_("tensioned", "HF-5103", "09:28:00", moment(50), "3"),
            pass_("tensioned", "HF-5104", "09:35:00", moment(65), "4"),
        ],
        "notes": "Invented test data for the claim-file audit.",
    }


def case(name, change=None):
    s = clean()
    if change:
        change(s)
    folder = os.path.join(HERE, name)
    os.makedirs(folder, exist_ok=True)
    with open(os.path.join(folder, "session.json"), "w") as f:
        json.dump(s, f, indent=2)
        f.write("\n")


def set_(path, value):
    def change(s):
        obj = s
        for k in path[:-1]:
            obj = obj[k]
        obj[path[-1]] = value
    return change


def off_division(s):
    s["passes"][2]["steer"] += 5          # 5 lb: not a multiple of the 20 lb division


def gross_mismatch(s):
    p = s["passes"][1]
    p["gross"] = p["steer"] + p["drive"] + p["trailer"] + D   # printed gross one division off


def mixed_scale(s):
    s["passes"][3]["scale_id"] = "HF-1"   # the second tensioned pass printed by another scale


def passes_span(s):
    s["passes"][3]["weighed_at"] = "2026-10-14T10:13:00-06:00"   # 61 min after the first


def duplicate_pass(s):
    dup = copy.deepcopy(s["passes"][3])
    dup["ticket"] = "HF-5105"              # same time and readings, another ticket number
    s["passes"].append(dup)


def weight_drift(s):
    # 20 lb more on every platform of the last pass: 60 lb on the total, beyond the
    # root-sum-square allowance 20*sqrt(6) = 49 lb, yet small enough for the fit test.
    p = s["passes"][3]
    for k in ("steer", "drive", "trailer"):
        p[k] += D


def over_restored(s):
    s["passes"][3].update({k: v for k, v in zip(
        ("steer", "drive", "trailer"), map(rnd, loads(moment(130))))})


case("clean")
case("off-division", off_division)
case("gross-mismatch", gross_mismatch)
case("mixed-scale", mixed_scale)
case("passes-span", passes_span)
case("future-time")            # audited with a clock set just before the last pass
case("stale-weighing")         # audited with a claim date long after the weighing
case("duplicate-pass", duplicate_pass)
case("inspection-lapsed", set_(("scale", "last_inspected"), "2025-10-13"))
case("division-implausible", set_(("scale", "capacity"), 250000))
case("weight-drift", weight_drift)
# A ball-to-axle tape far off (60 in for 204 in): the fit names the length.
case("geometry-mismatch", set_(("trailer", "ball_to_axle"), 60))
case("over-restored", over_restored)
case("compliance-over", set_(("tow_vehicle", "front_gawr"), 3000))
# Steer 3377.5 +- 15.6 lb (2u) against 3385 lb: neither within nor over (GUM k = 2).
case("compliance-undecided", set_(("tow_vehicle", "front_gawr"), 3385))
# ticket-reuse: the same weighing filed in two claims (owner's name changed in the second).
case("reuse-a")
case("reuse-b", set_(("owner",), "Wilhelmina Crane"))
