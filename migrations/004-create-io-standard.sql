-- 004: I/O standard presets with their thresholds and the standard each value is cited from.
-- Filled from core/project/io-standards.ts when a project is created or opened.

CREATE TABLE io_standard (
  name        TEXT NOT NULL CONSTRAINT IoStandard_pk PRIMARY KEY,
  description TEXT NOT NULL,
  vddq        REAL NOT NULL,
  vref        REAL NOT NULL,
  vil_ac      REAL NOT NULL,
  vih_ac      REAL NOT NULL,
  vil_dc      REAL NOT NULL,
  vih_dc      REAL NOT NULL,
  vtt         REAL,
  source      TEXT NOT NULL,
  from_memory INTEGER NOT NULL CONSTRAINT IoStandard_ck_fromMemory CHECK (from_memory IN (0, 1)),
  note        TEXT NOT NULL
);
CREATE INDEX Part_ix_ioStandard ON part (io_standard);
