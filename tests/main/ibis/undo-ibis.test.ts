/**
 * Stored IBIS files are outside the undo stack (docs/design-file.md §9): undo entries do not carry the
 * files' texts, undo and redo keep the files stored now, and restore the parts' model choices.
 * Files: the invented fixtures/ibis models; project: the demo on its linear models.
 */
import { readFileSync } from 'node:fs';
import Database from 'better-sqlite3';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { buildLinearDemoProject } from '../../../fixtures/demo/demo-project.js';
import { ProjectStore } from '../../../main/services/project/project-store.js';
import { makeTempDir } from '../db/temp-files.js';

const wren = readFileSync(new URL('../../../fixtures/ibis/wren_mc7.ibs', import.meta.url), 'utf8');

let tmp: ReturnType<typeof makeTempDir>;
let path: string;
beforeEach(() => {
  tmp = makeTempDir('slackline-undo-ibis-');
  path = tmp.file('board.slk');
  ProjectStore.create(path, buildLinearDemoProject()).close();
});
afterEach(() => tmp.remove());

/** Every undo/redo snapshot text in the file (migration 007). */
function snapshots(): string[] {
  const db = new Database(path, { readonly: true });
  try {
    return (db.prepare('SELECT snapshot FROM undo_entry').all() as { snapshot: string }[]).map((r) => r.snapshot);
  } finally {
    db.close();
  }
}

describe('IBIS files and undo', () => {
  it('an edit made before an import, undone, keeps the imported file; no entry holds an .ibs text', () => {
    const store = ProjectStore.open(path);
    try {
      store.authorEdit('edit-info', (p) => ({ project: { ...p, info: { ...p.info, description: 'changed' } }, detail: 'changed the description' }));
      store.importIbis('wren_mc7.ibs', wren);
      const partName = store.load().parts.find((p) => p.driver !== null)!.name;
      store.authorEdit('set-part-ibis', (p) => ({
        project: { ...p, parts: p.parts.map((x) => (x.name === partName ? { ...x, ibis: { file: 'wren_mc7.ibs', model: 'dq_drv40' } } : x)) },
        detail: `part ${partName} uses dq_drv40`,
      }));
      expect(snapshots().some((s) => s.includes('[IBIS Ver]'))).toBe(false);

      store.undo(); // the model choice goes, the file stays
      let now = store.load();
      expect(now.parts.find((p) => p.name === partName)!.ibis).toBeUndefined();
      expect(now.ibisFiles?.map((f) => f.name)).toEqual(['wren_mc7.ibs']);
      store.undo(); // the description edit made before the import: the file still stays
      now = store.load();
      expect(now.info.description).not.toBe('changed');
      expect(now.ibisFiles?.map((f) => f.name)).toEqual(['wren_mc7.ibs']);
      store.redo();
      store.redo(); // the model choice comes back and resolves against the stored file
      now = store.load();
      expect(now.parts.find((p) => p.name === partName)!.ibis).toEqual({ file: 'wren_mc7.ibs', model: 'dq_drv40' });
      expect(snapshots().some((s) => s.includes('[IBIS Ver]'))).toBe(false);
    } finally {
      store.close();
    }
  });

  it('stores the [Pin] a part names and reads it back (migration 013)', () => {
    const store = ProjectStore.open(path);
    try {
      store.importIbis('wren_mc7.ibs', wren);
      const part = store.load().parts.find((p) => p.driver !== null)!;
      store.upsertPart({ ...part, ibis: { file: 'wren_mc7.ibs', model: 'dq_drv40', pin: 'A2' } });
    } finally {
      store.close();
    }
    const again = ProjectStore.open(path);
    try {
      expect(again.load().parts.find((p) => p.ibis)!.ibis).toEqual({ file: 'wren_mc7.ibs', model: 'dq_drv40', pin: 'A2' });
    } finally {
      again.close();
    }
  });
});
