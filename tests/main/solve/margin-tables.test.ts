/**
 * Margin tables (docs/board-partitioning.md §4, "Margin tables"): every bus entry is stored with its
 * margin table beside it, and `solveBoardTable` reads the tables instead of the full entries. The
 * tables must say exactly what the full results say wherever a table is used: the same rows, the same
 * `slackline check` text, the same waiver states. Behaviour, no numeric source.
 * Boards: bench/generate-board.ts (invented), solved in this thread without length windows.
 */
import { describe, expect, it } from 'vitest';
import { SolveService } from '../../../main/services/solve/solve-service.js';
import { editOneNet, generateBoard } from '../../../bench/generate-board.js';
import { memoryStore } from '../../../bench/memory-store.js';
import { busTable } from '../../../core/engine/board-summary.js';
import { checkText } from '../../../main/cli/commands/check.js';
import { waivableCheck, waiverState } from '../../../core/budget/waiver.js';
import type { BoardResult, BoardTable } from '../../../core/budget/results.js';
import type { Waiver } from '../../../core/project/model.js';

const options = { workers: 0, solve: { lengthWindow: false } };
const tables = (board: BoardResult): BoardTable => ({ ...board, buses: board.buses.map(busTable) });

describe('margin tables', () => {
  it('are read back from their own entries, equal to the tables of the full results', async () => {
    const store = memoryStore(generateBoard(24));
    const service = new SolveService(store, options);
    const full = await service.solveBoard();
    const reader = new SolveService(store, options); // nothing in memory: the tables come from the store
    const table = await reader.solveBoardTable();
    expect(reader.lastStats.solved).toBe(0);
    expect(table).toEqual(tables(full));
    // a table is much smaller than the result it stands for (no budget line items, only failing checks)
    expect(JSON.stringify(table).length).toBeLessThan(JSON.stringify(full).length / 3);
  });

  it('after a one-net edit, give the tables of a full solve from scratch', async () => {
    const before = generateBoard(30);
    const store = memoryStore(before);
    await new SolveService(store, options).solveBoard();
    const edited = editOneNet(before, 12, 3e-4);
    store.setProject(edited);
    const service = new SolveService(store, options);
    const table = await service.solveBoardTable();
    expect(service.lastStats.solvedNets.sort()).toEqual(['DQ10', 'DQS1']);
    const scratch = await new SolveService(memoryStore(edited), options).solveBoard();
    expect(table.buses).toEqual(tables(scratch).buses);
    // and the full results stored by that re-check are the scratch solve's
    const again = new SolveService(store, options);
    expect((await again.solveBoard()).buses).toEqual(scratch.buses);
    expect(again.lastStats.solved).toBe(0);
  });

  it('are derived from the full entries of a store written before tables existed', async () => {
    const store = memoryStore(generateBoard(12));
    const full = await new SolveService(store, options).solveBoard();
    // the same store as a file solved by an earlier version reads: no table entries
    const withoutTables = { ...store, getResult: (key: string) => (key.startsWith('table:') ? null : store.getResult(key)) };
    const tableKeys = (JSON.parse(store.getManifest()!.json) as { buses: { key: string }[] }).buses.map((b) => `table:${b.key}`);
    for (const key of tableKeys) expect(store.getResult(key)).not.toBeNull();
    expect(await new SolveService(withoutTables, options).solveBoardTable()).toEqual(tables(full));
  });

  it('print the same check text and waiver states as the full results', async () => {
    const project = generateBoard(30);
    const store = memoryStore(project);
    const full = await new SolveService(store, options).solveBoard();
    const table = await new SolveService(store, options).solveBoardTable();
    const failing = full.buses.flatMap((b) => b.nets).filter((n) => n.status !== 'pass');
    expect(failing.length).toBeGreaterThan(0); // the generated board fails some nets by design
    const waivers: Waiver[] = failing.slice(0, 4).map((n, i) => {
      const check = waivableCheck(n)!;
      return {
        net: n.net, check: check.check, status: check.status, margin: check.margin === null ? null : check.margin + (i % 2 ? 1e-12 : -1e-12),
        unit: check.unit, author: 'reviewer', at: '2026-12-03T00:00:00Z', comment: 'accepted for the test',
      };
    });
    expect(checkText(table, 'board.slackline', waivers)).toBe(checkText(full, 'board.slackline', waivers));
    const rows = new Map(table.buses.flatMap((b) => b.nets).map((n) => [n.net, n]));
    for (const n of full.buses.flatMap((b) => b.nets)) {
      for (const w of waivers) expect(waiverState(w, rows.get(n.net)), n.net).toEqual(waiverState(w, n));
    }
  });
});
