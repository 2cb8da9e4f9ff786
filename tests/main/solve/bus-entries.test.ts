/**
 * Stored bus entries name their nets' job results instead of repeating them (docs/board-partitioning.md
 * §4, main/services/solve/bus-entry.ts): read back, a bus is the assembled bus to the last field; an
 * outdated solve stays readable while newer results of its nets are stored; entries of the older layout
 * (the whole BusResult) still read. Storage behaviour, no numeric source. Board: bench/generate-board.ts
 * (invented), 30 nets, solved in this thread.
 */
import { afterAll, describe, expect, it } from 'vitest';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { ProjectStore } from '../../../main/services/project/project-store.js';
import { lengthen } from './lengthen.js';
import { storedRows } from './stored-rows.js';
import { SolveService } from '../../../main/services/solve/solve-service.js';
import { busEntryJson, busFromEntry } from '../../../main/services/solve/bus-entry.js';
import { netAssembly, withNetAssembly } from '../../../core/engine/board.js';
import { generateBoard } from '../../../bench/generate-board.js';
import type { BoardResult } from '../../../core/budget/results.js';

const dir = mkdtempSync(join(tmpdir(), 'slackline-bus-entries-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));
const options = { workers: 0, solve: { lengthWindow: false } };


/** Every stored bus entry's JSON text, as the file holds it (decompressed through the store). */
function busEntryTexts(file: string, store: ProjectStore): string[] {
  const keys = storedRows(file, "SELECT key FROM solve_result WHERE slot LIKE 'bus:%'") as { key: string }[];
  return keys.map((k) => store.getResult(k.key)!);
}

describe('stored bus entries', () => {
  it('hold job keys and assembly fields only, and read back as the assembled buses', async () => {
    const file = join(dir, 'board.slackline');
    ProjectStore.create(file, generateBoard(30)).close();
    const store = ProjectStore.open(file);
    const solver = new SolveService(store, options);
    const board = (await solver.solveBoard()) as BoardResult;
    await solver.close();
    const texts = busEntryTexts(file, store);
    expect(texts.length).toBe(board.buses.length);
    for (const text of texts) {
      expect(text).not.toContain('"quality"'); // no net result repeated
      expect(text).not.toContain('"setupItems"');
    }
    // a new service on the same file reads every bus from its entry and the job entries it names
    const reader = new SolveService(store, options);
    expect(reader.freshResults()).toEqual(board);
    for (const bus of board.buses) expect(reader.solvedBus(bus.bus)?.bus).toEqual(bus);
    await reader.close();
    store.close();
  });

  it('of an outdated solve stay readable after an edit and a solve of that bus', async () => {
    const file = join(dir, 'outdated.slackline');
    ProjectStore.create(file, generateBoard(30)).close();
    const store = ProjectStore.open(file);
    const solver = new SolveService(store, options);
    const board = (await solver.solveBoard()) as BoardResult;
    const edited = board.buses[0].nets[1].net;
    lengthen(store, edited, 4e-3);
    // solving the net stores its new result in the slot the whole-board solve's entry reads from
    const now = await solver.solveNet(edited);
    expect(now.inputHash).not.toBe(board.buses[0].nets[1].inputHash);
    const outdated = solver.solvedBus(board.buses[0].bus);
    expect(outdated?.fresh).toBe(false);
    expect(outdated?.changedNets.has(edited)).toBe(true);
    expect(outdated?.bus).toEqual(board.buses[0]);
    // the next whole-board solve replaces the entry and prunes the outdated result
    await solver.solveBoard();
    const slots = storedRows(file, 'SELECT slot, COUNT(*) AS n FROM solve_result GROUP BY slot HAVING n > 1');
    expect(slots).toEqual([]);
    await solver.close();
    store.close();
  });

  it('read as before when written whole (the older layout), and not at all when a job entry is gone', async () => {
    const store = ProjectStore.create(join(dir, 'layout.slackline'), generateBoard(30));
    const solver = new SolveService(store, options);
    const board = (await solver.solveBoard()) as BoardResult;
    await solver.close();
    const bus = board.buses[1];
    expect(busFromEntry(JSON.stringify(bus), () => null)).toEqual(bus);
    const jobs = new Map(bus.nets.map((n) => [n.inputHash, store.getResult(n.inputHash)]));
    expect(busFromEntry(busEntryJson(bus), (key) => jobs.get(key) ?? null)).toEqual(bus);
    jobs.delete(bus.nets[0].inputHash);
    expect(busFromEntry(busEntryJson(bus), (key) => jobs.get(key) ?? null)).toBeNull();
    store.close();
  });

  it('assembly fields carry what assembly changed, and only apply to a result with the same corner rows', () => {
    const own = { corners: [{ corner: 'slow', setupMargin: null, holdMargin: null }], skew: null, setupMargin: null, holdMargin: null } as never;
    const assembled = { corners: [{ corner: 'slow', setupMargin: 1e-10, holdMargin: 2e-10 }], skew: 3e-12, setupMargin: 1e-10, holdMargin: 2e-10 } as never;
    const a = netAssembly(assembled);
    expect(a).toEqual({ skew: 3e-12, setupMargin: 1e-10, holdMargin: 2e-10, corners: [[1e-10, 2e-10]] });
    expect(withNetAssembly(own, a)).toEqual(assembled);
    expect(own).toEqual({ corners: [{ corner: 'slow', setupMargin: null, holdMargin: null }], skew: null, setupMargin: null, holdMargin: null }); // not changed
    expect(withNetAssembly({ ...(own as object), corners: [] } as never, a)).toBeNull();
  });
});
