/**
 * The full check of a project file and the restore of its automatic backup copy
 * (docs/reliability.md §2). Works on files the normal open refuses: it opens read-only and never
 * writes into the file it examines.
 */
import { closeSync, copyFileSync, existsSync, openSync, readSync, renameSync, rmSync, statSync } from 'node:fs';
import Database from 'better-sqlite3';
import { InputError } from '../../../core/errors.js';
import { sqliteNativeBinding } from './native-binding.js';
import { isSlacklineProjectFile, newestBackup } from './open-database.js';

export interface DoctorReport {
  path: string;
  /** True when SQLite's full integrity check answers "ok". */
  sound: boolean;
  /** The problems found (at most 20), empty when sound. */
  problems: string[];
  /** The newest automatic backup copy beside the file, or null. */
  backup: string | null;
  /** Whether that backup itself passes the full check (null when there is none). */
  backupSound: boolean | null;
}

/** Runs PRAGMA integrity_check (sqlite.org/pragma.html#pragma_integrity_check) on a read-only connection. */
function fullCheck(path: string): string[] {
  const nativeBinding = sqliteNativeBinding();
  let db: Database.Database | null = null;
  try {
    db = new Database(path, { ...(nativeBinding ? { nativeBinding } : {}), readonly: true, fileMustExist: true });
    const rows = db.pragma('integrity_check(20)') as { integrity_check: string }[];
    const found = rows.map((r) => r.integrity_check);
    return found.length === 1 && found[0] === 'ok' ? [] : found;
  } catch (error) {
    return [(error as Error).message];
  } finally {
    db?.close();
  }
}

export function diagnoseProject(path: string): DoctorReport {
  if (!existsSync(path) || !statSync(path).isFile()) throw new InputError(path, 'no such project file');
  const header = Buffer.alloc(16);
  const fd = openSync(path, 'r');
  try {
    readSync(fd, header, 0, 16, 0);
  } finally {
    closeSync(fd);
  }
  // SQLite's magic string (sqlite.org/fileformat2.html §1.3.1) with another application id: a foreign
  // database, not a damaged project.
  if (header.toString('latin1') === 'SQLite format 3\u0000' && !isSlacklineProjectFile(path)) {
    throw new InputError(path, 'is not a Slackline project (another SQLite database); it was left untouched');
  }
  const problems = statSync(path).size === 0 ? ['the file is empty'] : fullCheck(path);
  const backup = newestBackup(path);
  return { path, sound: problems.length === 0, problems, backup, backupSound: backup ? fullCheck(backup).length === 0 : null };
}

/**
 * Replaces a damaged project with its newest sound backup copy. The damaged file (with its -wal and
 * -shm) is kept aside as `<file>.damaged-<time>`; returns that name and the backup used.
 */
export function restoreProject(path: string): { restoredFrom: string; damagedCopy: string } {
  const report = diagnoseProject(path);
  if (report.sound) throw new InputError(path, 'passes the full integrity check; there is nothing to restore');
  if (!report.backup) throw new InputError(path, 'is damaged and has no automatic backup copy beside it; nothing was changed');
  if (!report.backupSound) throw new InputError(report.backup, 'the backup copy is damaged too; nothing was changed');
  const damagedCopy = `${path}.damaged-${new Date().toISOString().replace(/[:.]/g, '-')}`;
  renameSync(path, damagedCopy);
  for (const side of ['-wal', '-shm']) {
    if (existsSync(`${path}${side}`)) renameSync(`${path}${side}`, `${damagedCopy}${side}`);
  }
  const partial = `${path}.restoring`;
  copyFileSync(report.backup, partial);
  renameSync(partial, path); // whole or absent (POSIX rename(2))
  rmSync(partial, { force: true });
  return { restoredFrom: report.backup, damagedCopy };
}
