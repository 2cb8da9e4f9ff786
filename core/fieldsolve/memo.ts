/**
 * A bounded in-memory memo of field solutions keyed by the exact cross-section and options, so that
 * a board check asking the same layer, width and corner many times solves it once per process.
 * Results are deterministic, so the memo is invisible except in time; callers get copies.
 * (A cache that outlives the process belongs to the project store; see docs/field-solver.md §10.)
 */
import type { CrossSection } from './cross-section.js';
import { fieldPair, fieldSingleLine, type FieldLine, type FieldPair } from './lines.js';
import type { FieldSolveOptions } from './solve.js';

/** Entries kept; the oldest used entry is dropped first. */
const CAPACITY = 512;

const lines = new Map<string, FieldLine>();
const pairs = new Map<string, FieldPair>();

function key(section: CrossSection, options: FieldSolveOptions | undefined): string {
  return JSON.stringify([section, options ?? null]);
}

function remember<T>(store: Map<string, T>, k: string, compute: () => T): T {
  const hit = store.get(k);
  if (hit !== undefined) {
    store.delete(k); // re-insert: Map iteration order is the recency order
    store.set(k, hit);
    return hit;
  }
  const value = compute();
  store.set(k, value);
  if (store.size > CAPACITY) store.delete(store.keys().next().value as string);
  return value;
}

/** fieldSingleLine through the memo. */
export function cachedFieldSingleLine(section: CrossSection, options?: FieldSolveOptions): FieldLine {
  return { ...remember(lines, key(section, options), () => fieldSingleLine(section, options)) };
}

/** fieldPair through the memo. */
export function cachedFieldPair(section: CrossSection, options?: FieldSolveOptions): FieldPair {
  return { ...remember(pairs, key(section, options), () => fieldPair(section, options)) };
}

/** Empties the memo (tests and benchmarks that must measure a cold solve). */
export function clearFieldMemo(): void {
  lines.clear();
  pairs.clear();
}
