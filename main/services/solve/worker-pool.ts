/**
 * A fixed pool of worker threads running solve jobs (one job per worker at a time). Workers are
 * started on first use and kept for later solves; they do not keep the process alive while idle.
 * A worker takes about a second to start (it loads the TypeScript sources through tsx): until the
 * first one reports ready, queued jobs run on this thread (`local`), so a short solve does not wait
 * for start-up. Jobs are queued in submission order; each worker holds up to PIPELINE_DEPTH of them
 * (the next one waits in its port while it runs one, so it never idles for a round trip to this thread).
 * `cancelQueued` drops the jobs still queued (those a worker holds finish and their results are
 * dropped by the caller). A worker replies with the output as one JSON text (`PooledOutput.json`):
 * a string crosses the thread boundary as a copy, where a structured clone walks every object twice.
 */
import type { Worker } from 'node:worker_threads';
import { startWorker } from '../worker-exec-argv.js';
import { availableParallelism } from 'node:os';
import { InputError } from '../../../core/errors.js';
import type { ProjectData } from '../../../core/project/model.js';
import type { JobOutput, SolveJobSpec } from '../../../core/engine/jobs.js';
import type { SolveOptions } from '../../../core/engine/solve-net.js';
import type { WorkerMessage, WorkerRequest } from './solve-worker.js';
import type { FieldMemoEntry } from '../../../core/fieldsolve/memo.js';

interface Task {
  request: Omit<WorkerRequest, 'project' | 'fieldSeed'>;
  project: ProjectData;
  /** Field solutions to seed a worker's memo with, sent with the project. */
  fieldSeed?: FieldMemoEntry[];
  /** Receives the field solutions the worker solved for this job (docs/field-solver.md §10). */
  onFieldSolutions?: (entries: FieldMemoEntry[]) => void;
  resolve: (output: PooledOutput) => void;
  reject: (error: Error) => void;
}

/** Jobs a worker holds at once: the one it runs and the next. */
const PIPELINE_DEPTH = 2;

/** A job's output with the JSON text it arrived as (`{ measures, result }`, as the results cache stores it). */
export type PooledOutput = JobOutput & { json?: string };

interface Slot {
  worker: Worker;
  /** Set when the worker has loaded its modules and can take jobs. */
  ready: boolean;
  projectId: string | null;
  /** Jobs sent to the worker and not answered yet, oldest first. */
  tasks: Task[];
  /** Resolves when the thread has exited (set right after the worker is created). */
  exited: Promise<void> | null;
}

/** Runs a job on this thread (used while no worker is ready yet). */
export type LocalRunner = (project: ProjectData, job: SolveJobSpec, options: SolveOptions) => JobOutput;

type JobReply =
  | { id: number; net: string; simulations: number; json: string; fieldSolutions?: FieldMemoEntry[] }
  | { id: number; error: { name: string; message: string; where: string | null; stack?: string } };
type WorkerReply = { ready: true } | JobReply;

export class AbortedError extends Error {
  constructor(message = 'solve cancelled') {
    super(message);
    this.name = 'AbortError';
  }
}

export class WorkerPool {
  private readonly slots: Slot[] = [];
  private readonly queue: Task[] = [];
  private nextId = 1;
  private closed = false;
  private localBusy = false;
  /** Set when a worker failed before it was ready (e.g. no worker entry in a bundled build): run locally. */
  private workersUnavailable: Error | null = null;

  /** `size` defaults to os.availableParallelism(). */
  constructor(
    readonly size: number = availableParallelism(),
    private readonly local: LocalRunner | null = null,
    /** The worker entry (tests point it elsewhere). */
    private readonly entry: URL = new URL('./solve-worker.mjs', import.meta.url),
  ) {
    if (!(Number.isInteger(size) && size >= 1)) throw new Error(`worker pool size must be a positive integer, got ${size}`);
  }

  /** Runs one job on the next free worker. */
  run(
    projectId: string, project: ProjectData, job: SolveJobSpec, options: SolveOptions,
    field: { seed?: FieldMemoEntry[]; onSolved?: (entries: FieldMemoEntry[]) => void } = {},
  ): Promise<PooledOutput> {
    if (this.closed) return Promise.reject(new Error('worker pool is closed'));
    return new Promise<PooledOutput>((resolve, reject) => {
      this.queue.push({ request: { id: this.nextId++, projectId, job, options }, project, fieldSeed: field.seed, onFieldSolutions: field.onSolved, resolve, reject });
      this.pump();
    });
  }

  /** Starts every worker thread now, so they load while the caller prepares the first jobs. */
  start(): void {
    while (!this.closed && this.slots.length < this.size && !this.workersUnavailable) this.startWorker();
  }

  /** Rejects every queued (not yet started) job with an AbortError. */
  cancelQueued(): void {
    for (const task of this.queue.splice(0)) task.reject(new AbortedError());
  }

  /**
   * Stops the workers; queued and running jobs are rejected. Resolves once every worker thread has
   * exited: an idle worker is asked to leave (it closes its port and ends with status 0), a busy or
   * still-loading one is terminated. Each worker is ref'd first, so the process stays alive until the
   * exits are seen (an unref'd worker's pending exit does not hold the event loop, and a caller
   * awaiting close() at the top level would otherwise end with Node's unsettled-await status 13).
   */
  async close(): Promise<void> {
    this.closed = true;
    this.cancelQueued();
    const running = this.slots.splice(0);
    const busy = running.map((slot) => slot.tasks.length > 0);
    for (const slot of running) {
      for (const task of slot.tasks.splice(0)) task.reject(new Error('worker pool closed'));
    }
    await Promise.all(running.map((slot, i) => stopWorker(slot, busy[i])));
  }

  private startWorker(): Slot {
    const worker = startWorker(this.entry);
    const slot: Slot = { worker, ready: false, projectId: null, tasks: [], exited: null };
    slot.exited = new Promise<void>((resolve) => worker.once('exit', () => resolve()));
    worker.on('message', (reply: WorkerReply) => {
      if (this.closed) return;
      if ('ready' in reply) {
        slot.ready = true;
        this.pump();
        if (slot.tasks.length === 0) worker.unref(); // idle: must not keep the process alive
      } else {
        this.finish(slot, reply);
      }
    });
    worker.on('error', (error) => this.fail(slot, error));
    // A worker that ends by itself (crash, out of memory, a failed load) leaves the pool whether or not
    // it held a job: a dead slot left behind would take the next job and never answer it.
    worker.on('exit', (code) => this.fail(slot, new Error(`solve worker exited with status ${code}`)));
    this.slots.push(slot);
    return slot;
  }

  private pump(): void {
    while (this.queue.length > 0 && this.slots.length < this.size && !this.workersUnavailable) this.startWorker();
    while (this.queue.length > 0) {
      // an idle worker first, then one with room for its next job
      const slot = this.slots.find((s) => s.ready && s.tasks.length === 0)
        ?? this.slots.find((s) => s.ready && s.tasks.length < PIPELINE_DEPTH);
      if (!slot) break;
      const task = this.queue.shift()!;
      slot.tasks.push(task);
      const request: WorkerRequest = { ...task.request };
      if (slot.projectId !== task.request.projectId) {
        request.project = task.project;
        if (task.fieldSeed && task.fieldSeed.length > 0) request.fieldSeed = task.fieldSeed;
        slot.projectId = task.request.projectId;
      }
      slot.worker.ref();
      slot.worker.postMessage(request);
    }
    if (this.queue.length > 0 && !this.slots.some((s) => s.ready)) {
      if (this.local && !this.localBusy) this.runLocally(this.local);
      else if (!this.local && this.workersUnavailable && this.slots.length === 0) {
        for (const task of this.queue.splice(0)) task.reject(this.workersUnavailable);
      }
    }
  }

  /** One queued job on this thread, in its own macrotask so worker messages get through in between. */
  private runLocally(local: LocalRunner): void {
    this.localBusy = true;
    setImmediate(() => {
      const task = this.queue.shift();
      if (task) {
        try {
          task.resolve(local(task.project, task.request.job, task.request.options));
        } catch (error) {
          task.reject(error as Error);
        }
      }
      this.localBusy = false;
      this.pump();
    });
  }

  private finish(slot: Slot, reply: JobReply): void {
    const index = slot.tasks.findIndex((t) => t.request.id === reply.id);
    const task = index >= 0 ? slot.tasks.splice(index, 1)[0] : null;
    if (slot.tasks.length === 0) slot.worker.unref();
    if (task) {
      if ('json' in reply) {
        if (reply.fieldSolutions) task.onFieldSolutions?.(reply.fieldSolutions);
        const { measures, result } = JSON.parse(reply.json) as Pick<JobOutput, 'measures' | 'result'>;
        task.resolve({ net: reply.net, measures, result, simulations: reply.simulations, json: reply.json });
      }
      else {
        const e = reply.error;
        const error = e.name === 'InputError' && e.where !== null
          ? new InputError(e.where, e.message.startsWith(`${e.where}: `) ? e.message.slice(e.where.length + 2) : e.message)
          : Object.assign(new Error(e.message), { name: e.name, stack: e.stack });
        task.reject(error);
      }
    }
    this.pump();
  }

  private fail(slot: Slot, error: Error): void {
    if (this.closed) return;
    const index = this.slots.indexOf(slot);
    if (index < 0) return; // already removed (an 'error' is followed by an 'exit')
    this.slots.splice(index, 1);
    if (!slot.ready) this.workersUnavailable = error;
    void slot.worker.terminate();
    for (const task of slot.tasks.splice(0)) task.reject(error);
    this.pump();
  }
}

/** How long an idle worker gets to leave on its own before it is terminated, ms. */
const LEAVE_TIMEOUT_MS = 2000;

/** Ends one worker thread (see WorkerPool.close) and resolves when it has exited. */
async function stopWorker(slot: Slot, busy: boolean): Promise<void> {
  const { worker } = slot;
  worker.ref();
  worker.removeAllListeners('message');
  worker.on('error', () => undefined); // a late error of a leaving worker is not the caller's failure
  if (slot.ready && !busy) {
    const leave: WorkerMessage = { leave: true };
    worker.postMessage(leave);
    const timer = setTimeout(() => void worker.terminate(), LEAVE_TIMEOUT_MS);
    await slot.exited;
    clearTimeout(timer);
  } else {
    await worker.terminate();
    await slot.exited;
  }
}
