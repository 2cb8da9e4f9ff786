/**
 * Body of a solve worker thread: keeps the latest project it was sent and runs jobs on it (core/budget
 * runJob). Messages: { id, projectId, project?, job, options } or { leave: true } in; { ready: true } once loaded, then
 * { id, net, simulations, json } (json: the output's measures and result) or { id, error } out.
 */
import { parentPort } from 'node:worker_threads';
import { InputError } from '../../../core/errors.js';
import type { ProjectData } from '../../../core/project/model.js';
import { runJob, type SolveJobSpec } from '../../../core/engine/jobs.js';
import type { SolveOptions } from '../../../core/engine/solve-net.js';
import { seedFieldMemo, takeFreshFieldEntries, type FieldMemoEntry } from '../../../core/fieldsolve/memo.js';

export interface WorkerRequest {
  id: number;
  projectId: string;
  /** Sent only when this worker does not hold `projectId` yet. */
  project?: ProjectData;
  /** Field solutions the pool's thread knows, sent with the project (docs/field-solver.md §10). */
  fieldSeed?: FieldMemoEntry[];
  job: SolveJobSpec;
  options: SolveOptions;
}

/** What the pool sends: a job, or `{ leave: true }` when it closes (the worker then ends with status 0). */
export type WorkerMessage = WorkerRequest | { leave: true };

let held: { id: string; project: ProjectData } | null = null;

parentPort?.on('message', (message: WorkerMessage) => {
  if ('leave' in message) {
    held = null;
    parentPort?.close(); // nothing else keeps this thread alive: it exits normally
    return;
  }
  const request = message;
  try {
    if (request.project) held = { id: request.projectId, project: request.project };
    if (!held || held.id !== request.projectId) throw new Error(`solve worker: project ${request.projectId} was never sent`);
    if (request.fieldSeed) seedFieldMemo(request.fieldSeed);
    const { net, measures, result, simulations } = runJob(held.project, request.job, request.options);
    // one JSON text, as the results cache stores it (worker-pool.ts: cheaper than a structured clone)
    const reply = { id: request.id, net, simulations, json: JSON.stringify({ measures, result }) };
    const fieldSolutions = takeFreshFieldEntries(); // solved here: the pool's thread stores them
    parentPort?.postMessage(fieldSolutions.length > 0 ? { ...reply, fieldSolutions } : reply);
  } catch (error) {
    const e = error as Error;
    parentPort?.postMessage({
      id: request.id,
      error: { name: e.name, message: e.message, where: error instanceof InputError ? error.where : null, stack: e.stack },
    });
  }
});

parentPort?.postMessage({ ready: true });
