/**
 * What-if sweep through the service API (core/contract/api.ts sweepNet, startSweep, getSweepResult;
 * docs/design.md §6.5): every host calls it through dispatch, the values are solved on the worker pool
 * with the same numbers as core's in-thread sweep, the job reports progress and ends done, and a bad
 * request is refused before anything runs, with the field named. Project: the invented demo project.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { openWorkbench, type Workbench } from '../../main/services/compose.js';
import { createDemoProject } from '../../main/services/project/demo.js';
import { dispatchApiCall } from '../../main/services/api/dispatch.js';
import { sweepNet } from '../../core/engine/sweep.js';
import { ProjectStore } from '../../main/services/project/project-store.js';
import type { NetSweep, SweepRequest } from '../../core/contract/api.js';

const dir = mkdtempSync(join(tmpdir(), 'slackline-sweep-'));
let bench: Workbench;
let path: string;
const request: SweepRequest = { quantity: { kind: 'length', elementIndex: 2 }, start: 0.02, stop: 0.12, points: 6 };

beforeAll(async () => {
  path = createDemoProject(dir);
  // one worker thread: the values run off this thread (docs/design.md §6.5)
  bench = await openWorkbench(path, { solve: { workers: 1 } });
});
afterAll(async () => {
  await bench?.close();
  rmSync(dir, { recursive: true, force: true });
});

describe('sweepNet through dispatch', () => {
  let swept: NetSweep;
  let inThread: NetSweep;
  beforeAll(async () => {
    const outcome = await dispatchApiCall(bench.api, 'sweepNet', ['DQ12', request]);
    if (!outcome.ok) throw new Error(outcome.error.message);
    swept = outcome.value as NetSweep;
    const store = ProjectStore.open(path, { readOnly: true });
    try {
      inThread = sweepNet(store.load(), 'DQ12', request);
    } finally {
      store.close();
    }
  }, 120_000);

  it('gives the worker pool the same numbers as the in-thread sweep (deterministic solve, no tolerance)', () => {
    expect(swept.points.map((p) => [p.value, p.setupMargin, p.holdMargin, p.status])).toEqual(
      inThread.points.map((p) => [p.value, p.setupMargin, p.holdMargin, p.status]),
    );
    expect(swept.lengthWindow).toEqual(inThread.lengthWindow);
    expect(swept.points).toHaveLength(6);
  });

  it('gives, at the present value, the net\'s margins from the normal solve (consistency)', async () => {
    const net = await bench.api.solveNet('DQ12');
    expect(swept.atCurrent.setupMargin).toBe(net.setupMargin);
    expect(swept.atCurrent.holdMargin).toBe(net.holdMargin);
    expect(swept.lengthWindow).toEqual(net.lengthWindow);
  });

  it('refuses a bad request with the field named, and a malformed one as a bad payload', async () => {
    const few = await dispatchApiCall(bench.api, 'sweepNet', ['DQ12', { ...request, points: 1 }]);
    expect(few.ok).toBe(false);
    if (!few.ok) expect(few.error).toMatchObject({ kind: 'input', where: 'sweep points' });
    const far = await dispatchApiCall(bench.api, 'startSweep', ['DQ12', { ...request, stop: 3 }]);
    expect(far.ok).toBe(false);
    if (!far.ok) expect(far.error).toMatchObject({ kind: 'input', where: 'sweep stop' });
    const shape = await dispatchApiCall(bench.api, 'sweepNet', ['DQ12', { ...request, quantity: { kind: 'width', elementIndex: 2 } }]);
    expect(shape.ok).toBe(false);
    if (!shape.ok) expect(shape.error.kind).toBe('payload');
  });
});

describe('startSweep as a job', () => {
  it('reports progress, ends done, and its result is the sweep', async () => {
    const job = await bench.api.startSweep('DQ12', request);
    expect(job.state).toBe('running');
    const end = await bench.api.waitForJob(job.id);
    expect(end.state).toBe('done');
    expect(end.progress).toBe(1);
    const result = await bench.api.getSweepResult(job.id);
    expect(result.points).toHaveLength(6);
    expect(result.net).toBe('DQ12');
  }, 120_000);

  it('says a job without a sweep result has none', async () => {
    await expect(bench.api.getSweepResult('no-such-job')).rejects.toThrow(/no such job/);
  });
});
