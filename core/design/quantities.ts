/**
 * Quantities in a design file: every dimensioned value carries its unit ("5mil", "400ps"); a bare
 * number is refused except 0, since a lone "5" could be metres or mils (docs/design-file.md §2).
 * Ranges refuse unit slips, not engineering choices (common practice, no source).
 */
import { InputError } from '../errors.js';
import { parseQuantity, type Dimension, type QuantityLimits } from '../units/quantity.js';
import type { DesignIssue, FieldPath } from './located.js';

export type QuantityKind =
  | 'thickness' | 'width' | 'length' | 'widthDelta'
  | 'voltage' | 'settleBand'
  | 'rout' | 'ohms' | 'z0'
  | 'edge' | 'signedTime' | 'cycleTime' | 'nonNegativeTime' | 'delay'
  | 'cin' | 'viaC' | 'farads'
  | 'henries';

const us = 1e-6;
export const QUANTITY_KINDS: Record<QuantityKind, { dimension: Dimension; limits: QuantityLimits; example: string }> = {
  thickness: { dimension: 'length', limits: { min: 0, minExclusive: true, max: 10e-3 }, example: '0.035mm' },
  width: { dimension: 'length', limits: { min: 0, minExclusive: true, max: 10e-3 }, example: '5mil' },
  length: { dimension: 'length', limits: { min: 0, max: 2 }, example: '25mm' },
  widthDelta: { dimension: 'length', limits: { min: -1e-3, max: 1e-3 }, example: '-0.5mil' },
  voltage: { dimension: 'voltage', limits: { min: -100, max: 100 }, example: '1.2V' },
  settleBand: { dimension: 'voltage', limits: { min: 0, minExclusive: true, max: 10 }, example: '50mV' },
  rout: { dimension: 'resistance', limits: { min: 0, minExclusive: true, max: 1e6 }, example: '34ohm' },
  ohms: { dimension: 'resistance', limits: { min: 0, minExclusive: true, max: 1e6 }, example: '22ohm' },
  z0: { dimension: 'resistance', limits: { min: 1, max: 1000 }, example: '50ohm' },
  edge: { dimension: 'time', limits: { min: 0, minExclusive: true, max: us }, example: '150ps' },
  signedTime: { dimension: 'time', limits: { min: -us, max: us }, example: '300ps' },
  cycleTime: { dimension: 'time', limits: { min: 0, minExclusive: true, max: 1 }, example: '2.5ns' },
  nonNegativeTime: { dimension: 'time', limits: { min: 0, max: us }, example: '25ps' },
  delay: { dimension: 'time', limits: { min: 0, max: us }, example: '120ps' },
  cin: { dimension: 'capacitance', limits: { min: 0, max: 1e-9 }, example: '1.5pF' },
  viaC: { dimension: 'capacitance', limits: { min: 0, max: 100e-12 }, example: '0.45pF' },
  farads: { dimension: 'capacitance', limits: { min: 0, minExclusive: true, max: 1e-6 }, example: '10pF' },
  henries: { dimension: 'inductance', limits: { min: 0, minExclusive: true, max: 1e-6 }, example: '1nH' },
};

/**
 * Reads one quantity; on a problem records an issue at `path` and returns null. `undefined` is
 * "missing" only when the caller did not give a default.
 */
export function readQuantity(
  issues: DesignIssue[], value: unknown, kind: QuantityKind, path: FieldPath, fallback?: number,
): number | null {
  const { dimension, limits, example } = QUANTITY_KINDS[kind];
  if (value === undefined || value === null) {
    if (fallback !== undefined) return fallback;
    issues.push({ path, message: `is missing (expected a ${dimension} such as ${example})` });
    return null;
  }
  if (typeof value === 'number' && value !== 0) {
    issues.push({ path, message: `${value} has no unit; write it with one, e.g. ${value}${example.replace(/^[-\d.]+/, '')}` });
    return null;
  }
  if (typeof value !== 'number' && typeof value !== 'string') return null; // the schema check reported the type
  try {
    return parseQuantity(value, dimension, '', limits);
  } catch (error) {
    if (error instanceof InputError) {
      issues.push({ path, message: `${error.reason} (expected a ${dimension} such as ${example})` });
      return null;
    }
    throw error;
  }
}

/** A plain number (Dk, Df, corner multipliers) inside [min, max]. */
export function readRatio(
  issues: DesignIssue[], value: unknown, path: FieldPath, min: number, max: number, fallback?: number,
): number | null {
  if (value === undefined || value === null) {
    if (fallback !== undefined) return fallback;
    issues.push({ path, message: `is missing (expected a plain number from ${min} to ${max})` });
    return null;
  }
  if (typeof value !== 'number') return null; // the schema check reported the type
  if (!(value >= min && value <= max)) {
    issues.push({ path, message: `${value} is out of range: must be from ${min} to ${max}` });
    return null;
  }
  return value;
}
