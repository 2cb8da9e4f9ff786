-- 001: the project itself: info, stackup, part models, buses, nets with their topology, corners.
-- All quantities are SI base units (m, s, ohm, F, H, V), as in core/project/model.ts.
-- A shipped migration is never edited; later changes are new numbered files.

CREATE TABLE project_info (
  id             INTEGER NOT NULL CONSTRAINT ProjectInfo_pk PRIMARY KEY
                 CONSTRAINT ProjectInfo_ck_singleRow CHECK (id = 1),
  name           TEXT NOT NULL,
  board_revision TEXT NOT NULL,
  description    TEXT NOT NULL,
  guard_band     REAL NOT NULL,
  settle_band    REAL NOT NULL
);

CREATE TABLE stackup (
  id   INTEGER NOT NULL CONSTRAINT Stackup_pk PRIMARY KEY
       CONSTRAINT Stackup_ck_singleRow CHECK (id = 1),
  name TEXT NOT NULL
);

-- Layers top (position 0) to bottom.
CREATE TABLE stackup_layer (
  id            INTEGER NOT NULL CONSTRAINT StackupLayer_pk PRIMARY KEY,
  position      INTEGER NOT NULL,
  name          TEXT NOT NULL,
  kind          TEXT NOT NULL CONSTRAINT StackupLayer_ck_kind CHECK (kind IN ('copper', 'dielectric', 'mask')),
  thickness     REAL NOT NULL CONSTRAINT StackupLayer_ck_thickness CHECK (thickness > 0),
  dk            REAL,
  df            REAL,
  role          TEXT CONSTRAINT StackupLayer_ck_role CHECK (role IS NULL OR role IN ('signal', 'plane')),
  default_width REAL,
  CONSTRAINT StackupLayer_uq_name UNIQUE (name),
  CONSTRAINT StackupLayer_uq_position UNIQUE (position)
);

CREATE TABLE part (
  id          INTEGER NOT NULL CONSTRAINT Part_pk PRIMARY KEY,
  name        TEXT NOT NULL,
  description TEXT NOT NULL,
  io_standard TEXT NOT NULL DEFAULT '',
  CONSTRAINT Part_uq_name UNIQUE (name)
);

-- Linear driver model of a part (docs/design.md §4); absent when the part only receives.
CREATE TABLE part_driver (
  part_id         INTEGER NOT NULL CONSTRAINT PartDriver_pk PRIMARY KEY
                  CONSTRAINT PartDriver_fk_partId REFERENCES part (id) ON DELETE CASCADE,
  vol             REAL NOT NULL,
  voh             REAL NOT NULL,
  rout_high       REAL NOT NULL,
  rout_low        REAL NOT NULL,
  rise_time       REAL NOT NULL,
  fall_time       REAL NOT NULL,
  tco_min         REAL NOT NULL,
  tco_max         REAL NOT NULL,
  ref_load_ohms   REAL NOT NULL,
  ref_load_vtt    REAL NOT NULL,
  ref_load_farads REAL NOT NULL,
  vmeas           REAL NOT NULL
);

CREATE TABLE part_receiver (
  part_id  INTEGER NOT NULL CONSTRAINT PartReceiver_pk PRIMARY KEY
           CONSTRAINT PartReceiver_fk_partId REFERENCES part (id) ON DELETE CASCADE,
  cin      REAL NOT NULL,
  vil      REAL NOT NULL,
  vih      REAL NOT NULL,
  vref     REAL NOT NULL,
  odt_ohms REAL,
  odt_vtt  REAL NOT NULL,
  vmax_abs REAL NOT NULL,
  vmin_abs REAL NOT NULL,
  tsetup   REAL NOT NULL,
  thold    REAL NOT NULL
);

-- Timing columns are those of the bus kind; the others stay NULL.
CREATE TABLE bus (
  id             INTEGER NOT NULL CONSTRAINT Bus_pk PRIMARY KEY,
  position       INTEGER NOT NULL,
  name           TEXT NOT NULL,
  kind           TEXT NOT NULL CONSTRAINT Bus_ck_kind CHECK (kind IN ('common-clock', 'source-synchronous')),
  description    TEXT NOT NULL,
  reference_net  TEXT,
  cycle_time     REAL,
  clock_skew     REAL,
  jitter         REAL,
  t_valid_before REAL,
  t_valid_after  REAL,
  CONSTRAINT Bus_uq_name UNIQUE (name),
  CONSTRAINT Bus_ck_timing CHECK (
    (kind = 'common-clock' AND cycle_time IS NOT NULL AND clock_skew IS NOT NULL AND jitter IS NOT NULL)
    OR (kind = 'source-synchronous' AND t_valid_before IS NOT NULL AND t_valid_after IS NOT NULL))
);

CREATE TABLE bus_allowance (
  id         INTEGER NOT NULL CONSTRAINT BusAllowance_pk PRIMARY KEY,
  bus_id     INTEGER NOT NULL CONSTRAINT BusAllowance_fk_busId REFERENCES bus (id) ON DELETE CASCADE,
  position   INTEGER NOT NULL,
  name       TEXT NOT NULL,
  value      REAL NOT NULL,
  applies_to TEXT NOT NULL CONSTRAINT BusAllowance_ck_appliesTo CHECK (applies_to IN ('setup', 'hold', 'both')),
  note       TEXT NOT NULL,
  CONSTRAINT BusAllowance_uq_busPosition UNIQUE (bus_id, position)
);

CREATE TABLE net (
  id       INTEGER NOT NULL CONSTRAINT Net_pk PRIMARY KEY,
  position INTEGER NOT NULL,
  name     TEXT NOT NULL,
  bus_id   INTEGER NOT NULL CONSTRAINT Net_fk_busId REFERENCES bus (id),
  role     TEXT NOT NULL CONSTRAINT Net_ck_role
           CHECK (role IN ('data', 'strobe', 'clock', 'address', 'command', 'control')),
  CONSTRAINT Net_uq_name UNIQUE (name)
);
CREATE INDEX Net_ix_busId ON net (bus_id);

-- The driver (is_driver = 1, position 0) and the receivers (is_driver = 0, in order) of a net.
CREATE TABLE net_endpoint (
  id         INTEGER NOT NULL CONSTRAINT NetEndpoint_pk PRIMARY KEY,
  net_id     INTEGER NOT NULL CONSTRAINT NetEndpoint_fk_netId REFERENCES net (id) ON DELETE CASCADE,
  is_driver  INTEGER NOT NULL CONSTRAINT NetEndpoint_ck_isDriver CHECK (is_driver IN (0, 1)),
  position   INTEGER NOT NULL,
  part_name  TEXT NOT NULL CONSTRAINT NetEndpoint_fk_partName REFERENCES part (name)
             ON UPDATE CASCADE DEFERRABLE INITIALLY DEFERRED,
  node       TEXT NOT NULL,
  designator TEXT NOT NULL,
  CONSTRAINT NetEndpoint_uq_netRolePosition UNIQUE (net_id, is_driver, position)
);
CREATE INDEX NetEndpoint_ix_partName ON net_endpoint (part_name);

CREATE TABLE net_rail (
  net_id INTEGER NOT NULL CONSTRAINT NetRail_fk_netId REFERENCES net (id) ON DELETE CASCADE,
  name   TEXT NOT NULL,
  volts  REAL NOT NULL,
  CONSTRAINT NetRail_pk PRIMARY KEY (net_id, name)
);

-- One element of a net's topology, in order. A segment names a stackup layer; the reference is
-- checked at commit so that a stackup can be replaced inside one transaction.
CREATE TABLE net_element (
  id         INTEGER NOT NULL CONSTRAINT NetElement_pk PRIMARY KEY,
  net_id     INTEGER NOT NULL CONSTRAINT NetElement_fk_netId REFERENCES net (id) ON DELETE CASCADE,
  position   INTEGER NOT NULL,
  kind       TEXT NOT NULL CONSTRAINT NetElement_ck_kind
             CHECK (kind IN ('segment', 'line', 'resistor', 'capacitor', 'inductor', 'via')),
  node_a     TEXT NOT NULL,
  node_b     TEXT,
  layer_name TEXT CONSTRAINT NetElement_fk_layerName REFERENCES stackup_layer (name)
             ON UPDATE CASCADE DEFERRABLE INITIALLY DEFERRED,
  width      REAL,
  length     REAL,
  z0         REAL,
  delay      REAL,
  ohms       REAL,
  farads     REAL,
  henries    REAL,
  CONSTRAINT NetElement_uq_netPosition UNIQUE (net_id, position),
  CONSTRAINT NetElement_ck_fields CHECK (
    (kind = 'segment' AND node_b IS NOT NULL AND layer_name IS NOT NULL AND width > 0 AND length >= 0)
    OR (kind = 'line' AND node_b IS NOT NULL AND z0 > 0 AND delay >= 0)
    OR (kind = 'resistor' AND node_b IS NOT NULL AND ohms IS NOT NULL)
    OR (kind = 'capacitor' AND node_b IS NOT NULL AND farads IS NOT NULL)
    OR (kind = 'inductor' AND node_b IS NOT NULL AND henries IS NOT NULL)
    OR (kind = 'via' AND node_b IS NULL AND farads IS NOT NULL))
);
CREATE INDEX NetElement_ix_layerName ON net_element (layer_name);

CREATE TABLE corner (
  id              INTEGER NOT NULL CONSTRAINT Corner_pk PRIMARY KEY,
  position        INTEGER NOT NULL,
  name            TEXT NOT NULL,
  driver_strength REAL NOT NULL,
  edge_rate       REAL NOT NULL,
  dk              REAL NOT NULL,
  width_delta     REAL NOT NULL,
  rail            REAL NOT NULL,
  cin             REAL NOT NULL,
  tco             TEXT NOT NULL CONSTRAINT Corner_ck_tco CHECK (tco IN ('min', 'max', 'typ')),
  CONSTRAINT Corner_uq_name UNIQUE (name)
);
