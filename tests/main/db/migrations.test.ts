import { copyFileSync, existsSync, mkdirSync, writeFileSync } from 'node:fs';
import Database from 'better-sqlite3';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import {
  APPLICATION_ID, MIGRATIONS_DIR, expectedTables, latestVersion, loadMigrations, migrate,
} from '../../../main/services/db/migrations.js';
import { ProjectDatabase } from '../../../main/services/db/project-database.js';
import { openProjectDatabase } from '../../../main/services/db/open-database.js';
import { ProjectStore } from '../../../main/services/project/project-store.js';
import { buildDemoProject, buildLinearDemoProject } from '../../../fixtures/demo/demo-project.js';
import { expectSoundProject, fileHash, listing, makeTempDir } from './temp-files.js';
import type { ProjectData } from '../../../core/project/model.js';

/** The first schema version with the pair spacing of segments (migration 005). */
const SPACING_VERSION = 5;
/** Migration 008 adds stored IBIS files and part models. */
const IBIS_VERSION = 8;

/**
 * The demo as a file of `version` can hold it: before migration 008 there are no IBIS models (the
 * parts' linear models only); before migration 005 there is no pair spacing, so the strobes and the
 * clock are single-ended traces there (as the demo modelled them until then).
 */
function demoAtVersion(version: number): ProjectData {
  const project = version >= IBIS_VERSION ? buildDemoProject() : buildLinearDemoProject();
  if (version >= SPACING_VERSION) return project;
  for (const net of project.nets) {
    net.elements = net.elements.map((e) => {
      if (e.kind !== 'segment' || e.spacing === undefined) return e;
      const { spacing: _dropped, ...single } = e;
      return single;
    });
  }
  return project;
}

/** Builds a project file at an older schema version, the way that version would have written it. */
function fileAtVersion(path: string, version: number): void {
  const db = new Database(path);
  db.pragma('journal_mode = WAL');
  db.pragma('foreign_keys = ON');
  migrate(db, version);
  // Versions >= 1 hold every project table insertProject writes (migration 001).
  const data = ProjectDatabase.fromConnection(db);
  data.transaction(() => data.insertProject(demoAtVersion(version)));
  db.close();
}

describe('migrations', () => {
  let temp: ReturnType<typeof makeTempDir>;
  beforeEach(() => {
    temp = makeTempDir();
  });
  afterEach(() => temp.remove());

  it('are numbered 1..N without gaps and name the tables they create', () => {
    const migrations = loadMigrations();
    expect(migrations.map((m) => m.version)).toEqual(migrations.map((_, i) => i + 1));
    expect(latestVersion()).toBe(migrations.length);
    expect(expectedTables(1)).toContain('net_element');
    expect(expectedTables(latestVersion())).toEqual(expect.arrayContaining(['change_log', 'results_cache', 'io_standard']));
  });

  it('build the whole schema from an empty file and record every step', () => {
    const path = temp.file('empty.slackline');
    writeFileSync(path, '');
    const { db, fromVersion, backupPath } = openProjectDatabase(path, { mode: 'create' });
    try {
      expect(fromVersion).toBe(0);
      expect(backupPath).toBeNull(); // nothing to back up in an empty file
      expect(db.pragma('user_version', { simple: true })).toBe(latestVersion());
      expect(db.pragma('application_id', { simple: true })).toBe(APPLICATION_ID);
      const recorded = db.prepare('SELECT version, name FROM schema_migration ORDER BY version').all();
      expect(recorded).toEqual(loadMigrations().map((m) => ({ version: m.version, name: m.name })));
      expect(db.pragma('integrity_check', { simple: true })).toBe('ok');
      expect(db.pragma('foreign_key_check')).toEqual([]);
    } finally {
      db.close();
    }
  });

  for (let version = 1; version < latestVersion(); version += 1) {
    it(`bring a version ${version} file up to date after writing a backup copy`, () => {
      const path = temp.file(`v${version}.slackline`);
      fileAtVersion(path, version);
      const before = fileHash(path);

      const store = ProjectStore.open(path);
      try {
        expect(store.migratedFrom).toBe(version);
        expect(store.settings().schemaVersion).toBe(latestVersion());
        expect(store.load()).toStrictEqual(demoAtVersion(version));
        expect(store.ioStandards().length).toBeGreaterThan(0);
        expect(store.integrityCheck()).toBe('ok');
      } finally {
        store.close();
      }

      // The backup is the file as it was: its version, its data, no later tables.
      const backup = temp.file(`v${version}.slackline.v${version}-backup`);
      expect(store.backupPath).toBe(backup);
      const copy = new Database(backup, { readonly: true });
      try {
        expect(copy.pragma('user_version', { simple: true })).toBe(version);
        expect(copy.pragma('application_id', { simple: true })).toBe(APPLICATION_ID);
        const tables = (copy.prepare("SELECT name FROM sqlite_schema WHERE type = 'table'").all() as { name: string }[]).map((r) => r.name);
        // sqlite_sequence is SQLite's own bookkeeping for AUTOINCREMENT (sqlite.org/autoinc.html).
        expect(tables.filter((t) => t !== 'sqlite_sequence').sort()).toEqual(expectedTables(version).sort());
        expect(copy.pragma('integrity_check', { simple: true })).toBe('ok');
      } finally {
        copy.close();
      }
      // Opening a copy of the backup migrates it to the same project.
      const again = temp.file('again.slackline');
      copyFileSync(backup, again);
      const reopened = ProjectStore.open(again);
      try {
        expect(reopened.load()).toStrictEqual(demoAtVersion(version));
      } finally {
        reopened.close();
      }
      expect(before).not.toBe(fileHash(path)); // the original was migrated in place
    });
  }

  it('give a version 4 file the pair spacing column, keep its data, and store pairs afterwards', () => {
    const path = temp.file('v4.slackline');
    fileAtVersion(path, 4);
    const store = ProjectStore.open(path);
    try {
      expect(store.migratedFrom).toBe(4);
      // Every element of the old file is still there and single-ended (spacing NULL reads as absent).
      const loaded = store.load();
      expect(loaded).toStrictEqual(demoAtVersion(4));
      expect(loaded.nets.flatMap((n) => n.elements).some((e) => e.kind === 'segment' && e.spacing !== undefined)).toBe(false);
      // The migrated file takes a pair leg and gives it back (migration 005's column and named CHECK).
      const dqs0 = loaded.nets.find((n) => n.name === 'DQS0')!;
      const first = dqs0.elements[0];
      if (first.kind !== 'segment') throw new Error('DQS0 starts with a segment in the demo');
      store.updateNetElement('DQS0', 0, { ...first, spacing: 75e-6 });
      const again = store.load().nets.find((n) => n.name === 'DQS0')!.elements[0];
      expect(again).toStrictEqual({ ...first, spacing: 75e-6 });
    } finally {
      store.close();
    }
    const db = new Database(path, { readonly: true });
    try {
      const columns = (db.prepare('PRAGMA table_info(net_element)').all() as { name: string }[]).map((c) => c.name);
      expect(columns).toContain('spacing');
      expect(db.pragma('integrity_check', { simple: true })).toBe('ok');
    } finally {
      db.close();
    }
  });

  it('refuse a pair spacing that is not positive or not on a segment (named CHECK of migration 005)', () => {
    const path = temp.file('p.slackline');
    ProjectStore.create(path, buildDemoProject()).close();
    const db = new Database(path);
    try {
      const row = db.prepare("SELECT id, kind FROM net_element WHERE kind = 'via' LIMIT 1").get() as { id: number };
      expect(() => db.prepare('UPDATE net_element SET spacing = 1e-4 WHERE id = ?').run(row.id)).toThrow(/NetElement_ck_spacing/);
      const segment = db.prepare("SELECT id FROM net_element WHERE kind = 'segment' LIMIT 1").get() as { id: number };
      expect(() => db.prepare('UPDATE net_element SET spacing = 0 WHERE id = ?').run(segment.id)).toThrow(/NetElement_ck_spacing/);
    } finally {
      db.close();
    }
  });

  it('roll a failing migration back completely and stay at the last good version', () => {
    const dir = temp.file('migrations');
    mkdirSync(dir);
    copyFileSync(`${MIGRATIONS_DIR}/001-create-project.sql`, `${dir}/001-create-project.sql`);
    // The first statement is fine, the second is not: exec() alone would keep the first.
    writeFileSync(`${dir}/002-add-broken.sql`, 'CREATE TABLE half_done (x);\nCREATE TABLE oops (;\n');
    const path = temp.file('p.slackline');
    expect(() => openProjectDatabase(path, { mode: 'create', migrationsDir: dir })).toThrow(/syntax error/);
    const db = new Database(path, { readonly: true });
    try {
      expect(db.pragma('user_version', { simple: true })).toBe(1);
      const tables = (db.prepare("SELECT name FROM sqlite_schema WHERE type = 'table'").all() as { name: string }[]).map((r) => r.name);
      expect(tables).toContain('net_element');
      expect(tables).not.toContain('half_done');
    } finally {
      db.close();
    }
  });

  it('write no backup when the file is already current', () => {
    const path = temp.file('p.slackline');
    ProjectStore.create(path, buildDemoProject()).close();
    const store = ProjectStore.open(path);
    expect(store.backupPath).toBeNull();
    store.close();
    expect(listing(temp.dir)).toEqual(['p.slackline']);
  });

  it('number a second backup of the same version instead of overwriting the first', async () => {
    const path = temp.file('p.slackline');
    fileAtVersion(path, 2);
    copyFileSync(path, temp.file('saved'));
    ProjectStore.open(path).close();
    copyFileSync(temp.file('saved'), path);
    const store = ProjectStore.open(path);
    expect(store.backupPath).toBe(`${path}.v2-backup-2`);
    store.close();
    expect(existsSync(`${path}.v2-backup`)).toBe(true);
    await expectSoundProject(path);
  });
});

describe('files that are not projects', () => {
  let temp: ReturnType<typeof makeTempDir>;
  beforeEach(() => {
    temp = makeTempDir();
  });
  afterEach(() => temp.remove());

  /** Opens, expects the message, and checks the folder and the file's bytes did not change. */
  function expectRefused(path: string, message: RegExp): void {
    const hash = fileHash(path);
    const files = listing(temp.dir);
    expect(() => ProjectStore.open(path)).toThrow(message);
    expect(fileHash(path)).toBe(hash);
    expect(listing(temp.dir)).toEqual(files);
  }

  it('refuses a text file', () => {
    const path = temp.file('notes.slackline');
    writeFileSync(path, 'net,layer,length\nDQ0,L1,5mil\n'.repeat(50));
    expectRefused(path, /notes\.slackline: is not a Slackline project \(not an SQLite database at all\)/);
  });

  it('refuses another application\'s SQLite database', () => {
    const path = temp.file('other.db');
    const db = new Database(path);
    db.pragma('journal_mode = WAL');
    db.exec('CREATE TABLE t (x); INSERT INTO t VALUES (1)');
    db.close();
    expectRefused(path, new RegExp(`other\\.db: is not a Slackline project \\(SQLite application id 0, expected ${APPLICATION_ID}\\)`));
  });

  it('refuses a file with the project id but missing tables', () => {
    const path = temp.file('broken.slackline');
    const db = new Database(path);
    migrate(db, 2);
    db.exec('DROP TABLE corner');
    db.close();
    expectRefused(path, /broken\.slackline: is not a complete Slackline project \(schema version 2, missing tables: corner\)/);
  });

  it('refuses a project from a newer schema version', () => {
    const path = temp.file('future.slackline');
    ProjectStore.create(path, buildDemoProject()).close();
    const db = new Database(path);
    db.pragma(`user_version = ${latestVersion() + 1}`);
    db.close();
    expectRefused(
      path,
      new RegExp(`future\\.slackline: was written by a newer Slackline \\(schema version ${latestVersion() + 1}; this program reads up to ${latestVersion()}\\)`),
    );
  });

  it('refuses an empty file, a folder and a missing file with their own messages', () => {
    const empty = temp.file('empty.slackline');
    writeFileSync(empty, '');
    expectRefused(empty, /is an empty file, not a Slackline project/);
    expect(() => ProjectStore.open(temp.dir)).toThrow(/is a folder, not a project file/);
    expect(() => ProjectStore.open(temp.file('missing.slackline'))).toThrow(/missing\.slackline: no such file/);
  });

  it('refuses a schema-only file that holds no project', () => {
    const path = temp.file('shell.slackline');
    openProjectDatabase(path, { mode: 'create' }).db.close();
    expectRefused(path, /holds the Slackline schema but no project/);
  });
});
