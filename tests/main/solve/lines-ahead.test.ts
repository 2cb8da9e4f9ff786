/**
 * A board's routed cross-sections solved on two threads before its nets (main/services/solve/
 * lines-ahead.ts, docs/field-solver.md §10). The solutions must be those one thread finds, each
 * geometry solved once, and a check must store the worker's solutions with its own. Project: the
 * demo (invented), whose strobes and clocks are edge-coupled pairs on three layers at three corners.
 * Behaviour and determinism, no numeric source needed.
 */
import { afterAll, describe, expect, it } from 'vitest';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { clearFieldMemo, fieldMemoEntries, fieldMemoSize } from '../../../core/fieldsolve/memo.js';
import { routedLineGeometries, solveRoutedLines } from '../../../core/netbuild/index.js';
import { buildLinearDemoProject } from '../../../fixtures/demo/demo-project.js';
import { startLinesAhead } from '../../../main/services/solve/lines-ahead.js';
import { ProjectStore } from '../../../main/services/project/project-store.js';
import { SolveService } from '../../../main/services/solve/solve-service.js';

const project = buildLinearDemoProject();
const geometries = routedLineGeometries(project);
// routedLine remembers its answers per stackup object: each solve below gets a stackup of its own
const stackup = () => structuredClone(project.stackup);
const dir = mkdtempSync(join(tmpdir(), 'slackline-lines-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

/** The memo's solutions by key, as one thread alone finds them. */
function oneThread(): Map<string, unknown> {
  clearFieldMemo();
  solveRoutedLines(stackup(), geometries);
  return new Map(fieldMemoEntries().map((e) => [e.key, e.value]));
}

async function until(condition: () => boolean): Promise<void> {
  for (let i = 0; i < 400 && !condition(); i++) await new Promise((r) => setTimeout(r, 50));
}

describe('cross-sections solved on two threads', () => {
  it('the demo has field-solved geometries to share (pairs on several layers and corners)', () => {
    expect(geometries.length).toBeGreaterThanOrEqual(6);
    expect(oneThread().size).toBeGreaterThanOrEqual(6);
  });

  it('gives the memo exactly the solutions one thread finds, each geometry solved by one thread', async () => {
    const expected = oneThread();
    clearFieldMemo();
    const ahead = startLinesAhead(stackup(), geometries);
    // let the worker load and take some (its solutions reach this thread's memo as they come)
    await until(() => fieldMemoSize() > 0);
    const out = await ahead.finish();
    expect(out.helper).toBeGreaterThan(0);
    expect(out.here + out.helper).toBe(geometries.length);
    const got = new Map(fieldMemoEntries().map((e) => [e.key, e.value]));
    expect([...got.keys()].sort()).toEqual([...expected.keys()].sort());
    for (const [key, value] of expected) expect(got.get(key)).toEqual(value);
    // the worker's entries are handed over for storing, none of them solved here as well
    expect(out.entries.length).toBeGreaterThan(0);
    expect(out.entries.length).toBeLessThan(expected.size);
  });

  it('solves everything on this thread when no worker starts', async () => {
    const expected = oneThread();
    clearFieldMemo();
    const out = await startLinesAhead(stackup(), geometries, { entry: new URL('./no-such-lines-worker.mjs', import.meta.url) }).finish();
    expect(out).toMatchObject({ here: geometries.length, helper: 0, entries: [] });
    expect(new Set(fieldMemoEntries().map((e) => e.key))).toEqual(new Set(expected.keys()));
  });

  it('a cold check on a service that may use workers stores every solution it needed, the worker\'s among them', async () => {
    const expected = oneThread();
    clearFieldMemo();
    const store = ProjectStore.create(join(dir, 'demo.slackline'), structuredClone(project));
    const service = new SolveService(store, { workers: 2, inThreadUpTo: 100000, solve: { lengthWindow: false, suggestion: false } });
    try {
      await service.solveBoard();
      const stored = store.fieldSolutions().map((r) => r.key.replace(/^engine [^|]*\|/, ''));
      expect(new Set(stored)).toEqual(new Set(expected.keys()));
    } finally {
      await service.close();
      store.close();
    }
  });
});
