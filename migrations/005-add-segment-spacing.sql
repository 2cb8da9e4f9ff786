-- 005: edge-to-edge gap of an edge-coupled differential pair, m. A segment with a spacing is one leg of
-- a pair driven differentially (modelled in the odd mode); NULL for single-ended traces and every
-- other element kind.

ALTER TABLE net_element ADD COLUMN spacing REAL
  CONSTRAINT NetElement_ck_spacing CHECK (spacing IS NULL OR (kind = 'segment' AND spacing > 0));
