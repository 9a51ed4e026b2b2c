-- Migration 003: signed checkpoints.
-- A checkpoint is a chained row that states the chain as it stood just before it: `rows` (the
-- chain positions 1..rows) and `head` (hex SHA-256 of row `rows`), signed by the station key
-- (`public_key`, raw Ed25519 in hex; `signature`, 64 bytes in hex) over the message defined in
-- src/report/checkpoint.h. Recomputing every hash after a rewrite cannot re-sign the checkpoints
-- without the key, so `scaleproof check-store` names a rewrite made behind a checkpoint.
-- Append-only like every table of 001 (same three guards).
CREATE TABLE checkpoints (
  id INTEGER PRIMARY KEY,
  seq INTEGER NOT NULL UNIQUE,
  hash BLOB NOT NULL,
  rows INTEGER NOT NULL CHECK (rows > 0),
  head TEXT NOT NULL CHECK (length(head) = 64),
  public_key TEXT NOT NULL CHECK (length(public_key) = 64),
  key_fingerprint TEXT NOT NULL,
  signature TEXT NOT NULL CHECK (length(signature) = 128),
  signed_by TEXT,
  signed_at TEXT NOT NULL
) STRICT;

CREATE TRIGGER checkpoints_no_update BEFORE UPDATE ON checkpoints
  BEGIN SELECT RAISE(ABORT, 'checkpoints is append-only: rows cannot be changed'); END;
CREATE TRIGGER checkpoints_no_delete BEFORE DELETE ON checkpoints
  BEGIN SELECT RAISE(ABORT, 'checkpoints is append-only: rows cannot be deleted'); END;
CREATE TRIGGER checkpoints_no_replace BEFORE INSERT ON checkpoints
  WHEN EXISTS (SELECT 1 FROM checkpoints WHERE id = NEW.id OR seq = NEW.seq)
  BEGIN SELECT RAISE(ABORT, 'checkpoints is append-only: a row with this id or key exists and cannot be replaced'); END;
