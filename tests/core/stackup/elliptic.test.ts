import { describe, expect, it } from 'vitest';
import { agm, complementaryModulus, ellipticK, ellipticKFromComplement, ellipticKRatio } from '../../../core/stackup/elliptic.js';
import { kByQuadrature } from './elliptic-quadrature.js';

describe('complete elliptic integral K(k) by the AGM (A&S 17.6)', () => {
  it('agrees with trapezoidal quadrature of the defining integral to 1e-10', () => {
    // Reference: A&S 17.3.1 integrated numerically in this test. Tolerance: both are near double precision.
    for (const k of [0, 0.1, 0.3, 0.5, 0.7, 0.9, 0.99, 0.999]) {
      expect(ellipticK(k)).toBeCloseTo(kByQuadrature(k), 9);
      expect(Math.abs(ellipticK(k) / kByQuadrature(k) - 1)).toBeLessThan(1e-10);
    }
  });

  it('gives K(0) = π/2 and the small-k series', () => {
    // A&S 17.3.11: K = π/2 (1 + k²/4 + 9k⁴/64 + ...); at k = 1e-3 the next term is ~1e-13.
    expect(ellipticK(0)).toBe(Math.PI / 2);
    const k = 1e-3;
    expect(Math.abs(ellipticK(k) / ((Math.PI / 2) * (1 + k * k / 4 + (9 * k ** 4) / 64)) - 1)).toBeLessThan(1e-13);
  });

  it('approaches ln(4/k′) as k -> 1', () => {
    // A&S 17.3.26: K ≈ ln(4/k′) + O(k′² ln k′); at k′ = 1e-6 the correction is ~1e-11 relative.
    for (const kp of [1e-6, 1e-9, 1e-12]) {
      expect(Math.abs(ellipticKFromComplement(kp) / Math.log(4 / kp) - 1)).toBeLessThan(1e-10);
    }
  });

  it('keeps k′ accurate near k = 1 and is infinite at k = 1', () => {
    // Identity k′ = sqrt((1-k)(1+k)); at k = 1 - 1e-12 the naive 1 - k² would lose ~4 digits.
    const k = 1 - 1e-12;
    expect(Math.abs(complementaryModulus(k) / Math.sqrt(2e-12) - 1)).toBeLessThan(1e-3);
    expect(ellipticK(1)).toBe(Infinity);
  });

  it('ratio K(k)/K(k′) has the limits of both ends and the k = 1/√2 symmetry', () => {
    // k = k′ = 1/√2 gives ratio 1 (definition). k -> 0: ratio -> (π/2)/ln(4/k) (A&S 17.3.11 and 17.3.26).
    expect(ellipticKRatio(Math.SQRT1_2, Math.SQRT1_2)).toBeCloseTo(1, 14);
    const k = 1e-8;
    expect(Math.abs(ellipticKRatio(k, complementaryModulus(k)) / (Math.PI / 2 / Math.log(4 / k)) - 1)).toBeLessThan(1e-12);
    expect(ellipticKRatio(0, 1)).toBe(0);
    expect(ellipticKRatio(1, 0)).toBe(Infinity);
  });

  it('AGM of equal numbers is that number; AGM(1, √2)... Gauss constant', () => {
    // Gauss's constant 1/AGM(1, √2) = 0.8346268416740731 (A&S 17.6 / OEIS A014549).
    expect(agm(3, 3)).toBe(3);
    expect(1 / agm(1, Math.SQRT2)).toBeCloseTo(0.8346268416740731, 14);
  });
});
