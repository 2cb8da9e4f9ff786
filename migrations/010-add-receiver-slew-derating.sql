-- 010: slew-rate derating table of a receiver's setup and hold (docs/design.md §6.4), as JSON
-- {"signalSlews": [V/s...], "strobeSlews": [V/s...], "setup": [[s...]...], "hold": [[s...]...]};
-- NULL when the part gives none (nothing is derated).

ALTER TABLE part_receiver ADD COLUMN slew_derating TEXT
  CONSTRAINT PartReceiver_ck_slewDerating CHECK (slew_derating IS NULL OR substr(slew_derating, 1, 1) = '{');
