/**
 * A SolveStore in memory with the same slot and pruning rules as the project file (migration 006), for
 * benchmarks that measure solving rather than SQLite.
 */
import type { ProjectData } from '../core/project/model.js';
import type { SolveStore, StoredManifest, StoredResult } from '../main/services/solve/solve-service.js';

export interface MemoryStore extends SolveStore {
  /** Forgets every stored result and the manifest. */
  clear(): void;
  /** Replaces the project (an edit). */
  setProject(project: ProjectData): void;
}

export function memoryStore(project: ProjectData): MemoryStore {
  let current = project;
  let revision = 0;
  const results = new Map<string, StoredResult>();
  const slots = new Map<string, string>();
  let manifest: StoredManifest | null = null;
  return {
    load: () => current,
    changeStamp: () => String(revision),
    getResult: (key) => results.get(key)?.json ?? null,
    putResults(entries) {
      for (const e of entries) {
        const old = slots.get(e.slot);
        if (old !== undefined && old !== e.key && old !== e.keeps) results.delete(old);
        slots.set(e.slot, e.key);
        results.set(e.key, e);
      }
      revision++;
    },
    pruneResults(keep) {
      const kept = new Set(keep);
      let removed = 0;
      for (const [key, e] of results) {
        if (kept.has(key)) continue;
        results.delete(key);
        if (slots.get(e.slot) === key) slots.delete(e.slot);
        removed++;
      }
      revision++;
      return removed;
    },
    getManifest: () => manifest,
    putManifest(m) {
      manifest = m;
      revision++;
    },
    clear() {
      results.clear();
      slots.clear();
      manifest = null;
      revision++;
    },
    setProject(p) {
      current = p;
      revision++;
    },
  };
}
