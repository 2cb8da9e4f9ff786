/**
 * Text fields that hold one engineering quantity in a column whose unit is stated in the header
 * ("Value, ps"). A bare number is read in that column unit, unlike core's parseQuantity where a bare
 * number is SI: typing "230" under a "ps" header must not mean 230 seconds. A unit typed with the
 * number ("0.23 ns", "-12 um") wins over the column unit.
 */
import { parseQuantity, SI_PER, type Dimension, type QuantityLimits } from '../../../core/units/quantity.js';
import { InputError } from '../../../core/errors.js';

const BARE_NUMBER = /^[-+]?(?:\d+\.?\d*|\.\d+)(?:e[-+]?\d+)?$/i;

/** Units a column may be stated in, with their SI factor. */
export type ColumnUnit = 'ps' | 'mil' | 'µm' | 'mm';
const FACTOR: Record<ColumnUnit, number> = { ps: SI_PER.ps, mil: SI_PER.mil, 'µm': SI_PER.um, mm: SI_PER.mm };

/** Display decimals per column unit: 0.1 ps and 0.01 mil / 0.1 µm are below any tolerance in the inputs. */
const DECIMALS: Record<ColumnUnit, number> = { ps: 1, mil: 2, 'µm': 1, mm: 4 };

/**
 * Reads `text` as a quantity; a bare number is in `unit`. Throws InputError naming `field` for empty,
 * non-numeric, non-finite or out-of-range text. Accepts the typographic minus "−".
 */
export function parseInColumn(text: string, dimension: Dimension, unit: ColumnUnit, field: string, limits: QuantityLimits = {}): number {
  const cleaned = text.replace(/\u2212/g, '-').trim();
  if (!cleaned) throw new InputError(field, `a value in ${unit} is needed`);
  return parseQuantity(BARE_NUMBER.test(cleaned) ? `${cleaned} ${unit}` : cleaned, dimension, field, limits);
}

/** SI value as the editable text of a column: 2.3e-10 s in ps -> "230 ps"; trailing zeros dropped. */
export function columnText(si: number, unit: ColumnUnit): string {
  const scaled = Number((si / FACTOR[unit]).toFixed(DECIMALS[unit]));
  return `${Object.is(scaled, -0) ? 0 : scaled} ${unit}`;
}

/**
 * A dimensionless multiplier (a corner factor): finite and greater than zero. "115 %" reads as 1.15.
 * Throws InputError naming `field`.
 */
export function parseFactor(text: string, field: string): number {
  const cleaned = text.replace(/\u2212/g, '-').trim();
  if (!cleaned) throw new InputError(field, 'a factor is needed (1 = typical)');
  return parseQuantity(cleaned, 'ratio', field, { min: 0, minExclusive: true });
}

/** A factor as editable text: up to 4 decimals, no trailing zeros (1.15, 0.85, 1). */
export function factorText(value: number): string {
  return String(Number(value.toFixed(4)));
}

/**
 * Like parseInColumn for any unit core's parser knows ("V", "Ω", "pF", "nH", "ps"): a bare number is
 * read in `unit`, a unit typed with it wins. Throws InputError naming `field`.
 */
export function parseWithUnit(text: string, dimension: Dimension, unit: string, field: string, limits: QuantityLimits = {}): number {
  const cleaned = text.replace(/\u2212/g, '-').trim();
  if (!cleaned) throw new InputError(field, `a value in ${unit} is needed`);
  return parseQuantity(BARE_NUMBER.test(cleaned) ? `${cleaned} ${unit}` : cleaned, dimension, field, limits);
}
