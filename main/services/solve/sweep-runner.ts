/**
 * Runs a what-if sweep (core/engine/sweep.ts, docs/design.md §6.5) as independent solve jobs: first the
 * measures the net's budget needs from other nets, then every swept value and the present value, all
 * on the executor the solve service gives (its worker pool, or this thread). Progress after each job;
 * an abort stops before the next job. Business logic stays in core/.
 */
import type { ProjectData } from '../../../core/project/model.js';
import type { JobOutput, SolveJobSpec } from '../../../core/engine/jobs.js';
import { assembleSweep, planSweep, type NetSweep, type SweepRequest } from '../../../core/engine/sweep.js';
import type { NetMeasures } from '../../../core/engine/solve-net.js';
import { AbortedError } from './worker-pool.js';

export interface SweepRunOptions {
  onProgress?: (done: number, total: number, message: string) => void;
  signal?: AbortSignal;
}

export async function runSweep(
  project: ProjectData, netName: string, request: SweepRequest,
  execute: (job: SolveJobSpec) => Promise<JobOutput>, options: SweepRunOptions = {},
): Promise<NetSweep> {
  // refused here, before any job runs, with the field named
  const plan = planSweep(project, netName, request);
  const others = [...(plan.strobe ? [plan.strobe] : []), ...plan.dataNets];
  const total = others.length + plan.values.length + 1;
  let done = 0;
  let simulations = 0;
  const checkAbort = () => {
    if (options.signal?.aborted) throw new AbortedError('sweep cancelled');
  };
  const run = async (job: SolveJobSpec, message: string): Promise<JobOutput> => {
    checkAbort();
    const out = await execute(job);
    checkAbort();
    simulations += out.simulations;
    done++;
    options.onProgress?.(done, total, message);
    return out;
  };
  options.onProgress?.(0, total, `sweeping ${plan.values.length} values of ${plan.element}`);
  const measured = await Promise.all(others.map((net) => run({ kind: 'strobe-measures', net, key: '' }, `simulated ${net}`)
    .then((out): NetMeasures => ({ net, measures: out.measures }))));
  const strobe = plan.strobe ? measured[0] : null;
  const dataNets = plan.strobe ? measured.slice(1) : measured;
  const point = (value: number | null, window: boolean): SolveJobSpec => ({
    kind: 'sweep-point', net: plan.net, key: '', quantity: plan.quantity, value, window, strobe, dataNets,
  });
  const current = run(point(null, true), 'solved the present value');
  const solved = plan.values.map((v, i) => run(point(v, false), `solved value ${i + 1} of ${plan.values.length}`));
  const [now, ...rest] = await Promise.all([current, ...solved]);
  const pick = (o: JobOutput) => ({ result: o.result!, measures: o.measures });
  return assembleSweep(project, plan, pick(now), rest.map(pick), simulations);
}
