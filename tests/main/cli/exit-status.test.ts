/**
 * The exit-status contract (docs/reliability.md §4): a command whose work never settles ends with
 * one line and status 70, never Node's 13 ("unsettled top-level await", nodejs.org/api/process.html
 * exit codes).
 */
import { spawnSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';

const ROOT = fileURLToPath(new URL('../../../', import.meta.url));
const CHILD = fileURLToPath(new URL('./unsettled-child.ts', import.meta.url));

describe('exit status contract', () => {
  it('work that never settles ends with one line and 70, not 13', () => {
    const run = spawnSync(process.execPath, ['--import', 'tsx/esm', CHILD], { cwd: ROOT, encoding: 'utf8', timeout: 60_000 });
    expect(run.status).toBe(70); // EX_SOFTWARE (BSD sysexits(3)); without the guard Node ends with 13
    const lines = run.stderr.trim().split('\n').filter((l) => !l.startsWith('Warning'));
    expect(lines).toEqual([expect.stringMatching(/^slackline check: internal error: the command stopped before finishing/)]);
  });
});
