#!/usr/bin/env python3
"""The hostile full rewrite of a scaleproof ledger from issue 16, for the e2e tests only.

rewrite_ledger.py STORE "SQL" [--restore-triggers]
Drops every trigger (the append-only guards), runs SQL (e.g. change a steer reading), then
recomputes every row's hash in chain order with the public SPR1 encoding (src/store/chain.h),
so the chain links again. --restore-triggers re-creates the triggers exactly as they were, so
the schema looks untouched too. Only a signed checkpoint or an outside anchor catches it.
"""
import hashlib
import sqlite3
import struct
import sys

db = sqlite3.connect(sys.argv[1])
triggers = db.execute("SELECT name, sql FROM sqlite_schema WHERE type = 'trigger'").fetchall()
for name, _ in triggers:
    db.execute(f'DROP TRIGGER "{name}"')
db.executescript(sys.argv[2])


def field(v):
    if v is None:
        return b"\0"
    if isinstance(v, int):
        return b"\1" + struct.pack("<q", v)
    if isinstance(v, float):
        return b"\2" + struct.pack("<d", v if v != 0 else 0.0)
    b = v.encode()
    return b"\3" + struct.pack("<I", len(b)) + b


rows = []
for (t,) in db.execute("SELECT name FROM sqlite_schema WHERE type = 'table'").fetchall():
    cols = [c[1] for c in db.execute(f'PRAGMA table_info("{t}")')]
    if "hash" not in cols:
        continue
    seq = "seq" if "seq" in cols else "id"
    chained = [c for c in cols if c not in ("id", "seq", "hash")]
    for r in db.execute(f'SELECT {seq}, id, {", ".join(chained)} FROM "{t}"'):
        rows.append((r[0], t, r[1], r[2:]))
rows.sort(key=lambda r: r[0])
prev = bytes(32)
for seq, t, row_id, values in rows:
    enc = b"SPR1" + field(t) + field(seq) + field(row_id) + b"".join(map(field, values))
    prev = hashlib.sha256(prev + enc).digest()
    db.execute(f'UPDATE "{t}" SET hash = ? WHERE id = ?', (prev, row_id))
if "--restore-triggers" in sys.argv:
    for _, sql in triggers:
        db.execute(sql)
db.commit()
