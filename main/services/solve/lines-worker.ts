/**
 * Worker thread of lines-ahead.ts: solves the routed cross-sections it claims, from the last one
 * backwards (the calling thread claims from the first), and posts each one's field solutions.
 */
import { parentPort, workerData } from 'node:worker_threads';
import { takeFreshFieldEntries } from '../../../core/fieldsolve/memo.js';
import { solveRoutedLines, type LineGeometry } from '../../../core/netbuild/index.js';
import type { Stackup } from '../../../core/project/model.js';
import type { LinesWorkerMessage } from './lines-ahead.js';

const { stackup, geometries, claims } = workerData as { stackup: Stackup; geometries: LineGeometry[]; claims: SharedArrayBuffer };
const flags = new Int32Array(claims);
for (let index = geometries.length - 1; index >= 0; index--) {
  if (Atomics.compareExchange(flags, index, 0, 2) !== 0) continue; // the calling thread has it
  solveRoutedLines(stackup, [geometries[index]]);
  const message: LinesWorkerMessage = { index, entries: takeFreshFieldEntries() };
  parentPort!.postMessage(message);
}
