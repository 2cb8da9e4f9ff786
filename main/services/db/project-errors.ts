/**
 * What can go wrong with a project file that is not a bug: another process holds it, it is damaged,
 * it is read-only, or the disk is full. Each is an InputError naming the file, so every host shows it
 * in one line (CLI exit status 2, HTTP 400) instead of a driver stack trace (docs/reliability.md §1).
 */
import { InputError } from '../../../core/errors.js';

/** Another connection held the write lock for longer than the bounded wait. */
export class ProjectBusyError extends InputError {
  constructor(path: string, waitedMs: number) {
    super(
      path,
      `the project is in use by another process (waited ${(waitedMs / 1000).toFixed(1)} s for it to finish writing); ` +
        'nothing was written — try again when the other program is done',
    );
    this.name = 'ProjectBusyError';
  }
}

/** The file fails SQLite's integrity check or a read found a malformed page. */
export class DamagedProjectError extends InputError {
  constructor(
    path: string,
    readonly detail: string,
    /** The newest automatic backup copy beside the file, or null when there is none. */
    readonly backup: string | null,
  ) {
    super(
      path,
      `the project file is damaged (${oneLine(detail)}); nothing was written to it. ` +
        (backup
          ? `The automatic backup copy ${backup} can replace it: run "slackline doctor ${path} --restore"`
          : 'There is no automatic backup copy beside it; run "slackline doctor" on it for the full check'),
    );
    this.name = 'DamagedProjectError';
  }
}

/** The file or its folder cannot be written: the project is open read-only. */
export class ReadOnlyProjectError extends InputError {
  constructor(path: string, what: string) {
    super(path, `the project is read-only (${what}); the edit was refused and nothing was written`);
    this.name = 'ReadOnlyProjectError';
  }
}

/** The disk (or the file system's quota) is full. */
export class DiskFullError extends InputError {
  constructor(path: string) {
    super(path, 'the disk holding the project is full; the change was rolled back and nothing was written — free some space and try again');
    this.name = 'DiskFullError';
  }
}

/** The disk failed a read or write (a full disk often shows up as this when SQLite creates its -shm or -wal). */
export class StorageError extends InputError {
  constructor(path: string, detail: string) {
    super(path, `the disk could not complete a read or write (${detail}); nothing was written — check that it has free space and is still attached`);
    this.name = 'StorageError';
  }
}

/** SQLite's check messages span lines ("*** in database main ***\nOn page 3 ..."); a message is one line. */
function oneLine(text: string): string {
  return text.replace(/^\*\*\* in database \w+ \*\*\*\s*/, '').replace(/\s*\n\s*/g, '; ').slice(0, 200);
}

/** SQLite result codes (sqlite.org/rescode.html) as better-sqlite3 reports them in `error.code`. */
export function sqliteCode(error: unknown): string {
  const code = (error as { code?: unknown } | null)?.code;
  return typeof code === 'string' ? code : '';
}

export const isBusy = (error: unknown): boolean => /^SQLITE_(BUSY|LOCKED)/.test(sqliteCode(error));
export const isCorrupt = (error: unknown): boolean => /^SQLITE_(CORRUPT|NOTADB)/.test(sqliteCode(error));
export const isReadOnly = (error: unknown): boolean => /^SQLITE_READONLY/.test(sqliteCode(error));
export const isFull = (error: unknown): boolean => /^SQLITE_FULL/.test(sqliteCode(error));
export const isIoError = (error: unknown): boolean => /^SQLITE_IOERR/.test(sqliteCode(error));

/**
 * Turns a driver error about the file itself into the matching message; anything else (a bug,
 * a constraint this program should have checked first) is returned unchanged.
 */
export function translateSqliteError(
  path: string,
  error: unknown,
  context: { busyTimeoutMs: number; backup: () => string | null },
): unknown {
  if (error instanceof InputError) return error;
  if (isBusy(error)) return new ProjectBusyError(path, context.busyTimeoutMs);
  if (isCorrupt(error)) return new DamagedProjectError(path, (error as Error).message, context.backup());
  if (isReadOnly(error)) return new ReadOnlyProjectError(path, (error as Error).message);
  if (isFull(error)) return new DiskFullError(path);
  if (isIoError(error)) return new StorageError(path, `${(error as Error).message}, ${sqliteCode(error)}`);
  return error;
}
