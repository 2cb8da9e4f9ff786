/**
 * `slackline check FILE [--bus NAME] [--json]` (docs/design.md §8.5): exit 0 when no net fails, 1 when
 * any fails, 2 on bad input; a margin table per bus; JSON in SI units. Project: fixtures/report/heron-ridge
 * (invented; every net there is an open-ended, unterminated line that overshoots, so it fails).
 */
import { afterAll, describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { main } from '../../../main/cli/index.js';
import { ProjectStore } from '../../../main/services/project/project-store.js';
import type { ProjectData } from '../../../core/project/model.js';
import type { BoardResult } from '../../../core/budget/results.js';

const fixture = JSON.parse(
  readFileSync(new URL('../../../fixtures/report/heron-ridge.project.json', import.meta.url), 'utf8'),
) as ProjectData;
const dir = mkdtempSync(join(tmpdir(), 'slackline-check-'));
const file = join(dir, 'heron.slackline');
ProjectStore.create(file, fixture).close();
afterAll(() => rmSync(dir, { recursive: true, force: true }));

async function check(args: string[]): Promise<{ code: number; out: string; err: string }> {
  let out = '';
  let err = '';
  const code = await main(['check', ...args], { out: (t) => void (out += `${t}\n`), err: (t) => void (err += `${t}\n`) });
  return { code, out, err };
}

describe('slackline check', () => {
  it('prints a margin table per bus and exits 1 when a net fails', async () => {
    const r = await check([file, '--bus', 'CMD']);
    expect(r.code).toBe(1);
    expect(r.out).toMatch(/^CMD \(common-clock\): FAIL/m);
    expect(r.out).toMatch(/net\s+role\s+flight min ps\s+flight max ps\s+setup ps\s+hold ps\s+worst corner\s+status\s+reason/);
    // A0's first reason is its hold margin since the clock net CK's own launch and flight enter the
    // common-clock budget (docs/design.md §6.1); its overshoot follows on its own line
    expect(r.out).toMatch(/^ {2}A0\s+address\s+\d+\s+\d+\s+-?\d+\s+-?\d+\s+\w+\s+FAIL\s+hold margin -\d+ ps at \w+ corner/m);
    expect(r.out).toMatch(/^ {4}A0: overshoot to \d\.\d\d V/m);
    expect(r.out).toMatch(/vendors' models and design rules, measurement on the built board and the reviewer's sign-off remain the authority\./); // docs/design.md §9
  });

  it('prints the BoardResult as JSON in SI units with --json', async () => {
    const r = await check([file, '--bus', 'LANE0', '--json']);
    expect(r.code).toBe(1);
    const board = JSON.parse(r.out) as BoardResult;
    expect(board.buses.map((b) => b.bus)).toEqual(['LANE0']);
    const dq0 = board.buses[0].nets.find((n) => n.net === 'DQ0')!;
    // seconds, not picoseconds: a 38 mm stripline flight is a few hundred ps (~6-7 ps/mm, docs/design.md §3)
    expect(dq0.flightMax).toBeGreaterThan(100e-12);
    expect(dq0.flightMax).toBeLessThan(1e-9);
  });

  it('exits 2 with a message naming the problem on bad input', async () => {
    const missing = await check([join(dir, 'nope.slackline')]);
    expect(missing.code).toBe(2);
    expect(missing.err).toMatch(/nope\.slackline: no such project file/);
    const bus = await check([file, '--bus', 'NOPE']);
    expect(bus.code).toBe(2);
    expect(bus.err).toMatch(/--bus: no bus named "NOPE" \(buses: LANE0, CMD, SPARE\)/);
    expect((await check([])).code).toBe(2);
  });
});
