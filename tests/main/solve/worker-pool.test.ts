/**
 * WorkerPool behaviour (no numeric source: threading behaviour): jobs run on worker threads with the
 * same output as on this thread; when no worker can start (a missing entry, as in a build without the
 * worker file) the jobs still run, on this thread; errors keep their InputError type and place.
 */
import { afterAll, describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { execFileSync } from 'node:child_process';
import { WorkerPool } from '../../../main/services/solve/worker-pool.js';
import { runJob, type SolveJobSpec } from '../../../core/engine/jobs.js';
import { InputError } from '../../../core/errors.js';
import type { ProjectData } from '../../../core/project/model.js';

const project = JSON.parse(
  readFileSync(new URL('../../../fixtures/report/heron-ridge.project.json', import.meta.url), 'utf8'),
) as ProjectData;
const job: SolveJobSpec = { kind: 'net', net: 'A0', key: 'k', strobe: null };
const options = { lengthWindow: false, suggestion: false };
const pools: WorkerPool[] = [];
afterAll(async () => {
  for (const p of pools) await p.close();
});

describe('WorkerPool', () => {
  it('runs a job on a worker thread with the same output as on this thread', async () => {
    const pool = new WorkerPool(1);
    pools.push(pool);
    const { json, ...out } = await pool.run('p1', project, job, options);
    const here = runJob(project, job, options);
    expect(out).toEqual(here);
    // the text it arrived as is the one the results cache stores
    expect(json).toBe(JSON.stringify({ measures: here.measures, result: here.result }));
  });

  it('keeps two jobs in each worker and answers every one of them with its own output', async () => {
    const pool = new WorkerPool(1);
    pools.push(pool);
    const commonClock = new Set(project.buses.filter((b) => b.timing.kind !== 'source-synchronous').map((b) => b.name));
    const nets = project.nets.filter((n) => commonClock.has(n.bus)).slice(0, 4).map((n) => n.name);
    expect(nets.length).toBe(4); // more jobs than the worker holds at once
    const outs = await Promise.all(nets.map((net) => pool.run('p1', project, { ...job, net }, options)));
    expect(outs.map((o) => o.net)).toEqual(nets);
    for (const [i, o] of outs.entries()) expect(o.result).toEqual(runJob(project, { ...job, net: nets[i] }, options).result);
  });

  it('falls back to this thread when no worker can start', async () => {
    const pool = new WorkerPool(2, runJob, new URL('./no-such-worker.mjs', import.meta.url));
    pools.push(pool);
    const outs = await Promise.all([pool.run('p1', project, job, options), pool.run('p1', project, { ...job, net: 'A1' }, options)]);
    expect(outs.map((o) => o.net)).toEqual(['A0', 'A1']);
    // without a local runner the same pool reports the start-up failure instead of hanging
    const bare = new WorkerPool(1, null, new URL('./no-such-worker.mjs', import.meta.url));
    pools.push(bare);
    await expect(bare.run('p1', project, job, options)).rejects.toThrow(/no-such-worker|Cannot find module/);
  });

  /**
   * Runs one job on a pool of one worker without a local runner, in a host started as
   * `node NODE_OPTIONS... --import tsx --input-type=module -e SCRIPT`: prints "ran NET" and the host's
   * --max options when the job ran on the worker (else the pool rejects it and the host fails).
   */
  const hostRun = (nodeOptions: string[]): string => {
    const pool = new URL('../../../main/services/solve/worker-pool.ts', import.meta.url).href;
    const fixture = new URL('../../../fixtures/report/heron-ridge.project.json', import.meta.url);
    const script = `
      const { readFileSync } = await import('node:fs');
      const { WorkerPool } = await import(${JSON.stringify(pool)});
      const project = JSON.parse(readFileSync(new URL(${JSON.stringify(fixture.href)}), 'utf8'));
      const p = new WorkerPool(1, null);
      const out = await p.run('p1', project, { kind: 'net', net: 'A0', key: 'k', strobe: null }, { lengthWindow: false, suggestion: false });
      await p.close();
      console.log(['ran ' + out.net, ...process.execArgv.filter((a) => a.startsWith('--max'))].join(' '));`;
    return execFileSync(process.execPath, [...nodeOptions, '--import', 'tsx', '--input-type=module', '-e', script], { encoding: 'utf8' }).trim();
  };

  it('starts its workers when the host runs as `node --input-type=module -e ...`', () => {
    // A worker inherits the host's execArgv, and Node refuses --input-type for a file entry: without
    // the filter of main/services/worker-exec-argv.ts no worker starts.
    expect(hostRun([])).toBe('ran A0');
  });

  it('starts its workers when the host was given V8 options a worker cannot take (node --max-old-space-size=...)', () => {
    // Node's worker_threads documentation: V8 options and per-process options are not supported in a
    // worker's execArgv; a host started with one must still get its workers (not an internal error).
    expect(hostRun(['--max-old-space-size=3072', '--max-semi-space-size=32'])).toBe('ran A0 --max-old-space-size=3072 --max-semi-space-size=32');
  });

  it('passes an InputError back with the place it names', async () => {
    const pool = new WorkerPool(1);
    pools.push(pool);
    const error = await pool.run('p1', project, { ...job, net: 'NOPE' }, options).catch((e: unknown) => e);
    expect(error).toBeInstanceOf(InputError);
    expect((error as InputError).where).toBe('net NOPE');
    expect((error as Error).message).toBe('net NOPE: not in the project');
  });

  it('closes cleanly: an idle worker leaves with status 0, close() resolves after every exit', async () => {
    const pool = new WorkerPool(1);
    await pool.run('p1', project, job, options); // the worker is loaded and idle now
    const worker = (pool as unknown as { slots: { worker: import('node:worker_threads').Worker }[] }).slots[0].worker;
    const exit = new Promise<number>((resolve) => worker.once('exit', resolve));
    let exited = false;
    void exit.then(() => (exited = true));
    await pool.close();
    await Promise.resolve(); // let the exit listener above run before looking
    expect(exited).toBe(true);
    expect(await exit).toBe(0); // left on its own (asked to leave), not terminated (status 1)
    await expect(pool.run('p1', project, job, options)).rejects.toThrow(/closed/);
  });
});
