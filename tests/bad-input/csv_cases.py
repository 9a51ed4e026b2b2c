"""CSV half of the bad-input corpus (called by generate.py).

The base file is one valid session of four passes (the same readings as the JSON base) on the
scale ST-1 and rig 1 that the e2e test's store holds after importing
tests/fuzz/corpus/session_json/valid_1.json. Each file breaks one thing; the expected fragment
is "<line>: <column>" as format/pass_csv.h promises ("<source>:<line>: <column>: ..."), or for
the store's checks "<line>: ticket T, pass KIND: <platform>".
"""
import os

COLUMNS = ["session", "scale", "rig", "kind", "setting", "ticket", "weighed_at", "steer",
           "drive", "trailer", "gross", "entered_by"]


def base_rows(base_session, key="K-1"):
    rows = []
    for p in base_session["passes"]:
        rows.append({"session": key, "scale": "ST-1", "rig": "1", "kind": p["kind"],
                     "setting": p.get("setting", ""), "ticket": "C" + p["ticket"][1:],
                     "weighed_at": p["weighed_at"], "steer": str(p["steer"]),
                     "drive": str(p["drive"]), "trailer": str(p.get("trailer", "")),
                     "gross": str(p["gross"]), "entered_by": "bench"})
    return rows


def render(rows, columns=COLUMNS):
    out = ",".join(columns) + "\n"
    for r in rows:
        out += ",".join(r.get(c, "") for c in columns) + "\n"
    return out.encode("utf-8")


def write_all(here):
    import copy
    import random
    import sys
    sys.path.insert(0, os.path.join(here, "..", "..", "bench"))
    import gen_data
    base = gen_data.session_json(random.Random(1))
    rows = []

    def write(name, data, fragment, why):
        with open(os.path.join(here, name), "wb") as f:
            f.write(data)
        rows.append((name, "65", fragment, why))

    def variant(name, fragment, why, i, column, value):
        r = copy.deepcopy(base_rows(base))
        r[i][column] = value
        write(name, render(r), fragment, why)

    good = render(base_rows(base))
    write("csv_empty.csv", b"", "csv_empty.csv", "empty file (no header)")
    write("csv_missing_column.csv",
          render(base_rows(base), [c for c in COLUMNS if c != "ticket"]), "ticket",
          "header without the required ticket column")
    write("csv_unknown_column.csv", good.replace(b",steer,", b",steer_lb,", 1), "steer_lb",
          "unknown column name")
    write("csv_duplicate_column.csv", good.replace(b",gross,", b",drive,", 1), "drive",
          "the same column twice")
    variant("csv_steer_text.csv", ":3: steer", "reading is text", 1, "steer", "abc")
    variant("csv_steer_negative.csv", ":2: steer", "negative reading", 0, "steer", "-20")
    variant("csv_drive_absurd.csv", ":4: drive", "9 000 000 lb on one platform", 2, "drive",
            "9000000")
    variant("csv_huge_number.csv", ":5: trailer", "1e400 overflows a double", 3, "trailer",
            "1e400")
    variant("csv_weight_with_unit.csv", ":3: drive", "unit written into the value", 1, "drive",
            "4860 lb")
    write("csv_truncated.csv", good[: len(good) - 25], ":5", "file cut inside the last row")
    variant("csv_unterminated_quote.csv", ":4", "a quote that never closes", 2, "entered_by",
            '"bench')
    variant("csv_duplicate_ticket.csv", "C-0001002", "two passes with the same ticket", 2,
            "ticket", "C-0001002")
    variant("csv_sql_kind.csv", ":3: kind", "SQL text where a pass kind belongs", 1, "kind",
            "hitched'); DROP TABLE pass; --")
    variant("csv_sql_steer.csv", ":2: steer", "SQL text where a reading belongs", 0, "steer",
            "0; DELETE FROM pass")
    variant("csv_ticket_long.csv", ":2: ticket", "ticket of 5 000 characters", 0, "ticket",
            "C" * 5000)
    write("csv_invalid_utf8.csv", good.replace(b"bench\n", b"be\xff\xfench\n", 3)
          .replace(b"be\xff\xfench\n", b"bench\n", 2), ":4: entered_by",
          "bytes that are not UTF-8")
    write("csv_latin1.csv", good.replace(b"C-0001001", b"C-000100\xe9", 1), ":2: ticket",
          "a Latin-1 byte in a ticket")
    write("csv_utf16.csv", b"\xff\xfe" + good.decode("utf-8").encode("utf-16-le"),
          "csv_utf16.csv", "the file saved as UTF-16")
    write("csv_nul_byte.csv", good.replace(b"C-0001003", b"C-00\x0001003", 1), ":4: ticket",
          "a raw NUL byte in a ticket")
    variant("csv_unknown_rig.csv", ":2: rig", "a rig the store does not have", 0, "rig",
            "R-404")
    variant("csv_unknown_scale.csv", ":2: scale", "a scale the store does not have", 0,
            "scale", "ST-9")
    variant("csv_unhitched_trailer.csv", ":2: trailer", "trailer reading on an unhitched pass",
            0, "trailer", "200")
    variant("csv_gross_mismatch.csv", ":3: ticket C-0001002, pass hitched: gross", "printed gross is not the sum", 1, "gross",
            "99999")
    variant("csv_date_no_offset.csv", ":4: weighed_at", "time without its UTC offset", 2,
            "weighed_at", "2026-01-01T09:12:00")
    variant("csv_kind_unknown.csv", ":3: kind", "pass kind 'coupled'", 1, "kind", "coupled")
    # Text that displays differently from what is stored, control characters, quoted newlines.
    variant("csv_name_bidi.csv", ":3: entered_by: expected text without invisible",
            "right-to-left override U+202E in a name", 1, "entered_by", "ben\u202ehc")
    variant("csv_ticket_bom.csv", ":2: ticket: expected text without invisible",
            "U+FEFF inside a ticket", 0, "ticket", "C-000\ufeff1001")
    variant("csv_ticket_esc.csv",
            ":4: ticket: expected text without control characters, got control character U+001B",
            "ESC in a ticket", 2, "ticket", "C-0001\x1b003")
    variant("csv_newline_quoted.csv",
            ":3: entered_by: expected one line of text, got a newline inside a quoted field",
            "a newline inside a quoted field", 1, "entered_by", '"ben\nch"')
    variant("csv_formula_steer.csv", ":2: steer: expected a number, got \"=4460\"",
            "a formula where a reading belongs", 0, "steer", "=4460")
    # All-or-nothing at size: 2 000 good rows in 500 new sessions, then one bad row.
    many = []
    for n in range(500):
        for r in base_rows(base, "M-%d" % n):
            r["ticket"] = "%s-%d" % (r["ticket"], n)
            many.append(r)
    bad = copy.deepcopy(base_rows(base, "M-last"))[0]
    bad["steer"] = "-1"
    write("csv_bad_last_row.csv", render(many + [bad]), ":2002: steer",
          "2 000 good rows, then a negative reading on the last")
    return rows
