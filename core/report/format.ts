/**
 * How the report writes numbers: fixed units per column so columns line up and a reader can compare
 * rows at a glance. Non-finite values print as an em dash, never "NaN".
 */
import { formatIn } from '../units/quantity.js';
import type { Status } from '../budget/results.js';

const PS = 1e-12;

/** Time in ps with one decimal, no unit (the column header carries it). -0.0 prints as 0.0. */
export function psCell(seconds: number | null): string {
  if (seconds === null || !Number.isFinite(seconds)) return '—';
  const text = (seconds / PS).toFixed(1);
  return text === '-0.0' ? '0.0' : text;
}

/** A margin with its unit and explicit sign, as the report writes it in sentences: "+12.3 ps", "-35.0 ps". */
export function formatMarginPs(seconds: number | null): string {
  if (seconds === null || !Number.isFinite(seconds)) return '—';
  const cell = psCell(seconds);
  return `${cell.startsWith('-') || cell === '0.0' ? cell : `+${cell}`} ps`;
}

/** Length in mm (two decimals) with mil in brackets: "25.40 mm (1000 mil)". */
export function lengthCell(metres: number | null): string {
  if (metres === null || !Number.isFinite(metres)) return '—';
  return `${formatIn(metres, 'mm', 2)} (${formatIn(metres, 'mil', 0)})`;
}

/** Length as "mm / mil" for table cells whose header names both units: "40.00 / 1575". */
export function lengthPair(metres: number | null): string {
  if (metres === null || !Number.isFinite(metres)) return '—';
  return `${formatIn(metres, 'mm', 2, false)} / ${formatIn(metres, 'mil', 0, false)}`;
}

export function voltsCell(volts: number, decimals = 3): string {
  return Number.isFinite(volts) ? formatIn(volts, 'V', decimals) : '—';
}

/** Upper-case status word for tables and headings. */
export function statusWord(status: Status): string {
  return status.toUpperCase();
}

/** A plain number with a fixed count of decimals, or an em dash. */
export function fixed(value: number | undefined, decimals: number): string {
  return value !== undefined && Number.isFinite(value) ? value.toFixed(decimals) : '—';
}

/** "2026-12-01 18:30 UTC" from an ISO time (the report is archived; say the zone). */
export function dateTimeText(iso: string): string {
  const date = new Date(iso);
  if (Number.isNaN(date.getTime())) return iso;
  return `${date.toISOString().slice(0, 16).replace('T', ' ')} UTC`;
}
