import { spawn } from 'node:child_process';
import { existsSync, statSync, writeFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { ProjectStore } from '../../../main/services/project/project-store.js';
import { lengthReportCsv, syntheticProject } from '../../../fixtures/lengths/synthetic.js';
import { fileHash, makeTempDir } from '../db/temp-files.js';

const ROOT = fileURLToPath(new URL('../../../', import.meta.url));
const CHILD = fileURLToPath(new URL('./import-child.ts', import.meta.url));

interface ChildRun {
  output: string;
  signal: NodeJS.Signals | null;
  code: number | null;
  /** Size of the -wal file at the moment the child paused, bytes (-1 when it did not pause). */
  walAtPause: number;
}

/** Runs the child; when it reports a pause, records the WAL size and kills it with SIGKILL. */
function runChild(project: string, csv: string, pause: boolean): Promise<ChildRun> {
  return new Promise((resolve, reject) => {
    const child = spawn(process.execPath, ['--import', 'tsx/esm', CHILD, project, csv, ...(pause ? ['pause'] : [])], {
      cwd: ROOT,
      stdio: ['ignore', 'pipe', 'pipe'],
    });
    let output = '';
    let walAtPause = -1;
    child.stdout.on('data', (chunk: Buffer) => {
      output += chunk.toString();
      if (pause && walAtPause < 0 && output.includes('paused')) {
        walAtPause = existsSync(`${project}-wal`) ? statSync(`${project}-wal`).size : 0;
        child.kill('SIGKILL');
      }
    });
    child.stderr.on('data', (chunk: Buffer) => (output += chunk.toString()));
    child.on('error', reject);
    child.on('exit', (code, signal) => resolve({ output, signal, code, walAtPause }));
  });
}

describe('an import killed in the middle', () => {
  let temp: ReturnType<typeof makeTempDir>;
  beforeEach(() => {
    temp = makeTempDir('slackline-kill-');
  });
  afterEach(() => temp.remove());

  it('leaves the project file valid and unchanged', async () => {
    // 3000 nets x 20 segments = 60,000 changed rows (about 3.5 MB of table pages): the transaction
    // outgrows the child's 1 MB page cache, so by the pause it has spilled pages to the WAL (checked below).
    const data = syntheticProject(3000, 20);
    const project = temp.file('large.slackline');
    const csv = temp.file('large.csv');
    ProjectStore.create(project, data, { author: 'setup' }).close();
    writeFileSync(csv, lengthReportCsv(data, 1.25));
    const hashBefore = fileHash(project);

    const run = await runChild(project, csv, true);
    expect(run.output).toMatch(/paused (\d+)\/60000/);
    expect(run.signal).toBe('SIGKILL');
    expect(run.output).not.toContain('finished');
    // Evidence that the kill hit a transaction with data on disk, not one still in memory only.
    expect(run.walAtPause).toBeGreaterThan(0);
    // Uncommitted WAL frames never reach the main file (sqlite.org/wal.html): its bytes are as before.
    expect(fileHash(project)).toBe(hashBefore);

    const store = ProjectStore.open(project);
    try {
      expect(store.integrityCheck()).toBe('ok');
      expect(store.load()).toStrictEqual(data);
      expect(store.changeLog(10).map((e) => e.action)).toEqual(['create-project']);
    } finally {
      store.close();
    }
  });

  it('(control) the same child, not killed, applies the whole report', async () => {
    const data = syntheticProject(50, 20);
    const project = temp.file('small.slackline');
    const csv = temp.file('small.csv');
    ProjectStore.create(project, data).close();
    writeFileSync(csv, lengthReportCsv(data, 1.25));
    const run = await runChild(project, csv, false);
    expect(run.code).toBe(0);
    expect(run.output).toContain('finished applied=true changed=1000');
    const store = ProjectStore.open(project);
    try {
      const first = store.load().nets[0].elements[0];
      // 1 mm x 1.25 printed to 0.01 mil: within 0.005 mil = 127 nm of 1.25 mm.
      expect(first.kind === 'segment' && Math.abs(first.length - 1.25e-3)).toBeLessThan(0.127e-6);
      expect(store.changeLog(1)).toMatchObject([{ author: 'child', action: 'import-lengths' }]);
      expect(store.integrityCheck()).toBe('ok');
    } finally {
      store.close();
    }
  });
});
