/**
 * The whole-board solve before the latest one, kept as per-net worst margins (docs/board-partitioning.md
 * §4, scope 'previous-board' of solve_manifest) for "Δ vs previous solve" in the report and its CSV
 * (docs/workbench.md, "Margin table"); a waiver changes no result (the solve stays fresh). Board:
 * bench/generate-board.ts (invented, 12 nets), solved in this thread. Expected
 * deltas are the two solves' own numbers subtracted (worst = min(setup, hold)), rounded as the CSV rounds.
 */
import { afterAll, describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { parse } from 'csv-parse/sync';
import { generateBoard } from '../../../bench/generate-board.js';
import { setWaiver } from '../../../core/design/edits.js';
import { createProject, openProjectServices } from '../../../main/services/compose.js';
import type { BoardResult } from '../../../core/budget/results.js';

const dir = mkdtempSync(join(tmpdir(), 'slackline-previous-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));
const options = { solve: { workers: 0, solve: { lengthWindow: false } } };
const worstOf = (b: BoardResult) => new Map(b.buses.flatMap((x) => x.nets).map((n) => [n.net, n.setupMargin === null || n.holdMargin === null ? null : Math.min(n.setupMargin, n.holdMargin)]));

describe('the previous whole-board solve', { timeout: 300_000 }, () => {
  it('is the solve a new one replaced, with each net\'s worst margin then; the report CSV takes its delta from it', async () => {
    const path = join(dir, 'board.slackline');
    createProject(path, generateBoard(12), { author: 'tester' });
    const [edited] = generateBoard(12).nets.filter((n) => n.role === 'data').map((n) => n.name);
    let services = openProjectServices(path, options);
    let first: BoardResult;
    let second: BoardResult;
    try {
      const { store, solver, reports } = services;
      first = await solver.solveBoard({});
      expect(solver.previousSolve()).toBeNull();
      // Lengthen one data net's first segment by 20 mm: its margins change, the others' (of other buses) do not.
      const net = store.load().nets.find((n) => n.name === edited)!;
      const index = net.elements.findIndex((e) => e.kind === 'segment');
      const segment = net.elements[index];
      if (segment.kind !== 'segment') throw new Error('no segment');
      store.updateNetElement(edited, index, { ...segment, length: segment.length + 20e-3 });
      second = await solver.solveBoard({});
      const previous = solver.previousSolve()!;
      expect(previous.solvedAt).toBe(first.solvedAt);
      expect(previous.fingerprint).toBe(first.fingerprint);
      expect(new Map(Object.entries(previous.margins))).toEqual(worstOf(first));
      const before = worstOf(first).get(edited)!;
      const now = worstOf(second).get(edited)!;
      expect(now).not.toBe(before);

      // A waiver is no input: the latest solve stays fresh and the board is not solved again.
      store.authorEdit('set-waiver', (p) => setWaiver(p, {
        net: edited, check: 'setup margin', status: 'fail', margin: -1e-12, unit: 's', comment: 'invented', author: 'tester', at: '2026-12-01T10:00:00.000Z',
      }));
      expect(solver.freshResults()?.solvedAt).toBe(second.solvedAt);

      const [csv] = await reports.write(second, { outDir: join(dir, 'out'), formats: ['csv'] });
      const rows = parse(readFileSync(csv, 'utf8'), { columns: true }) as Record<string, string>[];
      const dq5 = rows.find((r) => r.net === edited)!;
      expect(Number(dq5.delta_vs_previous_ps)).toBe(Math.round(((now - before) / 1e-12) * 1000) / 1000);
      expect(dq5.previous_solved_at).toBe(first.solvedAt);
      expect(dq5.waiver_author).toBe('tester');
      // Each net's delta is its own worst now minus then (0 where nothing it depends on changed).
      for (const r of rows) {
        const a = worstOf(second).get(r.net)!;
        const b = worstOf(first).get(r.net)!;
        expect(Number(r.delta_vs_previous_ps)).toBe(Math.round(((a - b) / 1e-12) * 1000) / 1000 + 0);
      }
    } finally {
      await services.close();
    }

    // Kept in the file; an unchanged re-check (served from the manifest) does not replace it.
    services = openProjectServices(path, options);
    try {
      expect((await services.solver.solveBoard({})).solvedAt).toBe(second.solvedAt);
      expect(services.solver.previousSolve()?.solvedAt).toBe(first.solvedAt);
    } finally {
      await services.close();
    }
  });
});
