/**
 * Waivers in the project file and through the service API (docs/workbench.md, "Waivers"; migration
 * 012): a file of schema version 11 gains the table when opened; a waiver round-trips, is undone and
 * redone, follows a renamed net and goes with a deleted one (the change-log line says so); comment and
 * author are required and a refusal names the field; a waiver records the net's result as it is and
 * changes no result. Storage behaviour; the demo's DQ45 fails setup (fixtures/demo/README.md).
 */
import { afterAll, describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import Database from 'better-sqlite3';
import { ProjectStore } from '../../../main/services/project/project-store.js';
import { ProjectDatabase } from '../../../main/services/db/project-database.js';
import { latestVersion, migrate } from '../../../main/services/db/migrations.js';
import { readDesign } from '../../../core/design/index.js';
import { deleteNet, removeWaiver, renameNet, setWaiver } from '../../../core/design/edits.js';
import { createDemo, openWorkbench } from '../../../main/services/compose.js';
import { dispatchApiCall } from '../../../main/services/api/dispatch.js';
import type { Waiver } from '../../../core/project/model.js';

const dir = mkdtempSync(join(tmpdir(), 'slackline-waivers-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));
const board = () => readDesign('two-bus.design.yaml', readFileSync(join(import.meta.dirname, '..', 'design', 'two-bus.design.yaml'), 'utf8'));

// An invented waiver of the two-bus board's DQ5 (its numbers are not checked against a result here).
const WAIVER: Waiver = {
  net: 'DQ5', check: 'setup margin', status: 'tight', margin: 12e-12, unit: 's',
  comment: 'longer breakout accepted for this spin', author: 'tester', at: '2026-12-01T10:00:00.000Z',
};

describe('waivers in the project file', () => {
  it('a version 11 file gains the waiver table when opened, and then stores waivers', () => {
    const path = join(dir, 'v11.slackline');
    const db = new Database(path);
    db.pragma('journal_mode = WAL');
    db.pragma('foreign_keys = ON');
    migrate(db, 11);
    const data = ProjectDatabase.fromConnection(db);
    data.transaction(() => data.insertProject(board()));
    db.close();
    const store = ProjectStore.open(path, { author: 'tester' });
    try {
      expect(store.migratedFrom).toBe(11);
      expect(store.settings().schemaVersion).toBe(latestVersion()); // 012 and every later migration ran
      expect(store.load().waivers).toBeUndefined(); // a project without waivers reads back as before
      store.authorEdit('set-waiver', (p) => setWaiver(p, WAIVER));
      expect(store.load().waivers).toEqual([WAIVER]);
    } finally {
      store.close();
    }
  });

  it('round-trips, survives a reopen, undoes and redoes with the authoring stack', () => {
    const path = join(dir, 'round.slackline');
    const store = ProjectStore.create(path, board(), { author: 'tester' });
    const before = store.load();
    store.authorEdit('set-waiver', (p) => setWaiver(p, { ...WAIVER, comment: `  ${WAIVER.comment} ` }));
    store.close();
    const again = ProjectStore.open(path, { author: 'tester' });
    try {
      // Stored trimmed, every field as given.
      expect(again.load().waivers).toEqual([WAIVER]);
      expect(again.undoHistory().undo[0]).toMatchObject({ action: 'set-waiver', detail: `waived net DQ5 (tight setup margin) by tester: ${WAIVER.comment}` });
      again.undo();
      expect(again.load()).toEqual(before);
      again.redo();
      expect(again.load().waivers).toEqual([WAIVER]);
      // The table's own checks refuse an empty comment even past the services (migration 012).
      const raw = new Database(path);
      try {
        expect(() => raw.prepare("UPDATE waiver SET comment = '  '").run()).toThrow(/Waiver_ck_comment/);
      } finally {
        raw.close();
      }
      again.authorEdit('remove-waiver', (p) => removeWaiver(p, 'DQ5'));
      expect(again.load().waivers).toBeUndefined();
      expect(() => again.authorEdit('remove-waiver', (p) => removeWaiver(p, 'DQ5'))).toThrow(/net DQ5: has no waiver/);
    } finally {
      again.close();
    }
  });

  it('follows a renamed net and goes with a deleted one; undo brings both back', () => {
    const store = ProjectStore.create(join(dir, 'rename.slackline'), board(), { author: 'tester' });
    try {
      store.authorEdit('set-waiver', (p) => setWaiver(p, WAIVER));
      store.authorEdit('rename-net', (p) => renameNet(p, 'DQ5', 'DQ5_LONG'));
      expect(store.load().waivers).toEqual([{ ...WAIVER, net: 'DQ5_LONG' }]);
      expect(store.undoHistory().undo[0].detail).toBe('renamed net DQ5 to DQ5_LONG (its waiver follows)');
      store.authorEdit('delete-net', (p) => deleteNet(p, 'DQ5_LONG'));
      expect(store.load().waivers).toBeUndefined();
      expect(store.undoHistory().undo[0].detail).toBe('deleted net DQ5_LONG and its waiver (by tester)');
      store.undo();
      expect(store.load().waivers).toEqual([{ ...WAIVER, net: 'DQ5_LONG' }]);
    } finally {
      store.close();
    }
  });

  it('refuses a waiver without comment or author, or of a net not in the project, naming the field', () => {
    const store = ProjectStore.create(join(dir, 'refuse.slackline'), board(), { author: 'tester' });
    try {
      expect(() => store.authorEdit('set-waiver', (p) => setWaiver(p, { ...WAIVER, comment: ' ' }))).toThrow(/waiver of net DQ5 comment: is required/);
      expect(() => store.authorEdit('set-waiver', (p) => setWaiver(p, { ...WAIVER, author: '' }))).toThrow(/waiver of net DQ5 author: is required/);
      expect(() => store.authorEdit('set-waiver', (p) => setWaiver(p, { ...WAIVER, net: 'NOPE' }))).toThrow(/net NOPE: is not in the project/);
      expect(store.load().waivers).toBeUndefined();
      expect(store.undoHistory().undo).toEqual([]);
    } finally {
      store.close();
    }
  });
});

describe('waivers through the service API', { timeout: 300_000 }, () => {
  it('records the net\'s worst check as solved, refuses missing fields by name, and undoes', async () => {
    const path = createDemo(join(dir, 'demo'));
    const bench = await openWorkbench(path);
    try {
      const { api } = bench;
      // Shape checks name the missing argument field; empty text is refused by the service, naming it.
      const missing = await dispatchApiCall(api, 'setWaiver', ['DQ45', { comment: 'x' }]);
      expect(missing).toMatchObject({ ok: false, error: { kind: 'payload' } });
      expect(!missing.ok && missing.error.message).toMatch(/argument 1\.author/);
      const empty = await dispatchApiCall(api, 'setWaiver', ['DQ45', { comment: '', author: 'R. Vale' }]);
      expect(empty).toMatchObject({ ok: false, error: { kind: 'input', where: 'waiver of net DQ45 comment' } });
      await expect(api.setWaiver('DQ45', { comment: 'accepted', author: '   ' })).rejects.toThrow(/waiver of net DQ45 author: is required/);
      await expect(api.setWaiver('NOPE', { comment: 'accepted', author: 'R. Vale' })).rejects.toThrow(/net NOPE: is not in the project/);
      expect((await api.getProject()).data.waivers).toBeUndefined();

      const result = await api.solveNet('DQ45');
      // fixtures/demo/README.md: DQ45 fails setup (routed 40 mm longer than its strobe).
      expect(result.status).toBe('fail');
      const summary = await api.setWaiver('DQ45', { comment: 'trained lane, accepted for the prototype', author: 'R. Vale' });
      const [waiver] = summary.data.waivers!;
      // What is waived is the result as it is: its setup margin, in seconds.
      expect(waiver).toMatchObject({ net: 'DQ45', check: 'setup margin', status: 'fail', margin: result.setupMargin, unit: 's', author: 'R. Vale' });
      expect(Date.parse(waiver.at)).not.toBeNaN();
      // The status is unchanged: the net still fails.
      expect((await api.solveNet('DQ45')).status).toBe('fail');
      expect((await api.getEditHistory()).undo[0].action).toBe('set-waiver');

      // A passing net has nothing to waive (DQ40 passes on the demo, fixtures/demo/README.md).
      expect((await api.solveNet('DQ40')).status).toBe('pass');
      await expect(api.setWaiver('DQ40', { comment: 'x', author: 'y' })).rejects.toThrow(/net DQ40: passes every check/);

      await api.undo();
      expect((await api.getProject()).data.waivers).toBeUndefined();
      await api.redo();
      expect((await api.getProject()).data.waivers).toHaveLength(1);
      await api.removeWaiver('DQ45');
      expect((await api.getProject()).data.waivers).toBeUndefined();
    } finally {
      await bench.close();
    }
  });
});
