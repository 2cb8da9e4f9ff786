/**
 * Edge-coupled microstrip, static (low-frequency) even/odd modes after
 * M. Kirschning and R. H. Jansen, "Accurate Wide-Range Design Equations for the Frequency-Dependent
 * Characteristic of Parallel Coupled Microstrip Lines", IEEE Trans. MTT-32, no. 1, 1984, pp. 83-90:
 * eq. 3 (εeff,e(0)), eq. 4 (εeff,o(0)), eqs. 8-9 with Q1..Q10 (Z0e(0), Z0o(0)); the single-line terms
 * are Hammerstad & Jensen 1980 (eqs. 1-5, zero thickness). Only the f = 0 part is implemented: no dispersion.
 *
 * Verification (tests/core/stackup/coupled-microstrip.test.ts): (1) against a quasi-static moment-method
 * field solution written in that test from electrostatics: within 0.6 % (measured up to 0.52 %) across the
 * range below; (2) against tests/core/stackup/reference/kirschning_jansen_1984.py, a independent re-implementation of
 * the same equations kept in the repository: equal to 1e-8, which checks the implementation, not the paper.
 * The paper's text was not at hand to check the coefficients against it. The constant of eqs. 8-9 is
 * written as 377 Ω in some reproductions; this code uses the free-space impedance η0, which moves
 * Z0e/Z0o by < 0.05 % (also in that test).
 * Zero strip thickness (the static equations are for thin strips). Validity range as usually quoted for
 * the paper (value from memory, not checked against its text): 0.1 <= W/h <= 10, 0.1 <= S/h <= 10, 1 <= εr <= 18.
 */
import { ETA0 } from './constants.js';
import { hammerstadJensenEpsEff, hammerstadJensenZ01 } from './hammerstad-jensen.js';

export interface CoupledMicrostripStatic {
  /** Ω */
  zeven: number;
  zodd: number;
  epsEffEven: number;
  epsEffOdd: number;
}

/**
 * Static even/odd Z0 and εeff of a zero-thickness edge-coupled microstrip pair (K&J 1984).
 * @param width each strip's width W, m; @param spacing edge gap S, m; @param height substrate h, m.
 */
export function kirschningJansenCoupledMicrostrip(width: number, spacing: number, height: number, er: number): CoupledMicrostripStatic {
  const u = width / height;
  const g = spacing / height;
  // Single line, zero thickness (H&J 1980 eqs. 1-5), as K&J 1984 use it.
  const ee0 = hammerstadJensenEpsEff(u, er);
  const z0 = hammerstadJensenZ01(u) / Math.sqrt(ee0);

  // Even-mode εeff (K&J 1984 eq. 3): the H&J single-line form evaluated at the modified ratio v.
  const v = (u * (20 + g * g)) / (10 + g * g) + g * Math.exp(-g);
  const epsEffEven = hammerstadJensenEpsEff(v, er);

  // Odd-mode εeff (K&J 1984 eq. 4).
  const ao = 0.7287 * (ee0 - (er + 1) / 2) * (1 - Math.exp(-0.179 * u));
  const bo = (0.747 * er) / (0.15 + er);
  const co = bo - (bo - 0.207) * Math.exp(-0.414 * u);
  const dO = 0.593 + 0.694 * Math.exp(-0.562 * u);
  const epsEffOdd = ((er + 1) / 2 + ao - ee0) * Math.exp(-co * Math.pow(g, dO)) + ee0;

  // Impedances (K&J 1984 eqs. 8-9 with Q1..Q10).
  const q1 = 0.8695 * Math.pow(u, 0.194);
  const q2 = 1 + 0.7519 * g + 0.189 * Math.pow(g, 2.31);
  const q3 =
    0.1975 + Math.pow(16.6 + Math.pow(8.4 / g, 6), -0.387) + Math.log(Math.pow(g, 10) / (1 + Math.pow(g / 3.4, 10))) / 241;
  const q4 = ((2 * q1) / q2) / (Math.exp(-g) * Math.pow(u, q3) + (2 - Math.exp(-g)) * Math.pow(u, -q3));
  const q5 = 1.794 + 1.14 * Math.log(1 + 0.638 / (g + 0.517 * Math.pow(g, 2.43)));
  const q6 = 0.2305 + Math.log(Math.pow(g, 10) / (1 + Math.pow(g / 5.8, 10))) / 281.3 + Math.log(1 + 0.598 * Math.pow(g, 1.154)) / 5.1;
  const q7 = (10 + 190 * g * g) / (1 + 82.3 * g * g * g);
  const q8 = Math.exp(-6.5 - 0.95 * Math.log(g) - Math.pow(g / 0.15, 5));
  const q9 = Math.log(q7) * (q8 + 1 / 16.5);
  const q10 = q4 - (q5 / q2) * Math.exp((q6 * Math.log(u)) / Math.pow(u, q9));

  // Z0(0)·sqrt(εeff(0))/η0 = Z01/η0: the air-line impedance over the free-space impedance.
  const common = (z0 / ETA0) * Math.sqrt(ee0);
  const zeven = (z0 * Math.sqrt(ee0 / epsEffEven)) / (1 - common * q4);
  const zodd = (z0 * Math.sqrt(ee0 / epsEffOdd)) / (1 - common * q10);
  return { zeven, zodd, epsEffEven, epsEffOdd };
}
