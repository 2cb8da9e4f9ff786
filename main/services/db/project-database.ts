/**
 * The data layer: the only module that holds SQL. It maps core/project/model.ts shapes (SI units) to
 * rows and back. Writes are plain statements; callers group them with `transaction()` so that each
 * edit or import is one transaction.
 */
import type Database from 'better-sqlite3';
import { deflateRawSync, inflateRawSync } from 'node:zlib';
import type {
  BudgetAllowance, BusDefinition, Corner, NetDefinition, NetElement, NetEndpoint, PartModel, ProjectData,
  ProjectInfo, Stackup, StackupLayer, IbisFileRecord, SlewDerating, Waiver,
} from '../../../core/project/model.js';
import type { IoStandardPreset } from '../../../core/project/io-standards.js';
import { newestBackup, openProjectDatabase, writeSessionBackup, type OpenedDatabase } from './open-database.js';
import { ReadOnlyProjectError, translateSqliteError } from './project-errors.js';

export interface ChangeRecord {
  /** ISO 8601 UTC. */
  at: string;
  author: string;
  action: string;
  detail: string;
}

/** Address of one segment for a length update. */
export interface SegmentUpdate {
  net: string;
  /** Element index in the net's topology. */
  elementIndex: number;
  length: number;
  width: number;
}

type Row = Record<string, unknown>;
const num = (value: unknown): number => value as number;
const text = (value: unknown): string => value as string;

export class ProjectDatabase {
  private readonly statements = new Map<string, Database.Statement>();
  private sessionBackupTaken = false;
  private elementSpacing: boolean | undefined;

  private constructor(
    private readonly db: Database.Database,
    /** Schema version before this open and the pre-migration copy, if one was written. */
    readonly opened: Omit<OpenedDatabase, 'db'>,
    /** The project file, for messages. */
    readonly path: string,
  ) {}

  /** Creates a new project file (missing or empty) with the full schema. */
  static create(path: string, options: { busyTimeoutMs?: number } = {}): ProjectDatabase {
    const { db, ...opened } = openProjectDatabase(path, { mode: 'create', ...options });
    return new ProjectDatabase(db, opened, path);
  }

  /**
   * Opens an existing project, migrating it (after a backup copy) when its schema is older. A file
   * that cannot be written opens read-only (`opened.readOnly` says why); a damaged one is refused.
   */
  static open(path: string, options: { cacheSizeKib?: number; busyTimeoutMs?: number; readOnly?: boolean } = {}): ProjectDatabase {
    const { db, ...opened } = openProjectDatabase(path, { mode: 'open', ...options });
    return new ProjectDatabase(db, opened, path);
  }

  /**
   * Wraps a connection the caller opened and migrated itself (tools and tests that build a file at
   * an older schema version). The caller keeps responsibility for its settings.
   */
  static fromConnection(db: Database.Database): ProjectDatabase {
    return new ProjectDatabase(
      db,
      { fromVersion: db.pragma('user_version', { simple: true }) as number, backupPath: null, readOnly: db.readonly ? 'read-only connection' : null, busyTimeoutMs: db.pragma('busy_timeout', { simple: true }) as number },
      db.name,
    );
  }

  /** Why the project is open read-only, or null when it can be written. */
  get readOnly(): string | null {
    return this.opened.readOnly;
  }

  get isOpen(): boolean {
    return this.db.open;
  }

  close(): void {
    if (this.db.open) this.db.close();
  }

  /**
   * Runs `fn` in one transaction (nested calls become savepoints); any throw rolls it all back. It
   * begins IMMEDIATE: the write lock is taken before the first read, so a transaction that reads
   * then writes never meets a newer snapshot (SQLITE_BUSY_SNAPSHOT) and the bounded busy wait applies
   * (sqlite.org/lang_transaction.html; docs/reliability.md §1). A driver error about the file itself
   * (busy, damaged, read-only, full) comes back as a one-line InputError.
   */
  transaction<T>(fn: () => T): T {
    if (this.opened.readOnly && !this.db.inTransaction) throw new ReadOnlyProjectError(this.path, this.opened.readOnly);
    return this.guard(() => this.db.transaction(fn).immediate());
  }

  /** Runs `fn`, turning driver errors about the file into their messages (project-errors.ts). */
  guard<T>(fn: () => T): T {
    try {
      return fn();
    } catch (error) {
      throw translateSqliteError(this.path, error, { busyTimeoutMs: this.opened.busyTimeoutMs, backup: () => newestBackup(this.path) });
    }
  }

  /**
   * Writes the automatic copy (`<file>.last-good`) once per session, before its first project edit,
   * so a file damaged later can be restored to the state before that session (docs/reliability.md §2).
   */
  backupBeforeFirstEdit(): void {
    if (this.sessionBackupTaken || this.opened.readOnly || this.db.inTransaction || this.db.memory) return;
    this.sessionBackupTaken = true;
    writeSessionBackup(this.db, this.path);
  }

  /** `PRAGMA integrity_check` result: "ok" when the file is sound. */
  integrityCheck(): string {
    const rows = this.guard(() => this.db.pragma('integrity_check') as { integrity_check: string }[]);
    return rows.map((r) => r.integrity_check).join('; ');
  }

  /** Connection settings, for diagnostics and tests. */
  settings(): { foreignKeys: number; journalMode: string; synchronous: number; schemaVersion: number } {
    return {
      foreignKeys: this.db.pragma('foreign_keys', { simple: true }) as number,
      journalMode: this.db.pragma('journal_mode', { simple: true }) as string,
      synchronous: this.db.pragma('synchronous', { simple: true }) as number,
      schemaVersion: this.db.pragma('user_version', { simple: true }) as number,
    };
  }

  private stmt(sql: string): Database.Statement {
    let statement = this.statements.get(sql);
    if (!statement) {
      statement = this.db.prepare(sql);
      this.statements.set(sql, statement);
    }
    return statement;
  }

  /** A cached statement that returns rows as arrays of its columns (kept apart from stmt's). */
  private rawStmt(sql: string): Database.Statement {
    const key = `raw: ${sql}`;
    let statement = this.statements.get(key);
    if (!statement) {
      statement = this.db.prepare(sql).raw(true);
      this.statements.set(key, statement);
    }
    return statement;
  }

  /** Whether net_element has migration 005's spacing column (a connection at an older schema may not). */
  private hasElementSpacing(): boolean {
    return (this.elementSpacing ??= (this.db.pragma('table_info(net_element)') as { name: string }[]).some((c) => c.name === 'spacing'));
  }

  // ------------------------------------------------------------------ whole project

  hasProject(): boolean {
    return this.stmt('SELECT 1 FROM project_info WHERE id = 1').get() !== undefined;
  }

  /** Writes a whole project into an empty file. */
  insertProject(data: ProjectData): void {
    this.writeInfo(data.info);
    this.replaceStackup(data.stackup);
    for (const file of data.ibisFiles ?? []) this.upsertIbisFile(file);
    for (const part of data.parts) this.upsertPart(part);
    for (const bus of data.buses) this.upsertBus(bus);
    for (const net of data.nets) this.insertNet(net);
    this.replaceCorners(data.corners);
    for (const waiver of data.waivers ?? []) this.upsertWaiver(waiver);
  }

  readProject(): ProjectData {
    return this.guard(() => this.readProjectRows());
  }

  private readProjectRows(): ProjectData {
    const data: ProjectData = {
      info: this.readInfo(),
      stackup: this.readStackup(),
      parts: this.readParts(),
      buses: this.readBuses(),
      nets: this.readNets(),
      corners: this.readCorners(),
    };
    // Optional in the model: a project without IBIS files reads back exactly as before migration 008.
    const ibisFiles = this.hasIbisTables() ? this.readIbisFiles() : [];
    if (ibisFiles.length > 0) data.ibisFiles = ibisFiles;
    // Optional too: a project without waivers reads back exactly as before migration 012.
    const waivers = this.hasWaiverTable() ? this.readWaivers() : [];
    if (waivers.length > 0) data.waivers = waivers;
    return data;
  }

  // ------------------------------------------------------------------ waivers (migration 012)

  private waiverTable: boolean | undefined;

  /** True once migration 012 has run on this file. */
  private hasWaiverTable(): boolean {
    this.waiverTable ??= this.db.prepare("SELECT 1 FROM sqlite_schema WHERE type = 'table' AND name = 'waiver'").get() !== undefined;
    return this.waiverTable;
  }

  /** Stores the waiver of a net (replacing one the net had); the net must exist. */
  upsertWaiver(waiver: Waiver): void {
    if (!this.hasWaiverTable()) throw new Error('this project file predates waivers (schema version 12): open it writable to upgrade it');
    const net = this.stmt('SELECT id FROM net WHERE name = ?').get(waiver.net) as { id: number } | undefined;
    if (!net) throw new Error(`waiver: net ${waiver.net} is not in the project`);
    this.stmt(
      `INSERT INTO waiver (net_id, net_check, status, margin, unit, comment, author, at)
       VALUES (@netId, @check, @status, @margin, @unit, @comment, @author, @at)
       ON CONFLICT (net_id) DO UPDATE SET net_check = excluded.net_check, status = excluded.status, margin = excluded.margin,
         unit = excluded.unit, comment = excluded.comment, author = excluded.author, at = excluded.at`,
    ).run({ netId: net.id, check: waiver.check, status: waiver.status, margin: waiver.margin, unit: waiver.unit, comment: waiver.comment, author: waiver.author, at: waiver.at });
  }

  /** Every waiver, in net order. */
  readWaivers(): Waiver[] {
    const rows = this.stmt(
      'SELECT n.name, w.net_check, w.status, w.margin, w.unit, w.comment, w.author, w.at FROM waiver w JOIN net n ON n.id = w.net_id ORDER BY n.position',
    ).all() as Row[];
    return rows.map((row) => ({
      net: text(row.name),
      check: text(row.net_check),
      status: row.status as Waiver['status'],
      margin: row.margin === null ? null : num(row.margin),
      unit: row.unit === null ? null : (row.unit as 's' | 'V'),
      comment: text(row.comment),
      author: text(row.author),
      at: text(row.at),
    }));
  }

  // ------------------------------------------------------------------ IBIS files (migration 008)

  private ibisTables: boolean | undefined;

  /** True once migration 008 has run on this file (older versions are written by tests and by upgrades). */
  private hasIbisTables(): boolean {
    this.ibisTables ??= this.db.prepare("SELECT 1 FROM sqlite_schema WHERE type = 'table' AND name = 'ibis_file'").get() !== undefined;
    return this.ibisTables;
  }

  /** Stores an IBIS file's text and hash under its name, replacing a file of that name. */
  upsertIbisFile(file: IbisFileRecord): void {
    this.stmt(
      `INSERT INTO ibis_file (name, sha256, content) VALUES (@name, @sha256, @text)
       ON CONFLICT (name) DO UPDATE SET sha256 = excluded.sha256, content = excluded.content`,
    ).run(file);
  }

  readIbisFiles(): IbisFileRecord[] {
    const rows = this.stmt('SELECT name, sha256, content FROM ibis_file ORDER BY id').all() as Row[];
    return rows.map((row) => ({ name: text(row.name), sha256: text(row.sha256), text: text(row.content) }));
  }

  // ------------------------------------------------------------------ info

  writeInfo(info: ProjectInfo): void {
    this.stmt(
      `INSERT INTO project_info (id, name, board_revision, description, guard_band, settle_band)
       VALUES (1, @name, @boardRevision, @description, @guardBand, @settleBand)
       ON CONFLICT (id) DO UPDATE SET name = excluded.name, board_revision = excluded.board_revision,
         description = excluded.description, guard_band = excluded.guard_band, settle_band = excluded.settle_band`,
    ).run(info);
  }

  readInfo(): ProjectInfo {
    const row = this.stmt('SELECT * FROM project_info WHERE id = 1').get() as Row | undefined;
    if (!row) throw new Error('project file holds no project info row');
    return {
      name: text(row.name),
      boardRevision: text(row.board_revision),
      description: text(row.description),
      guardBand: num(row.guard_band),
      settleBand: num(row.settle_band),
    };
  }

  // ------------------------------------------------------------------ stackup

  /** Replaces the stackup; segment layer references are checked when the transaction commits. */
  replaceStackup(stackup: Stackup): void {
    this.stmt(
      `INSERT INTO stackup (id, name) VALUES (1, ?) ON CONFLICT (id) DO UPDATE SET name = excluded.name`,
    ).run(stackup.name);
    this.stmt('DELETE FROM stackup_layer').run();
    const insert = this.stmt(
      `INSERT INTO stackup_layer (position, name, kind, thickness, dk, df, role, default_width)
       VALUES (?, ?, ?, ?, ?, ?, ?, ?)`,
    );
    stackup.layers.forEach((layer, position) => {
      insert.run(position, layer.name, layer.kind, layer.thickness, layer.dk ?? null, layer.df ?? null, layer.role ?? null, layer.defaultWidth ?? null);
    });
  }

  readStackup(): Stackup {
    const head = this.stmt('SELECT name FROM stackup WHERE id = 1').get() as Row | undefined;
    const rows = this.stmt('SELECT * FROM stackup_layer ORDER BY position').all() as Row[];
    const layers = rows.map((row): StackupLayer => {
      const layer: StackupLayer = { name: text(row.name), kind: row.kind as StackupLayer['kind'], thickness: num(row.thickness) };
      if (row.dk !== null) layer.dk = num(row.dk);
      if (row.df !== null) layer.df = num(row.df);
      if (row.role !== null) layer.role = row.role as StackupLayer['role'];
      if (row.default_width !== null) layer.defaultWidth = num(row.default_width);
      return layer;
    });
    return { name: head ? text(head.name) : '', layers };
  }

  // ------------------------------------------------------------------ parts

  upsertPart(part: PartModel): void {
    this.stmt(
      `INSERT INTO part (name, description, io_standard) VALUES (@name, @description, @ioStandard)
       ON CONFLICT (name) DO UPDATE SET description = excluded.description, io_standard = excluded.io_standard`,
    ).run({ name: part.name, description: part.description, ioStandard: part.ioStandard });
    const { id } = this.stmt('SELECT id FROM part WHERE name = ?').get(part.name) as { id: number };
    if (this.hasIbisTables()) {
      this.stmt('DELETE FROM part_ibis WHERE part_id = ?').run(id);
      if (part.ibis) this.stmt('INSERT INTO part_ibis (part_id, file_name, model) VALUES (?, ?, ?)').run(id, part.ibis.file, part.ibis.model);
      // migration 013: the chosen [Pin] (files before 013 cannot hold one)
      if (part.ibis?.pin) this.stmt('UPDATE part_ibis SET pin = ? WHERE part_id = ?').run(part.ibis.pin, id);
    }
    this.stmt('DELETE FROM part_driver WHERE part_id = ?').run(id);
    this.stmt('DELETE FROM part_receiver WHERE part_id = ?').run(id);
    const d = part.driver;
    if (d) {
      this.stmt(
        `INSERT INTO part_driver (part_id, vol, voh, rout_high, rout_low, rise_time, fall_time, tco_min, tco_max,
           ref_load_ohms, ref_load_vtt, ref_load_farads, vmeas) VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)`,
      ).run(id, d.vol, d.voh, d.routHigh, d.routLow, d.riseTime, d.fallTime, d.tcoMin, d.tcoMax,
        d.refLoad.ohms, d.refLoad.vtt, d.refLoad.farads, d.vmeas);
    }
    const r = part.receiver;
    if (r) {
      this.stmt(
        `INSERT INTO part_receiver (part_id, cin, vil, vih, vref, odt_ohms, odt_vtt, vmax_abs, vmin_abs, tsetup, thold)
         VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)`,
      ).run(id, r.cin, r.vil, r.vih, r.vref, r.odtOhms, r.odtVtt, r.vmaxAbs, r.vminAbs, r.tsetup, r.thold);
      // migration 010: the optional slew-rate derating table as JSON (files before 010 cannot hold one)
      if (r.derating) this.stmt('UPDATE part_receiver SET slew_derating = ? WHERE part_id = ?').run(JSON.stringify(r.derating), id);
    }
  }

  readParts(): PartModel[] {
    const rows = this.stmt(
      `SELECT p.name, p.description, p.io_standard,
              d.part_id AS d_id, d.vol, d.voh, d.rout_high, d.rout_low, d.rise_time, d.fall_time, d.tco_min, d.tco_max,
              d.ref_load_ohms, d.ref_load_vtt, d.ref_load_farads, d.vmeas,
              r.part_id AS r_id, r.cin, r.vil, r.vih, r.vref, r.odt_ohms, r.odt_vtt, r.vmax_abs, r.vmin_abs, r.tsetup, r.thold
       FROM part p
       LEFT JOIN part_driver d ON d.part_id = p.id
       LEFT JOIN part_receiver r ON r.part_id = p.id
       ORDER BY p.id`,
    ).all() as Row[];
    // Files before migration 008 have no part_ibis table: linear models only.
    const ibis = new Map<string, { file: string; model: string; pin?: string }>();
    if (this.hasIbisTables()) {
      // Files before migration 013 have no pin column: the first [Pin] row of the model.
      const withPin = this.stmt("SELECT 1 AS x FROM pragma_table_info('part_ibis') WHERE name = 'pin'").get() !== undefined;
      const links = this.stmt(`SELECT p.name, i.file_name, i.model${withPin ? ', i.pin' : ''} FROM part_ibis i JOIN part p ON p.id = i.part_id`).all() as Row[];
      for (const link of links) {
        const ref: { file: string; model: string; pin?: string } = { file: text(link.file_name), model: text(link.model) };
        if (withPin && link.pin !== null && link.pin !== undefined) ref.pin = text(link.pin);
        ibis.set(text(link.name), ref);
      }
    }
    // Files before migration 010 have no slew_derating column: no derating tables.
    const deratings = new Map<string, SlewDerating>();
    if (this.stmt("SELECT 1 AS x FROM pragma_table_info('part_receiver') WHERE name = 'slew_derating'").get()) {
      const tables = this.stmt('SELECT p.name, r.slew_derating FROM part_receiver r JOIN part p ON p.id = r.part_id WHERE r.slew_derating IS NOT NULL').all() as Row[];
      for (const t of tables) deratings.set(text(t.name), JSON.parse(text(t.slew_derating)) as SlewDerating);
    }
    return rows.map((row): PartModel => ({
      name: text(row.name),
      description: text(row.description),
      ioStandard: text(row.io_standard),
      ...(ibis.has(text(row.name)) ? { ibis: ibis.get(text(row.name)) } : {}),
      driver:
        row.d_id === null
          ? null
          : {
              vol: num(row.vol), voh: num(row.voh), routHigh: num(row.rout_high), routLow: num(row.rout_low),
              riseTime: num(row.rise_time), fallTime: num(row.fall_time), tcoMin: num(row.tco_min), tcoMax: num(row.tco_max),
              refLoad: { ohms: num(row.ref_load_ohms), vtt: num(row.ref_load_vtt), farads: num(row.ref_load_farads) },
              vmeas: num(row.vmeas),
            },
      receiver:
        row.r_id === null
          ? null
          : {
              cin: num(row.cin), vil: num(row.vil), vih: num(row.vih), vref: num(row.vref),
              odtOhms: row.odt_ohms === null ? null : num(row.odt_ohms), odtVtt: num(row.odt_vtt),
              vmaxAbs: num(row.vmax_abs), vminAbs: num(row.vmin_abs), tsetup: num(row.tsetup), thold: num(row.thold),
              ...(deratings.has(text(row.name)) ? { derating: deratings.get(text(row.name)) } : {}),
            },
    }));
  }

  // ------------------------------------------------------------------ buses

  /** Updates the bus of that name, or appends it when new. */
  upsertBus(bus: BusDefinition): void {
    const t = bus.timing;
    const values = {
      name: bus.name,
      kind: bus.kind,
      description: bus.description,
      referenceNet: bus.referenceNet,
      cycleTime: t.kind === 'common-clock' ? t.cycleTime : null,
      clockSkew: t.kind === 'common-clock' ? t.clockSkew : null,
      jitter: t.kind === 'common-clock' ? t.jitter : null,
      tValidBefore: t.kind === 'source-synchronous' ? t.tValidBefore : null,
      tValidAfter: t.kind === 'source-synchronous' ? t.tValidAfter : null,
    };
    this.stmt(
      `INSERT INTO bus (position, name, kind, description, reference_net, cycle_time, clock_skew, jitter, t_valid_before, t_valid_after)
       VALUES ((SELECT COALESCE(MAX(position) + 1, 0) FROM bus), @name, @kind, @description, @referenceNet,
               @cycleTime, @clockSkew, @jitter, @tValidBefore, @tValidAfter)
       ON CONFLICT (name) DO UPDATE SET kind = excluded.kind, description = excluded.description,
         reference_net = excluded.reference_net, cycle_time = excluded.cycle_time, clock_skew = excluded.clock_skew,
         jitter = excluded.jitter, t_valid_before = excluded.t_valid_before, t_valid_after = excluded.t_valid_after`,
    ).run(values);
    // migration 009: NULL (as defined), 'fixed', 'cross' or a JSON list of {silicon, board} pairs; files
    // before 009 have no column (then only an absent pairing can be stored, as before)
    const pairing = bus.cornerPairing === undefined ? null : typeof bus.cornerPairing === 'string' ? bus.cornerPairing : JSON.stringify(bus.cornerPairing);
    if (pairing !== null || this.stmt("SELECT 1 AS x FROM pragma_table_info('bus') WHERE name = 'corner_pairing'").get()) {
      this.stmt('UPDATE bus SET corner_pairing = ? WHERE name = ?').run(pairing, bus.name);
    }
    const { id } = this.stmt('SELECT id FROM bus WHERE name = ?').get(bus.name) as { id: number };
    this.stmt('DELETE FROM bus_allowance WHERE bus_id = ?').run(id);
    const insert = this.stmt(
      'INSERT INTO bus_allowance (bus_id, position, name, value, applies_to, note) VALUES (?, ?, ?, ?, ?, ?)',
    );
    bus.allowances.forEach((a, position) => insert.run(id, position, a.name, a.value, a.appliesTo, a.note));
  }

  readBuses(): BusDefinition[] {
    const allowances = new Map<number, BudgetAllowance[]>();
    for (const row of this.stmt('SELECT * FROM bus_allowance ORDER BY bus_id, position').all() as Row[]) {
      const list = allowances.get(num(row.bus_id)) ?? [];
      list.push({ name: text(row.name), value: num(row.value), appliesTo: row.applies_to as BudgetAllowance['appliesTo'], note: text(row.note) });
      allowances.set(num(row.bus_id), list);
    }
    return (this.stmt('SELECT * FROM bus ORDER BY position').all() as Row[]).map((row) => ({
      name: text(row.name),
      kind: row.kind as BusDefinition['kind'],
      description: text(row.description),
      referenceNet: row.reference_net === null ? null : text(row.reference_net),
      timing:
        row.kind === 'common-clock'
          ? { kind: 'common-clock', cycleTime: num(row.cycle_time), clockSkew: num(row.clock_skew), jitter: num(row.jitter) }
          : { kind: 'source-synchronous', tValidBefore: num(row.t_valid_before), tValidAfter: num(row.t_valid_after) },
      allowances: allowances.get(num(row.id)) ?? [],
      ...(row.corner_pairing === null || row.corner_pairing === undefined ? {} : {
        cornerPairing: text(row.corner_pairing).startsWith('[')
          ? (JSON.parse(text(row.corner_pairing)) as { silicon: string; board: string }[])
          : (text(row.corner_pairing) as 'fixed' | 'cross'),
      }),
    }));
  }

  // ------------------------------------------------------------------ nets

  insertNet(net: NetDefinition): void {
    const bus = this.stmt('SELECT id FROM bus WHERE name = ?').get(net.bus) as { id: number } | undefined;
    if (!bus) throw new Error(`net ${net.name}: bus "${net.bus}" is not in the project`);
    const { lastInsertRowid } = this.stmt(
      'INSERT INTO net (position, name, bus_id, role) VALUES ((SELECT COALESCE(MAX(position) + 1, 0) FROM net), ?, ?, ?)',
    ).run(net.name, bus.id, net.role);
    const netId = Number(lastInsertRowid);
    const endpoint = this.stmt(
      'INSERT INTO net_endpoint (net_id, is_driver, position, part_name, node, designator) VALUES (?, ?, ?, ?, ?, ?)',
    );
    endpoint.run(netId, 1, 0, net.driver.part, net.driver.node, net.driver.designator);
    net.receivers.forEach((r, position) => endpoint.run(netId, 0, position, r.part, r.node, r.designator));
    const rail = this.stmt('INSERT INTO net_rail (net_id, name, volts) VALUES (?, ?, ?)');
    for (const [name, volts] of Object.entries(net.rails)) rail.run(netId, name, volts);
    net.elements.forEach((element, position) => this.insertElement(netId, position, element));
  }

  private insertElement(netId: number, position: number, e: NetElement): void {
    const row = {
      netId, position, kind: e.kind, nodeA: e.a, nodeB: null as string | null, layer: null as string | null,
      width: null as number | null, length: null as number | null, z0: null as number | null, delay: null as number | null,
      ohms: null as number | null, farads: null as number | null, henries: null as number | null,
    };
    switch (e.kind) {
      case 'segment': Object.assign(row, { nodeB: e.b, layer: e.layer, width: e.width, length: e.length }); break;
      case 'line': Object.assign(row, { nodeB: e.b, z0: e.z0, delay: e.delay }); break;
      case 'resistor': Object.assign(row, { nodeB: e.b, ohms: e.ohms }); break;
      case 'capacitor': Object.assign(row, { nodeB: e.b, farads: e.farads }); break;
      case 'inductor': Object.assign(row, { nodeB: e.b, henries: e.henries }); break;
      case 'via': Object.assign(row, { farads: e.farads }); break;
      default: {
        const never: never = e;
        throw new Error(`unknown net element kind ${(never as { kind: string }).kind}`);
      }
    }
    if (e.kind === 'segment' && e.spacing !== undefined) {
      // Pair gap (migration 005); single-ended rows leave the column out so they also write into older files.
      this.stmt(
        `INSERT INTO net_element (net_id, position, kind, node_a, node_b, layer_name, width, length, spacing)
         VALUES (@netId, @position, @kind, @nodeA, @nodeB, @layer, @width, @length, @spacing)`,
      ).run({ netId, position, kind: e.kind, nodeA: e.a, nodeB: e.b, layer: e.layer, width: e.width, length: e.length, spacing: e.spacing });
      return;
    }
    this.stmt(
      `INSERT INTO net_element (net_id, position, kind, node_a, node_b, layer_name, width, length, z0, delay, ohms, farads, henries)
       VALUES (@netId, @position, @kind, @nodeA, @nodeB, @layer, @width, @length, @z0, @delay, @ohms, @farads, @henries)`,
    ).run(row);
  }

  /** Replaces element `index` of a net; returns false when the net or index does not exist. */
  replaceNetElement(netName: string, index: number, element: NetElement): boolean {
    const net = this.stmt('SELECT id FROM net WHERE name = ?').get(netName) as { id: number } | undefined;
    if (!net) return false;
    const { changes } = this.stmt('DELETE FROM net_element WHERE net_id = ? AND position = ?').run(net.id, index);
    if (changes !== 1) return false;
    this.insertElement(net.id, index, element);
    return true;
  }

  /** Sets length and width of segment elements; throws if any address is not a segment. */
  updateSegments(updates: readonly SegmentUpdate[]): void {
    const ids = new Map(this.stmt('SELECT name, id FROM net').raw().all() as [string, number][]);
    const update = this.stmt(`UPDATE net_element SET length = ?, width = ? WHERE net_id = ? AND position = ? AND kind = 'segment'`);
    for (const u of updates) {
      const { changes } = update.run(u.length, u.width, ids.get(u.net) ?? -1, u.elementIndex);
      if (changes !== 1) throw new Error(`net ${u.net} element ${u.elementIndex} is not a segment`);
    }
  }

  readNets(): NetDefinition[] {
    const endpoints = new Map<number, { driver?: NetEndpoint; receivers: NetEndpoint[] }>();
    // rows as arrays, as for the elements below (13,000 endpoints at 5,000 nets: 12-15 ms against 38-49 ms)
    const endpointRows = this.rawStmt('SELECT net_id, is_driver, part_name, node, designator FROM net_endpoint ORDER BY net_id, is_driver DESC, position').all() as unknown[][];
    for (const [netId, isDriver, part, node, designator] of endpointRows) {
      const entry = endpoints.get(num(netId)) ?? { receivers: [] };
      const endpoint = { part: text(part), node: text(node), designator: text(designator) };
      if (isDriver === 1) entry.driver = endpoint;
      else entry.receivers.push(endpoint);
      endpoints.set(num(netId), entry);
    }
    const rails = new Map<number, Record<string, number>>();
    for (const row of this.stmt('SELECT * FROM net_rail ORDER BY net_id, name').all() as Row[]) {
      const record = rails.get(num(row.net_id)) ?? {};
      record[text(row.name)] = num(row.volts);
      rails.set(num(row.net_id), record);
    }
    const elements = new Map<number, NetElement[]>();
    // Rows as arrays of the named columns: a board has tens of thousands of elements, and rows as
    // objects of every column cost twice the time (measured at 36,000 rows: 130 ms against 60 ms).
    // A connection at a schema before migration 005 (fromConnection) has no spacing column: NULL.
    const columns = this.hasElementSpacing() ? ELEMENT_COLUMNS : ELEMENT_COLUMNS.map((c) => (c === 'spacing' ? 'NULL AS spacing' : c));
    for (const values of this.rawStmt(`SELECT ${columns.join(', ')} FROM net_element ORDER BY net_id, position`).all() as unknown[][]) {
      const id = num(values[0]);
      const list = elements.get(id);
      if (list) list.push(elementFromValues(values));
      else elements.set(id, [elementFromValues(values)]);
    }
    return (
      this.stmt('SELECT n.id, n.name, n.role, b.name AS bus FROM net n JOIN bus b ON b.id = n.bus_id ORDER BY n.position').all() as Row[]
    ).map((row) => {
      const id = num(row.id);
      const ends = endpoints.get(id);
      if (!ends?.driver) throw new Error(`net ${text(row.name)} has no driver row`);
      return {
        name: text(row.name),
        bus: text(row.bus),
        role: row.role as NetDefinition['role'],
        driver: ends.driver,
        receivers: ends.receivers,
        elements: elements.get(id) ?? [],
        rails: rails.get(id) ?? {},
      };
    });
  }

  // ------------------------------------------------------------------ corners

  replaceCorners(corners: readonly Corner[]): void {
    this.stmt('DELETE FROM corner').run();
    const insert = this.stmt(
      `INSERT INTO corner (position, name, driver_strength, edge_rate, dk, width_delta, rail, cin, tco)
       VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?)`,
    );
    corners.forEach((c, position) =>
      insert.run(position, c.name, c.driverStrength, c.edgeRate, c.dk, c.widthDelta, c.rail, c.cin, c.tco),
    );
  }

  readCorners(): Corner[] {
    return (this.stmt('SELECT * FROM corner ORDER BY position').all() as Row[]).map((row) => ({
      name: text(row.name),
      driverStrength: num(row.driver_strength),
      edgeRate: num(row.edge_rate),
      dk: num(row.dk),
      widthDelta: num(row.width_delta),
      rail: num(row.rail),
      cin: num(row.cin),
      tco: row.tco as Corner['tco'],
    }));
  }

  // ------------------------------------------------------------------ I/O standard presets

  /** Inserts presets that are missing or differ; returns how many rows were written. */
  syncIoStandards(presets: readonly IoStandardPreset[]): number {
    const current = new Map(this.readIoStandards().map((p) => [p.name, JSON.stringify(p)]));
    const upsert = this.stmt(
      `INSERT INTO io_standard (name, description, vddq, vref, vil_ac, vih_ac, vil_dc, vih_dc, vtt, source, from_memory, note)
       VALUES (@name, @description, @vddq, @vref, @vilAc, @vihAc, @vilDc, @vihDc, @vtt, @source, @fromMemory, @note)
       ON CONFLICT (name) DO UPDATE SET description = excluded.description, vddq = excluded.vddq, vref = excluded.vref,
         vil_ac = excluded.vil_ac, vih_ac = excluded.vih_ac, vil_dc = excluded.vil_dc, vih_dc = excluded.vih_dc,
         vtt = excluded.vtt, source = excluded.source, from_memory = excluded.from_memory, note = excluded.note`,
    );
    let written = 0;
    for (const preset of presets) {
      const normal = normalisePreset(preset);
      if (current.get(preset.name) === JSON.stringify(normal)) continue;
      upsert.run({ ...normal, fromMemory: normal.fromMemory ? 1 : 0 });
      written += 1;
    }
    return written;
  }

  readIoStandards(): IoStandardPreset[] {
    return (this.stmt('SELECT * FROM io_standard ORDER BY name').all() as Row[]).map((row) =>
      normalisePreset({
        name: text(row.name), description: text(row.description), vddq: num(row.vddq), vref: num(row.vref),
        vilAc: num(row.vil_ac), vihAc: num(row.vih_ac), vilDc: num(row.vil_dc), vihDc: num(row.vih_dc),
        vtt: row.vtt === null ? null : num(row.vtt), source: text(row.source), fromMemory: row.from_memory === 1,
        note: text(row.note),
      }),
    );
  }

  // ------------------------------------------------------------------ change log and cache

  appendChange(change: ChangeRecord): void {
    this.stmt('INSERT INTO change_log (at, author, action, detail) VALUES (@at, @author, @action, @detail)').run(change);
  }

  /** Newest first. */
  listChanges(limit: number): ChangeRecord[] {
    return this.stmt('SELECT at, author, action, detail FROM change_log ORDER BY id DESC LIMIT ?').all(limit) as ChangeRecord[];
  }

  getCached(key: string): string | null {
    const row = this.stmt('SELECT json FROM results_cache WHERE key = ?').get(key) as { json: string } | undefined;
    return row ? row.json : null;
  }

  putCached(key: string, json: string, at: string): void {
    this.stmt(
      `INSERT INTO results_cache (key, json, created_at) VALUES (?, ?, ?)
       ON CONFLICT (key) DO UPDATE SET json = excluded.json, created_at = excluded.created_at`,
    ).run(key, json, at);
  }

  // ------------------------------------------------------------------ solve results (migration 006)

  /**
   * Changes whenever the project's inputs may have changed: a write to an input table on this
   * connection (the input revision, migration 014; in a file without it, any write: total_changes) or a
   * commit by another connection (PRAGMA data_version). Lets callers reuse a loaded project between
   * writes; derived data written beside it (results, fingerprints, field solutions) leaves it as is.
   */
  changeStamp(): string {
    const own = this.hasInputRevision()
      ? `r${this.inputRevision()}`
      : String((this.stmt('SELECT total_changes() AS n').get() as { n: number }).n);
    return `${this.db.pragma('data_version', { simple: true }) as number}:${own}`;
  }

  // ------------------------------------------------------------------ input revision (migration 014)

  /** The inputs' revision (bumped by triggers on every input table), or null in a file without it. */
  inputRevision(): number | null {
    if (!this.hasInputRevision()) return null;
    return (this.stmt('SELECT revision FROM input_revision WHERE id = 1').get() as { revision: number } | undefined)?.revision ?? null;
  }

  /** The fingerprint stored for inputs at `revision` hashed with `salt`, or null. */
  storedFingerprint(salt: string, revision: number): string | null {
    if (!this.hasInputRevision()) return null;
    const row = this.stmt(
      'SELECT fingerprint FROM input_revision WHERE id = 1 AND revision = ? AND fingerprint_revision = ? AND fingerprint_salt = ?',
    ).get(revision, revision, salt) as { fingerprint: string | null } | undefined;
    return row?.fingerprint ?? null;
  }

  /** Stores the fingerprint of the inputs at `revision`; nothing when the inputs have moved on since. */
  putFingerprint(salt: string, fingerprint: string, revision: number): void {
    if (!this.hasInputRevision()) return;
    this.stmt(
      'UPDATE input_revision SET fingerprint = ?, fingerprint_salt = ?, fingerprint_revision = ? WHERE id = 1 AND revision = ?',
    ).run(fingerprint, salt, revision, revision);
  }

  private inputRevisionTable: boolean | null = null;
  private hasInputRevision(): boolean {
    return (this.inputRevisionTable ??= this.db.prepare("SELECT 1 FROM sqlite_schema WHERE type = 'table' AND name = 'input_revision'").get() !== undefined);
  }

  /** The stored result JSON of a job's input hash, or null. One primary-key lookup. */
  getResult(key: string): string | null {
    const row = this.stmt('SELECT json FROM solve_result WHERE key = ?').get(key) as { json: string } | undefined;
    return row ? unpackResult(row.json) : null;
  }

  /**
   * Stores results; each replaces whatever its slot held before (one entry per slot), except the
   * entry under `keeps` (at most two per slot then: the latest solve's bus entry names it). The caller
   * wraps a batch in one transaction.
   */
  putResult(key: string, slot: string, json: string, at: string, keeps: string = key): void {
    this.stmt('DELETE FROM solve_result WHERE slot = ? AND key <> ? AND key <> ?').run(slot, key, keeps);
    this.stmt(
      `INSERT INTO solve_result (key, slot, json, stored_at) VALUES (?, ?, ?, ?)
       ON CONFLICT (key) DO UPDATE SET slot = excluded.slot, json = excluded.json, stored_at = excluded.stored_at`,
    ).run(key, slot, packResult(json), at);
  }

  /** Removes every stored result whose key is not in `keep`; returns how many were removed. */
  pruneResults(keep: readonly string[]): number {
    return this.stmt('DELETE FROM solve_result WHERE key NOT IN (SELECT value FROM json_each(?))').run(JSON.stringify(keep)).changes;
  }

  /** The manifest of a scope's latest solve, or null. */
  getManifest(scope: string): { fingerprint: string; solvedAt: string; json: string } | null {
    const row = this.stmt('SELECT fingerprint, solved_at, json FROM solve_manifest WHERE scope = ?').get(scope) as
      { fingerprint: string; solved_at: string; json: string } | undefined;
    return row ? { fingerprint: row.fingerprint, solvedAt: row.solved_at, json: row.json } : null;
  }

  putManifest(scope: string, fingerprint: string, solvedAt: string, json: string): void {
    this.stmt(
      `INSERT INTO solve_manifest (scope, fingerprint, solved_at, json) VALUES (?, ?, ?, ?)
       ON CONFLICT (scope) DO UPDATE SET fingerprint = excluded.fingerprint, solved_at = excluded.solved_at, json = excluded.json`,
    ).run(scope, fingerprint, solvedAt, json);
  }

  // ------------------------------------------------------------------ field solutions (migration 011)

  private fieldTable: boolean | undefined;
  private hasFieldTable(): boolean {
    this.fieldTable ??= this.db.prepare("SELECT 1 FROM sqlite_schema WHERE type = 'table' AND name = 'field_solution'").get() !== undefined;
    return this.fieldTable;
  }

  /** Every stored field solution (kind, key, value JSON); none in a file from before migration 011. */
  fieldSolutions(): { key: string; kind: string; value: string }[] {
    if (!this.hasFieldTable()) return [];
    return this.stmt('SELECT key, kind, value FROM field_solution').all() as { key: string; kind: string; value: string }[];
  }

  /** Stores one field solution (the caller wraps a batch in one transaction). */
  putFieldSolution(key: string, kind: string, value: string, at: string): void {
    if (!this.hasFieldTable()) return;
    this.stmt(
      `INSERT INTO field_solution (key, kind, value, stored_at) VALUES (?, ?, ?, ?)
       ON CONFLICT (key) DO UPDATE SET value = excluded.value, stored_at = excluded.stored_at`,
    ).run(key, kind, value, at);
  }

  /** Keeps the `keep` newest field solutions; returns how many were removed. */
  pruneFieldSolutions(keep: number): number {
    if (!this.hasFieldTable()) return 0;
    return this.stmt(
      'DELETE FROM field_solution WHERE key NOT IN (SELECT key FROM field_solution ORDER BY stored_at DESC LIMIT ?)',
    ).run(keep).changes;
  }

  /** Keeps the `keep` newest cache entries; returns how many were removed. */
  pruneCache(keep: number): number {
    return this.stmt(
      'DELETE FROM results_cache WHERE key NOT IN (SELECT key FROM results_cache ORDER BY created_at DESC LIMIT ?)',
    ).run(keep).changes;
  }

  // ------------------------------------------------------------------ authoring: whole content, undo stack

  /** Replaces every part, bus and net, the stackup, info and corners with `data` (inside a transaction). */
  replaceProjectContent(data: ProjectData): void {
    this.stmt('DELETE FROM net').run(); // endpoints, rails, elements and waivers go with their net (ON DELETE CASCADE)
    this.stmt('DELETE FROM bus').run();
    this.stmt('DELETE FROM part').run();
    if (this.hasIbisTables()) this.stmt('DELETE FROM ibis_file').run();
    this.insertProject(data);
  }

  /** Pushes a project snapshot on the undo or redo stack (migration 007). */
  pushUndoEntry(stack: 'undo' | 'redo', entry: { action: string; detail: string; at: string; snapshot: string }): void {
    this.stmt('INSERT INTO undo_entry (stack, action, detail, at, snapshot) VALUES (?, ?, ?, ?, ?)')
      .run(stack, entry.action, entry.detail, entry.at, entry.snapshot);
  }

  /** Removes and returns the newest entry of a stack, or null when it is empty. */
  popUndoEntry(stack: 'undo' | 'redo'): { action: string; detail: string; at: string; snapshot: string } | null {
    const row = this.stmt('SELECT id, action, detail, at, snapshot FROM undo_entry WHERE stack = ? ORDER BY id DESC LIMIT 1')
      .get(stack) as { id: number; action: string; detail: string; at: string; snapshot: string } | undefined;
    if (!row) return null;
    this.stmt('DELETE FROM undo_entry WHERE id = ?').run(row.id);
    return { action: row.action, detail: row.detail, at: row.at, snapshot: row.snapshot };
  }

  /** Newest first: action and detail of each entry of a stack (no snapshots). */
  listUndoEntries(stack: 'undo' | 'redo'): { action: string; detail: string; at: string }[] {
    return this.stmt('SELECT action, detail, at FROM undo_entry WHERE stack = ? ORDER BY id DESC').all(stack) as
      { action: string; detail: string; at: string }[];
  }

  /** Keeps the `keep` newest entries of a stack (0 empties it). */
  trimUndoEntries(stack: 'undo' | 'redo', keep: number): void {
    this.stmt('DELETE FROM undo_entry WHERE stack = ? AND id NOT IN (SELECT id FROM undo_entry WHERE stack = ? ORDER BY id DESC LIMIT ?)')
      .run(stack, stack, keep);
  }
}

/**
 * Stored solve results are compressed (DEFLATE, RFC 1951, level 1: about 8 times smaller on result
 * JSON, which repeats its keys) and kept as a JSON string "z1:<base64>", so the column's json_valid
 * check still holds and entries written uncompressed still read back. Smaller entries make the file,
 * its write-ahead log and the integrity check at open proportionally cheaper.
 */
const PACKED = 'z1:';

/** UTF-8 storage reused by packResult: writing into it is 2-9x faster than Buffer.from (no length pass, no allocation). */
let utf8Scratch = Buffer.alloc(0);

/** Largest scratch kept between calls; a larger entry is encoded on its own. */
const UTF8_SCRATCH_MAX = 32 << 20;

function packResult(json: string): string {
  // a UTF-16 code unit takes at most 3 bytes of UTF-8 (a surrogate pair, two units, takes 4)
  const worst = 3 * json.length;
  let utf8: Buffer;
  if (worst > UTF8_SCRATCH_MAX) utf8 = Buffer.from(json, 'utf8');
  else {
    if (utf8Scratch.length < worst) utf8Scratch = Buffer.allocUnsafe(Math.min(UTF8_SCRATCH_MAX, Math.max(worst, 2 * utf8Scratch.length)));
    utf8 = utf8Scratch.subarray(0, utf8Scratch.write(json, 'utf8'));
  }
  return JSON.stringify(PACKED + deflateRawSync(utf8, { level: 1 }).toString('base64'));
}

function unpackResult(stored: string): string {
  if (!stored.startsWith(`"${PACKED}`)) return stored;
  return inflateRawSync(Buffer.from((JSON.parse(stored) as string).slice(PACKED.length), 'base64')).toString('utf8');
}

/** The net_element columns readNets reads (net_id first), in order. */
const ELEMENT_COLUMNS = ['net_id', 'kind', 'node_a', 'node_b', 'layer_name', 'width', 'length', 'z0', 'delay', 'ohms', 'farads', 'henries', 'spacing'] as const;

/** A net element from the values of ELEMENT_COLUMNS, in that order. */
function elementFromValues(v: unknown[]): NetElement {
  const [, kind, nodeA, nodeB, layer, width, length, z0, delay, ohms, farads, henries, spacing] = v;
  const a = text(nodeA);
  const b = nodeB === null ? '' : text(nodeB);
  switch (kind) {
    case 'segment': {
      const segment: NetElement = { kind: 'segment', a, b, layer: text(layer), width: num(width), length: num(length) };
      // NULL means a single-ended trace.
      if (spacing !== null) segment.spacing = num(spacing);
      return segment;
    }
    case 'line': return { kind: 'line', a, b, z0: num(z0), delay: num(delay) };
    case 'resistor': return { kind: 'resistor', a, b, ohms: num(ohms) };
    case 'capacitor': return { kind: 'capacitor', a, b, farads: num(farads) };
    case 'inductor': return { kind: 'inductor', a, b, henries: num(henries) };
    case 'via': return { kind: 'via', a, farads: num(farads) };
    default: throw new Error(`net element of unknown kind "${String(kind)}" in the project file`);
  }
}

/** Fixed key order so stored and given presets compare as JSON. */
function normalisePreset(p: IoStandardPreset): IoStandardPreset {
  return {
    name: p.name, description: p.description, vddq: p.vddq, vref: p.vref, vilAc: p.vilAc, vihAc: p.vihAc,
    vilDc: p.vilDc, vihDc: p.vihDc, vtt: p.vtt, source: p.source, fromMemory: p.fromMemory, note: p.note,
  };
}
