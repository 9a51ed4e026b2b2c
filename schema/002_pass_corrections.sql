-- Migration 002: pass corrections, and append-only guards that cost little per inserted row.
-- Nothing stored is changed: no row of any table is written, rewritten or moved. What changes
-- is the schema (sqlite_schema): one new chained table, the `*_no_replace` triggers replaced,
-- and the text of one CHECK in `passes` rewritten to an equivalent form (see 3 below).
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

-- 2. The INSERT guards. INSERT OR REPLACE deletes the row it collides with without firing the
-- DELETE trigger when recursive_triggers is off (the stock shell's default: SQLite docs,
-- "CREATE TRIGGER" and "ON CONFLICT"), so a BEFORE INSERT trigger must refuse a row that
-- would collide. 001 asked one EXISTS over `id = NEW.id OR seq = NEW.seq OR key = NEW.key`,
-- which SQLite answers with a multi-index OR (a RowSet, i.e. an ephemeral structure, per row).
-- The chain's own columns do most of the work instead: rows are only ever appended, so a
-- legitimate row's id and seq are above every stored one, and a row at or below the top
-- (a collision, or a row slipped into a gap) is refused with two max() lookups (each one step
-- to the b-tree's last entry). Only a table's other UNIQUE keys need an index probe each.
-- Measured with bench/ledger_import.sql (bench/README.md, "append-only guards").
DROP TRIGGER scales_no_replace;
CREATE TRIGGER scales_no_replace BEFORE INSERT ON scales
  WHEN NEW.id <= (SELECT max(id) FROM scales) OR NEW.seq <= (SELECT max(seq) FROM scales)
    OR EXISTS (SELECT 1 FROM scales WHERE code = NEW.code)
  BEGIN SELECT RAISE(ABORT, 'scales is append-only: a row with this id or key exists and cannot be replaced'); END;

DROP TRIGGER scale_inspections_no_replace;
CREATE TRIGGER scale_inspections_no_replace BEFORE INSERT ON scale_inspections
  WHEN NEW.id <= (SELECT max(id) FROM scale_inspections)
    OR NEW.seq <= (SELECT max(seq) FROM scale_inspections)
  BEGIN SELECT RAISE(ABORT, 'scale_inspections is append-only: a row with this id or key exists and cannot be replaced'); END;

DROP TRIGGER vehicles_no_replace;
CREATE TRIGGER vehicles_no_replace BEFORE INSERT ON vehicles
  WHEN NEW.id <= (SELECT max(id) FROM vehicles) OR NEW.seq <= (SELECT max(seq) FROM vehicles)
  BEGIN SELECT RAISE(ABORT, 'vehicles is append-only: a row with this id or key exists and cannot be replaced'); END;

DROP TRIGGER trailers_no_replace;
CREATE TRIGGER trailers_no_replace BEFORE INSERT ON trailers
  WHEN NEW.id <= (SELECT max(id) FROM trailers) OR NEW.seq <= (SELECT max(seq) FROM trailers)
  BEGIN SELECT RAISE(ABORT, 'trailers is append-only: a row with this id or key exists and cannot be replaced'); END;

DROP TRIGGER rigs_no_replace;
CREATE TRIGGER rigs_no_replace BEFORE INSERT ON rigs
  WHEN NEW.id <= (SELECT max(id) FROM rigs) OR NEW.seq <= (SELECT max(seq) FROM rigs)
    OR EXISTS (SELECT 1 FROM rigs WHERE name = NEW.name)
  BEGIN SELECT RAISE(ABORT, 'rigs is append-only: a row with this id or key exists and cannot be replaced'); END;

DROP TRIGGER sessions_no_replace;
CREATE TRIGGER sessions_no_replace BEFORE INSERT ON sessions
  WHEN NEW.id <= (SELECT max(id) FROM sessions) OR NEW.seq <= (SELECT max(seq) FROM sessions)
    OR EXISTS (SELECT 1 FROM sessions WHERE ref = NEW.ref)
  BEGIN SELECT RAISE(ABORT, 'sessions is append-only: a row with this id or key exists and cannot be replaced'); END;

DROP TRIGGER session_closings_no_replace;
CREATE TRIGGER session_closings_no_replace BEFORE INSERT ON session_closings
  WHEN NEW.id <= (SELECT max(id) FROM session_closings)
    OR NEW.seq <= (SELECT max(seq) FROM session_closings)
    OR EXISTS (SELECT 1 FROM session_closings WHERE session_id = NEW.session_id)
  BEGIN SELECT RAISE(ABORT, 'session_closings is append-only: a row with this id or key exists and cannot be replaced'); END;

-- Passes use their id as seq, so one max() covers both.
DROP TRIGGER passes_no_replace;
CREATE TRIGGER passes_no_replace BEFORE INSERT ON passes
  WHEN NEW.id <= (SELECT max(id) FROM passes)
    OR EXISTS (SELECT 1 FROM passes WHERE session_id = NEW.session_id AND ticket = NEW.ticket)
  BEGIN SELECT RAISE(ABORT, 'passes is append-only: a row with this id or key exists and cannot be replaced'); END;

DROP TRIGGER corrections_no_replace;
CREATE TRIGGER corrections_no_replace BEFORE INSERT ON corrections
  WHEN NEW.id <= (SELECT max(id) FROM corrections) OR NEW.seq <= (SELECT max(seq) FROM corrections)
    OR EXISTS (SELECT 1 FROM corrections WHERE pass_id = NEW.pass_id)
  BEGIN SELECT RAISE(ABORT, 'corrections is append-only: a row with this id or key exists and cannot be replaced'); END;

DROP TRIGGER issued_reports_no_replace;
CREATE TRIGGER issued_reports_no_replace BEFORE INSERT ON issued_reports
  WHEN NEW.id <= (SELECT max(id) FROM issued_reports)
    OR NEW.seq <= (SELECT max(seq) FROM issued_reports)
    OR EXISTS (SELECT 1 FROM issued_reports WHERE report_id = NEW.report_id)
  BEGIN SELECT RAISE(ABORT, 'issued_reports is append-only: a row with this id or key exists and cannot be replaced'); END;

CREATE TRIGGER pass_corrections_no_replace BEFORE INSERT ON pass_corrections
  WHEN NEW.id <= (SELECT max(id) FROM pass_corrections)
    OR NEW.seq <= (SELECT max(seq) FROM pass_corrections)
  BEGIN SELECT RAISE(ABORT, 'pass_corrections is append-only: a row with this id or key exists and cannot be replaced'); END;

-- 3. passes.kind: `kind IN ('unhitched', 'hitched', 'tensioned')` makes SQLite build an
-- ephemeral table of the three values for every row it checks (a CHECK is coded without the
-- once-per-statement shortcut; more than two values rule out the no-table form). The same
-- predicate written as three comparisons needs none. Only the table's SQL text changes: both
-- forms accept exactly the same values, so every stored row still meets it, and no stored
-- byte moves (SQLite docs, "ALTER TABLE", section "Making Other Kinds Of Table Schema Changes";
-- the migration runner lifts SQLITE_DBCONFIG_DEFENSIVE for the migration only). When the text
-- is not exactly 001's, the replace() changes nothing and the old, equivalent CHECK stays.
-- writable_schema = RESET reloads this connection's schema; the DDL above already moved the
-- schema cookie, so other connections reload theirs.
PRAGMA writable_schema = ON;
UPDATE sqlite_schema
  SET sql = replace(sql, 'CHECK (kind IN (''unhitched'', ''hitched'', ''tensioned''))',
                    'CHECK (kind = ''unhitched'' OR kind = ''hitched'' OR kind = ''tensioned'')')
  WHERE type = 'table' AND name = 'passes';
PRAGMA writable_schema = RESET;
