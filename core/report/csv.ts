/**
 * The margin tables as CSV records: one row per net, the unit in every numeric header, numbers in
 * engineering units rounded to 0.001 ps (1 fs) or 0.001 mm, far below anything a reviewer acts on.
 * Missing values are empty cells, never "NaN". Serialising to text is the service's job (csv-stringify).
 */
import type { BoardResult, NetResult, BusResult } from '../budget/results.js';

export const MARGIN_CSV_COLUMNS = [
  'bus',
  'net',
  'role',
  'status',
  'worst_corner',
  'flight_min_ps',
  'flight_max_ps',
  'skew_ps',
  'setup_margin_ps',
  'hold_margin_ps',
  'window_layer',
  'length_current_mm',
  'length_min_mm',
  'length_max_mm',
  'suggestion',
  'reasons',
] as const;

export type MarginCsvColumn = (typeof MARGIN_CSV_COLUMNS)[number];
export type MarginCsvRecord = Record<MarginCsvColumn, string | number>;

function rounded(si: number | null | undefined, unit: number): number | '' {
  if (si === null || si === undefined || !Number.isFinite(si)) return '';
  const value = Math.round((si / unit) * 1000) / 1000;
  return Object.is(value, -0) ? 0 : value;
}

function suggestionText(net: NetResult): string {
  const s = net.suggestion;
  return s ? `${s.kind} ${s.ohms} ohm` : '';
}

function record(bus: BusResult, net: NetResult): MarginCsvRecord {
  const w = net.lengthWindow;
  return {
    bus: bus.bus,
    net: net.net,
    role: net.role,
    status: net.status,
    worst_corner: net.worstCorner,
    flight_min_ps: rounded(net.flightMin, 1e-12),
    flight_max_ps: rounded(net.flightMax, 1e-12),
    skew_ps: rounded(net.skew, 1e-12),
    setup_margin_ps: rounded(net.setupMargin, 1e-12),
    hold_margin_ps: rounded(net.holdMargin, 1e-12),
    window_layer: w?.layer ?? '',
    length_current_mm: rounded(w?.current, 1e-3),
    length_min_mm: rounded(w?.min, 1e-3),
    length_max_mm: rounded(w?.max, 1e-3),
    suggestion: suggestionText(net),
    reasons: net.reasons.join('; '),
  };
}

/** Rows of the margin CSV for every bus of `result`, or only `bus` when given. */
export function marginCsvRecords(result: BoardResult, bus?: string): MarginCsvRecord[] {
  return result.buses.filter((b) => bus === undefined || b.bus === bus).flatMap((b) => b.nets.map((n) => record(b, n)));
}
