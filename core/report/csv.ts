/**
 * The margin tables as CSV records: one row per net, the unit in every numeric header, numbers in
 * engineering units rounded to 0.001 ps (1 fs) or 0.001 mm, far below anything a reviewer acts on.
 * Missing values are empty cells, never "NaN". Serialising to text is the service's job (csv-stringify).
 */
import type { BoardResult, NetResult, BusResult } from '../budget/results.js';
import type { Waiver } from '../project/model.js';
import { waiverState } from '../budget/waiver.js';
import { marginDelta, netWorstMargin } from './columns.js';

/** The solve before the reported one: its time and each net's worst margin then (s). */
export interface PreviousMargins {
  solvedAt: string;
  margins: Record<string, number | null>;
}

/** What the CSV adds to the results: the previous solve and the project's waivers (both optional). */
export interface MarginCsvExtras {
  previous?: PreviousMargins | null;
  waivers?: readonly Waiver[];
}

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
  'worst_margin_ps',
  'delta_vs_previous_ps',
  'window_layer',
  'length_current_mm',
  'length_min_mm',
  'length_max_mm',
  'suggestion',
  'reasons',
  'previous_solved_at',
  'waiver',
  'waived_check',
  'waived_status',
  'waived_margin',
  'waiver_author',
  'waiver_at',
  'waiver_comment',
  'waiver_review',
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

/** A waived margin with its unit spelled out ("-14.000 ps", "-0.0123 V"). */
function waivedMarginText(waiver: Waiver): string {
  if (waiver.margin === null || waiver.unit === null) return '';
  return waiver.unit === 's' ? `${rounded(waiver.margin, 1e-12)} ps` : `${rounded(waiver.margin, 1e-3)} mV`;
}

function record(bus: BusResult, net: NetResult, extras: MarginCsvExtras): MarginCsvRecord {
  const w = net.lengthWindow;
  const worst = netWorstMargin(net);
  const waiver = extras.waivers?.find((x) => x.net === net.net);
  const state = waiver ? waiverState(waiver, net) : null;
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
    worst_margin_ps: rounded(worst, 1e-12),
    delta_vs_previous_ps: rounded(marginDelta(worst, extras.previous?.margins[net.net]), 1e-12),
    window_layer: w?.layer ?? '',
    length_current_mm: rounded(w?.current, 1e-3),
    length_min_mm: rounded(w?.min, 1e-3),
    length_max_mm: rounded(w?.max, 1e-3),
    suggestion: suggestionText(net),
    reasons: net.reasons.join('; '),
    previous_solved_at: extras.previous?.solvedAt ?? '',
    waiver: state ? (state.state === 'stale' ? 'waived, stale' : 'waived') : '',
    waived_check: waiver?.check ?? '',
    waived_status: waiver?.status ?? '',
    waived_margin: waiver ? waivedMarginText(waiver) : '',
    waiver_author: waiver?.author ?? '',
    waiver_at: waiver?.at ?? '',
    waiver_comment: waiver?.comment ?? '',
    waiver_review: state?.why ?? '',
  };
}

/**
 * Rows of the margin CSV for every bus of `result`, or only `bus` when given; the previous solve and
 * the waivers fill the delta and waiver columns (empty without them).
 */
export function marginCsvRecords(result: BoardResult, bus?: string, extras: MarginCsvExtras = {}): MarginCsvRecord[] {
  return result.buses.filter((b) => bus === undefined || b.bus === bus).flatMap((b) => b.nets.map((n) => record(b, n, extras)));
}
