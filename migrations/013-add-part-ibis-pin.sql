-- 013: the [Pin] of a part's IBIS model whose package the part's pins sit behind (docs/ibis.md §9);
-- NULL: the first [Pin] row that uses the model, as before.

ALTER TABLE part_ibis ADD COLUMN pin TEXT CONSTRAINT PartIbis_ck_pin CHECK (pin IS NULL OR length(pin) > 0);
