/**
 * Opens a project file safely. A file is inspected read-only first; anything that is not a
 * Slackline project of a known schema version is refused before a single byte is written. An older
 * project is copied aside before its migrations run.
 */
import { accessSync, closeSync, constants, existsSync, openSync, readFileSync, readSync, readdirSync, renameSync, rmSync, statSync } from 'node:fs';
import { basename, dirname, join } from 'node:path';
import Database from 'better-sqlite3';
import { InputError } from '../../../core/errors.js';
import { sqliteNativeBinding } from './native-binding.js';
import { APPLICATION_ID, MIGRATIONS_DIR, expectedTables, latestVersion, migrate } from './migrations.js';
import { DamagedProjectError, translateSqliteError } from './project-errors.js';

export interface OpenedDatabase {
  db: Database.Database;
  /** Schema version the file had before this open (0 for a new file). */
  fromVersion: number;
  /** Where the pre-migration copy was written, or null when no migration ran on an existing file. */
  backupPath: string | null;
  /** Why the file is open read-only (the file or its folder cannot be written), or null when writable. */
  readOnly: string | null;
  /** How long a write waits for another process's write lock before giving up, ms. */
  busyTimeoutMs: number;
}

export interface OpenDatabaseOptions {
  /** 'create': the file must not exist or be empty; 'open': it must be a project. */
  mode: 'create' | 'open';
  migrationsDir?: string;
  /** Page cache size in KiB (default: the driver's build default); a transaction larger than the
   *  cache spills uncommitted pages to the WAL. */
  cacheSizeKib?: number;
  /** Bounded wait for another process's write lock, ms (default $SLACKLINE_BUSY_TIMEOUT_MS, else 5000). */
  busyTimeoutMs?: number;
  /** Open read-only even when the file could be written. */
  readOnly?: boolean;
}

/** The bounded busy wait (docs/reliability.md §1): 5 s unless the environment says otherwise. */
export function defaultBusyTimeoutMs(): number {
  const fromEnv = Number(process.env.SLACKLINE_BUSY_TIMEOUT_MS);
  return Number.isInteger(fromEnv) && fromEnv >= 0 ? fromEnv : 5000;
}

/** Connection settings of every project file (docs/design.md §8). */
function configure(db: Database.Database, options: OpenDatabaseOptions, busyTimeoutMs: number): void {
  if (options.cacheSizeKib !== undefined) {
    if (!(Number.isInteger(options.cacheSizeKib) && options.cacheSizeKib > 0)) throw new Error('cacheSizeKib must be a positive integer');
    db.pragma(`cache_size = -${options.cacheSizeKib}`);
  }
  db.pragma('journal_mode = WAL');
  // WAL with synchronous=NORMAL can lose a committed edit on power loss; FULL keeps every saved edit.
  db.pragma('synchronous = FULL');
  db.pragma('foreign_keys = ON');
  // Another process (a second window, the CLI) may hold the write lock briefly; writes begin
  // IMMEDIATE, so this bounded wait applies to them (docs/reliability.md §1).
  db.pragma(`busy_timeout = ${busyTimeoutMs}`);
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
    const busyTimeoutMs = options.busyTimeoutMs ?? defaultBusyTimeoutMs();
    const db = new Database(path, driverOptions());
    try {
      configure(db, options, busyTimeoutMs);
      migrate(db, undefined, dir);
    } catch (error) {
      db.close();
      throw translateSqliteError(path, error, { busyTimeoutMs, backup: () => null });
    }
    return { db, fromVersion: 0, backupPath: null, readOnly: null, busyTimeoutMs };
  }

  if (!existsSync(path)) throw new InputError(path, 'no such file');
  if (statSync(path).isDirectory()) throw new InputError(path, 'is a folder, not a project file');
  if (statSync(path).size === 0) throw new InputError(path, 'is an empty file, not a Slackline project');
  const busyTimeoutMs = options.busyTimeoutMs ?? defaultBusyTimeoutMs();
  const context = { busyTimeoutMs, backup: () => newestBackup(path) };
  const readOnly = options.readOnly ? 'opened read-only on request' : writeBlocker(path);
  let db: Database.Database;
  try {
    db = readOnly ? openReadOnly(path) : new Database(path, { ...driverOptions(), fileMustExist: true });
  } catch (error) {
    throw translateSqliteError(path, error, context);
  }
  try {
    db.pragma(`busy_timeout = ${busyTimeoutMs}`);
    // Only reads until the file is known to be ours: reading leaves a foreign file byte-identical.
    const fromVersion = inspect(db, path, dir);
    if (readOnly) {
      if (fromVersion < latestVersion(dir)) {
        throw new InputError(
          path,
          `is read-only (${readOnly}) and from schema version ${fromVersion}, which this program must bring up to date ` +
            `(version ${latestVersion(dir)}) before using it; copy it to a folder you can write to`,
        );
      }
      db.pragma('foreign_keys = ON');
      return { db, fromVersion, backupPath: null, readOnly, busyTimeoutMs };
    }
    // Quick structural check before anything may be written (docs/reliability.md §2).
    const damage = quickCheck(db, path);
    if (damage) throw new DamagedProjectError(path, damage, newestBackup(path));
    let backupPath: string | null = null;
    if (fromVersion < latestVersion(dir)) {
      backupPath = writeBackup(db, path, fromVersion);
    }
    configure(db, options, busyTimeoutMs);
    migrate(db, undefined, dir);
    return { db, fromVersion, backupPath, readOnly: null, busyTimeoutMs };
  } catch (error) {
    db.close();
    throw translateSqliteError(path, error, context);
  }
}

/** Null when the file and its folder (for the -wal and -shm files) can be written, else why not. */
function writeBlocker(path: string): string | null {
  try {
    accessSync(path, constants.W_OK);
  } catch (error) {
    return `the file cannot be written: ${(error as { code?: string }).code ?? String(error)}`;
  }
  try {
    accessSync(dirname(path), constants.W_OK);
  } catch (error) {
    return `its folder ${dirname(path)} cannot be written: ${(error as { code?: string }).code ?? String(error)}`;
  }
  return null;
}

/**
 * A read-only connection. In a folder nobody can write, SQLite cannot create the WAL index (-shm)
 * a WAL file needs (sqlite.org/wal.html §"Read-Only Databases"); with no -wal file the main file holds
 * every committed change, so an in-memory copy of it (header marked rollback-journal: bytes 18-19 = 1,
 * sqlite.org/fileformat2.html §1.3.3) reads the same project.
 */
function openReadOnly(path: string): Database.Database {
  try {
    const db = new Database(path, { ...driverOptions(), readonly: true, fileMustExist: true });
    try {
      db.pragma('schema_version');
      return db;
    } catch (error) {
      db.close();
      throw error;
    }
  } catch (error) {
    if ((error as { code?: string }).code !== 'SQLITE_CANTOPEN' || existsSync(`${path}-wal`)) throw error;
  }
  const bytes = readFileSync(path);
  if (bytes.length >= 20) {
    bytes[18] = 1;
    bytes[19] = 1;
  }
  return new Database(bytes, { ...driverOptions(), readonly: true });
}

/**
 * Files up to this size get the full integrity check before a write (index entries matched to their
 * rows: a flipped bit in a key is found only so); larger ones the quick check, which skips that
 * O(N log N) part (sqlite.org/pragma.html#pragma_quick_check). 16 MB takes well under a second
 * (about 0.2 s measured for a 6 MB file of 60,000 segments).
 */
const FULL_CHECK_MAX_BYTES = 16 * 1024 * 1024;

/** First problem the integrity check finds (docs/reliability.md §2), or null when sound. */
function quickCheck(db: Database.Database, path: string): string | null {
  const pragma = statSync(path).size <= FULL_CHECK_MAX_BYTES ? 'integrity_check' : 'quick_check';
  const rows = db.pragma(`${pragma}(1)`) as Record<string, string>[];
  const first = rows[0] ? Object.values(rows[0])[0] : 'no answer';
  return first === 'ok' ? null : first;
}

/** The automatic session copy (written before the first edit of each session) beside `path`. */
export function sessionBackupPath(path: string): string {
  return `${path}.last-good`;
}

/**
 * The newest automatic backup copy beside the file: the session copy or a pre-migration copy
 * (`.v<N>-backup`, `-2`...). Null when there is none.
 */
export function newestBackup(path: string): string | null {
  const dir = dirname(path);
  const base = basename(path);
  let names: string[];
  try {
    names = readdirSync(dir);
  } catch {
    return null;
  }
  const candidates = names
    .filter((n) => n === `${base}.last-good` || (n.startsWith(`${base}.v`) && /\.v\d+-backup(-\d+)?$/.test(n)))
    .map((n) => join(dir, n))
    .map((p) => ({ p, at: statSync(p).mtimeMs }))
    .sort((a, b) => b.at - a.at);
  return candidates[0]?.p ?? null;
}

/**
 * Writes the session copy: VACUUM INTO a temporary name, then rename, so the copy is whole or absent
 * (rename is atomic on one file system, POSIX rename(2)). Best effort: a copy that cannot be written
 * (full disk) is skipped, and the edit itself then reports the full disk.
 */
export function writeSessionBackup(db: Database.Database, path: string): string | null {
  const target = sessionBackupPath(path);
  const partial = `${target}.partial`;
  try {
    rmSync(partial, { force: true });
    db.prepare('VACUUM INTO ?').run(partial);
    renameSync(partial, target);
    return target;
  } catch {
    rmSync(partial, { force: true });
    return null;
  }
}

/** Checks the file is a Slackline project this program can read; returns its schema version. */
function inspect(db: Database.Database, path: string, dir: string): number {
  let applicationId: number;
  try {
    applicationId = db.pragma('application_id', { simple: true }) as number;
  } catch (error) {
    if ((error as { code?: string }).code === 'SQLITE_NOTADB') {
      // Our header but unreadable pages: a damaged project, not a foreign file.
      if (isSlacklineProjectFile(path)) throw new DamagedProjectError(path, (error as Error).message, newestBackup(path));
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
