-- 003: solved results keyed by a hash of every input that affects them (docs/design.md §8). A changed
-- input gives a new key, so a stale entry is never found as fresh.

CREATE TABLE results_cache (
  key        TEXT NOT NULL CONSTRAINT ResultsCache_pk PRIMARY KEY,
  json       TEXT NOT NULL CONSTRAINT ResultsCache_ck_json CHECK (json_valid(json)),
  created_at TEXT NOT NULL
);
CREATE INDEX ResultsCache_ix_createdAt ON results_cache (created_at);
