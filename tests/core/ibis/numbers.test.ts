/** IBIS numbers and scale suffixes (ANSI/EIA-656, "Numerical data": T G M k m u n p f; trailing unit letters ignored). */
import { describe, expect, it } from 'vitest';
import { ibisNumber, ibisRatio, isNa } from '../../../core/ibis/numbers.js';

describe('ibisNumber', () => {
  it('reads the scale suffixes of the standard', () => {
    // ANSI/EIA-656 scaling factors; M is mega and m is milli in IBIS (unlike SPICE).
    expect(ibisNumber('1.5nH')).toBeCloseTo(1.5e-9, 21);
    expect(ibisNumber('2.0pF')).toBeCloseTo(2e-12, 24);
    expect(ibisNumber('35m')).toBeCloseTo(0.035, 15);
    expect(ibisNumber('2M')).toBe(2e6);
    expect(ibisNumber('4k')).toBe(4000);
    expect(ibisNumber('3u')).toBeCloseTo(3e-6, 18);
    expect(ibisNumber('7f')).toBeCloseTo(7e-15, 27);
    expect(ibisNumber('1T')).toBe(1e12);
    expect(ibisNumber('1G')).toBe(1e9);
  });
  it('ignores unit letters that are not a scale and reads scientific notation', () => {
    // Standard: text after the number and scale factor is ignored (units are for the reader).
    expect(ibisNumber('3.3V')).toBe(3.3);
    expect(ibisNumber('50ohm')).toBe(50);
    expect(ibisNumber('-2.5949e-2')).toBeCloseTo(-0.025949, 12);
    expect(ibisNumber('1.2e-9s')).toBeCloseTo(1.2e-9, 21);
    expect(ibisNumber('.5')).toBe(0.5);
  });
  it('rejects what is not a number and recognises NA', () => {
    expect(ibisNumber('abc')).toBeNull();
    expect(ibisNumber('NA')).toBeNull();
    expect(isNa('NA')).toBe(true);
    expect(isNa('na')).toBe(true);
    expect(ibisNumber('1.2.3')).toBeNull();
  });
  it('splits a dV/dt ratio', () => {
    // [Ramp] writes dV/dt as "dv/dt" with suffixes on each number (standard, [Ramp]).
    const r = ibisRatio('0.4554/0.1375n')!;
    expect(r.dv).toBe(0.4554);
    expect(r.dt).toBeCloseTo(0.1375e-9, 20);
    expect(ibisRatio('1.2')).toBeNull();
  });
});
