/**
 * Solve orchestration: plans a board solve (core/engine/board.ts), takes every job whose input hash is
 * stored in the project from there, runs the rest on a worker-thread pool (or in this thread when only
 * a few are left, as after a one-net edit), reports progress, honours cancellation, and assembles the
 * BoardResult. Storage (docs/board-partitioning.md §4): one entry per job under its input hash,
 * one entry per bus of the latest whole-board solve, and a small manifest naming them; a whole-board
 * solve prunes everything else. Business logic stays in core/.
 */
import { readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import type { ProjectData } from '../../../core/project/model.js';
import type { BoardResult, BoardTable, BusResult, BusTable, NetResult } from '../../../core/budget/results.js';
import type { NetWaveforms } from '../../../core/contract/api.js';
import type { ReceiverEdgeMeasure } from '../../../core/budget/measures.js';
import { assembleBoard, planBoard, projectFingerprint, type BoardPlan } from '../../../core/engine/board.js';
import { ENGINE_REVISION, runJob, type SolveJobSpec } from '../../../core/engine/jobs.js';
import { findNet, type SolveOptions } from '../../../core/engine/solve-net.js';
import { netWaveforms } from '../../../core/engine/waveforms.js';
import { routedLineGeometries, warmRoutedLines } from '../../../core/netbuild/index.js';
import { hashOf } from '../../../core/hash/index.js';
import { netWorstMargin } from '../../../core/report/columns.js';
import { busTable, summariseBus, type BusResultSummary } from '../../../core/engine/board-summary.js';
import { InputError } from '../../../core/errors.js';
import { fieldMemoEntries, fieldMemoSize, seedFieldMemo, takeFreshFieldEntries, type FieldMemoEntry } from '../../../core/fieldsolve/memo.js';
import { startLinesAhead, type LinesAheadRun } from './lines-ahead.js';
import { busEntryJson, busFromEntry } from './bus-entry.js';
import { AbortedError, WorkerPool, type PooledOutput } from './worker-pool.js';
import { runSweep, type SweepRunOptions } from './sweep-runner.js';
import type { NetSweep, SweepRequest } from '../../../core/engine/sweep.js';

/** One stored result: `slot` names what it answers (a new entry for a slot replaces the older one). */
export interface StoredResult {
  key: string;
  slot: string;
  json: string;
  /**
   * An older entry of the same slot that stays: the job result the latest whole-board solve's bus
   * entry names (bus-entry.ts), kept until that solve is replaced and pruned.
   */
  keeps?: string;
}

/** The latest whole-board solve: its input fingerprint, time, and JSON of a BoardManifest. */
export interface StoredManifest {
  fingerprint: string;
  solvedAt: string;
  json: string;
}

/** What the service needs from the project store (ProjectStore satisfies it). */
export interface SolveStore {
  load(): ProjectData;
  /** Optional: the project as a copy shared with other readers while the file is unchanged (ProjectStore.loadShared). */
  loadShared?(): ProjectData;
  /** Stored result JSON of an input hash, or null; a primary-key lookup, never a scan. */
  getResult(key: string): string | null;
  /** Stores a batch of results in one transaction. */
  putResults(entries: readonly StoredResult[]): void;
  /** Drops every stored result whose key is not in `keep`; returns how many were dropped. */
  pruneResults(keep: readonly string[]): number;
  getManifest(): StoredManifest | null;
  /**
   * Stores the latest solve's manifest; `previous`, when given, is the summary of the solve it replaces
   * (per-net worst margins, docs/board-partitioning.md §4), kept beside it in the same transaction.
   */
  putManifest(manifest: StoredManifest, previous?: StoredManifest): void;
  /** Optional: the summary of the whole-board solve before the latest one, or null. */
  getPreviousManifest?(): StoredManifest | null;
  /** Optional: a stamp that changes after every write to the inputs, so a loaded project can be reused until then. */
  changeStamp?(): string;
  /**
   * Optional: the inputs' revision (bumped on every write to an input) and the input fingerprint
   * stored for one (docs/board-partitioning.md §4), so a large project is not hashed again on opening.
   */
  inputRevision?(): number | null;
  storedFingerprint?(salt: string, revision: number): string | null;
  putFingerprint?(salt: string, fingerprint: string, revision: number): void;
  /** Optional: stored 2-D field solutions (docs/field-solver.md §10), and storing new ones. */
  fieldSolutions?(): { key: string; kind: string; value: string }[];
  putFieldSolutions?(entries: readonly { key: string; kind: string; value: string }[]): void;
}

/** Stored field solutions are valid for the engine revision that solved them. */
const FIELD_KEY_PREFIX = `engine ${ENGINE_REVISION}|`;

/** What the manifest names: the per-bus entries of the latest whole-board solve, in board order. */
interface BoardManifest {
  project: string;
  toolVersion: string;
  /** Jobs the solve planned (for SolveStats of a re-check served from the manifest). */
  jobs: number;
  /**
   * Per bus: its entry's key and, since board summaries (docs/workbench.md, "Board scale"), its
   * summary and each net's input hash, so the overview reads one row instead of every bus entry.
   */
  buses: { bus: string; key: string; summary?: BusResultSummary; inputs?: [string, string][] }[];
}

/** A bus of the latest whole-board solve as the board summary gives it (waivers are the caller's). */
export interface SolvedBusSummary extends BusResultSummary {
  /** Nets of the bus whose inputs changed since the solve. */
  changedNets: number;
}

/** The latest whole-board solve, bus by bus, without net results. */
export interface SolvedBoardSummary {
  project: string;
  solvedAt: string;
  fingerprint: string;
  toolVersion: string;
  fresh: boolean;
  nets: number;
  changedNets: number;
  buses: SolvedBusSummary[];
}

/** One bus's result in the latest whole-board solve, with whether it is fresh and which of its nets changed. */
export interface SolvedBus {
  bus: BusResult;
  solvedAt: string;
  fingerprint: string;
  fresh: boolean;
  changedNets: Set<string>;
}

export interface SolveBoardOptions {
  /** Solve only this bus. */
  bus?: string;
  onProgress?: (done: number, total: number, message: string) => void;
  signal?: AbortSignal;
}

/** The whole-board solve before the latest one, as a per-net summary. */
export interface PreviousSolve {
  solvedAt: string;
  fingerprint: string;
  /** Worst margin per net name, s; null where that solve had no number. */
  margins: Record<string, number | null>;
}

/** Counts of the last solve, for tests and benchmarks. */
export interface SolveStats {
  jobs: number;
  /** Jobs run (not taken from the cache). */
  solved: number;
  fromCache: number;
  simulations: number;
  /** Names of the nets whose jobs ran. */
  solvedNets: string[];
}

export interface SolveServiceOptions {
  /** Worker threads; default os.availableParallelism(). 0 = solve in this thread. */
  workers?: number;
  /**
   * Solves with at most this many jobs left after the cache run in this thread, not on the workers
   * (default IN_THREAD_JOBS: a worker costs more to start than a few nets cost to solve). A host that
   * may block its thread raises it where the pool is measured to lose (docs/board-partitioning.md §5).
   */
  inThreadUpTo?: number;
  /**
   * Solve a never field-solved board's cross-sections on two threads before its nets (default true
   * when the service may use workers; lines-ahead.ts).
   */
  linesAhead?: boolean;
  solve?: SolveOptions;
}

/**
 * The package version (main/ may do I/O; core/ may not): the nearest package.json named "slackline"
 * above this module, so it works from the source tree and from a bundled build alike.
 */
export function toolVersion(): string {
  let dir = dirname(fileURLToPath(import.meta.url));
  for (let i = 0; i < 8; i++) {
    try {
      const pkg = JSON.parse(readFileSync(join(dir, 'package.json'), 'utf8')) as { name?: string; version?: string };
      if (pkg.name === 'slackline' && pkg.version) return pkg.version;
    } catch {
      // no package.json here: keep walking up
    }
    const parent = dirname(dir);
    if (parent === dir) break;
    dir = parent;
  }
  return 'unknown';
}

type CachedJob = { measures: ReceiverEdgeMeasure[]; result: NetResult | null };

/**
 * At most this many jobs left to run after the cache: they run in this thread instead of starting
 * worker threads (a worker costs more to start than a few nets cost to solve; the one-net edit path).
 */
const IN_THREAD_JOBS = 8;
/** Stored results are written in batches of this many, each one transaction (plus the rest at the end). */
const WRITE_BATCH = 256;

type Execute = (project: ProjectData, job: SolveJobSpec) => Promise<PooledOutput>;
/** Where the jobs of a solve run, chosen once the number still to run (`missing`) is known. */
type ExecutorFor = (missing: number, project: ProjectData) => Execute;

/** What a board solve returns of each bus: its full result, or its margin table (BusTable). */
type Detail = 'full' | 'table';

/** Key of a bus entry's margin table, stored beside the entry (docs/board-partitioning.md §4). */
const tableKey = (busKey: string): string => `table:${busKey}`;

export class SolveService {
  private pool: WorkerPool | null = null;
  private readonly version = toolVersion();
  private readonly solveOptions: SolveOptions;
  private projectCounter = 0;
  private lastBoard: BoardResult | null = null;
  /** Jobs of the solve that gave lastBoard. */
  private lastJobs = 0;
  /** The project as last loaded, with the store's change stamp at that time. */
  /** `revision`: the inputs' revision the project was read at, null when unknown (then never stored). */
  private loaded: { stamp: string; project: ProjectData; revision: number | null; fingerprint?: string } | null = null;
  /** Statistics of the most recent solveBoard / solveBoardSync / solveNet call. */
  lastStats: SolveStats = { jobs: 0, solved: 0, fromCache: 0, simulations: 0, solvedNets: [] };

  constructor(
    private readonly store: SolveStore,
    private readonly options: SolveServiceOptions = {},
  ) {
    this.solveOptions = options.solve ?? {};
  }

  /** Cache salt: the tool version and the solve options change results without changing the project. */
  private get salt(): string {
    return `slackline ${this.version} engine ${ENGINE_REVISION} ${hashOf(this.solveOptions)}`;
  }

  /** Solves the board (or one bus) on the worker pool. Rejects with an AbortError when `signal` aborts. */
  async solveBoard(options: SolveBoardOptions = {}): Promise<BoardResult> {
    // Detail 'full': every bus is a full BusResult (read in full or solved now).
    return (await this.solveOnPool(options, 'full')) as BoardResult;
  }

  /**
   * The same solve, returning margin tables (docs/board-partitioning.md §4, "Margin tables"): buses
   * taken from the store are read from their small table entries, so a re-check that prints the table
   * does not read every bus's line items. Does not replace the results freshResults() serves.
   */
  async solveBoardTable(options: SolveBoardOptions = {}): Promise<BoardTable> {
    return this.solveOnPool(options, 'table');
  }

  private async solveOnPool(options: SolveBoardOptions, detail: Detail): Promise<BoardTable> {
    if ((this.options.workers ?? 1) === 0) return this.runBoard(options, () => this.inThread, detail);
    const projectId = `p${++this.projectCounter}`;
    let onAbort: (() => void) | null = null;
    try {
      return await this.runBoard(options, (missing, project) => {
        if (missing <= (this.options.inThreadUpTo ?? IN_THREAD_JOBS)) return this.inThread;
        const pool = (this.pool ??= new WorkerPool(this.options.workers, (project, job, options) => runJob(project, job, options)));
        onAbort = () => pool.cancelQueued();
        options.signal?.addEventListener('abort', onAbort);
        // The workers load while this thread solves the board's cross-sections once (they would each
        // solve them again otherwise); what this thread then knows is sent once per worker.
        pool.start();
        warmRoutedLines(project);
        const seed = fieldMemoEntries();
        const onSolved = (entries: FieldMemoEntry[]) => this.workerFieldSolutions.push(...entries);
        return (project, job) => pool.run(projectId, project, job, this.solveOptions, { seed, onSolved });
      }, detail);
    } finally {
      if (onAbort) options.signal?.removeEventListener('abort', onAbort);
    }
  }

  /** The same solve in this thread, one job after another (tests, benchmark comparison). */
  async solveBoardSync(options: SolveBoardOptions = {}): Promise<BoardResult> {
    return (await this.runBoard(options, () => this.inThread, 'full')) as BoardResult;
  }

  private readonly inThread: Execute = async (project, job) => runJob(project, job, this.solveOptions);

  /**
   * One net now, in this thread, through the cache (the fast path after an edit): its bus is planned
   * and assembled as in a board solve, so unchanged nets come from the cache and the result carries the
   * bus-level fields (skew to the reference net, bus-worst margins of a clock).
   */
  async solveNet(name: string): Promise<NetResult> {
    const net = findNet(this.project(), name);
    const board = (await this.runBoard({ bus: net.bus }, () => this.inThread, 'full')) as BoardResult;
    const result = board.buses[0]?.nets.find((n) => n.net === name);
    if (!result) throw new InputError(`net ${name}`, board.buses[0]?.note ?? 'its bus could not be solved');
    return result;
  }

  /**
   * A stored bus entry as `detail` asks: the full result, or its margin table (from the table entry,
   * or derived from the full entry when the solve that stored it wrote none); null when missing.
   */
  private readBus(key: string, detail: Detail): BusTable | null {
    if (detail === 'table') {
      const table = this.store.getResult(tableKey(key));
      if (table !== null) return JSON.parse(table) as BusTable;
    }
    const bus = this.readBusEntry(key);
    if (bus === null) return null;
    return detail === 'table' ? busTable(bus) : bus;
  }

  /** A stored bus entry with its nets' results read from their job entries (bus-entry.ts); null when missing. */
  private readBusEntry(key: string): BusResult | null {
    const json = this.store.getResult(key);
    return json === null ? null : busFromEntry(json, (job) => this.store.getResult(job));
  }

  /** The latest results whose fingerprint still matches the project, or null (stale results are never shown). */
  freshResults(): BoardResult | null {
    const fingerprint = this.fingerprintOf(this.project());
    if (this.lastBoard && this.lastBoard.fingerprint === fingerprint) return this.lastBoard;
    const manifest = this.store.getManifest();
    if (!manifest || manifest.fingerprint !== fingerprint) return null;
    const board = this.manifestBoard(manifest);
    if (board) this.lastBoard = board;
    return board;
  }

  /**
   * When the last whole-board solve ran and on which inputs, whether or not they still match the
   * project (the workbench says "inputs changed since the solve of ..." instead of "not solved yet").
   */
  latestSolve(): { solvedAt: string; fingerprint: string } | null {
    const manifest = this.store.getManifest();
    return manifest ? { solvedAt: manifest.solvedAt, fingerprint: manifest.fingerprint } : null;
  }

  /**
   * When the latest whole-board solve ran, if its results are still fresh, else null: one manifest row
   * and the project's fingerprint, without reading any bus's results (getProject asks this).
   */
  freshSolvedAt(): string | null {
    const manifest = this.store.getManifest();
    if (!manifest) return null;
    return manifest.fingerprint === this.fingerprintOf(this.project()) ? manifest.solvedAt : null;
  }

  /**
   * The latest whole-board solve, fresh or outdated, bus by bus (docs/workbench.md, "Board scale"):
   * from the manifest's per-bus summaries, so no bus entry is read (a manifest written before
   * summaries existed is summarised from its bus entries); null when never solved or an entry is gone.
   */
  boardSummary(): SolvedBoardSummary | null {
    const manifest = this.store.getManifest();
    if (!manifest) return null;
    const named = JSON.parse(manifest.json) as BoardManifest;
    const project = this.project();
    const fresh = manifest.fingerprint === this.fingerprintOf(project);
    const keys = fresh ? null : this.currentJobKeys(project);
    const buses: SolvedBusSummary[] = [];
    const solvedNets = new Set<string>();
    let changedTotal = 0;
    for (const entry of named.buses) {
      let summary = entry.summary;
      let inputs = entry.inputs;
      if (!summary || !inputs) {
        const bus = this.busEntry(entry.key);
        if (!bus) return null;
        summary = summariseBus(bus);
        inputs = bus.nets.map((n) => [n.net, n.inputHash]);
      }
      let changed = 0;
      for (const [net, hash] of inputs) {
        solvedNets.add(net);
        if (keys && keys.get(net) !== hash) changed++;
      }
      changedTotal += changed;
      buses.push({ ...summary, changedNets: changed });
    }
    // New nets count as changed too (they have no result in that solve).
    if (!fresh) for (const net of project.nets) if (!solvedNets.has(net.name)) changedTotal++;
    return {
      project: named.project, solvedAt: manifest.solvedAt, fingerprint: manifest.fingerprint, toolVersion: named.toolVersion,
      fresh, nets: solvedNets.size, changedNets: changedTotal, buses,
    };
  }

  /**
   * One bus of the latest whole-board solve (one entry read, kept parsed while it is the latest), fresh
   * or outdated, with its nets whose inputs changed since; null when never solved or not in that solve.
   */
  solvedBus(name: string): SolvedBus | null {
    const manifest = this.store.getManifest();
    if (!manifest) return null;
    const named = JSON.parse(manifest.json) as BoardManifest;
    const entry = named.buses.find((b) => b.bus === name);
    if (!entry) return null;
    const bus = this.busEntry(entry.key);
    if (!bus) return null;
    const project = this.project();
    const fresh = manifest.fingerprint === this.fingerprintOf(project);
    const changedNets = new Set<string>();
    if (!fresh) {
      const keys = this.currentJobKeys(project);
      for (const n of bus.nets) if (keys.get(n.net) !== n.inputHash) changedNets.add(n.net);
    }
    return { bus, solvedAt: manifest.solvedAt, fingerprint: manifest.fingerprint, fresh, changedNets };
  }

  /** Parsed bus entries by key (a key names one content forever, so an entry never goes stale). */
  private readonly busEntries = new Map<string, BusResult>();

  private busEntry(key: string): BusResult | null {
    const known = this.busEntries.get(key);
    if (known) return known;
    const bus = this.readBusEntry(key);
    if (!bus) return null;
    // A few buses' worth: the bus views a session opens (common practice, no source).
    if (this.busEntries.size >= 64) this.busEntries.delete(this.busEntries.keys().next().value as string);
    this.busEntries.set(key, bus);
    return bus;
  }

  /** Each net's current job key (planned once per loaded project); empty when the planner refuses it. */
  private jobKeys: { project: ProjectData; keys: Map<string, string> } | null = null;

  private currentJobKeys(project: ProjectData): Map<string, string> {
    if (this.jobKeys?.project === project) return this.jobKeys.keys;
    const keys = new Map<string, string>();
    try {
      const plan = planBoard(project, { salt: this.salt });
      for (const job of [...plan.nets, ...plan.strobes]) keys.set(job.net, job.key);
    } catch {
      // A project the planner refuses: every net counts as changed (the solve will say why).
    }
    this.jobKeys = { project, keys };
    return keys;
  }

  /**
   * The whole-board solve before the latest one: when it ran and each net's worst margin then (the
   * smaller of setup and hold, s; null where it had no number), for "Δ vs previous solve"
   * (docs/workbench.md, "Margin table"). Null when only one solve was ever stored.
   */
  previousSolve(): PreviousSolve | null {
    const stored = this.store.getPreviousManifest?.() ?? null;
    if (!stored) return null;
    const summary = JSON.parse(stored.json) as { nets?: [string, number | null][] };
    return { solvedAt: stored.solvedAt, fingerprint: stored.fingerprint, margins: Object.fromEntries(summary.nets ?? []) };
  }

  /** The BoardResult a manifest names, from its per-bus entries; null when one of them is missing. */
  private manifestBoard(manifest: StoredManifest): BoardResult | null {
    // Detail 'full': every bus read is a full BusResult.
    return (this.manifestBoardAndJobs(manifest, 'full')?.board ?? null) as BoardResult | null;
  }

  /** `known`: bus entries already parsed, by key (a key names one content, so they need no read). */
  private manifestBoardAndJobs(manifest: StoredManifest, detail: Detail, known?: ReadonlyMap<string, BusTable>): { board: BoardTable; jobs: number } | null {
    const named = JSON.parse(manifest.json) as BoardManifest;
    const buses: BusTable[] = [];
    for (const entry of named.buses) {
      const bus = known?.get(entry.key) ?? this.readBus(entry.key, detail);
      if (!bus) return null;
      buses.push(bus);
    }
    return {
      board: { project: named.project, solvedAt: manifest.solvedAt, fingerprint: manifest.fingerprint, toolVersion: named.toolVersion, buses },
      jobs: named.jobs,
    };
  }

  /**
   * The latest whole-board solve when its inputs no longer match the project, with the nets whose
   * own inputs changed (their job's cache key differs from the hash their result was computed for,
   * or they are new); null when that solve is still fresh or none was recorded.
   */
  outdatedResults(): { board: BoardResult; changedNets: string[] } | null {
    const latest = this.latestSolve();
    if (!latest) return null;
    const project = this.project();
    if (latest.fingerprint === this.fingerprintOf(project)) return null;
    const manifest = this.store.getManifest();
    const board = manifest ? this.manifestBoard(manifest) : null;
    if (!board) return null;
    const keys = new Map<string, string>();
    try {
      const plan = planBoard(project, { salt: this.salt });
      for (const job of [...plan.nets, ...plan.strobes]) keys.set(job.net, job.key);
    } catch {
      // A project the planner refuses: every net counts as changed (the solve will say why).
    }
    const solved = new Map(board.buses.flatMap((b) => b.nets.map((n) => [n.net, n.inputHash] as const)));
    const changed = new Set<string>();
    for (const [net, hash] of solved) if (keys.get(net) !== hash) changed.add(net);
    for (const net of project.nets) if (!solved.has(net.name)) changed.add(net.name);
    return { board, changedNets: [...changed].sort() };
  }

  /**
   * What-if sweep of one net (core/engine/sweep.ts): every value is its own job on the worker pool
   * (in this thread when the service has no workers), so a long sweep leaves this thread free.
   */
  async sweepNet(name: string, request: SweepRequest, options: SweepRunOptions = {}): Promise<NetSweep> {
    this.seedFieldSolutions();
    try {
      if ((this.options.workers ?? 1) === 0) return await runSweep(this.project(), name, request, (job) => this.inThread(this.project(), job), options);
      const projectId = `p${++this.projectCounter}`;
      const pool = (this.pool ??= new WorkerPool(this.options.workers, (project, job, o) => runJob(project, job, o)));
      const project = this.project();
      const seed = fieldMemoEntries();
      const onSolved = (entries: FieldMemoEntry[]) => this.workerFieldSolutions.push(...entries);
      // as a cancelled board solve: the jobs still queued are dropped
      const onAbort = () => pool.cancelQueued();
      options.signal?.addEventListener('abort', onAbort);
      try {
        return await runSweep(project, name, request, (job) => pool.run(projectId, project, job, this.solveOptions, { seed, onSolved }), options);
      } finally {
        options.signal?.removeEventListener('abort', onAbort);
      }
    } finally {
      this.storeFieldSolutions();
    }
  }

  /** Receiver and driver-pin waveforms of one net at every corner and edge (for the net view). */
  async netWaveforms(name: string): Promise<NetWaveforms> {
    this.seedFieldSolutions();
    return netWaveforms(this.project(), name);
  }

  /**
   * The project's input fingerprint (it hashes every net): kept with the loaded project while the
   * store's change stamp says nothing was written, else computed afresh.
   */
  private fingerprintOf(project: ProjectData): string {
    const loaded = this.loaded;
    if (loaded && loaded.project === project) return (loaded.fingerprint ??= this.fingerprintAt(loaded));
    return projectFingerprint(project, this.salt);
  }

  /**
   * The fingerprint stored for the loaded project's revision, else computed and stored for it (the
   * store keeps it only while the inputs are still at that revision).
   */
  private fingerprintAt(loaded: NonNullable<SolveService['loaded']>): string {
    const salt = this.salt;
    if (loaded.revision === null) return projectFingerprint(loaded.project, salt);
    const stored = this.store.storedFingerprint?.(salt, loaded.revision);
    if (stored) return stored;
    const fingerprint = projectFingerprint(loaded.project, salt);
    this.store.putFingerprint?.(salt, fingerprint, loaded.revision);
    return fingerprint;
  }

  /**
   * The project, reloaded only when the store says the file changed since the last load (a report
   * asks for the waveforms of many nets in a row: one load, not one per net).
   */
  private project(): ProjectData {
    const stamp = this.store.changeStamp?.();
    if (stamp !== undefined && this.loaded?.stamp === stamp) return this.loaded.project;
    // the revision read before and after the load: equal, the project is the inputs at that revision
    const before = this.store.inputRevision?.() ?? null;
    const project = this.store.loadShared?.() ?? this.store.load();
    const revision = before !== null && this.store.inputRevision?.() === before ? before : null;
    this.loaded = stamp === undefined ? null : { stamp, project, revision };
    return project;
  }

  /** Stops the worker threads. */
  async close(): Promise<void> {
    const pool = this.pool;
    this.pool = null;
    await pool?.close();
  }

  private resetStats(): SolveStats {
    this.lastStats = { jobs: 0, solved: 0, fromCache: 0, simulations: 0, solvedNets: [] };
    return this.lastStats;
  }

  /**
   * Starts solving the board's routed cross-sections on a second thread when the memo, seeded from the
   * store, is empty: a project not field-solved before (lines-ahead.ts; a check after an edit finds
   * its solutions stored and starts no worker). finish() solves this thread's share; null when there
   * is nothing to share.
   */
  private startLinesAhead(project: ProjectData): LinesAheadRun | null {
    if (this.options.linesAhead === false || (this.options.workers ?? 1) === 0 || fieldMemoSize() > 0) return null;
    const geometries = routedLineGeometries(project);
    return geometries.length < 2 ? null : startLinesAhead(project.stackup, geometries);
  }

  /** The cross-section worker of the board solve under way, if one was started. */
  private linesAhead: LinesAheadRun | null = null;

  /** Field solutions solved in workers since they were last stored. */
  private workerFieldSolutions: FieldMemoEntry[] = [];
  private fieldSeeded = false;

  /**
   * Seeds this thread's field-solution memo with the project's stored ones, once per service; the
   * workbench's layer table calls it too (opening a project then solves no stored cross-section again).
   */
  seedFieldSolutions(): void {
    if (this.fieldSeeded || !this.store.fieldSolutions) return;
    this.fieldSeeded = true;
    const entries: FieldMemoEntry[] = [];
    for (const row of this.store.fieldSolutions()) {
      if (!row.key.startsWith(FIELD_KEY_PREFIX) || (row.kind !== 'line' && row.kind !== 'pair')) continue;
      entries.push({ kind: row.kind, key: row.key.slice(FIELD_KEY_PREFIX.length), value: JSON.parse(row.value) } as FieldMemoEntry);
    }
    seedFieldMemo(entries);
  }

  /**
   * Stores the field solutions solved since the last call (in this thread and in workers); the
   * workbench's layer table calls it too.
   */
  storeFieldSolutions(): void {
    const fresh = [...takeFreshFieldEntries(), ...this.workerFieldSolutions.splice(0)];
    if (fresh.length === 0 || !this.store.putFieldSolutions) return;
    seedFieldMemo(fresh); // the workers' solutions serve this thread too
    const byKey = new Map(fresh.map((e) => [e.key, e]));
    this.store.putFieldSolutions([...byKey.values()].map((e) => ({ key: FIELD_KEY_PREFIX + e.key, kind: e.kind, value: JSON.stringify(e.value) })));
  }

  private async runBoard(options: SolveBoardOptions, executorFor: ExecutorFor, detail: Detail): Promise<BoardTable> {
    this.seedFieldSolutions();
    try {
      return await this.runBoardSeeded(options, executorFor, detail);
    } finally {
      // a solve that failed while planning leaves its cross-section worker running: stopped here
      await this.linesAhead?.cancel();
      this.linesAhead = null;
      this.storeFieldSolutions();
    }
  }

  /** With detail 'full' the board returned is a BoardResult; with 'table', every bus is a margin table. */
  private async runBoardSeeded(options: SolveBoardOptions, executorFor: ExecutorFor, detail: Detail): Promise<BoardTable> {
    const project = this.project();
    const stats = this.resetStats();
    if (options.bus === undefined) {
      // Unchanged board: the latest solve is served from its manifest, without planning or reading
      // every job (a cached check costs the fingerprint plus one read per bus).
      // The stored manifest decides (one row), so a store emptied behind this service is solved again.
      const fingerprint = this.fingerprintOf(project);
      const manifest = this.store.getManifest();
      const held = this.lastBoard !== null && this.lastBoard.fingerprint === fingerprint && this.lastBoard.solvedAt === manifest?.solvedAt;
      const fresh = manifest?.fingerprint !== fingerprint ? null
        : held ? { board: this.lastBoard!, jobs: this.lastJobs } : this.manifestBoardAndJobs(manifest, detail);
      if (fresh) {
        if (detail === 'full') {
          this.lastBoard = fresh.board as BoardResult;
          this.lastJobs = fresh.jobs;
        }
        Object.assign(stats, { jobs: fresh.jobs, fromCache: fresh.jobs });
        options.onProgress?.(fresh.jobs, fresh.jobs, 'unchanged since the latest solve');
        return fresh.board;
      }
    }
    // Not served whole from the store: the cross-sections start on a second thread while this one plans.
    const linesAhead = (this.linesAhead = this.startLinesAhead(project));
    const fullPlan: BoardPlan = planBoard(project, { bus: options.bus, salt: this.salt });
    const keys = [...fullPlan.strobeMeasures, ...fullPlan.nets, ...fullPlan.strobes].map((j) => j.key);
    const total = keys.length;
    // A whole-board solve takes every bus whose jobs all kept their keys from that bus's stored entry
    // (after a one-net edit: every bus but one), and plans only the others.
    const busKeys = options.bus === undefined ? this.busKeys(project, fullPlan) : null;
    const reused = new Map<string, BusTable>();
    for (const [bus, key] of busKeys ?? []) {
      const entry = this.readBus(key, detail);
      if (entry !== null) reused.set(bus, entry);
    }
    const plan = reused.size > 0 ? withoutBuses(project, fullPlan, reused) : fullPlan;
    const planned = plan.strobeMeasures.length + plan.nets.length + plan.strobes.length;
    stats.jobs = total - planned;
    stats.fromCache = total - planned;
    // One primary-key lookup per job, up front: how many are left decides where they run.
    const stored = new Map<string, string>();
    for (const j of [...plan.strobeMeasures, ...plan.nets, ...plan.strobes]) {
      const json = this.store.getResult(j.key);
      if (json !== null) stored.set(j.key, json);
    }
    // the worker's solutions are stored with this thread's (storeFieldSolutions)
    if (linesAhead) this.workerFieldSolutions.push(...(await linesAhead.finish()).entries);
    const execute = executorFor(planned - stored.size, project);
    const named = this.namedJobKeys();
    const pending: StoredResult[] = [];
    const flush = () => {
      if (pending.length > 0) this.store.putResults(pending.splice(0));
    };
    let done = total - planned;
    const progress = (message: string) => options.onProgress?.(done, total, message);
    const checkAbort = () => {
      if (options.signal?.aborted) throw new AbortedError();
    };
    const run = async (job: SolveJobSpec): Promise<CachedJob> => {
      checkAbort();
      stats.jobs++;
      let out: CachedJob;
      const json = stored.get(job.key);
      if (json !== undefined) {
        stats.fromCache++;
        out = JSON.parse(json) as CachedJob;
      } else {
        const output = await execute(project, job);
        stats.solved++;
        stats.simulations += output.simulations;
        stats.solvedNets.push(job.net);
        out = { measures: output.measures, result: output.result };
        // a worker's output arrives as this very text (worker-pool.ts); a job run here is serialised now
        pending.push({ key: job.key, slot: `${job.kind}:${job.net}`, json: output.json ?? JSON.stringify(out), keeps: named.get(job.net) });
        if (pending.length >= WRITE_BATCH) flush();
      }
      checkAbort();
      done++;
      progress(`${job.kind === 'strobe-measures' ? 'simulated strobe' : 'solved'} ${job.net}`);
      return out;
    };
    progress(`planned ${total} jobs`);

    // Jobs start as soon as what they depend on is done (a data net waits for its strobe's measurements
    // only, a strobe's result for its own bus's data nets only). Larger nets are submitted first so the
    // pool does not end on one long job (longest-processing-time-first ordering, common practice).
    const netsByName = new Map(project.nets.map((n) => [n.name, n]));
    try {
      const strobeMeasures = new Map<string, Promise<ReceiverEdgeMeasure[]>>();
      for (const j of plan.strobeMeasures) {
        strobeMeasures.set(j.net, run({ kind: 'strobe-measures', net: j.net, key: j.key }).then((out) => out.measures));
      }
      const size = (name: string) => {
        const net = netsByName.get(name);
        return net ? net.elements.length * net.receivers.length : 0;
      };
      const results = new Map<string, NetResult>();
      const netDone = new Map<string, Promise<ReceiverEdgeMeasure[]>>();
      for (const j of [...plan.nets].sort((a, b) => size(b.net) - size(a.net))) {
        netDone.set(j.net, (async () => {
          const strobe = j.strobe ? { net: j.strobe, measures: await strobeMeasures.get(j.strobe)! } : null;
          const out = await run({ kind: 'net', net: j.net, key: j.key, strobe });
          results.set(j.net, out.result!);
          return out.measures;
        })());
      }
      const strobeDone = plan.strobes.map(async (j) => {
        const dataNets = await Promise.all(j.dataNets.map(async (net) => ({ net, measures: await netDone.get(net)! })));
        const out = await run({ kind: 'strobe', net: j.net, key: j.key, own: await strobeMeasures.get(j.net)!, dataNets });
        results.set(j.net, out.result!);
      });
      await Promise.all([...strobeMeasures.values(), ...netDone.values(), ...strobeDone]);
      const fingerprint = this.fingerprintOf(project);
      const assembled = assembleBoard(project, plan, results, { fingerprint, toolVersion: this.version, solvedAt: new Date().toISOString() });
      const fresh = new Map(assembled.buses.map((b) => [b.bus, b]));
      const shown = (bus: BusResult): BusTable => (detail === 'table' ? busTable(bus) : bus);
      const board: BoardTable = { ...assembled, buses: fullPlan.buses.map((b) => reused.get(b.name) ?? shown(fresh.get(b.name)!)) };
      if (busKeys) {
        if (detail === 'full') {
          this.lastBoard = board as BoardResult;
          this.lastJobs = total;
        }
        this.storeBoard(board, busKeys, reused, fresh, keys, stats.solved > 0, pending);
      }
      return board;
    } finally {
      flush(); // results of a cancelled or failed solve are kept: they are right for their inputs
    }
  }

  /**
   * The job key of each net's result the latest whole-board solve's bus entries name (its manifest's
   * input hashes): an outdated solve stays readable while a newer result of the net is stored.
   */
  private namedJobKeys(): Map<string, string> {
    const manifest = this.store.getManifest();
    const named = new Map<string, string>();
    if (!manifest) return named;
    for (const bus of (JSON.parse(manifest.json) as BoardManifest).buses) for (const [net, key] of bus.inputs ?? []) named.set(net, key);
    return named;
  }

  /**
   * Key of each bus's stored entry: the hash of the salt, the bus name, its planning note and the keys
   * of all its jobs, so it changes exactly when one of the bus's results can change.
   */
  private busKeys(project: ProjectData, plan: BoardPlan): Map<string, string> {
    const busOfNet = new Map(project.nets.map((n) => [n.name, n.bus]));
    const jobsOf = new Map<string, string[]>();
    for (const j of [...plan.strobeMeasures, ...plan.nets, ...plan.strobes]) {
      const bus = busOfNet.get(j.net)!;
      const list = jobsOf.get(bus);
      if (list) list.push(j.key);
      else jobsOf.set(bus, [j.key]);
    }
    const keys = new Map<string, string>();
    for (const bus of plan.buses) {
      keys.set(bus.name, hashOf({ salt: this.salt, entry: 'bus', bus: bus.name, note: plan.busNotes.get(bus.name) ?? null, jobs: jobsOf.get(bus.name) ?? [] }));
    }
    return keys;
  }

  /**
   * Stores a whole-board solve: an entry and its margin table for each bus solved now (`solved`), the
   * manifest naming every bus's entry, and, when anything changed, prunes every stored result that
   * neither this solve's jobs nor its buses use (edits replace results; the file does not grow with them).
   */
  private storeBoard(
    board: BoardTable, busKeys: Map<string, string>, reused: Map<string, BusTable>, solved: Map<string, BusResult>, jobKeys: string[],
    solvedAny: boolean, pending: StoredResult[],
  ): void {
    const manifest: BoardManifest = { project: board.project, toolVersion: board.toolVersion, jobs: jobKeys.length, buses: [] };
    // The solve this one replaces, summarised before its bus entries are replaced (same slots) or pruned.
    const before = this.store.getManifest();
    // A replaced solve whose entries are gone is still named, with no numbers (never an older one's).
    // Buses taken from the store kept their entries' keys: only the re-solved ones are read back.
    const reusedByKey = new Map([...reused].map(([bus, result]) => [busKeys.get(bus)!, result]));
    const replaced = before && before.solvedAt !== board.solvedAt ? this.manifestBoardAndJobs(before, 'table', reusedByKey)?.board ?? null : null;
    const previous: StoredManifest | undefined = before && before.solvedAt !== board.solvedAt
      ? { fingerprint: before.fingerprint, solvedAt: before.solvedAt, json: JSON.stringify({ nets: replaced ? worstMargins(replaced) : [] }) }
      : undefined;
    let wroteBus = false;
    for (const bus of board.buses) {
      const key = busKeys.get(bus.bus)!;
      manifest.buses.push({ bus: bus.bus, key, summary: summariseBus(bus), inputs: bus.nets.map((n) => [n.net, n.inputHash]) });
      const result = solved.get(bus.bus);
      if (result) { // solved now (a bus taken from the store is never in `solved`)
        pending.push({ key, slot: `bus:${bus.bus}`, json: busEntryJson(result) });
        pending.push({ key: tableKey(key), slot: `bus-table:${bus.bus}`, json: JSON.stringify(busTable(result)) });
        wroteBus = true;
      }
    }
    if (pending.length > 0) this.store.putResults(pending.splice(0));
    this.store.putManifest({ fingerprint: board.fingerprint, solvedAt: board.solvedAt, json: JSON.stringify(manifest) }, previous);
    if (solvedAny || wroteBus) this.store.pruneResults([...jobKeys, ...manifest.buses.flatMap((b) => [b.key, tableKey(b.key)])]);
  }
}

/** Per-net worst margins of a board, [net, s or null], in board order. */
function worstMargins(board: BoardTable): [string, number | null][] {
  return board.buses.flatMap((b) => b.nets.map((n): [string, number | null] => [n.net, netWorstMargin(n)]));
}

/** The plan without the jobs and buses in `skip` (their results are already known). */
function withoutBuses(project: ProjectData, plan: BoardPlan, skip: ReadonlyMap<string, unknown>): BoardPlan {
  const busOfNet = new Map(project.nets.map((n) => [n.name, n.bus]));
  const keep = (j: { net: string }) => !skip.has(busOfNet.get(j.net)!);
  return {
    buses: plan.buses.filter((b) => !skip.has(b.name)),
    busNotes: plan.busNotes,
    strobeMeasures: plan.strobeMeasures.filter(keep),
    nets: plan.nets.filter(keep),
    strobes: plan.strobes.filter(keep),
  };
}
