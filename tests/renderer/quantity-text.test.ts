/**
 * Column-unit text fields (renderer/src/lib/quantity-text.ts): a bare number is read in the column's
 * unit, a typed unit wins, every refusal names its field. Contracts: core/errors.ts InputError(where,
 * reason), core/units/quantity.ts parseQuantity limits.
 */
import { describe, expect, it } from 'vitest';
import { columnText, factorText, parseFactor, parseInColumn } from '../../renderer/src/lib/quantity-text.js';
import { InputError } from '../../core/errors.js';

/** The InputError thrown by `run`, so tests can assert its exact place and words. */
function refusal(run: () => unknown): InputError {
  try {
    run();
  } catch (e) {
    if (e instanceof InputError) return e;
    throw e;
  }
  throw new Error('expected an InputError, nothing was thrown');
}

describe('parseInColumn', () => {
  it('reads a bare number in the column unit, not as SI', () => {
    // quantity-text.ts header: "230" under a "ps" header must not mean 230 seconds
    expect(parseInColumn('230', 'time', 'ps', 'f')).toBe(230e-12);
    expect(parseInColumn('5', 'length', 'mil', 'f')).toBeCloseTo(127e-6, 18); // 1e-18 m: float product 5 × 25.4e-6
    expect(parseInColumn('-12', 'length', 'µm', 'f')).toBe(-12e-6);
    expect(parseInColumn('  .5e1 ', 'time', 'ps', 'f')).toBe(5e-12);
  });

  it('lets a typed unit win over the column unit', () => {
    // quantity-text.ts header: "0.23 ns", "-12 um" win over the column unit
    expect(parseInColumn('0.23 ns', 'time', 'ps', 'f')).toBe(0.23 * 1e-9); // the same float product parseQuantity forms
    expect(parseInColumn('-12 um', 'length', 'mil', 'f')).toBe(-12e-6);
    expect(parseInColumn('1mil', 'length', 'µm', 'f')).toBe(25.4e-6);
  });

  it('accepts the typographic minus sign', () => {
    // common practice, no source: text copied from the tables (which show "−35 ps") must parse back
    expect(parseInColumn('\u221235', 'time', 'ps', 'f')).toBe(-35e-12);
    expect(parseInColumn('\u22120.1 ns', 'time', 'ps', 'f')).toBe(-0.1 * 1e-9); // the same float product parseQuantity forms
  });

  it('refuses empty text, naming the field and the unit wanted', () => {
    // core/errors.ts contract: every bad-input error names where
    const e = refusal(() => parseInColumn('   ', 'time', 'ps', 'bus MEM jitter'));
    expect(e.where).toBe('bus MEM jitter');
    expect(e.message).toBe('bus MEM jitter: a value in ps is needed');
  });

  it('refuses words, a unit of the wrong kind and non-finite numbers, naming the field', () => {
    // core/errors.ts contract; never NaN shown to people (docs/design.md §8)
    expect(refusal(() => parseInColumn('abc', 'time', 'ps', 'row 3 value')).message)
      .toBe('row 3 value: expected a number with an optional time unit, got "abc"');
    const wrongKind = refusal(() => parseInColumn('12 mil', 'time', 'ps', 'row 3 value'));
    expect(wrongKind.where).toBe('row 3 value');
    expect(wrongKind.message).toMatch(/^row 3 value: unknown time unit "mil" in "12 mil" \(known: /);
    expect(refusal(() => parseInColumn('1e400', 'time', 'ps', 'row 3 value')).message).toBe('row 3 value: value is not a finite number');
    expect(refusal(() => parseInColumn('NaN', 'time', 'ps', 'row 3 value')).where).toBe('row 3 value');
    expect(refusal(() => parseInColumn('Infinity', 'time', 'ps', 'row 3 value')).where).toBe('row 3 value');
  });

  it('applies limits in SI after the unit is applied', () => {
    // core/units/quantity.ts QuantityLimits contract
    const positive = { min: 0, minExclusive: true };
    expect(refusal(() => parseInColumn('0', 'time', 'ps', 'cycle time', positive)).message)
      .toBe('cycle time: 0 ps is out of range: must be greater than 0 ps');
    expect(refusal(() => parseInColumn('-1', 'time', 'ps', 'jitter', { min: 0 })).message)
      .toBe('jitter: -1 ps is out of range: must be at least 0 ps');
    expect(refusal(() => parseInColumn('2 ns', 'time', 'ps', 'x', { max: 1e-9 })).message)
      .toBe('x: 2 ns is out of range: must be at most 1 ns');
    expect(parseInColumn('0', 'time', 'ps', 'jitter', { min: 0 })).toBe(0);
  });
});

describe('columnText', () => {
  it('writes SI values in the column unit, dropping trailing zeros and negative zero', () => {
    // decimals per unit: quantity-text.ts (0.1 ps, 0.01 mil, 0.1 µm); common practice, no source
    expect(columnText(2.3e-10, 'ps')).toBe('230 ps');
    expect(columnText(1.2345e-12, 'ps')).toBe('1.2 ps');
    expect(columnText(-12.7e-6, 'mil')).toBe('-0.5 mil');
    expect(columnText(-3.04e-6, 'µm')).toBe('-3 µm');
    expect(columnText(-1e-20, 'µm')).toBe('0 µm');
  });

  it('round-trips through parseInColumn within the shown precision', () => {
    // common practice, no source: what is shown can be typed back
    expect(parseInColumn(columnText(-12.7e-6, 'mil'), 'length', 'mil', 'f')).toBeCloseTo(-12.7e-6, 18); // 1e-18 m: float
    expect(parseInColumn(columnText(2.3e-10, 'ps'), 'time', 'ps', 'f')).toBe(2.3e-10);
  });
});

describe('parseFactor and factorText', () => {
  it('reads plain factors and percentages', () => {
    // core/project/model.ts Corner: each factor is 1 at typical
    expect(parseFactor('1.15', 'f')).toBe(1.15);
    expect(parseFactor(' 115 % ', 'f')).toBe(115 * 0.01);
    expect(parseFactor('1', 'f')).toBe(1);
  });

  it('refuses zero, negative, empty, non-numeric and non-finite factors, naming the field', () => {
    // main/services/project/validate-project.ts: corner factors must be greater than 0
    expect(refusal(() => parseFactor('0', 'corner 1 (slow) edge rate ×')).message)
      .toBe('corner 1 (slow) edge rate ×: 0 is out of range: must be greater than 0');
    expect(refusal(() => parseFactor('\u22121.1', 'f')).message).toBe('f: -1.1 is out of range: must be greater than 0');
    expect(refusal(() => parseFactor('', 'f')).message).toBe('f: a factor is needed (1 = typical)');
    expect(refusal(() => parseFactor('fast', 'f')).where).toBe('f');
    expect(refusal(() => parseFactor('1 ps', 'f')).where).toBe('f');
    expect(refusal(() => parseFactor('1e999', 'f')).message).toBe('f: value is not a finite number');
  });

  it('writes factors with at most 4 decimals and no trailing zeros', () => {
    // common practice, no source
    expect(factorText(1)).toBe('1');
    expect(factorText(1.15)).toBe('1.15');
    expect(factorText(0.85)).toBe('0.85');
    expect(factorText(1.123456)).toBe('1.1235');
  });
});
