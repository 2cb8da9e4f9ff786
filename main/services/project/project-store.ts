/**
 * The project service: opens or creates a project file, loads it as core/project/model.ts shapes, and
 * applies edits and length imports. Each edit is validated against the whole project, written in one
 * transaction and recorded in the change log together with who made it. No SQL here: the data layer
 * (main/services/db) owns every statement.
 */
import { rmSync } from 'node:fs';
import { userInfo } from 'node:os';
import { InputError, require_ } from '../../../core/errors.js';
import type { ChangeLogEntry, ImportPreview } from '../../../core/contract/api.js';
import type {
  BusDefinition, Corner, NetElement, PartModel, ProjectData, ProjectInfo, Stackup,
} from '../../../core/project/model.js';
import { IO_STANDARDS, type IoStandardPreset } from '../../../core/project/io-standards.js';
import { planLengthImport, readLengthReport, summariseImport, type LengthImportPlan } from '../../../core/lengths/length-report.js';
import { describeImportPlan } from '../../../core/lengths/mapping-words.js';
import { ProjectDatabase } from '../db/project-database.js';
import { ReadOnlyProjectError } from '../db/project-errors.js';
import { tokeniseLengthCsv } from './length-csv.js';
import { validateCorners, validateProject } from '../../../core/project/validate.js';
import { checkProjectIbis, ibisFileRecord, parsedIbisFile } from '../../../core/netbuild/ibis-parts.js';

/** Field solutions kept per project: a few hundred layer geometries x corners (common practice, no source). */
const FIELD_SOLUTIONS_KEPT = 2000;

const parsedModels = (record: Parameters<typeof parsedIbisFile>[0]) => parsedIbisFile(record).models.map((m) => m.name);

export interface ProjectStoreOptions {
  /** Name written to the change log; default $SLACKLINE_AUTHOR, else the OS user name. */
  author?: string;
  /** SQLite page cache in KiB for this connection (open only); default: the driver's default. */
  cacheSizeKib?: number;
  /** Bounded wait for another process's write lock, ms (default 5000; docs/reliability.md §1). */
  busyTimeoutMs?: number;
  /** Open read-only even when the file could be written (open only). */
  readOnly?: boolean;
}

export interface ApplyImportOptions {
  /** Called while the changed segments are written (every 1000 rows and at the end). */
  onProgress?: (done: number, total: number) => void;
  /** Accept rows that repeat an earlier (net, layer, length) row, under the rule the preview states. */
  allowRepeatedRows?: boolean;
}

function defaultAuthor(): string {
  if (process.env.SLACKLINE_AUTHOR) return process.env.SLACKLINE_AUTHOR;
  try {
    return userInfo().username || 'unknown';
  } catch {
    return 'unknown'; // no passwd entry for the uid (some containers)
  }
}

export class ProjectStore {
  private constructor(
    private readonly database: ProjectDatabase,
    /** The project file. */
    readonly path: string,
    private readonly author: string,
  ) {}

  /** Creates a new project file from `data` (the file must not exist, or be empty). */
  static create(path: string, data: ProjectData, options: ProjectStoreOptions = {}): ProjectStore {
    validateProject(data);
    const database = ProjectDatabase.create(path, { busyTimeoutMs: options.busyTimeoutMs });
    const store = new ProjectStore(database, path, options.author ?? defaultAuthor());
    try {
      database.transaction(() => {
        database.insertProject(data);
        database.syncIoStandards(IO_STANDARDS);
        store.log('create-project', `created project "${data.info.name}" with ${data.nets.length} nets`);
      });
    } catch (error) {
      database.close();
      for (const file of [path, `${path}-wal`, `${path}-shm`]) rmSync(file, { force: true }); // ours, half-made
      throw error;
    }
    return store;
  }

  /**
   * Opens a project file. Refuses (InputError, file untouched) anything that is not a Slackline
   * project or comes from a newer schema; migrates an older one after writing a backup copy.
   */
  static open(path: string, options: ProjectStoreOptions = {}): ProjectStore {
    const database = ProjectDatabase.open(path, {
      cacheSizeKib: options.cacheSizeKib, busyTimeoutMs: options.busyTimeoutMs, readOnly: options.readOnly,
    });
    try {
      if (!database.guard(() => database.hasProject())) throw new InputError(path, 'holds the Slackline schema but no project (it was never filled)');
      // A read-only project keeps the presets it has (they are refreshed when it is next opened writable).
      if (!database.readOnly) database.transaction(() => database.syncIoStandards(IO_STANDARDS));
    } catch (error) {
      database.close();
      throw error;
    }
    return new ProjectStore(database, path, options.author ?? defaultAuthor());
  }

  /** Schema version the file had when opened (0 for a new file). */
  get migratedFrom(): number {
    return this.database.opened.fromVersion;
  }

  /** The copy written before migrating, or null. */
  get backupPath(): string | null {
    return this.database.opened.backupPath;
  }

  get isOpen(): boolean {
    return this.database.isOpen;
  }

  /**
   * Why the project is open read-only (the file or its folder cannot be written), or null. A read-only
   * project loads and solves; edits are refused and results are not stored (docs/reliability.md §3).
   */
  get readOnly(): string | null {
    return this.database.readOnly;
  }

  close(): void {
    this.database.close();
  }

  load(): ProjectData {
    return this.database.readProject();
  }

  private shared: { stamp: string; project: ProjectData } | null = null;

  /**
   * The project for readers that do not change it (the service API's getProject, the solver): the
   * same object while the file's change stamp stays, so a board of thousands of nets is read once per
   * write, not once per call (docs/workbench.md, "Board scale"). Callers must not modify it.
   */
  loadShared(): ProjectData {
    const stamp = this.database.changeStamp();
    if (this.shared?.stamp === stamp) return this.shared.project;
    const project = this.database.readProject();
    this.shared = { stamp, project };
    return project;
  }

  /** The I/O standard presets stored in the project (with their cited sources). */
  ioStandards(): IoStandardPreset[] {
    return this.database.readIoStandards();
  }

  // ------------------------------------------------------------------ edits (one transaction each)

  updateInfo(patch: Partial<ProjectInfo>): void {
    this.edit('update-info', (current) => {
      const info = { ...current.info, ...patch };
      validateProject({ ...current, info });
      this.database.writeInfo(info);
      const changed = (Object.keys(patch) as (keyof ProjectInfo)[]).filter((k) => current.info[k] !== info[k]);
      return `changed project ${changed.join(', ') || '(nothing)'}`;
    });
  }

  replaceStackup(stackup: Stackup): void {
    this.edit('replace-stackup', (current) => {
      validateProject({ ...current, stackup });
      this.database.replaceStackup(stackup);
      return `replaced stackup "${stackup.name}" (${stackup.layers.length} layers)`;
    });
  }

  upsertPart(part: PartModel): void {
    this.edit('upsert-part', (current) => {
      const exists = current.parts.some((p) => p.name === part.name);
      const parts = exists ? current.parts.map((p) => (p.name === part.name ? part : p)) : [...current.parts, part];
      validateProject({ ...current, parts });
      checkProjectIbis({ ...current, parts });
      this.database.upsertPart(part);
      return `${exists ? 'changed' : 'added'} part ${part.name}`;
    });
  }

  /**
   * Stores an IBIS file (docs/ibis.md §9) under its base name: the whole text is parsed first (errors
   * name file, line and keyword) and every part using a file of that name must still find its model;
   * then text and SHA-256 are written in one transaction. A bad file writes nothing.
   */
  importIbis(fileName: string, text: string): { name: string; sha256: string; models: string[]; replaced: boolean } {
    const name = fileName.split(/[\\/]/).pop() ?? fileName;
    const record = ibisFileRecord(name, text);
    const models = parsedModels(record);
    let replaced = false;
    this.edit('import-ibis', (current) => {
      const others = (current.ibisFiles ?? []).filter((f) => f.name !== name);
      replaced = others.length !== (current.ibisFiles ?? []).length;
      checkProjectIbis({ ...current, ibisFiles: [...others, record] });
      this.database.upsertIbisFile(record);
      return `${replaced ? 'replaced' : 'imported'} IBIS file ${name} (sha256 ${record.sha256.slice(0, 12)}…, models ${models.join(', ')})`;
    });
    return { name, sha256: record.sha256, models, replaced };
  }

  /** Updates the bus of that name, or adds it. */
  updateBus(bus: BusDefinition): void {
    this.edit('update-bus', (current) => {
      const exists = current.buses.some((b) => b.name === bus.name);
      const buses = exists ? current.buses.map((b) => (b.name === bus.name ? bus : b)) : [...current.buses, bus];
      validateProject({ ...current, buses });
      this.database.upsertBus(bus);
      return `${exists ? 'changed' : 'added'} bus ${bus.name}`;
    });
  }

  updateNetElement(netName: string, index: number, element: NetElement): void {
    this.edit('update-net-element', (current) => {
      const net = current.nets.find((n) => n.name === netName);
      require_(net !== undefined, `net ${netName}`, 'is not in the project');
      require_(
        Number.isInteger(index) && index >= 0 && index < net.elements.length,
        `net ${netName} element ${index + 1}`,
        `no such element (the net has ${net.elements.length})`,
      );
      const elements = net.elements.map((e, i) => (i === index ? element : e));
      validateProject({ ...current, nets: current.nets.map((n) => (n === net ? { ...net, elements } : n)) });
      this.database.replaceNetElement(netName, index, element);
      return `net ${netName} element ${index + 1}: ${describeElement(net.elements[index])} -> ${describeElement(element)}`;
    });
  }

  updateCorners(corners: Corner[]): void {
    this.edit('update-corners', () => {
      validateCorners(corners);
      this.database.replaceCorners(corners);
      return `corners: ${corners.map((c) => c.name).join(', ')}`;
    });
  }

  // ------------------------------------------------------------------ authoring with undo (docs/design-file.md §9)

  /** Undo steps kept in the file (at least 20 are promised; docs/design-file.md §9). */
  static readonly UNDO_DEPTH = 50;

  /**
   * One authoring edit: `change` returns the whole changed project and its change-log line. The result
   * is validated in full and written in one transaction, with the project as it was on the undo stack
   * (migration 007) and the redo stack cleared. Returns the change-log line.
   */
  authorEdit(action: string, change: (current: ProjectData) => { project: ProjectData; detail: string }): string {
    let line = '';
    this.edit(action, (current) => {
      const { project, detail } = change(current);
      validateProject(project);
      // Every part's IBIS reference must resolve to a stored file and a model in it (docs/ibis.md §9).
      checkProjectIbis(project);
      this.database.pushUndoEntry('undo', { action, detail, at: new Date().toISOString(), snapshot: undoSnapshot(current) });
      this.database.trimUndoEntries('undo', ProjectStore.UNDO_DEPTH);
      this.database.trimUndoEntries('redo', 0);
      this.database.replaceProjectContent(project);
      line = detail;
      return detail;
    });
    return line;
  }

  /** Restores the project as it was before the newest authoring edit; returns the change-log line. */
  undo(): string {
    return this.undoStep('undo', 'redo');
  }

  /** Re-applies the newest undone edit; returns the change-log line. */
  redo(): string {
    return this.undoStep('redo', 'undo');
  }

  /** Newest first: what undo and redo would restore. */
  undoHistory(): { undo: { action: string; detail: string; at: string }[]; redo: { action: string; detail: string; at: string }[] } {
    return { undo: this.database.listUndoEntries('undo'), redo: this.database.listUndoEntries('redo') };
  }

  private undoStep(from: 'undo' | 'redo', to: 'undo' | 'redo'): string {
    let line = '';
    this.edit(from, (current) => {
      const entry = this.database.popUndoEntry(from);
      require_(entry !== null, from, `there is nothing to ${from}`);
      this.database.pushUndoEntry(to, { action: entry.action, detail: entry.detail, at: entry.at, snapshot: undoSnapshot(current) });
      const project = restoredSnapshot(entry.snapshot, current);
      validateProject(project);
      checkProjectIbis(project);
      this.database.replaceProjectContent(project);
      line = `${from === 'undo' ? 'undid' : 'redid'} ${entry.action}: ${entry.detail}`;
      return line;
    });
    return line;
  }

  // ------------------------------------------------------------------ results cache and change log

  /** Cached result JSON for an input hash, or null. */
  getCached(key: string): string | null {
    return this.database.getCached(key);
  }

  /** Stores result JSON under an input hash (not a project edit: no change-log entry). */
  putCached(key: string, json: string): void {
    require_(key.length > 0, 'results cache key', 'must not be empty');
    if (this.database.readOnly) return; // results are not stored in a read-only project
    this.database.putCached(key, json, new Date().toISOString());
  }

  /** A stamp that differs after any write to the project's inputs (see ProjectDatabase.changeStamp). */
  changeStamp(): string {
    return this.database.changeStamp();
  }

  /** The inputs' revision (migration 014), or null in a file without it. */
  inputRevision(): number | null {
    return this.database.inputRevision();
  }

  /** The input fingerprint stored for `revision` and `salt`, or null (docs/board-partitioning.md §4). */
  storedFingerprint(salt: string, revision: number): string | null {
    return this.database.storedFingerprint(salt, revision);
  }

  /**
   * Stores the input fingerprint computed at `revision` (nothing in a read-only project, or when the
   * inputs have moved on). Not an input change: the change stamp stays.
   */
  putFingerprint(salt: string, fingerprint: string, revision: number): void {
    if (this.database.readOnly) return;
    this.database.putFingerprint(salt, fingerprint, revision);
  }

  /** Stored solve result JSON of a job's input hash, or null (migration 006). */
  getResult(key: string): string | null {
    return this.database.getResult(key);
  }

  /**
   * Stores solve results in one transaction; each entry replaces what its slot held (not a project
   * edit: no change-log entry).
   */
  putResults(entries: readonly { key: string; slot: string; json: string; keeps?: string }[]): void {
    if (entries.length === 0) return;
    for (const e of entries) require_(e.key.length > 0 && e.slot.length > 0, 'solve result', 'needs a key and a slot');
    if (this.database.readOnly) return; // results are not stored in a read-only project
    const at = new Date().toISOString();
    this.database.transaction(() => {
      for (const e of entries) this.database.putResult(e.key, e.slot, e.json, at, e.keeps);
    });
  }

  /** Stored 2-D field solutions (migration 011), as the memo entries of core/fieldsolve. */
  fieldSolutions(): { key: string; kind: string; value: string }[] {
    return this.database.fieldSolutions();
  }

  /**
   * Stores field solutions in one transaction and keeps at most FIELD_SOLUTIONS_KEPT of them (a cache:
   * not a project edit, no change-log entry; nothing is stored in a read-only project).
   */
  putFieldSolutions(entries: readonly { key: string; kind: string; value: string }[]): void {
    if (entries.length === 0 || this.database.readOnly) return;
    const at = new Date().toISOString();
    this.database.transaction(() => {
      for (const e of entries) this.database.putFieldSolution(e.key, e.kind, e.value, at);
      this.database.pruneFieldSolutions(FIELD_SOLUTIONS_KEPT);
    });
  }

  /** Drops every stored solve result not named in `keep`; returns how many were dropped. */
  pruneResults(keep: readonly string[]): number {
    if (this.database.readOnly) return 0;
    return this.database.transaction(() => this.database.pruneResults(keep));
  }

  /** The latest whole-board solve's manifest (JSON), or null. */
  getManifest(): { fingerprint: string; solvedAt: string; json: string } | null {
    return this.database.getManifest('board');
  }

  /**
   * Stores the latest solve's manifest and, when given, the summary of the solve it replaces (scope
   * 'previous-board' of the same table, docs/board-partitioning.md §4), in one transaction.
   */
  putManifest(manifest: { fingerprint: string; solvedAt: string; json: string }, previous?: { fingerprint: string; solvedAt: string; json: string }): void {
    if (this.database.readOnly) return;
    this.database.transaction(() => {
      if (previous) this.database.putManifest('previous-board', previous.fingerprint, previous.solvedAt, previous.json);
      this.database.putManifest('board', manifest.fingerprint, manifest.solvedAt, manifest.json);
    });
  }

  /** The summary of the whole-board solve before the latest one (per-net worst margins), or null. */
  getPreviousManifest(): { fingerprint: string; solvedAt: string; json: string } | null {
    return this.database.getManifest('previous-board');
  }

  /** Keeps the `keep` newest cached results; returns how many were dropped. */
  pruneCache(keep: number): number {
    require_(Number.isInteger(keep) && keep >= 0, 'results cache size', `must be a whole number, got ${keep}`);
    if (this.database.readOnly) return 0;
    return this.database.pruneCache(keep);
  }

  /** Newest first. */
  changeLog(limit = 50): ChangeLogEntry[] {
    return this.database.listChanges(limit);
  }

  /** "ok" when SQLite finds the file sound. */
  integrityCheck(): string {
    return this.database.integrityCheck();
  }

  settings(): ReturnType<ProjectDatabase['settings']> {
    return this.database.settings();
  }

  // ------------------------------------------------------------------ length import

  /** What importing the report would do; writes nothing. */
  previewImport(fileName: string, csvText: string, options: Pick<ApplyImportOptions, 'allowRepeatedRows'> = {}): ImportPreview {
    return this.planImport(fileName, csvText, this.load(), options).preview;
  }

  /**
   * Validates the whole report, then writes every changed segment in one transaction (with its
   * change-log entry). A report with errors writes nothing and comes back with `applied: false`.
   */
  applyImport(fileName: string, csvText: string, options: ApplyImportOptions = {}): ImportPreview {
    const parsed = this.parseImport(fileName, csvText);
    if (parsed.errors.length > 0) return this.planFrom(fileName, parsed, this.load(), options).preview;
    // An import that changes nothing writes nothing: no transaction, no change-log entry, file unchanged.
    const unlocked = this.planFrom(fileName, parsed, this.load(), options);
    if (unlocked.preview.errors.length > 0 || unlocked.updates.length === 0) return unlocked.preview;
    this.refuseIfReadOnly();
    this.database.backupBeforeFirstEdit();
    return this.database.transaction(() => {
      // Planned again under the write lock: another process may have changed the project meanwhile.
      const plan = this.planFrom(fileName, parsed, this.load(), options);
      if (plan.preview.errors.length > 0 || plan.updates.length === 0) return plan.preview;
      const { updates } = plan;
      const chunk = 1000;
      for (let done = 0; done < updates.length; done += chunk) {
        this.database.updateSegments(updates.slice(done, done + chunk));
        options.onProgress?.(Math.min(done + chunk, updates.length), updates.length);
      }
      this.log('import-lengths', summariseImport(plan.preview));
      return { ...plan.preview, applied: true };
    });
  }

  private parseImport(fileName: string, csvText: string) {
    requireReportSize(fileName, csvText.length);
    const tokens = tokeniseLengthCsv(fileName, csvText);
    if (tokens.errors.length > 0) return { rows: [], errors: tokens.errors };
    return readLengthReport(fileName, tokens.records);
  }

  private planFrom(
    fileName: string, parsed: ReturnType<ProjectStore['parseImport']>, project: ProjectData,
    options: Pick<ApplyImportOptions, 'allowRepeatedRows'> = {},
  ): LengthImportPlan {
    // The preview says in words where each row went and why others are not written (docs/design-file.md §6).
    return describeImportPlan(
      planLengthImport(fileName, parsed.rows, parsed.errors, project, { allowRepeatedRows: options.allowRepeatedRows }), project,
    );
  }

  private planImport(
    fileName: string, csvText: string, project: ProjectData, options: Pick<ApplyImportOptions, 'allowRepeatedRows'> = {},
  ): LengthImportPlan {
    return this.planFrom(fileName, this.parseImport(fileName, csvText), project, options);
  }

  // ------------------------------------------------------------------ helpers

  /** Runs one edit as one transaction: read, validate and write, then log; any throw undoes all. */
  private edit(action: string, apply: (current: ProjectData) => string): void {
    require_(this.database.isOpen, this.path, 'the project is closed');
    this.refuseIfReadOnly();
    this.database.backupBeforeFirstEdit();
    this.database.transaction(() => {
      const detail = apply(this.load());
      this.log(action, detail);
    });
  }

  private refuseIfReadOnly(): void {
    if (this.database.readOnly) throw new ReadOnlyProjectError(this.path, this.database.readOnly);
  }

  private log(action: string, detail: string): void {
    this.database.appendChange({ at: new Date().toISOString(), author: this.author, action, detail });
  }
}

/**
 * Largest length report read, in characters (16 MiB, about half a million rows of a board-wide
 * report): parsing and comparing take memory in proportion (about 50 bytes per character measured), so
 * the limit is checked before any of that work (docs/reliability.md §7).
 */
export const MAX_LENGTH_REPORT_CHARS = 16 * 1024 * 1024;

export function requireReportSize(fileName: string, chars: number): void {
  require_(
    chars <= MAX_LENGTH_REPORT_CHARS, fileName,
    `is ${(chars / 1048576).toFixed(1)} MB; length reports up to ${MAX_LENGTH_REPORT_CHARS / 1048576} MB are read (about 500,000 rows) — split the report by net or layer`,
  );
}

function describeElement(e: NetElement): string {
  switch (e.kind) {
    case 'segment': return `segment ${e.layer} ${(e.length * 1e3).toFixed(3)} mm x ${(e.width * 1e3).toFixed(3)} mm`
      + (e.spacing === undefined ? '' : `, pair gap ${(e.spacing * 1e3).toFixed(3)} mm`);
    case 'line': return `line ${e.z0} ohm ${(e.delay * 1e12).toFixed(1)} ps`;
    case 'resistor': return `resistor ${e.ohms} ohm`;
    case 'capacitor': return `capacitor ${(e.farads * 1e12).toFixed(3)} pF`;
    case 'inductor': return `inductor ${(e.henries * 1e9).toFixed(3)} nH`;
    case 'via': return `via ${(e.farads * 1e12).toFixed(3)} pF`;
  }
}

/**
 * An undo entry's project (migration 007) without the stored IBIS files: imports are not authoring
 * edits, so undo never takes a file back, and fifty entries do not hold fifty copies of every .ibs
 * text (docs/design-file.md §9).
 */
function undoSnapshot(project: ProjectData): string {
  const { ibisFiles: _kept, ...rest } = project;
  return JSON.stringify(rest);
}

/** The project an undo entry restores, with the IBIS files stored now (an older entry's copies are ignored). */
function restoredSnapshot(snapshot: string, current: ProjectData): ProjectData {
  const { ibisFiles: _older, ...rest } = JSON.parse(snapshot) as ProjectData;
  return current.ibisFiles ? { ...rest, ibisFiles: current.ibisFiles } : rest;
}
