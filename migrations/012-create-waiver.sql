-- 012: reviewers' waivers of a net's failing or tight check (docs/workbench.md, "Waivers"). One row per
-- net at most; it goes with its net (ON DELETE CASCADE). It records what was waived as it was then (the
-- check, the net's status and that check's margin) so a later result can be compared with it, and who
-- waived it, why and when. A waiver changes no result: it is not an input of any solve.

CREATE TABLE waiver (
  net_id  INTEGER NOT NULL CONSTRAINT Waiver_pk PRIMARY KEY
          CONSTRAINT Waiver_fk_netId REFERENCES net (id) ON DELETE CASCADE,
  net_check TEXT NOT NULL CONSTRAINT Waiver_ck_check CHECK (length(net_check) > 0),
  status  TEXT NOT NULL CONSTRAINT Waiver_ck_status CHECK (status IN ('fail', 'tight')),
  margin  REAL,            -- s for timing checks, V for signal checks; NULL when the check has none
  unit    TEXT CONSTRAINT Waiver_ck_unit CHECK (unit IS NULL OR unit IN ('s', 'V')),
  comment TEXT NOT NULL CONSTRAINT Waiver_ck_comment CHECK (length(trim(comment)) > 0),
  author  TEXT NOT NULL CONSTRAINT Waiver_ck_author CHECK (length(trim(author)) > 0),
  at      TEXT NOT NULL    -- ISO 8601 UTC of the waiver
);
