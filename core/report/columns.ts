/**
 * The margin table's columns, defined once for the workbench table (each header's tooltip) and the
 * report (printed under its margin table, HTML and PDF) — the same words as docs/workbench.md,
 * "Margin table". Plain data and one number rule, no formatting.
 */
import type { NetResult } from '../budget/results.js';

export type MarginColumnKey =
  | 'net' | 'role' | 'status' | 'worstCorner' | 'flightMin' | 'flightMax' | 'skew'
  | 'setup' | 'hold' | 'margin' | 'delta' | 'routed' | 'window';

/** Header words (without the unit) and the definition of each column. */
export const MARGIN_COLUMNS: Record<MarginColumnKey, { label: string; definition: string }> = {
  net: { label: 'Net', definition: 'Net name.' },
  role: { label: 'Role', definition: 'What the net carries: data, strobe, clock, address or control.' },
  status: {
    label: 'Status',
    definition: 'Worst result of the net\'s own checks: its timing budget (timed nets) and its signal-quality checks at every receiver, edge and corner. Fail when any check fails; tight when a margin is positive but below the guard band. A waived net shows "waived" beside its status, which stays as computed ("stale" when the result no longer matches what was waived).',
  },
  worstCorner: { label: 'Worst corner', definition: 'The corner at which the worse of the setup and hold margins occurs (the budget panel opens on it).' },
  flightMin: { label: 'Flight min', definition: 'Smallest compensated minimum flight time over every receiver, edge and corner: driver crossing into its reference load to the first near-threshold crossing.' },
  flightMax: { label: 'Flight max', definition: 'Largest compensated maximum flight time over every receiver, edge and corner: driver crossing into its reference load to the last far-threshold crossing.' },
  skew: { label: 'Skew to ref', definition: 'Flight relative to the bus\'s clock or strobe (worst over corners).' },
  setup: { label: 'Setup margin', definition: 'Worst setup margin over all corners. A strobe row shows the worst setup margin it gives its data nets (the net named in brackets).' },
  hold: { label: 'Hold margin', definition: 'Worst hold margin over all corners. A strobe row shows the worst hold margin it gives its data nets (the net named in brackets).' },
  margin: { label: 'Worst margin', definition: 'The smaller of the setup and hold margins.' },
  delta: {
    label: 'Δ vs previous solve',
    definition: 'Worst margin in this solve minus the worst margin of the same net in the previous solve of the board (positive: better now). Empty for a net without a number in either solve.',
  },
  routed: { label: 'Routed', definition: 'Total routed length of the net: the sum of all its segments.' },
  window: {
    label: 'Length window',
    definition: 'Length window of one segment (named by its number, the net\'s longest): the shortest and longest length of that segment alone that keep both margins positive, the rest of the net and bus as routed.',
  },
};

/** The definitions alone, by column (the workbench's header tooltips). */
export const COLUMN_DEFINITIONS: Record<MarginColumnKey, string> = Object.fromEntries(
  Object.entries(MARGIN_COLUMNS).map(([key, c]) => [key, c.definition]),
) as Record<MarginColumnKey, string>;

/** The worse of two margins, s; null when either is unknown (an unknown margin is never "better"). */
export function worseMargin(a: number | null | undefined, b: number | null | undefined): number | null {
  if (typeof a !== 'number' || typeof b !== 'number' || !Number.isFinite(a) || !Number.isFinite(b)) return null;
  return Math.min(a, b);
}

/** A net's worst margin: the smaller of its setup and hold margins, s; null when either is unknown. */
export function netWorstMargin(net: Pick<NetResult, 'setupMargin' | 'holdMargin'>): number | null {
  return worseMargin(net.setupMargin, net.holdMargin);
}

/** Worst margin now minus before, s; null when either is missing. */
export function marginDelta(now: number | null, before: number | null | undefined): number | null {
  return now !== null && typeof before === 'number' && Number.isFinite(before) ? now - before : null;
}
