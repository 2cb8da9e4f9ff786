import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync, rmSync, readdirSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { parse } from 'csv-parse/sync';
import { main } from '../../../main/cli/index.js';
import { ProjectStore } from '../../../main/services/project/project-store.js';
import { SolveService } from '../../../main/services/solve/solve-service.js';
import type { BoardResult } from '../../../core/budget/results.js';
import { loadProject } from '../../core/report/fixture.js';

function capture() {
  const out: string[] = [];
  const err: string[] = [];
  return { io: { out: (t: string) => out.push(t), err: (t: string) => err.push(t) }, out, err };
}

let dir: string;
let file: string;
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'slackline-cli-report-'));
  file = join(dir, 'heron.slackline');
  // The invented fixture project (fixtures/report), stored as a real project file.
  ProjectStore.create(file, loadProject()).close();
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('slackline report', () => {
  it('solves, writes the files, prints their paths and agrees with a direct solve', async () => {
    const { io, out, err } = capture();
    const status = await main(['report', file, '--out', join(dir, 'out'), '--format', 'csv,html', '--json'], io);
    expect(status).toBe(0);
    const printed = JSON.parse(out.join('\n')) as { files: string[]; status: Record<string, string> };
    expect(printed.files.map((f) => f.split('/').pop())).toEqual(['heron-ridge-data-logger-b2-margins.csv', 'heron-ridge-data-logger-b2-margin-report.html']);
    expect(readdirSync(join(dir, 'out')).sort()).toEqual(['heron-ridge-data-logger-b2-margin-report.html', 'heron-ridge-data-logger-b2-margins.csv']);
    expect(err.some((line) => line.startsWith('solving: 100 %'))).toBe(true); // progress goes to stderr

    // The same project solved in this thread (results cache of the same file): same margins.
    const store = ProjectStore.open(file);
    let board: BoardResult;
    try {
      board = await new SolveService(store, { workers: 0 }).solveBoardSync();
    } finally {
      store.close();
    }
    const rows = parse(readFileSync(printed.files[0], 'utf8'), { columns: true, cast: true }) as Record<string, number | string>[];
    const nets = board.buses.flatMap((b) => b.nets);
    expect(rows.map((r) => r.net)).toEqual(nets.map((n) => n.net));
    nets.forEach((n, i) => {
      // CSV values are rounded to 0.001 ps; half of that is the round-trip tolerance.
      expect(Math.abs(Number(rows[i].setup_margin_ps) - n.setupMargin! / 1e-12)).toBeLessThanOrEqual(0.0005);
      expect(Math.abs(Number(rows[i].hold_margin_ps) - n.holdMargin! / 1e-12)).toBeLessThanOrEqual(0.0005);
    });
    expect(printed.status).toEqual(Object.fromEntries(board.buses.map((b) => [b.bus, b.nets.length ? b.status : 'not evaluated'])));
  });

  it('rejects bad usage with exit status 2 and a message naming the option', async () => {
    const cases: [string[], RegExp][] = [
      [['report', file], /--out: missing output folder/],
      [['report', file, '--out', dir, '--format', 'pdf,xls'], /--format: unknown report format "xls"/],
      [['report', file, '--out', dir, '--bus', 'NOPE'], /--bus: no bus named "NOPE" \(buses: LANE0, CMD, SPARE\)/],
      [['report', join(dir, 'missing.slackline'), '--out', dir], /no such project file/],
    ];
    for (const [argv, message] of cases) {
      const { io, err } = capture();
      expect(await main(argv, io)).toBe(2);
      expect(err.join('\n')).toMatch(message);
    }
  });
});
