-- Migration 001: the ticket store.
-- Every table is append-only and chained: `seq` is the row's position in the one hash chain
-- that runs across all tables (passes use their id as seq), and `hash` is
-- SHA-256(previous row's hash || canonical encoding of this row), see src/store/chain.h.
-- Triggers refuse UPDATE and DELETE, and refuse an INSERT that would land on an existing id
-- (INSERT OR REPLACE would otherwise delete the old row without firing the DELETE trigger,
-- because recursive_triggers is off by default: SQLite docs, "CREATE TRIGGER" and "ON CONFLICT").
-- Triggers only guard against mistakes; the hash chain,
-- checked by `scaleproof check-store`, is what catches changes made behind the tool's back.
-- State changes (a session closed, a scale inspected, a pass voided) are new rows.
-- application_id marks the file as a scaleproof store ("sprf").
PRAGMA application_id = 1936749158;

CREATE TABLE scales (
  id INTEGER PRIMARY KEY,
  seq INTEGER NOT NULL UNIQUE,
  hash BLOB NOT NULL,
  code TEXT NOT NULL UNIQUE,               -- the station's own scale id, e.g. 'ST-3'
  name TEXT,
  location TEXT,
  unit TEXT NOT NULL CHECK (unit IN ('lb', 'kg')),
  division REAL NOT NULL CHECK (division > 0),
  accuracy_class TEXT NOT NULL,
  capacity REAL CHECK (capacity IS NULL OR capacity > 0),
  reading_uncertainty REAL CHECK (reading_uncertainty IS NULL OR reading_uncertainty > 0),
  entered_by TEXT,
  entered_at TEXT NOT NULL
) STRICT;

CREATE TRIGGER scales_no_update BEFORE UPDATE ON scales
  BEGIN SELECT RAISE(ABORT, 'scales is append-only: rows cannot be changed'); END;
CREATE TRIGGER scales_no_delete BEFORE DELETE ON scales
  BEGIN SELECT RAISE(ABORT, 'scales is append-only: rows cannot be deleted'); END;
CREATE TRIGGER scales_no_replace BEFORE INSERT ON scales
  WHEN EXISTS (SELECT 1 FROM scales WHERE id = NEW.id OR seq = NEW.seq OR code = NEW.code)
  BEGIN SELECT RAISE(ABORT, 'scales is append-only: a row with this id or key exists and cannot be replaced'); END;

CREATE TABLE scale_inspections (
  id INTEGER PRIMARY KEY,
  seq INTEGER NOT NULL UNIQUE,
  hash BLOB NOT NULL,
  scale_id INTEGER NOT NULL REFERENCES scales(id),
  inspected_on TEXT NOT NULL,              -- ISO date YYYY-MM-DD
  seal TEXT,                               -- seal or certificate number
  inspector TEXT,
  notes TEXT,
  entered_by TEXT,
  entered_at TEXT NOT NULL
) STRICT;

CREATE TRIGGER scale_inspections_no_update BEFORE UPDATE ON scale_inspections
  BEGIN SELECT RAISE(ABORT, 'scale_inspections is append-only: rows cannot be changed'); END;
CREATE TRIGGER scale_inspections_no_delete BEFORE DELETE ON scale_inspections
  BEGIN SELECT RAISE(ABORT, 'scale_inspections is append-only: rows cannot be deleted'); END;
CREATE TRIGGER scale_inspections_no_replace BEFORE INSERT ON scale_inspections
  WHEN EXISTS (SELECT 1 FROM scale_inspections WHERE id = NEW.id OR seq = NEW.seq)
  BEGIN SELECT RAISE(ABORT, 'scale_inspections is append-only: a row with this id or key exists and cannot be replaced'); END;

CREATE TABLE vehicles (
  id INTEGER PRIMARY KEY,
  seq INTEGER NOT NULL UNIQUE,
  hash BLOB NOT NULL,
  label TEXT NOT NULL,
  weight_unit TEXT NOT NULL CHECK (weight_unit IN ('lb', 'kg')),
  length_unit TEXT NOT NULL CHECK (length_unit IN ('in', 'ft', 'mm', 'cm', 'm')),
  wheelbase REAL NOT NULL CHECK (wheelbase > 0),
  rear_axle_to_ball REAL NOT NULL,
  gvwr REAL,
  front_gawr REAL,
  rear_gawr REAL,
  gcwr REAL,
  hitch_tongue_rating REAL,
  hitch_trailer_rating REAL,
  falr_target REAL,
  entered_by TEXT,
  entered_at TEXT NOT NULL
) STRICT;

CREATE TRIGGER vehicles_no_update BEFORE UPDATE ON vehicles
  BEGIN SELECT RAISE(ABORT, 'vehicles is append-only: rows cannot be changed'); END;
CREATE TRIGGER vehicles_no_delete BEFORE DELETE ON vehicles
  BEGIN SELECT RAISE(ABORT, 'vehicles is append-only: rows cannot be deleted'); END;
CREATE TRIGGER vehicles_no_replace BEFORE INSERT ON vehicles
  WHEN EXISTS (SELECT 1 FROM vehicles WHERE id = NEW.id OR seq = NEW.seq)
  BEGIN SELECT RAISE(ABORT, 'vehicles is append-only: a row with this id or key exists and cannot be replaced'); END;

CREATE TABLE trailers (
  id INTEGER PRIMARY KEY,
  seq INTEGER NOT NULL UNIQUE,
  hash BLOB NOT NULL,
  label TEXT NOT NULL,
  weight_unit TEXT NOT NULL CHECK (weight_unit IN ('lb', 'kg')),
  length_unit TEXT NOT NULL CHECK (length_unit IN ('in', 'ft', 'mm', 'cm', 'm')),
  type TEXT NOT NULL CHECK (type IN ('conventional', 'fifth-wheel')),
  ball_to_axle REAL NOT NULL CHECK (ball_to_axle > 0),
  gvwr REAL,
  axle_gawr REAL,
  entered_by TEXT,
  entered_at TEXT NOT NULL
) STRICT;

CREATE TRIGGER trailers_no_update BEFORE UPDATE ON trailers
  BEGIN SELECT RAISE(ABORT, 'trailers is append-only: rows cannot be changed'); END;
CREATE TRIGGER trailers_no_delete BEFORE DELETE ON trailers
  BEGIN SELECT RAISE(ABORT, 'trailers is append-only: rows cannot be deleted'); END;
CREATE TRIGGER trailers_no_replace BEFORE INSERT ON trailers
  WHEN EXISTS (SELECT 1 FROM trailers WHERE id = NEW.id OR seq = NEW.seq)
  BEGIN SELECT RAISE(ABORT, 'trailers is append-only: a row with this id or key exists and cannot be replaced'); END;

CREATE TABLE rigs (
  id INTEGER PRIMARY KEY,
  seq INTEGER NOT NULL UNIQUE,
  hash BLOB NOT NULL,
  name TEXT NOT NULL UNIQUE,
  vehicle_id INTEGER NOT NULL REFERENCES vehicles(id),
  trailer_id INTEGER NOT NULL REFERENCES trailers(id),
  entered_by TEXT,
  entered_at TEXT NOT NULL
) STRICT;

CREATE TRIGGER rigs_no_update BEFORE UPDATE ON rigs
  BEGIN SELECT RAISE(ABORT, 'rigs is append-only: rows cannot be changed'); END;
CREATE TRIGGER rigs_no_delete BEFORE DELETE ON rigs
  BEGIN SELECT RAISE(ABORT, 'rigs is append-only: rows cannot be deleted'); END;
CREATE TRIGGER rigs_no_replace BEFORE INSERT ON rigs
  WHEN EXISTS (SELECT 1 FROM rigs WHERE id = NEW.id OR seq = NEW.seq OR name = NEW.name)
  BEGIN SELECT RAISE(ABORT, 'rigs is append-only: a row with this id or key exists and cannot be replaced'); END;

CREATE TABLE sessions (
  id INTEGER PRIMARY KEY,                  -- 1, 2, 3, ... (what users type)
  seq INTEGER NOT NULL UNIQUE,
  hash BLOB NOT NULL,
  ref TEXT UNIQUE,                         -- optional external key (CSV `session` column)
  rig_id INTEGER NOT NULL REFERENCES rigs(id),
  scale_id INTEGER NOT NULL REFERENCES scales(id),
  station TEXT,
  operator TEXT,
  owner TEXT,
  notes TEXT,
  length_uncertainty REAL CHECK (length_uncertainty IS NULL OR length_uncertainty > 0),
  opened_by TEXT,
  opened_at TEXT NOT NULL
) STRICT;

CREATE TRIGGER sessions_no_update BEFORE UPDATE ON sessions
  BEGIN SELECT RAISE(ABORT, 'sessions is append-only: rows cannot be changed'); END;
CREATE TRIGGER sessions_no_delete BEFORE DELETE ON sessions
  BEGIN SELECT RAISE(ABORT, 'sessions is append-only: rows cannot be deleted'); END;
CREATE TRIGGER sessions_no_replace BEFORE INSERT ON sessions
  WHEN EXISTS (SELECT 1 FROM sessions WHERE id = NEW.id OR seq = NEW.seq OR ref = NEW.ref)
  BEGIN SELECT RAISE(ABORT, 'sessions is append-only: a row with this id or key exists and cannot be replaced'); END;

CREATE TABLE session_closings (
  id INTEGER PRIMARY KEY,
  seq INTEGER NOT NULL UNIQUE,
  hash BLOB NOT NULL,
  session_id INTEGER NOT NULL UNIQUE REFERENCES sessions(id),
  closed_by TEXT,
  closed_at TEXT NOT NULL
) STRICT;

CREATE TRIGGER session_closings_no_update BEFORE UPDATE ON session_closings
  BEGIN SELECT RAISE(ABORT, 'session_closings is append-only: rows cannot be changed'); END;
CREATE TRIGGER session_closings_no_delete BEFORE DELETE ON session_closings
  BEGIN SELECT RAISE(ABORT, 'session_closings is append-only: rows cannot be deleted'); END;
CREATE TRIGGER session_closings_no_replace BEFORE INSERT ON session_closings
  WHEN EXISTS (SELECT 1 FROM session_closings WHERE id = NEW.id OR seq = NEW.seq OR session_id = NEW.session_id)
  BEGIN SELECT RAISE(ABORT, 'session_closings is append-only: a row with this id or key exists and cannot be replaced'); END;

CREATE TABLE passes (
  id INTEGER PRIMARY KEY,                  -- equals the pass's position in the chain (seq)
  hash BLOB NOT NULL,
  session_id INTEGER NOT NULL REFERENCES sessions(id),
  kind TEXT NOT NULL CHECK (kind IN ('unhitched', 'hitched', 'tensioned')),
  setting TEXT,
  ticket TEXT NOT NULL,
  weighed_at TEXT NOT NULL,
  steer REAL NOT NULL CHECK (steer >= 0),
  drive REAL NOT NULL CHECK (drive >= 0),
  trailer REAL CHECK (trailer IS NULL OR trailer >= 0),
  gross REAL CHECK (gross IS NULL OR gross >= 0),
  scale_code TEXT,                         -- when the ticket came from another scale
  entered_by TEXT,
  entered_at TEXT NOT NULL,
  UNIQUE (session_id, ticket)
) STRICT;

CREATE TRIGGER passes_no_update BEFORE UPDATE ON passes
  BEGIN SELECT RAISE(ABORT, 'passes is append-only: rows cannot be changed'); END;
CREATE TRIGGER passes_no_delete BEFORE DELETE ON passes
  BEGIN SELECT RAISE(ABORT, 'passes is append-only: rows cannot be deleted'); END;
CREATE TRIGGER passes_no_replace BEFORE INSERT ON passes
  WHEN EXISTS (SELECT 1 FROM passes WHERE id = NEW.id OR (session_id = NEW.session_id AND ticket = NEW.ticket))
  BEGIN SELECT RAISE(ABORT, 'passes is append-only: a row with this id or key exists and cannot be replaced'); END;

CREATE TABLE corrections (
  id INTEGER PRIMARY KEY,
  seq INTEGER NOT NULL UNIQUE,
  hash BLOB NOT NULL,
  pass_id INTEGER NOT NULL UNIQUE REFERENCES passes(id),
  action TEXT NOT NULL CHECK (action IN ('void')),
  reason TEXT NOT NULL CHECK (length(reason) > 0),
  made_by TEXT,
  made_at TEXT NOT NULL
) STRICT;

CREATE TRIGGER corrections_no_update BEFORE UPDATE ON corrections
  BEGIN SELECT RAISE(ABORT, 'corrections is append-only: rows cannot be changed'); END;
CREATE TRIGGER corrections_no_delete BEFORE DELETE ON corrections
  BEGIN SELECT RAISE(ABORT, 'corrections is append-only: rows cannot be deleted'); END;
CREATE TRIGGER corrections_no_replace BEFORE INSERT ON corrections
  WHEN EXISTS (SELECT 1 FROM corrections WHERE id = NEW.id OR seq = NEW.seq OR pass_id = NEW.pass_id)
  BEGIN SELECT RAISE(ABORT, 'corrections is append-only: a row with this id or key exists and cannot be replaced'); END;

CREATE TABLE issued_reports (
  id INTEGER PRIMARY KEY,
  seq INTEGER NOT NULL UNIQUE,
  hash BLOB NOT NULL,
  session_id INTEGER NOT NULL REFERENCES sessions(id),
  report_id TEXT NOT NULL UNIQUE,
  pdf_sha256 TEXT NOT NULL CHECK (length(pdf_sha256) = 64),
  key_fingerprint TEXT NOT NULL,
  signed_by TEXT,
  issued_at TEXT NOT NULL
) STRICT;

CREATE TRIGGER issued_reports_no_update BEFORE UPDATE ON issued_reports
  BEGIN SELECT RAISE(ABORT, 'issued_reports is append-only: rows cannot be changed'); END;
CREATE TRIGGER issued_reports_no_delete BEFORE DELETE ON issued_reports
  BEGIN SELECT RAISE(ABORT, 'issued_reports is append-only: rows cannot be deleted'); END;
CREATE TRIGGER issued_reports_no_replace BEFORE INSERT ON issued_reports
  WHEN EXISTS (SELECT 1 FROM issued_reports WHERE id = NEW.id OR seq = NEW.seq OR report_id = NEW.report_id)
  BEGIN SELECT RAISE(ABORT, 'issued_reports is append-only: a row with this id or key exists and cannot be replaced'); END;

CREATE INDEX sessions_by_rig ON sessions(rig_id);
CREATE INDEX scale_inspections_by_scale ON scale_inspections(scale_id);
CREATE INDEX issued_reports_by_session ON issued_reports(session_id);
