/**
 * `slackline check --threads N` (docs/design.md §7, command line): the same results on worker threads
 * and in the command's own thread, and a located error for a bad count (common practice, no source:
 * the threads only change where the jobs run). Project: the invented demo, bus BYTE5.
 */
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { buildDemoProject } from '../../fixtures/demo/demo-project.js';
import { main } from '../../main/cli/index.js';
import { defaultCheckThreads } from '../../main/cli/commands/check.js';
import { ProjectStore } from '../../main/services/project/project-store.js';
import { makeTempDir } from './db/temp-files.js';

async function cli(...argv: string[]): Promise<{ status: number; out: string; err: string }> {
  let out = '';
  let err = '';
  const status = await main(argv, { out: (t) => (out += `${t}\n`), err: (t) => (err += `${t}\n`) });
  return { status, out, err };
}

/** The BoardResult's buses without the fields that say when and where it was solved. */
function buses(json: string): unknown {
  return JSON.parse(json, (key, value) => (key === 'solvedAt' || key === 'inputHash' ? undefined : value)).buses;
}

let temp: ReturnType<typeof makeTempDir>;
beforeEach(() => { temp = makeTempDir('slackline-check-threads-'); });
afterEach(() => temp.remove());

describe('slackline check --threads', () => {
  it('gives the same results in its own thread (0) as on a worker thread (1)', async () => {
    const results = [];
    for (const threads of ['0', '1']) {
      const path = temp.file(`t${threads}.slackline`);
      ProjectStore.create(path, buildDemoProject()).close();
      const r = await cli('check', path, '--bus', 'BYTE5', '--threads', threads, '--json');
      expect(r.status).toBe(1); // DQ45 fails setup in the demo
      results.push(buses(r.out));
    }
    expect(results[0]).toEqual(results[1]);
  });

  it('keeps up to 3,000 jobs in its own thread below three cores, else one worker per core (measured on two cores, docs/board-partitioning.md §5)', () => {
    expect([1, 2].map(defaultCheckThreads)).toEqual([{ workers: 1, inThreadUpTo: 3000 }, { workers: 2, inThreadUpTo: 3000 }]);
    expect([3, 4, 16].map(defaultCheckThreads)).toEqual([{ workers: 3 }, { workers: 4 }, { workers: 16 }]);
  });

  it('names --threads when the count is not a whole number from 0 to 256', async () => {
    const path = temp.file('bad.slackline');
    ProjectStore.create(path, buildDemoProject()).close();
    for (const bad of ['-1', '1.5', 'many', '999']) {
      const r = await cli('check', path, `--threads=${bad}`);
      expect(r.status, bad).toBe(2);
      expect(r.err).toContain(`--threads: must be a whole number from 0 to 256, got "${bad}"`);
    }
  });
});
