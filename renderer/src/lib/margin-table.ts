/** Rows, sorting and filtering of a bus's margin table: plain functions, no Vue. */
import type { NetResult, Status } from '../../../core/budget/results.js';
import type { NetDefinition } from '../../../core/project/model.js';

export interface MarginRow {
  net: string;
  role: string;
  status: Status;
  worstCorner: string;
  flightMin: number;
  flightMax: number;
  skew: number;
  setup: number;
  hold: number;
  /** Worse of setup and hold, s. */
  margin: number;
  /** Total routed length of the net's segments, m. */
  routed: number;
  windowMin: number | null;
  windowMax: number | null;
  reason: string;
  /** Set when the margins are not the net's own (a strobe or clock row shows what its data nets get). */
  marginsFrom: string | null;
}

export type SortKey = 'net' | 'role' | 'status' | 'worstCorner' | 'flightMin' | 'flightMax' | 'skew' | 'setup' | 'hold' | 'margin' | 'routed';
export type Filter = 'all' | 'attention' | 'failing';

const STATUS_RANK: Record<Status, number> = { fail: 0, tight: 1, pass: 2 };

export function routedLength(net: NetDefinition | undefined): number {
  if (!net) return 0;
  return net.elements.reduce((sum, element) => sum + (element.kind === 'segment' ? element.length : 0), 0);
}

export function toRow(result: NetResult, definition: NetDefinition | undefined): MarginRow {
  return {
    net: result.net,
    role: result.role,
    status: result.status,
    worstCorner: result.worstCorner,
    flightMin: result.flightMin,
    flightMax: result.flightMax,
    skew: result.skew,
    setup: result.setupMargin,
    hold: result.holdMargin,
    margin: Math.min(result.setupMargin, result.holdMargin),
    routed: routedLength(definition),
    windowMin: result.lengthWindow?.min ?? null,
    windowMax: result.lengthWindow?.max ?? null,
    reason: result.reasons[0] ?? '',
    marginsFrom: result.marginsFrom ?? null,
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
      const missing = Number(!Number.isFinite(a[key])) - Number(!Number.isFinite(b[key]));
      if (missing) return missing;
      order = Number.isFinite(a[key]) ? a[key] - b[key] : 0;
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
