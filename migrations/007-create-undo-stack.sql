-- 007: undo and redo of authoring edits (docs/design-file.md §9). Each entry holds the whole project
-- as JSON (core/project/model.ts shapes, SI units): on the undo stack as it was before the edit, on the
-- redo stack as it was before the undo. The newest entry of a stack has the highest id. Kept in the
-- project file so the history survives closing and reopening it.

CREATE TABLE undo_entry (
  id       INTEGER NOT NULL CONSTRAINT UndoEntry_pk PRIMARY KEY AUTOINCREMENT,
  stack    TEXT NOT NULL CONSTRAINT UndoEntry_ck_stack CHECK (stack IN ('undo', 'redo')),
  action   TEXT NOT NULL,   -- the edit, e.g. 'create-bus'
  detail   TEXT NOT NULL,   -- its change-log line
  at       TEXT NOT NULL,   -- ISO 8601 UTC of the edit
  snapshot TEXT NOT NULL    -- ProjectData JSON
);
CREATE INDEX UndoEntry_ix_stack ON undo_entry (stack, id);
