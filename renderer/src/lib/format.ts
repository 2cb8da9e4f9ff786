/** Display helpers: SI in, engineering text out (units always shown). Uses core's unit tables. */
import { formatIn, formatQuantity } from '../../../core/units/quantity.js';

export type LengthUnit = 'mil' | 'mm';

/** A leading ASCII minus as the true minus sign (U+2212): one minus on every screen. */
function trueMinus(text: string): string {
  return text.startsWith('-') ? `\u2212${text.slice(1)}` : text;
}

export function ps(seconds: number | null | undefined, decimals = 0): string {
  if (seconds === null || seconds === undefined) return '—';
  return trueMinus(formatIn(seconds, 'ps', decimals));
}

/** Signed picoseconds for margins: "+12 ps", "−35 ps" (true minus sign reads better in tables). */
export function margin(seconds: number | null | undefined): string {
  if (seconds === null || seconds === undefined || !Number.isFinite(seconds)) return '—';
  const text = formatIn(Math.abs(seconds), 'ps', 0);
  if (Math.round(seconds / 1e-12) === 0) return `0 ps`;
  return `${seconds < 0 ? '−' : '+'}${text}`;
}

/**
 * Words from the services with every minus before a number as the true minus sign (U+2212), as the
 * tables print margins: "hold margin -35 ps" -> "hold margin −35 ps". Hyphens in words stay.
 */
export function prose(text: string): string {
  return text.replace(/(^|[\s(\[=:,/])-(?=\.?\d)/g, '$1\u2212');
}

export function length(metres: number | null | undefined, unit: LengthUnit): string {
  if (metres === null || metres === undefined) return '—';
  return trueMinus(formatIn(metres, unit, unit === 'mil' ? 1 : 3));
}

export function thickness(metres: number, unit: LengthUnit): string {
  return trueMinus(formatIn(metres, unit, unit === 'mil' ? 2 : 4));
}

export function ohms(value: number | null | undefined, decimals = 1): string {
  if (value === null || value === undefined) return '—';
  return trueMinus(formatIn(value, 'Ω', decimals));
}

export function volts(value: number | null | undefined, decimals = 3): string {
  if (value === null || value === undefined) return '—';
  return trueMinus(formatIn(value, 'V', decimals));
}

/** Delay per length, s/m -> "ps/in" or "ps/mm" matching the length unit in use. */
export function delayPerLength(secondsPerMetre: number, unit: LengthUnit): string {
  return unit === 'mil' ? formatIn(secondsPerMetre, 'ps/in', 1) : formatIn(secondsPerMetre, 'ps/mm', 2);
}

export function auto(value: number, dimension: Parameters<typeof formatQuantity>[1], digits = 3): string {
  return trueMinus(formatQuantity(value, dimension, digits));
}

/** Local date and time for "last solved". */
export function when(iso: string | null): string {
  if (!iso) return 'never';
  const date = new Date(iso);
  if (Number.isNaN(date.getTime())) return iso;
  return date.toLocaleString(undefined, { dateStyle: 'medium', timeStyle: 'medium' });
}

/** Value in `unit` as an editable string with its unit: (0.03175 m, "mil", 1) -> "1250.0 mil". */
export function editable(si: number, unit: string, decimals: number): string {
  return `${formatIn(si, unit, decimals, false)} ${unit}`;
}
