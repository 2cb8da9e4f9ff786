/**
 * Complete elliptic integral of the first kind by the arithmetic-geometric mean.
 * K(k) = π / (2·AGM(1, k')) with k' = sqrt(1 - k²)
 * (Abramowitz & Stegun, Handbook of Mathematical Functions, 1964, §17.6, eq. 17.6.1-17.6.4).
 * The AGM converges quadratically: six to eight steps reach double precision for any k in [0, 1).
 */

/** Arithmetic-geometric mean of two non-negative numbers (A&S 17.6). */
export function agm(a: number, b: number): number {
  let x = a;
  let y = b;
  // Quadratic convergence: 40 steps is far beyond what any double needs; the bound only guards NaN.
  for (let i = 0; i < 40 && Math.abs(x - y) > 1e-16 * x; i++) {
    const mean = 0.5 * (x + y);
    y = Math.sqrt(x * y);
    x = mean;
  }
  return 0.5 * (x + y);
}

/**
 * Complementary modulus k' = sqrt(1 - k²) computed as sqrt((1 - k)(1 + k)), which keeps full
 * relative precision as k -> 1 (no cancellation in 1 - k²).
 */
export function complementaryModulus(k: number): number {
  return Math.sqrt((1 - k) * (1 + k));
}

/**
 * K(k) for modulus 0 <= k < 1 (A&S 17.6). Infinite at k = 1; K(0) = π/2.
 * When the caller knows k' directly (e.g. tanh of a geometry ratio), use {@link ellipticKFromComplement}
 * to keep precision as k -> 1.
 */
export function ellipticK(k: number): number {
  return ellipticKFromComplement(complementaryModulus(Math.abs(k)));
}

/** K expressed through the complementary modulus: K = π / (2·AGM(1, k')) (A&S 17.6.1). */
export function ellipticKFromComplement(kPrime: number): number {
  if (kPrime <= 0) return Infinity;
  return Math.PI / (2 * agm(1, kPrime));
}

/**
 * The ratio K(k)/K(k') given both moduli (k² + k'² = 1), as AGM(1, k)/AGM(1, k').
 * Stable at both ends because neither modulus is formed by subtraction.
 */
export function ellipticKRatio(k: number, kPrime: number): number {
  if (kPrime <= 0) return Infinity;
  if (k <= 0) return 0;
  return agm(1, k) / agm(1, kPrime);
}
