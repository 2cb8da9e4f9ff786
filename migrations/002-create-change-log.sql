-- 002: who changed what and when. One row per edit or import (each is one transaction).

CREATE TABLE change_log (
  id     INTEGER NOT NULL CONSTRAINT ChangeLog_pk PRIMARY KEY AUTOINCREMENT,
  at     TEXT NOT NULL,   -- ISO 8601 UTC
  author TEXT NOT NULL,
  action TEXT NOT NULL,   -- e.g. 'update-bus', 'import-lengths'
  detail TEXT NOT NULL    -- one line for people
);
CREATE INDEX ChangeLog_ix_at ON change_log (at);
