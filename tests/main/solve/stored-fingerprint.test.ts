/**
 * The input fingerprint stored by input revision (migration 014, docs/board-partitioning.md §4): every
 * input table bumps the revision through triggers, whoever writes; the fingerprint a freshness check
 * computes is stored for its revision and read instead of hashing the project again; after any input
 * write the stored one no longer applies, so results are never called fresh for other inputs. The
 * rules are this program's own (common practice for derived-data caches, no source).
 */
import { afterAll, describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import Database from 'better-sqlite3';
import { ProjectStore } from '../../../main/services/project/project-store.js';
import { SolveService } from '../../../main/services/solve/solve-service.js';
import { generateBoard } from '../../../bench/generate-board.js';
import { projectFingerprint } from '../../../core/engine/board.js';

const dir = mkdtempSync(join(tmpdir(), 'slackline-fingerprint-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));
const options = { workers: 0, solve: { lengthWindow: false } };

/** Tables that hold no input of a solve: they need no revision trigger. */
const NOT_INPUTS = ['schema_migration', 'change_log', 'results_cache', 'solve_result', 'solve_manifest', 'undo_entry', 'field_solution', 'input_revision'];

function storedRow(path: string): { revision: number; fingerprint: string | null; fingerprint_revision: number | null } {
  const db = new Database(path, { readonly: true });
  try {
    return db.prepare('SELECT revision, fingerprint, fingerprint_revision FROM input_revision').get() as never;
  } finally {
    db.close();
  }
}

describe('input fingerprint stored by input revision', () => {
  it('every table except the non-input ones has its insert, update and delete trigger', () => {
    const file = join(dir, 'schema.slackline');
    ProjectStore.create(file, generateBoard(2)).close();
    const db = new Database(file, { readonly: true });
    try {
      const tables = (db.prepare("SELECT name FROM sqlite_schema WHERE type = 'table' AND name NOT LIKE 'sqlite_%'").all() as { name: string }[]).map((t) => t.name);
      const triggers = new Set((db.prepare("SELECT name FROM sqlite_schema WHERE type = 'trigger'").all() as { name: string }[]).map((t) => t.name));
      const inputs = tables.filter((t) => !NOT_INPUTS.includes(t));
      expect(inputs).toEqual(expect.arrayContaining(['net', 'net_element', 'part', 'stackup_layer', 'corner', 'bus', 'waiver']));
      for (const t of inputs) for (const ev of ['insert', 'update', 'delete']) expect(triggers.has(`${t}_revision_${ev}`), `${t} ${ev}`).toBe(true);
    } finally {
      db.close();
    }
  });

  it('is stored by a freshness check, read back instead of hashing, and never used after an input changes', async () => {
    const file = join(dir, 'board.slackline');
    ProjectStore.create(file, generateBoard(6)).close();
    let store = ProjectStore.open(file);
    let service = new SolveService(store, options);
    await service.solveBoardTable();
    expect(service.freshSolvedAt()).not.toBeNull();
    const salt = (service as unknown as { salt: string }).salt;
    const row = storedRow(file);
    expect(row.fingerprint_revision).toBe(row.revision);
    expect(row.fingerprint).toBe(projectFingerprint(store.load(), salt));
    store.close();

    // reopened: the stored fingerprint answers (a planted wrong value shows it is the one read)
    const planted = new Database(file);
    planted.prepare("UPDATE input_revision SET fingerprint = 'planted'").run();
    planted.close();
    store = ProjectStore.open(file);
    service = new SolveService(store, options);
    expect(service.freshSolvedAt()).toBeNull(); // 'planted' is not the manifest's fingerprint
    store.close();

    // an edit through the store bumps the revision: the planted value no longer applies
    store = ProjectStore.open(file);
    service = new SolveService(store, options);
    const before = store.inputRevision()!;
    const name = store.load().nets[0].name;
    const index = store.load().nets[0].elements.findIndex((e) => e.kind === 'segment');
    const original = store.load().nets[0].elements[index];
    if (original.kind !== 'segment') throw new Error('no segment');
    store.updateNetElement(name, index, { ...original, length: original.length + 1e-3 });
    expect(store.inputRevision()!).toBeGreaterThan(before);
    expect(service.freshSolvedAt()).toBeNull(); // outdated by the edit
    store.updateNetElement(name, index, original); // the element as it was
    expect(service.freshSolvedAt()).not.toBeNull(); // the inputs are back: fresh again (recomputed, not planted)
    expect(storedRow(file).fingerprint).toBe(projectFingerprint(store.load(), salt));
    store.close();
  });

  it('a write by another program bumps the revision too, and a read-only open stores nothing', async () => {
    const file = join(dir, 'external.slackline');
    ProjectStore.create(file, generateBoard(3)).close();
    const store = ProjectStore.open(file);
    const service = new SolveService(store, options);
    await service.solveBoardTable();
    expect(service.freshSolvedAt()).not.toBeNull();
    const other = new Database(file);
    other.prepare('UPDATE net_element SET length = length * 1.5 WHERE rowid = (SELECT min(rowid) FROM net_element WHERE kind = ?)').run('segment');
    other.close();
    expect(service.freshSolvedAt()).toBeNull();
    store.close();
    const bytes = readFileSync(file);
    const readOnly = ProjectStore.open(file, { readOnly: true });
    expect(new SolveService(readOnly, options).freshSolvedAt()).toBeNull();
    readOnly.close();
    expect(readFileSync(file).equals(bytes)).toBe(true);
  });
});
