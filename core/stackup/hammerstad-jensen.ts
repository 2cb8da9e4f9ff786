/**
 * Microstrip static Z0 and effective permittivity after
 * E. Hammerstad and Ø. Jensen, "Accurate Models for Microstrip Computer-Aided Design",
 * IEEE MTT-S International Microwave Symposium Digest, 1980, pp. 407-409.
 *
 * Dimensionless inputs: u = W/h (strip width over substrate height), t = T/h (strip thickness over h).
 * Validity stated by the authors: Z01 error < 0.01 % for u <= 1 and < 0.03 % for u <= 1000;
 * eps_eff error < 0.2 % for 0.01 <= u <= 100 and εr <= 128. Static (low-frequency) values only:
 * no dispersion. A solder-mask coat is not modelled (it lowers Z0 by a few percent).
 */
import { ETA0 } from './constants.js';

const E = Math.E;

/** Z0 of a zero-thickness microstrip in air, Ω (H&J 1980, eq. 1 with f(u) of eq. 2). */
export function hammerstadJensenZ01(u: number): number {
  const f = 6 + (2 * Math.PI - 6) * Math.exp(-Math.pow(30.666 / u, 0.7528));
  return (ETA0 / (2 * Math.PI)) * Math.log(f / u + Math.sqrt(1 + (2 / u) * (2 / u)));
}

/** Effective permittivity of a zero-thickness microstrip (H&J 1980, eqs. 3-5). */
export function hammerstadJensenEpsEff(u: number, er: number): number {
  const u4 = u * u * u * u;
  const a =
    1 +
    Math.log((u4 + (u / 52) * (u / 52)) / (u4 + 0.432)) / 49 +
    Math.log(1 + Math.pow(u / 18.1, 3)) / 18.7;
  const b = 0.564 * Math.pow((er - 0.9) / (er + 3), 0.053);
  return (er + 1) / 2 + ((er - 1) / 2) * Math.pow(1 + 10 / u, -a * b);
}

/** Width corrections for strip thickness (H&J 1980, eqs. 6-7): u1 in air, ur in the dielectric. */
export function hammerstadJensenThicknessWidths(u: number, t: number, er: number): { u1: number; ur: number } {
  if (t <= 0) return { u1: u, ur: u };
  const coth = 1 / Math.tanh(Math.sqrt(6.517 * u));
  const du1 = (t / Math.PI) * Math.log(1 + (4 * E) / (t * coth * coth));
  const dur = 0.5 * (1 + 1 / Math.cosh(Math.sqrt(er - 1))) * du1;
  return { u1: u + du1, ur: u + dur };
}

export interface MicrostripResult {
  /** Ω */
  z0: number;
  epsEff: number;
  /** Z0 with the dielectric replaced by air (thickness-corrected), Ω. */
  z0Air: number;
}

/**
 * Microstrip with strip-thickness correction (H&J 1980, eqs. 1-7):
 * Z0 = Z01(ur)/sqrt(εe(ur)), εe = εe(ur)·(Z01(u1)/Z01(ur))².
 * @param width strip width W, m (> 0)
 * @param thickness strip thickness T, m (>= 0)
 * @param height dielectric height h between strip and plane, m (> 0)
 * @param er relative permittivity of the substrate (>= 1)
 */
export function hammerstadJensenMicrostrip(width: number, thickness: number, height: number, er: number): MicrostripResult {
  const u = width / height;
  const { u1, ur } = hammerstadJensenThicknessWidths(u, thickness / height, er);
  const z01r = hammerstadJensenZ01(ur);
  const z01a = hammerstadJensenZ01(u1);
  const eeR = hammerstadJensenEpsEff(ur, er);
  const z0 = z01r / Math.sqrt(eeR);
  const epsEff = eeR * (z01a / z01r) * (z01a / z01r);
  return { z0, epsEff, z0Air: z01a };
}
