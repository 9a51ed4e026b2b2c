-- Reference for benchmark item 1 (bench/run): the stock sqlite3 shell storing the same CSV into
-- the ledger's own schema (every CHECK, UNIQUE, foreign key and append-only trigger), with
-- none of scaleproof's work (no validation of readings, no hash chain: hashes are zero).
-- It stages the CSV with .import, then stores it with one INSERT ... SELECT per table, which
-- is the cheapest way SQLite can do it. CSVFILE is replaced by bench/run.
PRAGMA foreign_keys = ON;
PRAGMA recursive_triggers = ON;
CREATE TEMP TABLE raw(session TEXT, scale TEXT, rig TEXT, kind TEXT, setting TEXT, ticket TEXT,
  weighed_at TEXT, steer TEXT, drive TEXT, trailer TEXT, gross TEXT, entered_by TEXT);
.import --csv --skip 1 --schema temp CSVFILE raw
BEGIN;
INSERT INTO sessions(id, seq, hash, ref, rig_id, scale_id, opened_at)
  SELECT min(rowid), 1000000000 + min(rowid), zeroblob(32), session,
         (SELECT id FROM rigs WHERE name = rig), (SELECT id FROM scales WHERE code = scale),
         '2026-12-01T00:00:00Z'
  FROM temp.raw GROUP BY session ORDER BY 1;
INSERT INTO passes(id, hash, session_id, kind, setting, ticket, weighed_at, steer, drive,
                   trailer, gross, entered_by, entered_at)
  SELECT 3000000000 + r.rowid, zeroblob(32), s.id, r.kind, nullif(r.setting, ''), r.ticket,
         r.weighed_at, CAST(r.steer AS REAL), CAST(r.drive AS REAL),
         CAST(nullif(r.trailer, '') AS REAL), CAST(nullif(r.gross, '') AS REAL),
         nullif(r.entered_by, ''), '2026-12-01T00:00:00Z'
  FROM temp.raw r JOIN sessions s ON s.ref = r.session ORDER BY r.rowid;
COMMIT;
