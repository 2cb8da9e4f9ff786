/**
 * A bounded in-memory memo of field solutions keyed by the exact cross-section and options, so that
 * a board check asking the same layer, width and corner many times solves it once per process.
 * Results are deterministic, so the memo is invisible except in time; callers get copies.
 * A cache that outlives the process belongs to the project store (docs/field-solver.md §10): the host
 * seeds the memo with stored entries and persists the ones solved since (takeFreshFieldEntries).
 */
import type { CrossSection } from './cross-section.js';
import { fieldPair, fieldSingleLine, type FieldLine, type FieldPair } from './lines.js';
import type { FieldSolveOptions } from './solve.js';

/** Entries kept; the oldest used entry is dropped first. */
const CAPACITY = 512;

const lines = new Map<string, FieldLine>();
const pairs = new Map<string, FieldPair>();

/** One memo entry as plain data, to cross a thread boundary or be stored. */
export type FieldMemoEntry =
  | { kind: 'line'; key: string; value: FieldLine }
  | { kind: 'pair'; key: string; value: FieldPair };

/** Entries solved in this process since the last takeFreshFieldEntries (not those seeded). */
let fresh: FieldMemoEntry[] = [];

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
  fresh.push(store === lines ? { kind: 'line', key: k, value: value as FieldLine } : { kind: 'pair', key: k, value: value as FieldPair });
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
  fresh = [];
}

/** Adds stored or received entries to the memo (they do not count as fresh). */
export function seedFieldMemo(entries: readonly FieldMemoEntry[]): void {
  for (const e of entries) {
    if (e.kind === 'line') { if (!lines.has(e.key)) lines.set(e.key, e.value); }
    else if (!pairs.has(e.key)) pairs.set(e.key, e.value);
  }
  for (const store of [lines, pairs] as Map<string, unknown>[]) {
    while (store.size > CAPACITY) store.delete(store.keys().next().value as string);
  }
}

/** Every entry the memo holds now (to seed another thread). */
export function fieldMemoEntries(): FieldMemoEntry[] {
  return [
    ...[...lines].map(([key, value]) => ({ kind: 'line' as const, key, value })),
    ...[...pairs].map(([key, value]) => ({ kind: 'pair' as const, key, value })),
  ];
}

/** The entries solved since the last call, and forgets them as fresh. */
export function takeFreshFieldEntries(): FieldMemoEntry[] {
  const out = fresh;
  fresh = [];
  return out;
}

/** How many solutions the memo holds (single lines and pairs). */
export function fieldMemoSize(): number {
  return lines.size + pairs.size;
}
