/**
 * `slackline check` shows a reviewer's waiver beside the status it leaves unchanged (docs/workbench.md,
 * "Waivers"): "FAIL · waived" in the table, who waived what and why below it, "(stale)" when the result
 * no longer matches, and the same exit status. Project: the invented demo, bus BYTE5 (DQ45 fails setup).
 */
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { buildDemoProject } from '../../fixtures/demo/demo-project.js';
import { main } from '../../main/cli/index.js';
import { ProjectStore } from '../../main/services/project/project-store.js';
import type { Waiver } from '../../core/project/model.js';
import { makeTempDir } from './db/temp-files.js';

async function cli(...argv: string[]): Promise<{ status: number; out: string }> {
  let out = '';
  const status = await main(argv, { out: (t) => (out += `${t}\n`), err: () => {} });
  return { status, out };
}

// Invented reviewer and reason; the margin is one the demo's DQ45 is far better than (-1 ns), or far worse than (0 ps).
const waiver = (margin: number): Waiver => ({
  net: 'DQ45', check: 'setup margin', status: 'fail', margin, unit: 's',
  comment: 'accepted for the first build', author: 'R. Reviewer', at: '2026-12-02T12:00:00.000Z',
});

let temp: ReturnType<typeof makeTempDir>;
beforeEach(() => { temp = makeTempDir('slackline-check-waivers-'); });
afterEach(() => temp.remove());

describe('slackline check with waivers', () => {
  it('marks the waived net, says who waived it and why, and still exits 1', async () => {
    const path = temp.file('w.slackline');
    ProjectStore.create(path, { ...buildDemoProject(), waivers: [waiver(-1e-9)] }).close();
    const r = await cli('check', path, '--bus', 'BYTE5');
    expect(r.status).toBe(1);
    expect(r.out).toMatch(/^\s+DQ45 .*FAIL · waived\s/m);
    expect(r.out).toContain('DQ45: waived (fail setup margin) by R. Reviewer on 2026-12-02: accepted for the first build');
    expect(r.out).not.toContain('stale');
    expect(r.out).toMatch(/\d+ pass, \d+ tight, 1 fail; 1 waived by a reviewer/);
  });

  it('calls the waiver stale when the margin is worse than when waived', async () => {
    const path = temp.file('s.slackline');
    ProjectStore.create(path, { ...buildDemoProject(), waivers: [waiver(0)] }).close();
    const r = await cli('check', path, '--bus', 'BYTE5');
    expect(r.status).toBe(1);
    expect(r.out).toMatch(/^\s+DQ45 .*FAIL · waived \(stale\)/m);
    expect(r.out).toMatch(/DQ45: the waiver is stale: setup margin got worse: 0\.0 ps when waived, -\d+\.\d ps now/);
  });
});
