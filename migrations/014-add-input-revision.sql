-- 014: the revision of the project's inputs and the input fingerprint last computed at it
-- (docs/board-partitioning.md §4). Triggers on every input table bump the revision on each row written,
-- whichever program writes the file; opening a large project then reads the fingerprint stored for the
-- current revision instead of hashing every net again. Result, log, undo and field-solution tables are
-- not inputs and have no trigger. A new input table needs the same three triggers (a test checks).

CREATE TABLE input_revision (
  id       INTEGER NOT NULL CONSTRAINT InputRevision_pk PRIMARY KEY CONSTRAINT InputRevision_ck_one CHECK (id = 1),
  revision INTEGER NOT NULL,
  fingerprint          TEXT,     -- the input fingerprint computed at fingerprint_revision with fingerprint_salt
  fingerprint_salt     TEXT,     -- what else it hashed: the tool version and the solve options
  fingerprint_revision INTEGER
);
INSERT INTO input_revision (id, revision) VALUES (1, 0);

CREATE TRIGGER project_info_revision_insert AFTER INSERT ON project_info BEGIN UPDATE input_revision SET revision = revision + 1 WHERE id = 1; END;
CREATE TRIGGER project_info_revision_update AFTER UPDATE ON project_info BEGIN UPDATE input_revision SET revision = revision + 1 WHERE id = 1; END;
CREATE TRIGGER project_info_revision_delete AFTER DELETE ON project_info BEGIN UPDATE input_revision SET revision = revision + 1 WHERE id = 1; END;
CREATE TRIGGER stackup_revision_insert AFTER INSERT ON stackup BEGIN UPDATE input_revision SET revision = revision + 1 WHERE id = 1; END;
CREATE TRIGGER stackup_revision_update AFTER UPDATE ON stackup BEGIN UPDATE input_revision SET revision = revision + 1 WHERE id = 1; END;
CREATE TRIGGER stackup_revision_delete AFTER DELETE ON stackup BEGIN UPDATE input_revision SET revision = revision + 1 WHERE id = 1; END;
CREATE TRIGGER stackup_layer_revision_insert AFTER INSERT ON stackup_layer BEGIN UPDATE input_revision SET revision = revision + 1 WHERE id = 1; END;
CREATE TRIGGER stackup_layer_revision_update AFTER UPDATE ON stackup_layer BEGIN UPDATE input_revision SET revision = revision + 1 WHERE id = 1; END;
CREATE TRIGGER stackup_layer_revision_delete AFTER DELETE ON stackup_layer BEGIN UPDATE input_revision SET revision = revision + 1 WHERE id = 1; END;
CREATE TRIGGER part_revision_insert AFTER INSERT ON part BEGIN UPDATE input_revision SET revision = revision + 1 WHERE id = 1; END;
CREATE TRIGGER part_revision_update AFTER UPDATE ON part BEGIN UPDATE input_revision SET revision = revision + 1 WHERE id = 1; END;
CREATE TRIGGER part_revision_delete AFTER DELETE ON part BEGIN UPDATE input_revision SET revision = revision + 1 WHERE id = 1; END;
CREATE TRIGGER part_driver_revision_insert AFTER INSERT ON part_driver BEGIN UPDATE input_revision SET revision = revision + 1 WHERE id = 1; END;
CREATE TRIGGER part_driver_revision_update AFTER UPDATE ON part_driver BEGIN UPDATE input_revision SET revision = revision + 1 WHERE id = 1; END;
CREATE TRIGGER part_driver_revision_delete AFTER DELETE ON part_driver BEGIN UPDATE input_revision SET revision = revision + 1 WHERE id = 1; END;
CREATE TRIGGER part_receiver_revision_insert AFTER INSERT ON part_receiver BEGIN UPDATE input_revision SET revision = revision + 1 WHERE id = 1; END;
CREATE TRIGGER part_receiver_revision_update AFTER UPDATE ON part_receiver BEGIN UPDATE input_revision SET revision = revision + 1 WHERE id = 1; END;
CREATE TRIGGER part_receiver_revision_delete AFTER DELETE ON part_receiver BEGIN UPDATE input_revision SET revision = revision + 1 WHERE id = 1; END;
CREATE TRIGGER bus_revision_insert AFTER INSERT ON bus BEGIN UPDATE input_revision SET revision = revision + 1 WHERE id = 1; END;
CREATE TRIGGER bus_revision_update AFTER UPDATE ON bus BEGIN UPDATE input_revision SET revision = revision + 1 WHERE id = 1; END;
CREATE TRIGGER bus_revision_delete AFTER DELETE ON bus BEGIN UPDATE input_revision SET revision = revision + 1 WHERE id = 1; END;
CREATE TRIGGER bus_allowance_revision_insert AFTER INSERT ON bus_allowance BEGIN UPDATE input_revision SET revision = revision + 1 WHERE id = 1; END;
CREATE TRIGGER bus_allowance_revision_update AFTER UPDATE ON bus_allowance BEGIN UPDATE input_revision SET revision = revision + 1 WHERE id = 1; END;
CREATE TRIGGER bus_allowance_revision_delete AFTER DELETE ON bus_allowance BEGIN UPDATE input_revision SET revision = revision + 1 WHERE id = 1; END;
CREATE TRIGGER net_revision_insert AFTER INSERT ON net BEGIN UPDATE input_revision SET revision = revision + 1 WHERE id = 1; END;
CREATE TRIGGER net_revision_update AFTER UPDATE ON net BEGIN UPDATE input_revision SET revision = revision + 1 WHERE id = 1; END;
CREATE TRIGGER net_revision_delete AFTER DELETE ON net BEGIN UPDATE input_revision SET revision = revision + 1 WHERE id = 1; END;
CREATE TRIGGER net_endpoint_revision_insert AFTER INSERT ON net_endpoint BEGIN UPDATE input_revision SET revision = revision + 1 WHERE id = 1; END;
CREATE TRIGGER net_endpoint_revision_update AFTER UPDATE ON net_endpoint BEGIN UPDATE input_revision SET revision = revision + 1 WHERE id = 1; END;
CREATE TRIGGER net_endpoint_revision_delete AFTER DELETE ON net_endpoint BEGIN UPDATE input_revision SET revision = revision + 1 WHERE id = 1; END;
CREATE TRIGGER net_rail_revision_insert AFTER INSERT ON net_rail BEGIN UPDATE input_revision SET revision = revision + 1 WHERE id = 1; END;
CREATE TRIGGER net_rail_revision_update AFTER UPDATE ON net_rail BEGIN UPDATE input_revision SET revision = revision + 1 WHERE id = 1; END;
CREATE TRIGGER net_rail_revision_delete AFTER DELETE ON net_rail BEGIN UPDATE input_revision SET revision = revision + 1 WHERE id = 1; END;
CREATE TRIGGER net_element_revision_insert AFTER INSERT ON net_element BEGIN UPDATE input_revision SET revision = revision + 1 WHERE id = 1; END;
CREATE TRIGGER net_element_revision_update AFTER UPDATE ON net_element BEGIN UPDATE input_revision SET revision = revision + 1 WHERE id = 1; END;
CREATE TRIGGER net_element_revision_delete AFTER DELETE ON net_element BEGIN UPDATE input_revision SET revision = revision + 1 WHERE id = 1; END;
CREATE TRIGGER corner_revision_insert AFTER INSERT ON corner BEGIN UPDATE input_revision SET revision = revision + 1 WHERE id = 1; END;
CREATE TRIGGER corner_revision_update AFTER UPDATE ON corner BEGIN UPDATE input_revision SET revision = revision + 1 WHERE id = 1; END;
CREATE TRIGGER corner_revision_delete AFTER DELETE ON corner BEGIN UPDATE input_revision SET revision = revision + 1 WHERE id = 1; END;
CREATE TRIGGER io_standard_revision_insert AFTER INSERT ON io_standard BEGIN UPDATE input_revision SET revision = revision + 1 WHERE id = 1; END;
CREATE TRIGGER io_standard_revision_update AFTER UPDATE ON io_standard BEGIN UPDATE input_revision SET revision = revision + 1 WHERE id = 1; END;
CREATE TRIGGER io_standard_revision_delete AFTER DELETE ON io_standard BEGIN UPDATE input_revision SET revision = revision + 1 WHERE id = 1; END;
CREATE TRIGGER ibis_file_revision_insert AFTER INSERT ON ibis_file BEGIN UPDATE input_revision SET revision = revision + 1 WHERE id = 1; END;
CREATE TRIGGER ibis_file_revision_update AFTER UPDATE ON ibis_file BEGIN UPDATE input_revision SET revision = revision + 1 WHERE id = 1; END;
CREATE TRIGGER ibis_file_revision_delete AFTER DELETE ON ibis_file BEGIN UPDATE input_revision SET revision = revision + 1 WHERE id = 1; END;
CREATE TRIGGER part_ibis_revision_insert AFTER INSERT ON part_ibis BEGIN UPDATE input_revision SET revision = revision + 1 WHERE id = 1; END;
CREATE TRIGGER part_ibis_revision_update AFTER UPDATE ON part_ibis BEGIN UPDATE input_revision SET revision = revision + 1 WHERE id = 1; END;
CREATE TRIGGER part_ibis_revision_delete AFTER DELETE ON part_ibis BEGIN UPDATE input_revision SET revision = revision + 1 WHERE id = 1; END;
CREATE TRIGGER waiver_revision_insert AFTER INSERT ON waiver BEGIN UPDATE input_revision SET revision = revision + 1 WHERE id = 1; END;
CREATE TRIGGER waiver_revision_update AFTER UPDATE ON waiver BEGIN UPDATE input_revision SET revision = revision + 1 WHERE id = 1; END;
CREATE TRIGGER waiver_revision_delete AFTER DELETE ON waiver BEGIN UPDATE input_revision SET revision = revision + 1 WHERE id = 1; END;
