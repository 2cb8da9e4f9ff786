/** Temporary folders for tests that write real project files; each test removes its own. */
import { createHash } from 'node:crypto';
import { mkdtempSync, readdirSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

export function makeTempDir(prefix = 'slackline-db-'): { dir: string; file: (name: string) => string; remove: () => void } {
  const dir = mkdtempSync(join(tmpdir(), prefix));
  return { dir, file: (name) => join(dir, name), remove: () => rmSync(dir, { recursive: true, force: true }) };
}

/** SHA-256 of a file's bytes. */
export function fileHash(path: string): string {
  return createHash('sha256').update(readFileSync(path)).digest('hex');
}

/** Names in a folder, sorted (to see that no -wal, -shm or backup file was left behind). */
export function listing(dir: string): string[] {
  return readdirSync(dir).sort();
}

/**
 * Opens the project, asserts SQLite's integrity check says "ok" and foreign keys are on, closes it.
 * Called at the end of every test that writes (a sound file is the bar, sqlite.org/pragma.html).
 */
export async function expectSoundProject(path: string): Promise<void> {
  const { ProjectStore } = await import('../../../main/services/project/project-store.js');
  const { expect } = await import('vitest');
  const store = ProjectStore.open(path);
  try {
    expect(store.integrityCheck()).toBe('ok');
    expect(store.settings().foreignKeys).toBe(1);
  } finally {
    store.close();
  }
}
