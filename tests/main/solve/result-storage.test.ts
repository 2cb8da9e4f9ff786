/**
 * Solve results in the project file (migration 006, docs/board-partitioning.md §Storage): one entry per
 * job under its input hash and one per bus of the latest whole-board solve, named by a small manifest;
 * edits replace entries instead of adding to them, and a whole-board solve prunes what it no longer
 * uses, so the file stays bounded through edit-and-check cycles. Storage behaviour, no numeric source.
 * Board: bench/generate-board.ts (invented), 30 nets, solved in this thread.
 */
import { afterAll, describe, expect, it } from 'vitest';
import { mkdtempSync, rmSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import Database from 'better-sqlite3';
import { ProjectStore } from '../../../main/services/project/project-store.js';
import { lengthen } from './lengthen.js';
import { storedRows as rows } from './stored-rows.js';
import { SolveService } from '../../../main/services/solve/solve-service.js';
import { generateBoard } from '../../../bench/generate-board.js';
import { migrate } from '../../../main/services/db/migrations.js';
import { editOneNet } from '../../../bench/generate-board.js';
import { memoryStore } from '../../../bench/memory-store.js';

const dir = mkdtempSync(join(tmpdir(), 'slackline-storage-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));
const options = { workers: 0, solve: { lengthWindow: false } };


/** Size of the project file with its write-ahead log folded in (closing the store checkpoints it). */
function fileSize(path: string): number {
  return statSync(path).size;
}

describe('stored solve results', () => {
  it('stay under 2x the size after the first check through 20 edit-and-check cycles', async () => {
    const file = join(dir, 'cycles.slackline');
    ProjectStore.create(file, generateBoard(30)).close();
    let store = ProjectStore.open(file);
    let service = new SolveService(store, options);
    await service.solveBoard();
    const jobs = service.lastStats.jobs;
    await service.close();
    store.close();
    const afterFirst = fileSize(file);
    const names = generateBoard(30).nets.map((n) => n.name);
    for (let cycle = 0; cycle < 20; cycle++) {
      store = ProjectStore.open(file);
      service = new SolveService(store, options);
      lengthen(store, names[(cycle * 7) % names.length], 1e-4);
      await service.solveBoard();
      // a one-net edit re-solves that net and, in a byte lane, the strobe's bus-wide result; an edited
      // strobe re-solves its whole lane (its measures, 8 data nets, its result): at most 10 jobs
      expect(service.lastStats.solved).toBeGreaterThanOrEqual(1);
      expect(service.lastStats.solved).toBeLessThanOrEqual(10);
      await service.close();
      store.close();
    }
    const afterCycles = fileSize(file);
    expect(afterCycles).toBeLessThan(2 * afterFirst); // the bound this storage promises (common practice, no source)
    // exactly one entry per job of the board plus two per bus (its result and its margin table): nothing stale is left behind
    const buses = generateBoard(30).buses.length;
    expect(rows(file, 'SELECT COUNT(*) AS n FROM solve_result')).toEqual([{ n: jobs + 2 * buses }]);
  }, 120_000);

  it('looks entries up by their key (primary-key search, never a scan of the table)', () => {
    const file = join(dir, 'plan.slackline');
    ProjectStore.create(file, generateBoard(3)).close();
    // SQLite's query plan names the index it searches (sqlite.org/eqp.html); a scan would read "SCAN".
    const plan = rows(file, "EXPLAIN QUERY PLAN SELECT json FROM solve_result WHERE key = 'k'") as { detail: string }[];
    expect(plan.map((p) => p.detail).join(' ')).toMatch(/SEARCH solve_result USING INDEX sqlite_autoindex_solve_result_1 \(key=\?\)/);
    const slot = rows(file, "EXPLAIN QUERY PLAN DELETE FROM solve_result WHERE slot = 's' AND key <> 'k'") as { detail: string }[];
    expect(slot.map((p) => p.detail).join(' ')).toMatch(/SEARCH solve_result USING INDEX SolveResult_ix_slot \(slot=\?\)/);
  });

  it('serves the latest board from its manifest, fresh until an edit, then as the outdated solve', async () => {
    const file = join(dir, 'manifest.slackline');
    ProjectStore.create(file, generateBoard(12)).close();
    const store = ProjectStore.open(file);
    try {
      const service = new SolveService(store, options);
      const board = await service.solveBoard();
      const reopened = new SolveService(store, options); // nothing in memory: read back from the file
      expect(reopened.freshResults()).toEqual(board);
      const again = await reopened.solveBoard();
      expect(reopened.lastStats.solved).toBe(0);
      expect(again.buses).toEqual(board.buses);
      const manifest = rows(file, 'SELECT length(json) AS bytes FROM solve_manifest') as { bytes: number }[];
      // small and independent of the number of nets: a name, a key and a fixed-size summary per bus (core/engine/board-summary.ts)
      expect(manifest[0].bytes).toBeLessThan(1000 * board.buses.length);
      lengthen(store, 'DQ3', 2e-4);
      const after = new SolveService(store, options);
      expect(after.freshResults()).toBeNull();
      const outdated = after.outdatedResults();
      expect(outdated?.board.buses).toEqual(board.buses);
      expect(outdated?.changedNets).toEqual(['DQ3', 'DQS0']); // the edited net and its lane's strobe (bus-wide result)
    } finally {
      store.close();
    }
  });

  it('migrate a version 5 file: whole-board blobs dropped, other cache entries and the new tables there', () => {
    const file = join(dir, 'v5.slackline');
    const db = new Database(file);
    try {
      migrate(db, 5);
      const put = db.prepare('INSERT INTO results_cache (key, json, created_at) VALUES (?, ?, ?)');
      put.run('board:0123456789abcdef', '{"buses":[]}', '2026-01-01T00:00:00Z');
      put.run('0123456789abcdef', '{"measures":[]}', '2026-01-01T00:00:00Z');
      expect(migrate(db)[0]).toBe(6); // 006 first (later migrations may follow it)
      expect(db.prepare('SELECT key FROM results_cache').all()).toEqual([{ key: '0123456789abcdef' }]);
      expect(db.prepare("SELECT name FROM sqlite_master WHERE type = 'table' AND name LIKE 'solve_%' ORDER BY name").all())
        .toEqual([{ name: 'solve_manifest' }, { name: 'solve_result' }]);
    } finally {
      db.close();
    }
  });

  it('after an edit, take unchanged buses from their entries and give the same board as a solve from scratch', async () => {
    const before = generateBoard(40);
    const store = memoryStore(before);
    const service = new SolveService(store, options);
    await service.solveBoard();
    const edited = editOneNet(before, 12, 3e-4); // net 12 is DQ10 (after BYTE0's 9 nets, DQS1 and DQ8, DQ9)
    store.setProject(edited);
    const incremental = await service.solveBoard();
    expect(service.lastStats.solvedNets.sort()).toEqual(['DQ10', 'DQS1']); // the net and its lane's strobe result
    expect(service.lastStats.jobs).toBe(service.lastStats.solved + service.lastStats.fromCache);
    const scratch = new SolveService(memoryStore(edited), options);
    const full = await scratch.solveBoard();
    expect(incremental.buses).toEqual(full.buses); // the same results, bus for bus (deterministic solver)
  });

  it('are stored compressed and read back exactly, and entries written uncompressed still read', () => {
    const file = join(dir, 'packed.slackline');
    ProjectStore.create(file, generateBoard(3)).close();
    const json = JSON.stringify({ measures: Array.from({ length: 50 }, (_, i) => ({ receiver: 'U1', corner: 'slow', t: i * 1e-12 })), result: null });
    const store = ProjectStore.open(file);
    try {
      store.putResults([{ key: 'k1', slot: 'net:A', json }]);
      expect(store.getResult('k1')).toBe(json);
      const stored = rows(file, "SELECT json FROM solve_result WHERE key = 'k1'") as { json: string }[];
      expect(stored[0].json.startsWith('"z1:')).toBe(true);
      expect(stored[0].json.length).toBeLessThan(json.length / 4); // repeated keys deflate well (RFC 1951; measured about 8x on results)
      const db = new Database(file);
      db.prepare("INSERT INTO solve_result (key, slot, json, stored_at) VALUES ('k2', 'net:B', '{\"old\":true}', 'x')").run();
      db.close();
      expect(store.getResult('k2')).toBe('{"old":true}');
      // text beyond ASCII (units and symbols of the budget details, a character outside the BMP) after
      // a longer entry that left its bytes in the reused UTF-8 storage, and an entry larger than it keeps
      const long = JSON.stringify({ note: 'x'.repeat(5000) });
      const symbols = JSON.stringify({ detail: 'Z0 50 Ω, 127 µm, margin ≥ 0 ps, Γ = −0.2, 𝛤 outside the BMP' });
      const large = JSON.stringify({ detail: 'Ω'.repeat(11_500_000) }); // 3 bytes per unit: more than the 32 MB kept
      store.putResults([{ key: 'k3', slot: 'net:C', json: long }, { key: 'k4', slot: 'net:D', json: symbols }, { key: 'k5', slot: 'net:E', json: large }]);
      expect(store.getResult('k3')).toBe(long);
      expect(store.getResult('k4')).toBe(symbols);
      expect(store.getResult('k5')).toBe(large);
    } finally {
      store.close();
    }
  });
});
