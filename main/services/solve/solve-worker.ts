/**
 * Body of a solve worker thread: keeps the latest project it was sent and runs jobs on it (core/budget
 * runJob). Messages: { id, projectId, project?, job, options } in; { ready: true } once loaded, then
 * { id, output } or { id, error } out.
 */
import { parentPort } from 'node:worker_threads';
import { InputError } from '../../../core/errors.js';
import type { ProjectData } from '../../../core/project/model.js';
import { runJob, type SolveJobSpec } from '../../../core/engine/jobs.js';
import type { SolveOptions } from '../../../core/engine/solve-net.js';

export interface WorkerRequest {
  id: number;
  projectId: string;
  /** Sent only when this worker does not hold `projectId` yet. */
  project?: ProjectData;
  job: SolveJobSpec;
  options: SolveOptions;
}

let held: { id: string; project: ProjectData } | null = null;

parentPort?.on('message', (request: WorkerRequest) => {
  try {
    if (request.project) held = { id: request.projectId, project: request.project };
    if (!held || held.id !== request.projectId) throw new Error(`solve worker: project ${request.projectId} was never sent`);
    const output = runJob(held.project, request.job, request.options);
    parentPort?.postMessage({ id: request.id, output });
  } catch (error) {
    const e = error as Error;
    parentPort?.postMessage({
      id: request.id,
      error: { name: e.name, message: e.message, where: error instanceof InputError ? error.where : null, stack: e.stack },
    });
  }
});

parentPort?.postMessage({ ready: true });
