-- 008: IBIS buffer-model files stored in the project (docs/ibis.md §9): the file's name, the SHA-256 of
-- its text (lowercase hex) and the whole text, so a project carries the models its parts use and a
-- report can name the exact file. A part may name one [Model] of one stored file (part_ibis); a part
-- with linear models only has no row there.

CREATE TABLE ibis_file (
  id      INTEGER NOT NULL CONSTRAINT IbisFile_pk PRIMARY KEY,
  name    TEXT NOT NULL,
  sha256  TEXT NOT NULL CONSTRAINT IbisFile_ck_sha256 CHECK (length(sha256) = 64 AND sha256 NOT GLOB '*[^0-9a-f]*'),
  content TEXT NOT NULL,
  CONSTRAINT IbisFile_uq_name UNIQUE (name)
);

CREATE TABLE part_ibis (
  part_id   INTEGER NOT NULL CONSTRAINT PartIbis_pk PRIMARY KEY
            CONSTRAINT PartIbis_fk_part REFERENCES part (id) ON DELETE CASCADE,
  file_name TEXT NOT NULL CONSTRAINT PartIbis_fk_file REFERENCES ibis_file (name) ON UPDATE CASCADE,
  model     TEXT NOT NULL CONSTRAINT PartIbis_ck_model CHECK (length(model) > 0)
);
CREATE INDEX PartIbis_ix_file ON part_ibis (file_name);
