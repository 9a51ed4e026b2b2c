#!/usr/bin/env python3
"""Writes the bad-input corpus (tests/bad-input/*.json, *.csv) and MANIFEST.tsv.

Each file is a valid base document with one thing wrong. MANIFEST.tsv lists, per file, the exit
code `scaleproof import` (and, for JSON, `scaleproof reconcile`) must give (65, EX_DATAERR) and a
fragment its one-line message must contain: the JSON path or the CSV line and column, as the
parsers' header contracts promise (src/format/session_json.h, src/format/pass_csv.h).
The files are committed; rerun this only to change the corpus (output is deterministic).
"""
import copy
import json
import os
import sys

HERE = os.path.dirname(os.path.abspath(__file__))
sys.path.insert(0, os.path.join(HERE, "..", "..", "bench"))
import gen_data  # noqa: E402
import random  # noqa: E402

BASE = gen_data.session_json(random.Random(1))
rows = []  # (file, exit code, fragment, what it shows)


def dump(doc):
    return json.dumps(doc, indent=2, ensure_ascii=False).encode("utf-8") + b"\n"


def write(name, data, fragment, why):
    with open(os.path.join(HERE, name), "wb") as f:
        f.write(data)
    rows.append((name, "65", fragment, why))


def variant(name, fragment, why, edit):
    doc = copy.deepcopy(BASE)
    edit(doc)
    write(name, dump(doc), fragment, why)


def setp(i, key, value):
    def edit(doc):
        doc["passes"][i][key] = value
    return edit


def setk(section, key, value):
    def edit(doc):
        doc[section][key] = value
    return edit


good = dump(BASE)
# --- JSON: truncated, empty, wrong shape
write("json_truncated.json", good[: len(good) // 2], "line ", "file cut in the middle")
write("json_empty.json", b"", "json_empty.json", "empty file")
write("json_array_top.json", b"[1, 2, 3]\n", "$", "top level is not an object")
write("json_trailing_garbage.json", good + b"}\n", "line ", "a second document after the first")
write("json_nested_deep.json", b"[" * 50000 + b"]" * 50000 + b"\n", "json_nested_deep.json",
      "50 000 nested arrays (must not exhaust the stack)")
variant("json_format_unknown.json", "$.format", "unknown format version",
        lambda d: d.update(format="scaleproof-session/9"))
variant("json_format_missing.json", "format", "no format field", lambda d: d.pop("format"))
variant("json_unknown_key.json", "wheelbse", "misspelt key",
        lambda d: d["tow_vehicle"].update(wheelbse=d["tow_vehicle"].pop("wheelbase")))
write("json_duplicate_key.json",
      good.replace(b'"steer": 4460,', b'"steer": 4460,\n      "steer": 4480,', 1), "steer",
      "the same key twice in one object")
variant("json_passes_not_array.json", "$.passes", "passes is an object",
        lambda d: d.update(passes={"a": 1}))
# --- wrong types
variant("json_steer_string.json", "$.passes[0].steer", "number given as a string",
        setp(0, "steer", "4460"))
variant("json_steer_null.json", "$.passes[0].steer", "null weight", setp(0, "steer", None))
variant("json_steer_bool.json", "$.passes[1].steer", "boolean weight", setp(1, "steer", True))
variant("json_division_string.json", "$.scale.division", "division as text",
        setk("scale", "division", "twenty"))
variant("json_wheelbase_array.json", "$.tow_vehicle.wheelbase", "length as an array",
        setk("tow_vehicle", "wheelbase", [138]))
# --- wrong units
variant("json_weight_unit_unknown.json", "$.units.weight", "weight unit 'stone'",
        lambda d: d["units"].update(weight="stone"))
variant("json_length_unit_unknown.json", "$.units.length", "length unit 'furlong'",
        lambda d: d["units"].update(length="furlong"))
variant("json_weight_unit_plural.json", "$.units.weight", "weight unit 'lbs' (not a unit name)",
        lambda d: d["units"].update(weight="lbs"))
variant("json_steer_with_unit.json", "$.passes[0].steer", "unit written into the value",
        setp(0, "steer", "4460 lb"))
# --- negative, zero, absurd, huge
variant("json_steer_negative.json", "$.passes[0].steer", "negative reading",
        setp(0, "steer", -40))
variant("json_trailer_negative.json", "$.passes[2].trailer", "negative trailer reading",
        setp(2, "trailer", -4600))
variant("json_drive_absurd.json", "$.passes[1].drive", "5 000 000 lb on one platform",
        setp(1, "drive", 5000000))
variant("json_wheelbase_zero.json", "$.tow_vehicle.wheelbase", "zero wheelbase",
        setk("tow_vehicle", "wheelbase", 0))
variant("json_ball_to_axle_negative.json", "$.trailer.ball_to_axle", "negative length",
        setk("trailer", "ball_to_axle", -214))
variant("json_division_zero.json", "$.scale.division", "zero scale division",
        setk("scale", "division", 0))
variant("json_falr_over.json", "$.tow_vehicle.falr_target", "FALR target 250 %",
        setk("tow_vehicle", "falr_target", 250))
write("json_huge_exponent.json", good.replace(b'"steer": 4460,', b'"steer": 1e400,', 1),
      "json_huge_exponent.json", "number beyond a double")
write("json_huge_integer.json",
      good.replace(b'"steer": 4460,', b'"steer": ' + b"9" * 400 + b",", 1),
      "json_huge_integer.json", "400-digit integer")
write("json_nan.json", good.replace(b'"steer": 4460,', b'"steer": NaN,', 1), "line ",
      "NaN is not JSON")
# --- logic: duplicates, contradictions
variant("json_duplicate_ticket.json", "T-0001002", "two passes with the same ticket",
        setp(2, "ticket", "T-0001002"))
variant("json_unhitched_trailer.json", "$.passes[0].trailer",
        "trailer reading on an unhitched pass", setp(0, "trailer", 200))
variant("json_kind_unknown.json", "$.passes[1].kind", "pass kind 'coupled'",
        setp(1, "kind", "coupled"))
variant("json_date_no_offset.json", "$.passes[0].weighed_at", "time without its UTC offset",
        setp(0, "weighed_at", "2026-01-01T09:00:00"))
variant("json_date_impossible.json", "$.passes[3].weighed_at", "February 30th",
        setp(3, "weighed_at", "2026-02-30T09:18:00-05:00"))
variant("json_setting_unhitched.json", "$.passes[0].setting", "bar setting on an unhitched pass",
        setp(0, "setting", "3"))
variant("json_fifth_wheel_behind.json", "rear_axle_to_ball",
        "fifth wheel with the coupling behind the axle, and WD passes",
        lambda d: d["trailer"].update(type="fifth-wheel"))
# --- very long strings, SQL-looking strings, encodings
variant("json_label_long.json", "$.tow_vehicle.label", "label of 100 000 characters",
        setk("tow_vehicle", "label", "x" * 100000))
variant("json_ticket_long.json", "$.passes[1].ticket", "ticket of 10 000 characters",
        setp(1, "ticket", "T" * 10000))
variant("json_sql_kind.json", "$.passes[0].kind", "SQL text where a pass kind belongs",
        setp(0, "kind", "unhitched'); DROP TABLE pass; --"))
variant("json_sql_unit.json", "$.units.weight", "SQL text where a unit belongs",
        lambda d: d["units"].update(weight="lb' OR '1'='1"))
write("json_invalid_utf8.json", good.replace(b"Bench pickup", b"Bench \xff\xfe pickup", 1),
      "json_invalid_utf8.json", "bytes that are not UTF-8 in a label")
write("json_latin1.json", good.replace(b"Bench camper", b"Caf\xe9 camper", 1),
      "json_latin1.json", "a Latin-1 byte in an otherwise UTF-8 file")
write("json_utf16.json", b"\xff\xfe" + good.decode("utf-8").encode("utf-16-le"),
      "json_utf16.json", "the file saved as UTF-16")
write("json_nul_byte.json", good.replace(b'"T-0001001"', b'"T-00\x0001001"', 1),
      "json_nul_byte.json", "a raw NUL byte inside a string")
# --- text that displays differently from what is stored (format/validate.h)
variant("json_label_bidi.json", "$.tow_vehicle.label: expected text without invisible",
        "right-to-left override U+202E in a label", setk("tow_vehicle", "label", "Bench\u202epickup"))
variant("json_ticket_zero_width.json", "$.passes[1].ticket: expected text without invisible",
        "zero width space U+200B in a ticket", setp(1, "ticket", "T-000\u200b1002"))
variant("json_label_isolate.json", "$.trailer.label: expected text without invisible",
        "right-to-left isolate U+2067 in a label", setk("trailer", "label", "Bench\u2067camper"))
variant("json_label_esc.json", "$.tow_vehicle.label: expected text without control characters, got control character U+001B",
        "ESC in a label", setk("tow_vehicle", "label", "Bench\u001b[31mpickup"))
variant("json_gvwr_huge.json", "$.tow_vehicle.gvwr: expected a rating greater than 0 and at most 200000 lb",
        "GVWR 1e308 (a 309-digit limit)", setk("tow_vehicle", "gvwr", 1e308))


if __name__ == "__main__":
    csv_rows = []
    try:
        import csv_cases  # written once the CSV columns are settled
        csv_rows = csv_cases.write_all(HERE)
    except ImportError:
        pass
    with open(os.path.join(HERE, "MANIFEST.tsv"), "w") as f:
        f.write("# file\texit\tmessage fragment\twhat is wrong\n")
        for r in rows + csv_rows:
            f.write("\t".join(r) + "\n")
    print("wrote %d files" % (len(rows) + len(csv_rows)))
