-- 006: solved results stored per job (one net, or one strobe's bus-wide result) under the hash of that
-- job's inputs, and the board's latest solve as a small manifest (docs/board-partitioning.md §4).
-- Replaces the whole-board result blobs of results_cache (003), whose entries are dropped: they are a
-- cache, every one of them can be recomputed.
--
-- `slot` names what an entry is the answer for (job kind and net, or a bus of the latest solve): a new
-- entry for a slot replaces the older one, so the table holds at most one entry per slot and does not
-- grow with edits. A whole-board solve also prunes every entry its manifest does not name.

CREATE TABLE solve_result (
  key       TEXT NOT NULL CONSTRAINT SolveResult_pk PRIMARY KEY,
  slot      TEXT NOT NULL,
  json      TEXT NOT NULL CONSTRAINT SolveResult_ck_json CHECK (json_valid(json)),
  stored_at TEXT NOT NULL   -- ISO 8601 UTC
);
CREATE INDEX SolveResult_ix_slot ON solve_result (slot);

-- One row per scope ('board'): the latest whole-board solve, its input fingerprint and the keys of its
-- per-bus entries in solve_result (JSON, a few hundred bytes per bus).
CREATE TABLE solve_manifest (
  scope       TEXT NOT NULL CONSTRAINT SolveManifest_pk PRIMARY KEY,
  fingerprint TEXT NOT NULL,
  solved_at   TEXT NOT NULL,   -- ISO 8601 UTC
  json        TEXT NOT NULL CONSTRAINT SolveManifest_ck_json CHECK (json_valid(json))
);

DELETE FROM results_cache WHERE key LIKE 'board:%';
