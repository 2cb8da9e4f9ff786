import { describe, expect, it } from 'vitest';
import { COPPER_OZ_THICKNESS, formatIn, formatQuantity, parseQuantity, SI_PER, unitsOf } from '../../core/units/index.js';

describe('parseQuantity', () => {
  it('converts engineering units to SI', () => {
    // Definitions: 1 mil = 25.4 µm exactly (inch = 25.4 mm, NIST SP 811); SI prefixes.
    expect(parseQuantity('5mil', 'length', 'w')).toBeCloseTo(127e-6, 18);
    expect(parseQuantity('0.1 mm', 'length', 'w')).toBeCloseTo(1e-4, 18);
    expect(parseQuantity('35um', 'length', 'w')).toBeCloseTo(35e-6, 18);
    // Both the micro sign (U+00B5) and the Greek small mu (U+03BC) are typed for "micro" (Unicode, NIST SP 811 prefix µ).
    expect(parseQuantity('35\u00b5m', 'length', 'w')).toBeCloseTo(35e-6, 18);
    expect(parseQuantity('35\u03bcm', 'length', 'w')).toBeCloseTo(35e-6, 18);
    expect(parseQuantity('2in', 'length', 'w')).toBeCloseTo(0.0508, 15);
    expect(parseQuantity('400ps', 'time', 't')).toBeCloseTo(4e-10, 22);
    expect(parseQuantity('1.5 ns', 'time', 't')).toBeCloseTo(1.5e-9, 21);
    expect(parseQuantity('2pF', 'capacitance', 'c')).toBeCloseTo(2e-12, 24);
    expect(parseQuantity('3.3nH', 'inductance', 'l')).toBeCloseTo(3.3e-9, 21);
    expect(parseQuantity('50ohm', 'resistance', 'r')).toBe(50);
    expect(parseQuantity('50Ω', 'resistance', 'r')).toBe(50);
    expect(parseQuantity('10%', 'ratio', 'x')).toBeCloseTo(0.1, 15);
  });

  it('reads copper weight in oz as thickness', () => {
    // Common practice, no source: 1 oz/ft² ≈ 35 µm (1.37 mil).
    expect(parseQuantity('1oz', 'length', 'copper')).toBe(COPPER_OZ_THICKNESS);
    expect(parseQuantity('0.5 oz', 'length', 'copper')).toBeCloseTo(17.5e-6, 18);
  });

  it('takes numbers and bare numeric strings as SI', () => {
    // Documented contract of parseQuantity: JSON numbers and unit-less strings are SI.
    expect(parseQuantity(1.27e-4, 'length', 'w')).toBe(1.27e-4);
    expect(parseQuantity('1.5e-4', 'length', 'w')).toBeCloseTo(1.5e-4, 18);
    expect(parseQuantity('0', 'length', 'w')).toBe(0);
    expect(parseQuantity('4.2', 'ratio', 'dk')).toBe(4.2);
  });

  it('names the field for an unknown unit, a missing number or a wrong type', () => {
    expect(() => parseQuantity('5 furlong', 'length', '--width')).toThrow(/--width: unknown length unit "furlong"/);
    expect(() => parseQuantity('5ps', 'length', '--width')).toThrow(/--width: unknown length unit "ps"/);
    expect(() => parseQuantity('mil', 'length', '--width')).toThrow(/--width: expected a number/);
    expect(() => parseQuantity('', 'length', '--width')).toThrow(/--width: expected a number/);
    expect(() => parseQuantity(undefined, 'length', 'layer thickness')).toThrow(/layer thickness: missing length value/);
    expect(() => parseQuantity(Number.NaN, 'length', 'w')).toThrow(/w: value is not a finite number/);
    expect(() => parseQuantity('1e999mil', 'length', 'w')).toThrow(/w: value is not a finite number/);
  });

  it('enforces limits, naming the field and the limit', () => {
    expect(() => parseQuantity('0mil', 'length', '--width', { min: 0, minExclusive: true })).toThrow(/--width: .*greater than 0 mm/);
    expect(() => parseQuantity('-1mil', 'length', 't', { min: 0 })).toThrow(/t: .*at least 0 mm/);
    expect(() => parseQuantity('0.5', 'ratio', '--er', { min: 1 })).toThrow(/--er: 0.5 is out of range: must be at least 1/);
    expect(() => parseQuantity('2ns', 'time', 'edge', { max: 1e-9 })).toThrow(/edge: .*at most 1 ns/);
    expect(parseQuantity('1', 'ratio', '--er', { min: 1 })).toBe(1);
  });

  it('lists known units without the empty unit', () => {
    expect(unitsOf('length')).toContain('mil');
    expect(unitsOf('ratio')).toEqual(['%']);
  });
});

describe('formatting for people', () => {
  it('formatQuantity picks an engineering unit', () => {
    // Examples from the function's documentation.
    expect(formatQuantity(1.7e-10, 'time')).toBe('170 ps');
    expect(formatQuantity(2.5e-9, 'time')).toBe('2.5 ns');
    expect(formatQuantity(1.27e-4, 'length')).toBe('0.127 mm');
    expect(formatQuantity(Number.NaN, 'time')).toBe('—');
  });

  it('formatIn uses a fixed unit and decimals, including per-inch units', () => {
    // 1 in = 0.0254 m exactly: 6.69e-9 s/m = 169.9 ps/in.
    expect(formatIn(1.2e-11, 'ps', 0)).toBe('12 ps');
    expect(formatIn(6.69e-9, 'ps/in', 1)).toBe('169.9 ps/in');
    expect(formatIn(127e-6, 'mil', 2)).toBe('5.00 mil');
    expect(formatIn(50, 'Ω', 1, false)).toBe('50.0');
    expect(formatIn(Infinity, 'ps', 0)).toBe('—');
    expect(() => formatIn(1, 'furlong', 0)).toThrow(/no factor/);
  });

  it('SI_PER matches the parser', () => {
    expect(SI_PER.mil).toBe(parseQuantity('1mil', 'length', 'x'));
    expect(SI_PER.ps).toBe(parseQuantity('1ps', 'time', 'x'));
  });
});
