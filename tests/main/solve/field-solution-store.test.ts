/**
 * Field solutions kept in the project (migration 011, docs/field-solver.md §10): a check stores the
 * 2-D solutions it needed, and a later process seeded from the file does not solve them again.
 * Project: fixtures/report/heron-ridge (invented) with its strobe routed as an edge-coupled pair, so
 * the pair is field-solved. Behaviour, no numeric source needed.
 */
import { afterAll, describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { ProjectData } from '../../../core/project/model.js';
import { clearFieldMemo, fieldMemoEntries, takeFreshFieldEntries } from '../../../core/fieldsolve/memo.js';
import { pairOnLayer } from '../../../core/stackup/index.js';
import { ProjectStore } from '../../../main/services/project/project-store.js';
import { SolveService } from '../../../main/services/solve/solve-service.js';
import { openWorkbench } from '../../../main/services/compose.js';
import Database from 'better-sqlite3';

const fixture = JSON.parse(readFileSync(new URL('../../../fixtures/report/heron-ridge.project.json', import.meta.url), 'utf8')) as ProjectData;
const dir = mkdtempSync(join(tmpdir(), 'slackline-field-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('field solutions stored in the project', () => {
  it('are stored by a check and seed a later solve, which then solves none of them again', async () => {
    const data = structuredClone(fixture);
    const strobe = data.nets.find((n) => n.name === 'DQS0')!;
    const segment = strobe.elements.find((e) => e.kind === 'segment')!;
    if (segment.kind === 'segment') segment.spacing = 0.1e-3;
    const path = join(dir, 'pair.slackline');
    clearFieldMemo();
    const store = ProjectStore.create(path, data);
    try {
      await new SolveService(store, { workers: 0 }).solveBoardSync();
      const stored = store.fieldSolutions();
      // one pair per corner at least (Dk and etch differ by corner)
      expect(stored.filter((r) => r.kind === 'pair').length).toBeGreaterThanOrEqual(data.corners.length);
      expect(stored.every((r) => r.key.startsWith('engine '))).toBe(true);
    } finally {
      store.close();
    }

    // A new process: nothing in memory, the file's solutions seed it.
    clearFieldMemo();
    const again = ProjectStore.open(path);
    try {
      await new SolveService(again, { workers: 0 }).solveBoardSync();
      expect(fieldMemoEntries().length).toBe(again.fieldSolutions().length);
      takeFreshFieldEntries();
      // the same pair geometry is answered from the seeded memo: nothing fresh was solved
      const { stackup } = again.load();
      pairOnLayer(stackup, segment.kind === 'segment' ? segment.layer : '', segment.kind === 'segment' ? segment.width : 0, 0.1e-3);
      expect(takeFreshFieldEntries()).toEqual([]);
    } finally {
      again.close();
    }
  });

  it('are stored when the jobs ran on worker threads too', async () => {
    const data = structuredClone(fixture);
    const strobe = data.nets.find((n) => n.name === 'DQS0')!;
    for (const e of strobe.elements) if (e.kind === 'segment') e.spacing = 0.12e-3;
    clearFieldMemo();
    const store = ProjectStore.create(join(dir, 'pool.slackline'), data);
    const service = new SolveService(store, { workers: 1 });
    try {
      await service.solveBoard();
      expect(store.fieldSolutions().filter((r) => r.kind === 'pair').length).toBeGreaterThanOrEqual(data.corners.length);
    } finally {
      await service.close();
      store.close();
    }
  });

  it("seed the workbench's layer table: opening a checked project solves no stored cross-section again", async () => {
    const path = join(dir, 'layers.slackline');
    clearFieldMemo();
    const store = ProjectStore.create(path, structuredClone(fixture));
    try {
      await new SolveService(store, { workers: 0 }).solveBoardSync();
      expect(store.fieldSolutions().length).toBeGreaterThan(0);
    } finally {
      store.close();
    }
    // a new process opens the workbench: the layer table solves the nominal sections the check did not
    // need (its corners change Dk and etch) and stores them, so the next process opening it solves
    // nothing (a solved section would be stored again with a new time)
    const storedRows = () => {
      const db = new Database(path, { readonly: true });
      try {
        return db.prepare('SELECT key, stored_at FROM field_solution ORDER BY key').all() as { key: string; stored_at: string }[];
      } finally {
        db.close();
      }
    };
    const afterCheck = storedRows();
    const rows: ReturnType<typeof storedRows>[] = [];
    for (let round = 0; round < 2; round++) {
      clearFieldMemo();
      const workbench = await openWorkbench(path);
      try {
        expect((await workbench.api.getProject()).layers.length).toBeGreaterThan(0);
      } finally {
        await workbench.close();
      }
      rows.push(storedRows());
      await new Promise((r) => setTimeout(r, 5)); // a later stored_at, were anything stored again
    }
    expect(rows[0].length).toBeGreaterThan(afterCheck.length);
    expect(rows[1]).toEqual(rows[0]);
  });
});
