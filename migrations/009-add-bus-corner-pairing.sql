-- 009: how a bus pairs silicon with board tolerances (docs/design.md §6.3): NULL = each corner as
-- defined, 'cross' = every silicon corner with every board corner, or a JSON list of
-- {"silicon": corner, "board": corner} pairs (text starting with '[').

ALTER TABLE bus ADD COLUMN corner_pairing TEXT
  CONSTRAINT Bus_ck_cornerPairing CHECK (corner_pairing IS NULL OR corner_pairing IN ('fixed', 'cross') OR substr(corner_pairing, 1, 1) = '[');
