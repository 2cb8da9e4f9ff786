/**
 * `slackline sweep` (main/cli/commands/sweep.ts; docs/design.md §6.5): the command-line host of the
 * what-if sweep prints the same sweep the services give, exits 1 when a value fails and 2 on a bad
 * range with the flag named. Project: the invented demo project. Behaviour, no numeric source needed.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { main } from '../../main/cli/index.js';
import type { CliIo } from '../../main/cli/command.js';
import { createDemoProject } from '../../main/services/project/demo.js';
import { ProjectStore } from '../../main/services/project/project-store.js';
import { sweepNet, type NetSweep } from '../../core/engine/sweep.js';

const dir = mkdtempSync(join(tmpdir(), 'slackline-cli-sweep-'));
const path = createDemoProject(dir);
afterAll(() => rmSync(dir, { recursive: true, force: true }));

async function run(...argv: string[]): Promise<{ code: number; stdout: string; stderr: string }> {
  const io = { stdout: '', stderr: '', out(t: string) { io.stdout += `${t}\n`; }, err(t: string) { io.stderr += `${t}\n`; } };
  const code = await main(argv, io as CliIo);
  return { code, stdout: io.stdout, stderr: io.stderr };
}

describe('slackline sweep', () => {
  it('prints the services\' sweep as JSON and exits 1 when a value fails', async () => {
    const r = await run('sweep', path, '--net', 'DQ12', '--length', '3', '--from', '20mm', '--to', '120mm', '--points', '6', '--json');
    // 120 mm is far past DQ12's length window (docs/design.md §6.3): setup fails there
    expect(r.code).toBe(1);
    const printed = JSON.parse(r.stdout) as NetSweep;
    const store = ProjectStore.open(path, { readOnly: true });
    let direct: NetSweep;
    try {
      direct = sweepNet(store.load(), 'DQ12', { quantity: { kind: 'length', elementIndex: 2 }, start: 0.02, stop: 0.12, points: 6 });
    } finally {
      store.close();
    }
    // the same solve in another thread: the same numbers (deterministic, no tolerance)
    expect(printed.points.map((p) => [p.value, p.setupMargin, p.holdMargin])).toEqual(direct.points.map((p) => [p.value, p.setupMargin, p.holdMargin]));
  }, 120_000);

  it('prints a table with units and the length window', async () => {
    const r = await run('sweep', path, '--net', 'DQ12', '--length', '3', '--from', '40mm', '--to', '50mm', '--points', '2');
    const store = ProjectStore.open(path, { readOnly: true });
    let direct: NetSweep;
    try {
      direct = sweepNet(store.load(), 'DQ12', { quantity: { kind: 'length', elementIndex: 2 }, start: 0.04, stop: 0.05, points: 2 });
    } finally {
      store.close();
    }
    expect(r.code).toBe(direct.points.some((p) => p.status === 'fail') ? 1 : 0);
    // each row: the value in mm, both margins in ps to 0.1 ps, the status (the printed form of the same numbers)
    const p = direct.points[0];
    const row = `40.00 mm\\s+${(p.setupMargin! / 1e-12).toFixed(1)} ps\\s+${(p.holdMargin! / 1e-12).toFixed(1)} ps\\s+${p.status}`;
    expect(r.stdout).toMatch(new RegExp(row.replace(/\./g, '\\.')));
    const w = direct.lengthWindow!;
    expect(r.stdout).toContain(`length window of segment 3: ${(w.min! * 1e3).toFixed(2)} mm to ${(w.max! * 1e3).toFixed(2)} mm (margins >= 0)`);
  }, 120_000);

  it('exits 2 naming the flag for a range beyond the sane lengths or a non-segment element', async () => {
    const far = await run('sweep', path, '--net', 'DQ12', '--length', '3', '--from', '20mm', '--to', '5m');
    expect(far.code).toBe(2);
    expect(far.stderr).toMatch(/--to: must lie from 0\.01 mm to 2000 mm, got 5000 mm/);
    const via = await run('sweep', path, '--net', 'DQ12', '--length', '2', '--from', '20mm', '--to', '50mm');
    expect(via.code).toBe(2);
    expect(via.stderr).toMatch(/net DQ12 element 2: a length sweep needs a segment, this element is a via/);
  });
});
