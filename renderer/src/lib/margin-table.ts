/** Rows, sorting and filtering of a bus's margin table: plain functions, no Vue. */
import type { CornerTiming, NetResult, Status } from '../../../core/budget/results.js';
import type { NetDefinition, Waiver } from '../../../core/project/model.js';
import { COLUMN_DEFINITIONS as SHARED_DEFINITIONS, worseMargin } from '../../../core/report/columns.js';
import { waiverState } from '../../../core/budget/waiver.js';

export interface MarginRow {
  net: string;
  role: string;
  status: Status;
  worstCorner: string;
  /** s; null where the services have no number (a receiver never crosses: the net fails with that reason). */
  flightMin: number | null;
  flightMax: number | null;
  skew: number | null;
  setup: number | null;
  hold: number | null;
  /** Worse of setup and hold, s; null when either is unknown. */
  margin: number | null;
  /** Total routed length of the net's segments, m. */
  routed: number;
  windowMin: number | null;
  windowMax: number | null;
  reason: string;
  /** Set when the margins are not the net's own (a strobe or clock row shows what its data nets get). */
  marginsFrom: string | null;
  /** The data net whose margins a strobe row carries, when the services name it. */
  marginsOwner: string | null;
  /** Index (0-based) of the segment the length window is for, or null. */
  windowElement: number | null;
  /** Length of that segment now, m. */
  windowCurrent: number | null;
  /** The row is from inputs that changed since its solve (shown, marked outdated). */
  outdated: boolean;
  /** Worst margin now minus worst margin in the previous solve, s; null without a previous number. */
  delta: number | null;
  /** The net's waiver and whether it still matches this result (docs/workbench.md, "Waivers"); null when none. */
  waiver?: (Waiver & { state: 'current' | 'stale'; why: string }) | null;
}

/**
 * One definition per column (shown as the header's tooltip): the same words the report prints under
 * its margin table, defined once in core/report/columns.ts (docs/workbench.md, "Margin table").
 */
export const COLUMN_DEFINITIONS = SHARED_DEFINITIONS;

/** The worse of two margins, s; null when either is unknown (an unknown margin is never "better"). */
export const worse = worseMargin;

const known = (x: number | null | undefined): x is number => typeof x === 'number' && Number.isFinite(x);

/** The worst corner of a result as the table defines it: where the worse of setup and hold occurs. */
export function worstCornerOf(result: NetResult): string {
  let best: { corner: string; margin: number } | null = null;
  for (const c of result.corners) {
    const m = worse(c.setupMargin, c.holdMargin);
    if (m !== null && (!best || m < best.margin)) best = { corner: c.corner, margin: m };
  }
  // Rows without a budget of their own (strobe, clock) keep the services' corner.
  return result.marginsFrom || !best ? result.worstCorner : best.corner;
}

/** The corners of a result's worst setup and worst hold margins (null without per-corner margins). */
export function worstSideCorners(result: NetResult): { setup: string | null; hold: string | null } {
  let setup: CornerTiming | null = null;
  let hold: CornerTiming | null = null;
  for (const c of result.corners) {
    if (known(c.setupMargin) && (!setup || c.setupMargin < (setup.setupMargin as number))) setup = c;
    if (known(c.holdMargin) && (!hold || c.holdMargin < (hold.holdMargin as number))) hold = c;
  }
  return { setup: setup?.corner ?? null, hold: hold?.corner ?? null };
}

/** The data net a strobe's margins belong to, from the services' words "... (worst: DQ58)". */
export function marginsOwnerOf(marginsFrom: string | null | undefined): string | null {
  const match = /\(worst: ([^)\s]+)\)/.exec(marginsFrom ?? '');
  return match && match[1] !== 'undefined' ? match[1] : null;
}

export type SortKey = 'net' | 'role' | 'status' | 'worstCorner' | 'flightMin' | 'flightMax' | 'skew' | 'setup' | 'hold' | 'margin' | 'delta' | 'routed';
export type Filter = 'all' | 'attention' | 'failing';

const STATUS_RANK: Record<Status, number> = { fail: 0, tight: 1, pass: 2 };

export function routedLength(net: NetDefinition | undefined): number {
  if (!net) return 0;
  return net.elements.reduce((sum, element) => sum + (element.kind === 'segment' ? element.length : 0), 0);
}

/** `previous`: the net's result in the previous solve, or its worst margin then (s; null without a number). */
export function toRow(result: NetResult, definition: NetDefinition | undefined, outdated = false, previous?: NetResult | number | null, waiver?: Waiver): MarginRow {
  const now = worse(result.setupMargin, result.holdMargin);
  const before = typeof previous === 'number' ? previous : previous ? worse(previous.setupMargin, previous.holdMargin) : null;
  return {
    net: result.net,
    role: result.role,
    status: result.status,
    worstCorner: worstCornerOf(result),
    flightMin: result.flightMin,
    flightMax: result.flightMax,
    skew: result.skew,
    setup: result.setupMargin,
    hold: result.holdMargin,
    margin: now,
    delta: now !== null && before !== null ? now - before : null,
    routed: routedLength(definition),
    windowMin: result.lengthWindow?.min ?? null,
    windowMax: result.lengthWindow?.max ?? null,
    reason: result.reasons[0] ?? '',
    marginsFrom: result.marginsFrom ?? null,
    marginsOwner: marginsOwnerOf(result.marginsFrom),
    windowElement: result.lengthWindow?.elementIndex ?? null,
    windowCurrent: result.lengthWindow?.current ?? null,
    outdated,
    waiver: waiver ? { ...waiver, ...waiverState(waiver, result) } : null,
  };
}

/** Natural order for names like DQ2 < DQ10. */
const collator = new Intl.Collator(undefined, { numeric: true, sensitivity: 'base' });

export function sortRows(rows: MarginRow[], key: SortKey, ascending: boolean): MarginRow[] {
  const sign = ascending ? 1 : -1;
  return [...rows].sort((a, b) => {
    let order: number;
    if (key === 'net' || key === 'role' || key === 'worstCorner') order = collator.compare(a[key], b[key]);
    else if (key === 'status') order = STATUS_RANK[a.status] - STATUS_RANK[b.status];
    else {
      // A missing number (non-finite, or null after JSON) goes last in either direction, never first.
      const missing = Number(!known(a[key])) - Number(!known(b[key]));
      if (missing) return missing;
      const x = a[key];
      const y = b[key];
      order = known(x) && known(y) ? x - y : 0;
    }
    // On equal values a net's own margins come before a strobe/clock row that repeats them.
    return order * sign || Number(a.marginsFrom !== null) - Number(b.marginsFrom !== null) || collator.compare(a.net, b.net);
  });
}

export function filterRows(rows: MarginRow[], filter: Filter, text: string): MarginRow[] {
  const needle = text.trim().toLowerCase();
  return rows.filter((row) => {
    if (filter === 'failing' && row.status !== 'fail') return false;
    if (filter === 'attention' && row.status === 'pass') return false;
    return !needle || row.net.toLowerCase().includes(needle) || row.role.toLowerCase().includes(needle);
  });
}
