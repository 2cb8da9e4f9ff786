/**
 * Opens a project file safely. A file is inspected read-only first; anything that is not a
 * Slackline project of a known schema version is refused before a single byte is written. An older
 * project is copied aside before its migrations run.
 */
import { closeSync, existsSync, openSync, readSync, statSync } from 'node:fs';
import { dirname } from 'node:path';
import Database from 'better-sqlite3';
import { InputError } from '../../../core/errors.js';
import { sqliteNativeBinding } from './native-binding.js';
import { APPLICATION_ID, MIGRATIONS_DIR, expectedTables, latestVersion, migrate } from './migrations.js';

export interface OpenedDatabase {
  db: Database.Database;
  /** Schema version the file had before this open (0 for a new file). */
  fromVersion: number;
  /** Where the pre-migration copy was written, or null when no migration ran on an existing file. */
  backupPath: string | null;
}

export interface OpenDatabaseOptions {
  /** 'create': the file must not exist or be empty; 'open': it must be a project. */
  mode: 'create' | 'open';
  migrationsDir?: string;
  /** Page cache size in KiB (default: the driver's build default); a transaction larger than the
   *  cache spills uncommitted pages to the WAL. */
  cacheSizeKib?: number;
}

/** Connection settings of every project file (DESIGN.md §8, ECOSYSTEM.md). */
function configure(db: Database.Database, options: OpenDatabaseOptions): void {
  if (options.cacheSizeKib !== undefined) {
    if (!(Number.isInteger(options.cacheSizeKib) && options.cacheSizeKib > 0)) throw new Error('cacheSizeKib must be a positive integer');
    db.pragma(`cache_size = -${options.cacheSizeKib}`);
  }
  db.pragma('journal_mode = WAL');
  // WAL with synchronous=NORMAL can lose a committed edit on power loss; FULL keeps every saved edit.
  db.pragma('synchronous = FULL');
  db.pragma('foreign_keys = ON');
  // Another process (a second window, the CLI) may hold the write lock briefly.
  db.pragma('busy_timeout = 5000');
}

/** Under Electron, the addon built for Electron's ABI (native-binding.ts); else the Node build. */
function driverOptions(): Database.Options {
  const nativeBinding = sqliteNativeBinding();
  return nativeBinding ? { nativeBinding } : {};
}

export function openProjectDatabase(path: string, options: OpenDatabaseOptions): OpenedDatabase {
  const dir = options.migrationsDir ?? MIGRATIONS_DIR;
  if (options.mode === 'create') {
    if (existsSync(path) && statSync(path).size > 0) {
      throw new InputError(path, 'a file of that name already exists; choose another name or open it instead');
    }
    if (!existsSync(dirname(path)) || !statSync(dirname(path)).isDirectory()) {
      throw new InputError(path, `the folder ${dirname(path)} does not exist`);
    }
    const db = new Database(path, driverOptions());
    try {
      configure(db, options);
      migrate(db, undefined, dir);
    } catch (error) {
      db.close();
      throw error;
    }
    return { db, fromVersion: 0, backupPath: null };
  }

  if (!existsSync(path)) throw new InputError(path, 'no such file');
  if (statSync(path).isDirectory()) throw new InputError(path, 'is a folder, not a project file');
  if (statSync(path).size === 0) throw new InputError(path, 'is an empty file, not a Slackline project');
  const db = new Database(path, { ...driverOptions(), fileMustExist: true });
  try {
    // Only reads until the file is known to be ours: reading leaves a foreign file byte-identical.
    const fromVersion = inspect(db, path, dir);
    let backupPath: string | null = null;
    if (fromVersion < latestVersion(dir)) {
      backupPath = writeBackup(db, path, fromVersion);
    }
    configure(db, options);
    migrate(db, undefined, dir);
    return { db, fromVersion, backupPath };
  } catch (error) {
    db.close();
    throw error;
  }
}

/** Checks the file is a Slackline project this program can read; returns its schema version. */
function inspect(db: Database.Database, path: string, dir: string): number {
  let applicationId: number;
  try {
    applicationId = db.pragma('application_id', { simple: true }) as number;
  } catch (error) {
    if ((error as { code?: string }).code === 'SQLITE_NOTADB') {
      throw new InputError(path, 'is not a Slackline project (not an SQLite database at all)');
    }
    throw error;
  }
  if (applicationId !== APPLICATION_ID) {
    throw new InputError(
      path,
      `is not a Slackline project (SQLite application id ${applicationId}, expected ${APPLICATION_ID}); it was left untouched`,
    );
  }
  const version = db.pragma('user_version', { simple: true }) as number;
  const latest = latestVersion(dir);
  if (version > latest) {
    throw new InputError(
      path,
      `was written by a newer Slackline (schema version ${version}; this program reads up to ${latest}). ` +
        'Open it with a newer Slackline; the file was left untouched',
    );
  }
  const present = new Set(
    (db.prepare("SELECT name FROM sqlite_schema WHERE type = 'table'").all() as { name: string }[]).map((r) => r.name),
  );
  const missing = expectedTables(version, dir).filter((table) => !present.has(table));
  if (version < 1 || missing.length > 0) {
    throw new InputError(
      path,
      `is not a complete Slackline project (schema version ${version}, missing tables: ${missing.join(', ') || 'all'}); it was left untouched`,
    );
  }
  const recorded = (db.prepare('SELECT version FROM schema_migration ORDER BY version').all() as { version: number }[]).map(
    (r) => r.version,
  );
  if (recorded.length !== version || recorded.some((v, i) => v !== i + 1)) {
    throw new InputError(path, `has an inconsistent migration record (${recorded.join(', ')}) for schema version ${version}`);
  }
  return version;
}

/**
 * Copies the file aside before migrating: `<file>.v<N>-backup`, then `-2`, `-3`... if taken.
 * VACUUM INTO writes a transactionally consistent copy synchronously (db.backup() is asynchronous,
 * and opening a project is synchronous for every host).
 */
function writeBackup(db: Database.Database, path: string, version: number): string {
  let target = `${path}.v${version}-backup`;
  for (let n = 2; existsSync(target); n += 1) target = `${path}.v${version}-backup-${n}`;
  db.prepare('VACUUM INTO ?').run(target);
  return target;
}

/**
 * True when the file starts with an SQLite header carrying Slackline's application id. Reads 72
 * bytes with plain file I/O, so it never changes the file.
 */
export function isSlacklineProjectFile(path: string): boolean {
  if (!existsSync(path) || !statSync(path).isFile()) return false;
  const header = Buffer.alloc(72);
  const fd = openSync(path, 'r');
  try {
    if (readSync(fd, header, 0, 72, 0) < 72) return false;
  } finally {
    closeSync(fd);
  }
  // SQLite file format: 16-byte magic string, application id big-endian at offset 68.
  return header.toString('latin1', 0, 16) === 'SQLite format 3\u0000' && header.readUInt32BE(68) === APPLICATION_ID;
}
