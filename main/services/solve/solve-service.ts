/**
 * Solve orchestration: plans a board solve (core/budget/board.ts), takes every job whose input hash is
 * in the project's results cache from there, runs the rest on a worker-thread pool (or in this thread),
 * reports progress, honours cancellation, and assembles the BoardResult. Business logic stays in core/.
 */
import { readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import type { ProjectData } from '../../../core/project/model.js';
import type { BoardResult, NetResult } from '../../../core/budget/results.js';
import type { NetWaveforms } from '../../../core/contract/api.js';
import type { ReceiverEdgeMeasure } from '../../../core/budget/measures.js';
import { assembleBoard, planBoard, projectFingerprint, type BoardPlan } from '../../../core/engine/board.js';
import { ENGINE_REVISION, runJob, type JobOutput, type SolveJobSpec } from '../../../core/engine/jobs.js';
import { findNet, type SolveOptions } from '../../../core/engine/solve-net.js';
import { netWaveforms } from '../../../core/engine/waveforms.js';
import { hashOf } from '../../../core/hash/index.js';
import { InputError } from '../../../core/errors.js';
import { AbortedError, WorkerPool } from './worker-pool.js';

/** What the service needs from the project store (ProjectStore satisfies it). */
export interface SolveStore {
  load(): ProjectData;
  getCached(key: string): string | null;
  putCached(key: string, json: string): void;
}

export interface SolveBoardOptions {
  /** Solve only this bus. */
  bus?: string;
  onProgress?: (done: number, total: number, message: string) => void;
  signal?: AbortSignal;
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

export class SolveService {
  private pool: WorkerPool | null = null;
  private readonly version = toolVersion();
  private readonly solveOptions: SolveOptions;
  private projectCounter = 0;
  private lastBoard: BoardResult | null = null;
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
    if ((this.options.workers ?? 1) === 0) return this.solveBoardSync(options);
    const pool = (this.pool ??= new WorkerPool(this.options.workers, (project, job, options) => runJob(project, job, options)));
    const projectId = `p${++this.projectCounter}`;
    const onAbort = () => pool.cancelQueued();
    options.signal?.addEventListener('abort', onAbort);
    try {
      return await this.runBoard(options, (project, job) => pool.run(projectId, project, job, this.solveOptions));
    } finally {
      options.signal?.removeEventListener('abort', onAbort);
    }
  }

  /** The same solve in this thread, one job after another (tests, benchmark comparison). */
  async solveBoardSync(options: SolveBoardOptions = {}): Promise<BoardResult> {
    return this.runBoard(options, async (project, job) => runJob(project, job, this.solveOptions));
  }

  /**
   * One net now, in this thread, through the cache (the fast path after an edit): its bus is planned
   * and assembled as in a board solve, so unchanged nets come from the cache and the result carries the
   * bus-level fields (skew to the reference net, bus-worst margins of a clock).
   */
  async solveNet(name: string): Promise<NetResult> {
    const net = findNet(this.store.load(), name);
    const board = await this.runBoard({ bus: net.bus }, async (project, job) => runJob(project, job, this.solveOptions));
    const result = board.buses[0]?.nets.find((n) => n.net === name);
    if (!result) throw new InputError(`net ${name}`, board.buses[0]?.note ?? 'its bus could not be solved');
    return result;
  }

  /** The latest results whose fingerprint still matches the project, or null (stale results are never shown). */
  freshResults(): BoardResult | null {
    const project = this.store.load();
    const fingerprint = projectFingerprint(project, this.salt);
    if (this.lastBoard && this.lastBoard.fingerprint === fingerprint) return this.lastBoard;
    const json = this.store.getCached(boardKey(fingerprint));
    if (!json) return null;
    this.lastBoard = JSON.parse(json) as BoardResult;
    return this.lastBoard;
  }

  /**
   * When the last whole-board solve ran and on which inputs, whether or not they still match the
   * project (the workbench says "inputs changed since the solve of ..." instead of "not solved yet").
   */
  latestSolve(): { solvedAt: string; fingerprint: string } | null {
    const json = this.store.getCached(LATEST_SOLVE_KEY);
    return json ? (JSON.parse(json) as { solvedAt: string; fingerprint: string }) : null;
  }

  /**
   * The latest whole-board solve when its inputs no longer match the project, with the nets whose
   * own inputs changed (their job's cache key differs from the hash their result was computed for,
   * or they are new); null when that solve is still fresh or none was recorded.
   */
  outdatedResults(): { board: BoardResult; changedNets: string[] } | null {
    const latest = this.latestSolve();
    if (!latest) return null;
    const project = this.store.load();
    if (latest.fingerprint === projectFingerprint(project, this.salt)) return null;
    const json = this.store.getCached(boardKey(latest.fingerprint));
    if (!json) return null;
    const board = JSON.parse(json) as BoardResult;
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

  /** Receiver and driver-pin waveforms of one net at every corner and edge (for the net view). */
  async netWaveforms(name: string): Promise<NetWaveforms> {
    return netWaveforms(this.store.load(), name);
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

  /** Takes a job's output from the cache, or runs it and stores it. */
  private async cachedRun(
    project: ProjectData,
    job: SolveJobSpec,
    execute: (project: ProjectData, job: SolveJobSpec) => Promise<JobOutput>,
    stats: SolveStats,
  ): Promise<CachedJob> {
    stats.jobs++;
    const json = this.store.getCached(job.key);
    if (json) {
      stats.fromCache++;
      return JSON.parse(json) as CachedJob;
    }
    const output = await execute(project, job);
    stats.solved++;
    stats.simulations += output.simulations;
    stats.solvedNets.push(job.net);
    const entry: CachedJob = { measures: output.measures, result: output.result };
    this.store.putCached(job.key, JSON.stringify(entry));
    return entry;
  }

  private async runBoard(
    options: SolveBoardOptions,
    execute: (project: ProjectData, job: SolveJobSpec) => Promise<JobOutput>,
  ): Promise<BoardResult> {
    const project = this.store.load();
    const plan: BoardPlan = planBoard(project, { bus: options.bus, salt: this.salt });
    const stats = this.resetStats();
    const total = plan.strobeMeasures.length + plan.nets.length + plan.strobes.length;
    let done = 0;
    const progress = (message: string) => options.onProgress?.(done, total, message);
    const checkAbort = () => {
      if (options.signal?.aborted) throw new AbortedError();
    };
    const run = async (job: SolveJobSpec): Promise<CachedJob> => {
      checkAbort();
      const out = await this.cachedRun(project, job, execute, stats);
      checkAbort();
      done++;
      progress(`${job.kind === 'strobe-measures' ? 'simulated strobe' : 'solved'} ${job.net}`);
      return out;
    };
    progress(`planned ${total} jobs`);

    // Jobs start as soon as what they depend on is done (a data net waits for its strobe's measurements
    // only, a strobe's result for its own bus's data nets only). Larger nets are submitted first so the
    // pool does not end on one long job (longest-processing-time-first ordering, common practice).
    const strobeMeasures = new Map<string, Promise<ReceiverEdgeMeasure[]>>();
    for (const j of plan.strobeMeasures) {
      strobeMeasures.set(j.net, run({ kind: 'strobe-measures', net: j.net, key: j.key }).then((out) => out.measures));
    }
    const size = (name: string) => {
      const net = project.nets.find((n) => n.name === name);
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
    const fingerprint = projectFingerprint(project, this.salt);
    const board = assembleBoard(project, plan, results, { fingerprint, toolVersion: this.version, solvedAt: new Date().toISOString() });
    if (options.bus === undefined) {
      this.lastBoard = board;
      this.store.putCached(boardKey(fingerprint), JSON.stringify(board));
      this.store.putCached(LATEST_SOLVE_KEY, JSON.stringify({ solvedAt: board.solvedAt, fingerprint }));
    }
    return board;
  }
}

/** Cache entry naming the latest whole-board solve (time and input fingerprint). */
const LATEST_SOLVE_KEY = 'board:latest';

function boardKey(fingerprint: string): string {
  return `board:${fingerprint}`;
}
