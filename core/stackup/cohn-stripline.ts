/**
 * Zero-thickness stripline by conformal mapping (exact for an infinitely thin strip centred between
 * infinite planes, homogeneous dielectric):
 * - single strip: S. B. Cohn, "Characteristic Impedance of the Shielded-Strip Transmission Line",
 *   IRE Trans. MTT-2, 1954, pp. 52-57: Z0 = (η0/4)/sqrt(εr) · K(k)/K(k'), k = sech(πW/2b), k' = tanh(πW/2b);
 * - edge-coupled pair: S. B. Cohn, "Shielded Coupled-Strip Transmission Line", IRE Trans. MTT-3,
 *   1955, pp. 29-38: even mode ke = tanh(πW/2b)·tanh(π(W+S)/2b), odd mode ko = tanh(πW/2b)·coth(π(W+S)/2b),
 *   Z0e,o = (η0/4)/sqrt(εr) · K(k')/K(k) with k = ke or ko.
 * η0/4 = 30π Ω. Valid for any W, S > 0; a strip of finite thickness has a lower Z0 (see wheeler-stripline.ts).
 */
import { ETA0 } from './constants.js';
import { ellipticKRatio } from './elliptic.js';

/**
 * Cohn's exact zero-thickness symmetric stripline Z0, Ω.
 * @param width strip width W, m (> 0)
 * @param planeSpacing b, distance between the two planes, m (> 0)
 * @param er relative permittivity (>= 1)
 */
export function cohnStriplineZ0(width: number, planeSpacing: number, er: number): number {
  const x = (Math.PI * width) / (2 * planeSpacing);
  const k = 1 / Math.cosh(x); // sech
  const kPrime = Math.tanh(x);
  return (ETA0 / 4 / Math.sqrt(er)) * ellipticKRatio(k, kPrime);
}

export interface EvenOdd {
  /** Even-mode impedance, Ω */
  zeven: number;
  /** Odd-mode impedance, Ω */
  zodd: number;
}

/**
 * Cohn 1955 even/odd-mode impedances of zero-thickness edge-coupled stripline, Ω.
 * @param width each strip's width W, m; @param spacing edge-to-edge gap S, m; @param planeSpacing b, m.
 */
export function cohnCoupledStripline(width: number, spacing: number, planeSpacing: number, er: number): EvenOdd {
  const a = Math.tanh((Math.PI * width) / (2 * planeSpacing));
  const c = Math.tanh((Math.PI * (width + spacing)) / (2 * planeSpacing));
  const scale = ETA0 / 4 / Math.sqrt(er);
  const ke = a * c;
  const ko = a / c;
  // Complementary moduli as sqrt((1-k)(1+k)) keep precision when k -> 1 (wide strips, narrow gaps).
  const kePrime = Math.sqrt((1 - ke) * (1 + ke));
  const koPrime = Math.sqrt((1 - ko) * (1 + ko));
  return {
    zeven: scale * ellipticKRatio(kePrime, ke),
    zodd: scale * ellipticKRatio(koPrime, ko),
  };
}
