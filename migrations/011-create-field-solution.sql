-- 011: 2-D field solutions of cross-sections (docs/field-solver.md §10), kept in the project so that a
-- check in a new process does not solve the same layer geometry again. Keyed by a hash of the exact
-- cross-section, the solve options and the engine revision; `value` is the solution as JSON. A cache:
-- every row can be recomputed, and the oldest rows are dropped past a bound.

CREATE TABLE field_solution (
  key       TEXT NOT NULL CONSTRAINT FieldSolution_pk PRIMARY KEY,
  kind      TEXT NOT NULL CONSTRAINT FieldSolution_ck_kind CHECK (kind IN ('line', 'pair')),
  value     TEXT NOT NULL CONSTRAINT FieldSolution_ck_value CHECK (json_valid(value)),
  stored_at TEXT NOT NULL   -- ISO 8601 UTC
);
CREATE INDEX FieldSolution_ix_storedAt ON field_solution (stored_at);
