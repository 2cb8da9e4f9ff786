import { InputError } from '../errors.js';

/**
 * Engineering quantities: parse text such as "5mil", "0.1 mm", "400ps", "2pF", "50ohm" into SI base
 * units, and format SI values back for people. Inside core/ every number is SI; conversion happens
 * only at the edges (CLI, import, UI, report).
 */
export type Dimension =
  | 'length'
  | 'time'
  | 'capacitance'
  | 'inductance'
  | 'resistance'
  | 'voltage'
  | 'frequency'
  | 'ratio';

const MIL = 25.4e-6; // 1 mil = 0.001 in = 25.4 um (exact by definition of the inch)
/** Copper weight to thickness: 1 oz/ft^2 is about 35 um — common practice, no source. */
export const COPPER_OZ_THICKNESS = 35e-6;

/** Unit symbol (lower-cased) to SI factor, per dimension. */
const UNITS: Record<Dimension, Record<string, number>> = {
  length: {
    m: 1, cm: 1e-2, mm: 1e-3, um: 1e-6, 'µm': 1e-6, 'μm': 1e-6, micron: 1e-6, nm: 1e-9,
    mil: MIL, mils: MIL, thou: MIL, in: 0.0254, inch: 0.0254, '"': 0.0254,
    oz: COPPER_OZ_THICKNESS,
  },
  time: { s: 1, ms: 1e-3, us: 1e-6, 'µs': 1e-6, 'μs': 1e-6, ns: 1e-9, ps: 1e-12, fs: 1e-15 },
  capacitance: { f: 1, uf: 1e-6, 'µf': 1e-6, 'μf': 1e-6, nf: 1e-9, pf: 1e-12, ff: 1e-15 },
  inductance: { h: 1, mh: 1e-3, uh: 1e-6, 'µh': 1e-6, 'μh': 1e-6, nh: 1e-9, ph: 1e-12 },
  resistance: { ohm: 1, ohms: 1, 'ω': 1, r: 1, kohm: 1e3, 'kω': 1e3, k: 1e3, mohm: 1e6, 'mω': 1e6 },
  voltage: { v: 1, mv: 1e-3, kv: 1e3 },
  frequency: { hz: 1, khz: 1e3, mhz: 1e6, ghz: 1e9 },
  ratio: { '': 1, '%': 0.01 },
};

/** The unit list for a dimension, for error messages. */
export function unitsOf(dimension: Dimension): string[] {
  return Object.keys(UNITS[dimension]).filter((u) => u !== '');
}

export interface QuantityLimits {
  /** Smallest allowed SI value (inclusive unless `minExclusive`). */
  min?: number;
  max?: number;
  minExclusive?: boolean;
}

const NUMBER_THEN_UNIT = /^([-+]?(?:\d+\.?\d*|\.\d+)(?:e[-+]?\d+)?)\s*(.*)$/i;

/**
 * Parses a number (taken as SI) or a string with an optional unit into SI.
 * A bare number string is SI too ("1e-9" seconds). Throws InputError naming `field` on an unknown
 * unit, a missing number, a non-finite value or a value outside `limits`.
 * Example: parseQuantity("5mil", "length", "trace width") === 127e-6.
 */
export function parseQuantity(
  value: unknown,
  dimension: Dimension,
  field: string,
  limits: QuantityLimits = {},
): number {
  let si: number;
  if (typeof value === 'number') {
    si = value;
  } else if (typeof value === 'string') {
    const text = value.trim();
    const match = NUMBER_THEN_UNIT.exec(text);
    if (!match) {
      throw new InputError(field, `expected a number with an optional ${dimension} unit, got "${value}"`);
    }
    const unit = match[2].trim().toLowerCase();
    // A bare number is SI in every dimension (documented above), e.g. "1.5e-4" metres.
    const factor = unit === '' ? 1 : UNITS[dimension][unit];
    if (factor === undefined) {
      throw new InputError(
        field,
        `unknown ${dimension} unit "${match[2].trim()}" in "${value}" (known: ${unitsOf(dimension).join(', ')})`,
      );
    }
    si = Number(match[1]) * factor;
  } else {
    throw new InputError(field, `missing ${dimension} value`);
  }
  if (!Number.isFinite(si)) throw new InputError(field, `value is not a finite number`);
  checkLimits(si, dimension, field, limits);
  return si;
}

function checkLimits(si: number, dimension: Dimension, field: string, limits: QuantityLimits): void {
  const { min, max, minExclusive } = limits;
  if (min !== undefined && (minExclusive ? si <= min : si < min)) {
    throw new InputError(
      field,
      `${formatQuantity(si, dimension)} is out of range: must be ${minExclusive ? 'greater than' : 'at least'} ${formatQuantity(min, dimension)}`,
    );
  }
  if (max !== undefined && si > max) {
    throw new InputError(field, `${formatQuantity(si, dimension)} is out of range: must be at most ${formatQuantity(max, dimension)}`);
  }
}

/** Preferred display unit per dimension for people (engineering units). */
const DISPLAY: Record<Dimension, { unit: string; factor: number }[]> = {
  length: [{ unit: 'mm', factor: 1e-3 }],
  time: [
    { unit: 'ns', factor: 1e-9 },
    { unit: 'ps', factor: 1e-12 },
  ],
  capacitance: [{ unit: 'pF', factor: 1e-12 }],
  inductance: [{ unit: 'nH', factor: 1e-9 }],
  resistance: [{ unit: 'Ω', factor: 1 }],
  voltage: [
    { unit: 'V', factor: 1 },
    { unit: 'mV', factor: 1e-3 },
  ],
  frequency: [
    { unit: 'GHz', factor: 1e9 },
    { unit: 'MHz', factor: 1e6 },
  ],
  ratio: [{ unit: '', factor: 1 }],
};

/**
 * Formats an SI value with an engineering unit and `digits` significant digits.
 * Picks the largest display unit in which |value| >= 1 (else the smallest). Example: 1.7e-10 s -> "170 ps".
 */
export function formatQuantity(si: number, dimension: Dimension, digits = 3): string {
  if (!Number.isFinite(si)) return '—';
  const choices = DISPLAY[dimension];
  const pick = choices.find((c) => Math.abs(si) >= c.factor) ?? choices[choices.length - 1];
  const scaled = si / pick.factor;
  const text = Number(scaled.toPrecision(digits)).toString();
  return pick.unit ? `${text} ${pick.unit}` : text;
}

/** Formats in a fixed unit with fixed decimals (for aligned table columns). Example: (1.2e-11,'ps',0) -> "12 ps". */
export function formatIn(si: number | null, unit: string, decimals: number, withUnit = true): string {
  if (si === null || !Number.isFinite(si)) return '—';
  const factor = FIXED_FACTORS[unit];
  if (factor === undefined) throw new Error(`formatIn: no factor for unit ${unit}`);
  const text = (si / factor).toFixed(decimals);
  return withUnit ? `${text} ${unit}` : text;
}

const FIXED_FACTORS: Record<string, number> = {
  m: 1, mm: 1e-3, um: 1e-6, mil: MIL, in: 0.0254,
  s: 1, ns: 1e-9, ps: 1e-12, 'ps/in': 1e-12 / 0.0254, 'ps/mm': 1e-12 / 1e-3,
  pF: 1e-12, nH: 1e-9, 'pF/in': 1e-12 / 0.0254, 'nH/in': 1e-9 / 0.0254,
  'Ω': 1, ohm: 1, V: 1, mV: 1e-3, W: 1, mW: 1e-3, '%': 0.01, '': 1,
};

/** SI conversion factors for callers that need them explicitly (e.g. CSV headers "length_mil"). */
export const SI_PER = { mil: MIL, mm: 1e-3, um: 1e-6, in: 0.0254, ps: 1e-12, ns: 1e-9, pF: 1e-12, nH: 1e-9 } as const;
