-- Migration 002: pass corrections, and a cheaper check of passes.kind on every inserted row.
-- Nothing stored is changed: no row of any table is written, rewritten or moved. What changes
-- is the schema (sqlite_schema): one new chained table with its guards, and the text of one
-- CHECK in `passes` rewritten to an equivalent form (see 3 below).
-- Every old row, its hash and the chain head stay exactly as they were
-- (store_migrate_test opens a version-1 store made by the version-1 code and proves it).

-- 1. pass_corrections: a correction that supersedes a pass and keeps its ticket number (the
-- re-keyed ticket is the same paper ticket). Each row holds the pass's complete corrected
-- values, not a difference; the latest correction of a pass (highest id) is what the engine
-- gets. A pass may be corrected again (each correction stays on record); a voided pass cannot
-- be corrected (store.h, correct_pass). Chained like every table: see 001 and src/store/chain.h.
CREATE TABLE pass_corrections (
  id INTEGER PRIMARY KEY,
  seq INTEGER NOT NULL UNIQUE,
  hash BLOB NOT NULL,
  pass_id INTEGER NOT NULL REFERENCES passes(id),
  kind TEXT NOT NULL CHECK (kind = 'unhitched' OR kind = 'hitched' OR kind = 'tensioned'),
  setting TEXT,
  weighed_at TEXT NOT NULL,
  steer REAL NOT NULL CHECK (steer >= 0),
  drive REAL NOT NULL CHECK (drive >= 0),
  trailer REAL CHECK (trailer IS NULL OR trailer >= 0),
  gross REAL CHECK (gross IS NULL OR gross >= 0),
  scale_code TEXT,                         -- when the ticket came from another scale
  reason TEXT NOT NULL CHECK (length(reason) > 0),
  made_by TEXT,
  made_at TEXT NOT NULL
) STRICT;
CREATE INDEX pass_corrections_by_pass ON pass_corrections(pass_id);

CREATE TRIGGER pass_corrections_no_update BEFORE UPDATE ON pass_corrections
  BEGIN SELECT RAISE(ABORT, 'pass_corrections is append-only: rows cannot be changed'); END;
CREATE TRIGGER pass_corrections_no_delete BEFORE DELETE ON pass_corrections
  BEGIN SELECT RAISE(ABORT, 'pass_corrections is append-only: rows cannot be deleted'); END;

-- 2. The INSERT guard of the new table, as 001 guards the others: INSERT OR REPLACE deletes
-- the row it collides with without firing the DELETE trigger when recursive_triggers is off
-- (the stock shell's default: SQLite docs, "CREATE TRIGGER" and "ON CONFLICT"), so a BEFORE
-- INSERT trigger refuses a row that would collide. 001's guards stay as they are: rewritten
-- with the chain's own columns (a new row's id and seq are above every stored one: two max()
-- lookups) plus one probe per other UNIQUE key, they measured slower, not faster, than 001's
-- single EXISTS (bench/README.md, "append-only guards"); a trigger's fixed cost per row is
-- most of what any of them costs.
CREATE TRIGGER pass_corrections_no_replace BEFORE INSERT ON pass_corrections
  WHEN EXISTS (SELECT 1 FROM pass_corrections WHERE id = NEW.id OR seq = NEW.seq)
  BEGIN SELECT RAISE(ABORT, 'pass_corrections is append-only: a row with this id or key exists and cannot be replaced'); END;

-- 3. passes.kind: `kind IN ('unhitched', 'hitched', 'tensioned')` makes SQLite build an
-- ephemeral table of the three values for every row it checks (a CHECK is coded without the
-- once-per-statement shortcut; more than two values rule out the no-table form). The same
-- predicate written as three comparisons needs none. Only the table's SQL text changes: both
-- forms accept exactly the same values, so every stored row still meets it, and no stored
-- byte moves (SQLite docs, "ALTER TABLE", section "Making Other Kinds Of Table Schema Changes";
-- the migration runner lifts SQLITE_DBCONFIG_DEFENSIVE for the migration only). When the text
-- is not exactly 001's, the replace() changes nothing and the old, equivalent CHECK stays.
-- writable_schema = RESET reloads this connection's schema; the CREATEs above already moved
-- the schema cookie, so other connections reload theirs.
PRAGMA writable_schema = ON;
UPDATE sqlite_schema
  SET sql = replace(sql, 'CHECK (kind IN (''unhitched'', ''hitched'', ''tensioned''))',
                    'CHECK (kind = ''unhitched'' OR kind = ''hitched'' OR kind = ''tensioned'')')
  WHERE type = 'table' AND name = 'passes';
PRAGMA writable_schema = RESET;
