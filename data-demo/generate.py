#!/usr/bin/env python3
"""Generates the invented demo scenario's weigh tickets from the statics of a tow vehicle and
trailer, rounds them to the scale division, then plants the two deliberate errors.

Everything here is invented: station, people, vehicles and tickets. No real names or brands.

Statics (any statics text, e.g. Meriam & Kraige, Engineering Mechanics: Statics, ch. 3; the
symbols of /work/shared/notes/references.md): WB wheelbase, o rear axle to ball (negative for a
coupling ahead of the axle), L ball to the trailer's effective axle, T tongue load with the bars
slack, M bar moment.
    ball load            Fv = T - M/L          trailer axles gain M/L
    steer change         dS = (M - Fv*o)/WB    drive change  Fv - dS  (total is conserved)

Run it from anywhere; it rewrites data-demo/sessions/*.json and data-demo/truth/*.json. The
committed files are exactly what it prints, so `python3 data-demo/generate.py --check` tells
whether anyone edited the numbers by hand.
    python3 data-demo/generate.py           # rewrite the files
    python3 data-demo/generate.py --check   # exit 1 if a committed file differs
"""
import json
import os
import sys

HERE = os.path.dirname(os.path.abspath(__file__))
DIVISION = 20  # lb; a typical vehicle-scale division (common practice)

STATION = "Quillmere Crossing Public Scale"
SCALE = {
    "id": "QX-1",
    "division": DIVISION,
    "accuracy_class": "IIIL",
    "last_inspected": "2026-03-18",
    "name": "Quillmere Crossing Public Scale, three-platform lane",
    "location": "Route 9 service yard, Quillmere Crossing, Tarnwick County",
    "capacity": 120000,
}


# Inspection history of the scale (invented county office, seals and inspector).
INSPECTIONS = [
    {"date": "2025-03-21", "seal": "TC-25-0311",
     "inspector": "Ilse Marchetti-Obi, Tarnwick County Weights and Measures"},
    {"date": "2026-03-18", "seal": "TC-26-0412",
     "inspector": "Ilse Marchetti-Obi, Tarnwick County Weights and Measures"},
]

# A return visit of rig RA-1, logged by the scale office as CSV rows (the store's pass CSV,
# format/pass_csv.h): fresh water on board, bars at settings 4 and 5 only.
RETURN_VISIT = {
    "file": "05-return-visit", "rig": "RA-1", "session": "QX-2026-11-04-A",
    "operator": "Marit Oyelaran", "entered_by": "Marit Oyelaran",
    "date": "2026-11-04", "tz": "-06:00", "start": (10, 2), "ticket0": 4711,
    "wheelbase": 145,
    "truth": {"steer0": 3500, "drive0": 2740, "axles0": 6560, "tongue": 960,
              "rear_axle_to_ball": 50, "ball_to_axle": 204},
    "settings": [("4", 1300), ("5", 1800)],
}


def rnd(x, division=DIVISION):
    """Rounds a load to the nearest scale division, as the indicator does."""
    return int(division * round(x / division))


def loads(rig, m_lbft):
    """Axle loads (steer, drive, trailer) in lb for bar moment m_lbft (lbf*ft), bars hooked up.

    m_lbft is None for the unhitched pass (tow vehicle alone).
    """
    wb, o, l_ = rig["wheelbase"], rig["rear_axle_to_ball"], rig["ball_to_axle"]
    s0, d0, a0, t = rig["steer0"], rig["drive0"], rig["axles0"], rig["tongue"]
    if m_lbft is None:
        return s0, d0, None
    # lbf*ft -> lb*in (1 ft = 12 in), or N*m -> kgf*mm (g_n = 9.80665 m/s^2, 1 m = 1000 mm;
    # NIST SP 811 B.8), so the moment matches the session's weight and length units.
    m = m_lbft * 1000.0 / 9.80665 if rig.get("metric") else 12.0 * m_lbft
    fv = t - m / l_
    ds = (m - fv * o) / wb
    return s0 + ds, d0 + fv - ds, a0 + m / l_


# One rig per session. "true" geometry and loads generate the readings; "entered" is what the
# owner's tape gave (equal to the truth except where an error is planted).
SESSIONS = [
    {
        "file": "01-pickup-travel-trailer",
        "rig": "RA-1",
        "story": "Owner proves a half-ton pickup + travel trailer setup at three bar settings.",
        "operator": "Marit Oyelaran",
        "owner": "Rosalind Achterberg",
        "date": "2026-10-14", "tz": "-06:00", "start": (9, 12), "ticket0": 4101,
        "tow": {"label": "Half-ton crew-cab pickup, 5.5 ft box (owner's unit RA-1)",
                "wheelbase": 145, "rear_axle_to_ball": 50,
                "gvwr": 7250, "front_gawr": 3900, "rear_gawr": 4250, "gcwr": 14500,
                "hitch_tongue_rating": 1100, "hitch_trailer_rating": 11000, "falr_target": 50},
        "trailer": {"label": "24 ft tandem-axle travel trailer (owner's unit RA-T)",
                    "type": "conventional", "ball_to_axle": 204, "gvwr": 7800, "axle_gawr": 7000},
        "truth": {"steer0": 3480, "drive0": 2700, "axles0": 6480, "tongue": 920,
                  "rear_axle_to_ball": 50, "ball_to_axle": 204},
        # bar settings: chain links left free below the snap-up bracket (owner's own label)
        "settings": [("3", 800), ("4", 1300), ("5", 1800)],
        "gross_on": "all",
    },
    {
        "file": "02-fifth-wheel-heavy-truck",
        "rig": "ET-2",
        "story": "Three-quarter-ton truck with a fifth-wheel trailer: no WD bars; rear axle heavy.",
        "operator": "Marit Oyelaran",
        "owner": "Emeka Thorsby",
        "date": "2026-10-14", "tz": "-06:00", "start": (11, 40), "ticket0": 4121,
        "tow": {"label": "Three-quarter-ton crew-cab long-bed truck (owner's unit ET-2)",
                "wheelbase": 172, "rear_axle_to_ball": -3,
                "gvwr": 11500, "front_gawr": 5600, "rear_gawr": 6200, "gcwr": 23000,
                "hitch_tongue_rating": 3000, "hitch_trailer_rating": 18000},
        "trailer": {"label": "32 ft fifth-wheel trailer (owner's unit ET-F)",
                    "type": "fifth-wheel", "ball_to_axle": 300, "gvwr": 14000, "axle_gawr": 12000},
        "truth": {"steer0": 4900, "drive0": 3700, "axles0": 10400, "tongue": 2600,
                  "rear_axle_to_ball": -3, "ball_to_axle": 300},
        "settings": [],
        "gross_on": "all",
    },
    {
        "file": "03-mis-keyed-reading",
        "rig": "GV-1",
        "story": "Travel trailer at two settings; the operator keyed one drive reading wrong.",
        "operator": "Tobias Kettleworth",
        "owner": "Greta Vanterpool",
        "date": "2026-10-21", "tz": "-06:00", "start": (14, 5), "ticket0": 4388,
        "tow": {"label": "Half-ton extended-cab pickup, 6.5 ft box (owner's unit GV-1)",
                "wheelbase": 157, "rear_axle_to_ball": 52,
                "gvwr": 7300, "front_gawr": 3950, "rear_gawr": 4300, "gcwr": 15000,
                "hitch_tongue_rating": 1200, "hitch_trailer_rating": 12000, "falr_target": 60},
        "trailer": {"label": "27 ft tandem-axle travel trailer (owner's unit GV-T)",
                    "type": "conventional", "ball_to_axle": 222, "gvwr": 8400, "axle_gawr": 7600},
        "truth": {"steer0": 3560, "drive0": 2880, "axles0": 7020, "tongue": 1020,
                  "rear_axle_to_ball": 52, "ball_to_axle": 222},
        "settings": [("2", 1400), ("3", 2100)],
        "gross_on": "none",
        # The drive platform of the first tensioned pass: hundreds and tens digits swapped.
        "plant": {"pass": "tensioned:2", "platform": "drive", "was": 4040, "keyed": 4400},
    },
    {
        "file": "04-wrong-tape-length",
        "rig": "HM-1",
        "story": ("Heavier travel trailer; the owner taped ball to the trailer's front wall (13 ft) "
                  "instead of to the mid-point between its axles (19 ft)."),
        "operator": "Tobias Kettleworth",
        "owner": "Hollis Mbeki-Strand",
        "date": "2026-10-28", "tz": "-06:00", "start": (8, 47), "ticket0": 4502,
        "tow": {"label": "Three-quarter-ton crew-cab pickup, 6.75 ft box (owner's unit HM-1)",
                "wheelbase": 160, "rear_axle_to_ball": 56,
                "gvwr": 10000, "front_gawr": 4800, "rear_gawr": 6000, "gcwr": 21000,
                "hitch_tongue_rating": 1400, "hitch_trailer_rating": 14000},
        "trailer": {"label": "31 ft tandem-axle travel trailer (owner's unit HM-T)",
                    "type": "conventional", "ball_to_axle": 156, "gvwr": 10800, "axle_gawr": 10000},
        "truth": {"steer0": 4260, "drive0": 3540, "axles0": 8950, "tongue": 1250,
                  "rear_axle_to_ball": 56, "ball_to_axle": 228},
        "settings": [("6", 2500), ("8", 3500), ("10", 4500)],
        "gross_on": "all",
        "plant": {"field": "ball_to_axle", "entered": 156, "true": 228},
    },
    {
        "file": "06-metric-suv-caravan",
        "rig": "KL-3",
        "story": "A mid-size SUV and a small caravan weighed in kilograms on the kg scale.",
        "operator": "Tobias Kettleworth",
        "owner": "Karin Lindqvist-Abara",
        "date": "2026-11-02", "tz": "-06:00", "start": (15, 20), "ticket0": 901,
        "metric": True,
        "scale": {"id": "QX-2", "division": 10, "accuracy_class": "IIIL",
                  "last_inspected": "2026-03-18",
                  "name": "Quillmere Crossing Public Scale, light-vehicle lane (kg)",
                  "location": "Route 9 service yard, Quillmere Crossing, Tarnwick County",
                  "capacity": 30000},
        "tow": {"label": "Mid-size SUV, seven seats (owner's unit KL-3)",
                "wheelbase": 2900, "rear_axle_to_ball": 1100,
                "gvwr": 2600, "front_gawr": 1300, "rear_gawr": 1450, "gcwr": 4300,
                "hitch_tongue_rating": 150, "hitch_trailer_rating": 2000},
        "trailer": {"label": "6 m single-axle caravan (owner's unit KL-C)",
                    "type": "conventional", "ball_to_axle": 4600, "gvwr": 1600,
                    "axle_gawr": 1600},
        "truth": {"steer0": 1180, "drive0": 1120, "axles0": 1350, "tongue": 150,
                  "rear_axle_to_ball": 1100, "ball_to_axle": 4600},
        "settings": [("2", 400), ("3", 700)],
        "gross_on": "all",
    },
]


def iso(s, minutes):
    h, m = s["start"]
    t = h * 60 + m + minutes
    return f'{s["date"]}T{t // 60:02d}:{t % 60:02d}:00{s["tz"]}'


def build(s):
    rig = dict(s["truth"])
    rig["wheelbase"] = s["tow"]["wheelbase"]
    rig["steer0"], rig["drive0"] = s["truth"]["steer0"], s["truth"]["drive0"]
    rig["axles0"] = s["truth"]["axles0"]
    rig["metric"] = s.get("metric", False)
    scale = s.get("scale", SCALE)
    d = scale["division"]
    passes, truth_passes = [], []
    plan = [("unhitched", None, None), ("hitched", None, 0.0)]
    plan += [("tensioned", label, m) for label, m in s["settings"]]
    for i, (kind, label, m) in enumerate(plan):
        st, dr, tr = loads(rig, None if kind == "unhitched" else m)
        p = {"kind": kind}
        if label is not None:
            p["setting"] = label
        p["ticket"] = f"{'QX' if scale is SCALE else 'QL'}-{s['ticket0'] + i}"  # ticket roll
        p["weighed_at"] = iso(s, 7 * i + (3 if i else 0))
        p["steer"], p["drive"] = rnd(st, d), rnd(dr, d)
        if tr is not None:
            p["trailer"] = rnd(tr, d)
        key = f"{kind}:{label}" if label is not None else kind
        plant = s.get("plant")
        if plant and plant.get("pass") == key:
            if p[plant["platform"]] != plant["was"]:
                sys.exit(f"generate.py: {s['file']}: planted error expects {plant['platform']}="
                         f"{plant['was']}, the statics give {p[plant['platform']]}")
            p[plant["platform"]] = plant["keyed"]
        if s["gross_on"] == "all":
            p["gross"] = p["steer"] + p["drive"] + p.get("trailer", 0)
        passes.append(p)
        truth_passes.append({"ticket": p["ticket"], "bar_moment": m if kind == "tensioned"
                             else None, "steer": round(st, 1), "drive": round(dr, 1),
                             "trailer": None if tr is None else round(tr, 1)})
    session = {
        "format": "scaleproof-session/1",
        "station": STATION,
        "operator": s["operator"],
        "owner": s["owner"],
        "units": {"weight": "kg", "length": "mm"} if rig["metric"] else
                 {"weight": "lb", "length": "in"},
        "scale": scale,
        "tow_vehicle": s["tow"],
        "trailer": s["trailer"],
        "passes": passes,
        "notes": "Invented demo data. " + s["story"],
    }
    t, l_, o = s["truth"]["tongue"], s["truth"]["ball_to_axle"], s["truth"]["rear_axle_to_ball"]
    trailer_weight = t + s["truth"]["axles0"]
    truth = {
        "story": s["story"], "station": STATION, "operator": s["operator"], "owner": s["owner"],
        "units": {"weight": "kg", "length": "mm", "moment": "N*m"} if rig["metric"] else
                 {"weight": "lb", "length": "in", "moment": "lbf*ft"},
        "tongue_load": t, "trailer_weight": trailer_weight,
        "tongue_percent": round(100.0 * t / trailer_weight, 3),
        "rear_axle_to_ball": o, "ball_to_axle": l_,
        "entered": {"rear_axle_to_ball": s["tow"]["rear_axle_to_ball"],
                    "ball_to_axle": s["trailer"]["ball_to_axle"]},
        "planted": s.get("plant"),
        "passes": truth_passes,
    }
    if s["settings"]:
        # M = f*T*o*L/(L+o), f = the FALR target (references.md), in lbf*ft.
        f = s["tow"].get("falr_target", 50) / 100.0
        to_model = 1000.0 / 9.80665 if rig["metric"] else 12.0  # moment unit -> weight*length
        truth["target_bar_moment"] = round(f * t * o * l_ / (l_ + o) / to_model, 1)
        truth["falr_percent"] = [round(100.0 * (to_model * m) * (1 + o / l_) / (t * o), 2)
                                 for _, m in s["settings"]]
    return session, truth


def return_visit_csv():
    v = RETURN_VISIT
    rig = dict(v["truth"])
    rig["wheelbase"] = v["wheelbase"]
    cols = ["session", "scale", "rig", "operator", "kind", "setting", "ticket", "weighed_at",
            "steer", "drive", "trailer", "gross", "entered_by"]
    lines = [",".join(cols)]
    plan = [("unhitched", "", None), ("hitched", "", 0.0)]
    plan += [("tensioned", label, m) for label, m in v["settings"]]
    truth = []
    for i, (kind, label, m) in enumerate(plan):
        st, dr, tr = loads(rig, None if kind == "unhitched" else m)
        row = {"session": v["session"], "scale": SCALE["id"], "rig": v["rig"],
               "operator": v["operator"], "kind": kind, "setting": label,
               "ticket": f"QX-{v['ticket0'] + i}", "weighed_at": iso(v, 6 * i + (2 if i else 0)),
               "steer": rnd(st), "drive": rnd(dr), "trailer": "" if tr is None else rnd(tr),
               "entered_by": v["entered_by"]}
        row["gross"] = row["steer"] + row["drive"] + (row["trailer"] or 0)
        lines.append(",".join(str(row[c]) for c in cols))
        truth.append({"ticket": row["ticket"], "bar_moment": m if kind == "tensioned"
                      else None, "steer": round(st, 1), "drive": round(dr, 1),
                      "trailer": None if tr is None else round(tr, 1)})
    t = v["truth"]
    return "\n".join(lines) + "\n", {
        "story": "Return visit of rig RA-1, logged as CSV by the scale office.",
        "units": {"weight": "lb", "length": "in", "moment": "lbf*ft"},
        "tongue_load": t["tongue"], "trailer_weight": t["tongue"] + t["axles0"],
        "rear_axle_to_ball": t["rear_axle_to_ball"], "ball_to_axle": t["ball_to_axle"],
        "passes": truth}


def rig_toml(s):
    """The rig as a `scaleproof rig add --file` TOML file (keys of src/cli/cmd_rig.cpp)."""
    def val(v):
        return json.dumps(v) if isinstance(v, str) else str(v)
    wu, lu = ("kg", "mm") if s.get("metric") else ("lb", "in")
    out = [f'name = {val(s["rig"])}', "", "[units]", f'weight = "{wu}"', f'length = "{lu}"', "",
           "[tow_vehicle]"]
    out += [f"{k} = {val(v)}" for k, v in s["tow"].items()]
    out += ["", "[trailer]"]
    for k, v in s["trailer"].items():
        out.append(f"{k} = {val(v)}")
    return "# Invented demo rig (data-demo/generate.py).\n" + "\n".join(out) + "\n"


def manifest():
    return {
        "format": "scaleproof-demo/1",
        "note": "Invented demo scenario; every name, place, vehicle and ticket is made up.",
        "station": STATION,
        "scale": dict(SCALE, inspections=INSPECTIONS),
        "rigs": [{"name": s["rig"], "from_session": f"sessions/{s['file']}.json"}
                 for s in SESSIONS if "rig" in s],
        "sessions": [f"sessions/{s['file']}.json" for s in SESSIONS],
        "pass_csv": [f"passes/{RETURN_VISIT['file']}.csv"],
        "audit": {"claim_date": "2026-11-18", "audit_time": "2026-11-20T12:00:00Z"},
        # What the demo must find: the two planted errors, each named where it was planted.
        "expect": [
            {"session": "sessions/03-mis-keyed-reading.json", "flag": "inconsistent-reading",
             "ticket": "QX-4390", "platform": "drive"},
            {"session": "sessions/04-wrong-tape-length.json", "flag": "geometry-mismatch",
             "field": "ball_to_axle"},
        ],
    }


def dump(obj):
    return json.dumps(obj, indent=2) + "\n"


def emit(path, text, check, stale):
    """Writes `text` to `path`, or with `check` only notes whether the file differs."""
    if check:
        try:
            with open(path, encoding="utf-8") as f:
                if f.read() != text:
                    stale.append(path)
        except FileNotFoundError:
            stale.append(path)
        return
    os.makedirs(os.path.dirname(path), exist_ok=True)
    with open(path, "w", encoding="utf-8") as f:
        f.write(text)


def main():
    check = "--check" in sys.argv[1:]
    stale = []
    files = []
    for s in SESSIONS:
        session, truth = build(s)
        files += [(f"sessions/{s['file']}.json", dump(session)),
                  (f"truth/{s['file']}.json", dump(truth))]
    csv, csv_truth = return_visit_csv()
    files += [("passes/" + RETURN_VISIT["file"] + ".csv", csv),
              ("truth/" + RETURN_VISIT["file"] + ".json", dump(csv_truth)),
              ("demo.json", dump(manifest()))]
    files += [(f"rigs/{s['rig']}.toml", rig_toml(s)) for s in SESSIONS]
    for rel, text in files:
        emit(os.path.join(HERE, rel), text, check, stale)
    if stale:
        print("generate.py: these files differ from what the statics give:\n  " +
              "\n  ".join(stale), file=sys.stderr)
        return 1
    return 0


if __name__ == "__main__":
    sys.exit(main())
