/**
 * The routed cross-sections of a board solved on two threads before its nets (docs/field-solver.md
 * §10): on a project never field-solved before they are a large part of the first check, and the net
 * jobs on this thread would otherwise solve them one by one while the second core idles. This thread
 * claims geometries from the first, a worker thread from the last (an atomic flag per geometry, so
 * none is solved twice); the worker's solutions come back as memo entries. When no worker starts, this
 * thread solves them all, as before.
 */
import type { Worker } from 'node:worker_threads';
import { seedFieldMemo, type FieldMemoEntry } from '../../../core/fieldsolve/memo.js';
import { solveRoutedLines, type LineGeometry } from '../../../core/netbuild/index.js';
import type { Stackup } from '../../../core/project/model.js';
import { startWorker } from '../worker-exec-argv.js';

/** What the worker posts per geometry it solved: the memo entries that solving made. */
export interface LinesWorkerMessage {
  index: number;
  entries: FieldMemoEntry[];
}

export interface LinesAhead {
  /** Geometries solved (or found in the memo) by this thread and by the worker. */
  here: number;
  helper: number;
  /** The worker's field solutions, already in this thread's memo (the caller stores them). */
  entries: FieldMemoEntry[];
}

/** A started run: finish() solves this thread's share and waits for the worker's; cancel() only stops the worker. */
export interface LinesAheadRun {
  finish(): Promise<LinesAhead>;
  cancel(): Promise<void>;
}

/**
 * Starts the worker on `geometries` now; a caller that fails before finish() calls cancel(). Started
 * early (while the caller plans the board), the worker has loaded by the time finish() is called.
 */
export function startLinesAhead(stackup: Stackup, geometries: readonly LineGeometry[], options: { entry?: URL } = {}): LinesAheadRun {
  const claims = new Int32Array(new SharedArrayBuffer(4 * Math.max(1, geometries.length)));
  const entries: FieldMemoEntry[] = [];
  const received = new Set<number>();
  let worker: Worker | null = null;
  let stopped: Promise<void> = Promise.resolve();
  let arrived = () => {};
  try {
    worker = startWorker(options.entry ?? new URL('./lines-worker.mjs', import.meta.url), {
      workerData: { stackup, geometries, claims: claims.buffer },
    });
    stopped = new Promise<void>((resolve) => {
      worker!.on('message', (m: LinesWorkerMessage) => {
        received.add(m.index);
        entries.push(...m.entries);
        seedFieldMemo(m.entries);
        arrived();
      });
      worker!.once('error', () => resolve());
      worker!.once('exit', () => resolve());
    });
  } catch {
    worker = null; // no worker: this thread takes every geometry in finish()
  }
  return {
    /** Stops the worker without solving this thread's share (the caller failed before finish()). */
    async cancel(): Promise<void> {
      if (worker) await worker.terminate();
    },
    async finish(): Promise<LinesAhead> {
      try {
        const here = solveRoutedLines(stackup, geometries, (i) => Atomics.compareExchange(claims, i, 0, 1) === 0);
        // The worker may hold a geometry it has claimed and not yet posted: wait for it, or for its end.
        const helperClaims = () => claims.filter((flag) => flag === 2).length;
        while (worker && received.size < helperClaims()) {
          const next = new Promise<void>((resolve) => (arrived = resolve));
          if ((await Promise.race([next.then(() => 'message'), stopped.then(() => 'stopped')])) === 'stopped') break;
        }
        // A worker that stopped before posting what it claimed leaves those to this thread.
        const lost = geometries.filter((_, i) => claims[i] === 2 && !received.has(i));
        solveRoutedLines(stackup, lost);
        return { here: here + lost.length, helper: received.size, entries };
      } finally {
        if (worker) await worker.terminate();
      }
    },
  };
}
