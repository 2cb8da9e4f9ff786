/**
 * Quasi-static moment-method (MoM) reference for zero-thickness microstrip lines and edge-coupled pairs,
 * used by tests/core/stackup/coupled-microstrip.test.ts and by kj-deviations.ts beside it.
 */
import { ETA0 } from '../../../../core/stackup/constants.js';
import { solveLinear } from '../dense-solve.js';

/*
 * Quasi-static MoM for zero-thickness strips on the top face (y = h) of a dielectric slab εr over an
 * infinite ground plane (y = 0), air above. Written for this test from Laplace's equation, not from any
 * line model: the potential on the face from a unit line charge on the face at horizontal distance x is
 *   φ(x) = 1/(2π ε0) · 2/(1+εr) · Σ_{n>=0} K^n · [ln r(x, 2(n+1)h) - ln r(x, 2nh)],  K = (1-εr)/(1+εr),
 * r(x, d) = sqrt(x² + d²). Derivation: Fourier transform along x gives φ̃(k) = q̃ / (ε0|k|(1 + εr coth|k|h));
 * 1/(1 + εr coth a) = (1 - e^{-2a}) / ((1+εr)(1 - K e^{-2a})), expanded as a geometric series, and
 * e^{-|k|d}/|k| transforms back to -ln r(x, d)/π. For εr = 1 it is the charge and its ground image.
 * Pulse basis on each strip (segments graded towards the edges by a cosine rule), point matching at the
 * segment midpoints, the logarithm integrated exactly over each segment. C per length comes out in units
 * of ε0, so Z = η0 / sqrt(C·C_air) and εeff = C / C_air (quasi-TEM: Z = 1/(c·sqrt(C·C_air))).
 */

/** ∫ ln sqrt(u² + d²) du (antiderivative; d = 0 allowed). */
function logAntiderivative(u: number, d: number): number {
  if (d === 0) return u === 0 ? 0 : u * Math.log(Math.abs(u)) - u;
  return 0.5 * u * Math.log(u * u + d * d) - u + d * Math.atan(u / d);
}

/** ∫_a^b ln sqrt((x - s)² + d²) ds. */
function segmentLog(x: number, a: number, b: number, d: number): number {
  return logAntiderivative(x - a, d) - logAntiderivative(x - b, d);
}


/**
 * Capacitance per length / ε0 of strip 1 (width u, h = 1) held at 1 V. With a gap g, strip 2 is its mirror
 * image about x = 0 at +1 V (even mode, partner = +1) or -1 V (odd mode, partner = -1); gap null = lone strip.
 */
function stripCapacitance(u: number, g: number | null, er: number, partner: 1 | -1, segments: number): number {
  const x0 = g === null ? -u / 2 : g / 2;
  const edges = Array.from({ length: segments + 1 }, (_, i) => x0 + (u * (1 - Math.cos((Math.PI * i) / segments))) / 2);
  const mids = edges.slice(0, segments).map((e, i) => 0.5 * (e + edges[i + 1]));
  const k = (1 - er) / (1 + er);
  const weights: number[] = [1];
  while (k !== 0 && Math.abs(weights[weights.length - 1]) > 1e-13) weights.push(weights[weights.length - 1] * k);
  const scale = 2 / (1 + er) / (2 * Math.PI);
  const kernel = (x: number, a: number, b: number): number => {
    let sum = 0;
    for (let n = 0; n < weights.length; n++) sum += weights[n] * (segmentLog(x, a, b, 2 * (n + 1)) - segmentLog(x, a, b, 2 * n));
    return scale * sum;
  };
  const matrix = mids.map((x) => edges.slice(0, segments).map((a, j) => {
    const b = edges[j + 1];
    return kernel(x, a, b) + (g === null ? 0 : partner * kernel(x, -b, -a));
  }));
  const density = solveLinear(matrix, new Array<number>(segments).fill(1));
  return density.reduce((q, s, j) => q + s * (edges[j + 1] - edges[j]), 0);
}

export interface Modes { zeven: number; zodd: number; epsEffEven: number; epsEffOdd: number }

export function momCoupled(u: number, g: number, er: number, segments = 40): Modes {
  const ce = stripCapacitance(u, g, er, 1, segments);
  const ceAir = stripCapacitance(u, g, 1, 1, segments);
  const co = stripCapacitance(u, g, er, -1, segments);
  const coAir = stripCapacitance(u, g, 1, -1, segments);
  return { zeven: ETA0 / Math.sqrt(ce * ceAir), zodd: ETA0 / Math.sqrt(co * coAir), epsEffEven: ce / ceAir, epsEffOdd: co / coAir };
}

export function momSingle(u: number, er: number, segments = 40): { z0: number; epsEff: number } {
  const c = stripCapacitance(u, null, er, 1, segments);
  const cAir = stripCapacitance(u, null, 1, 1, segments);
  return { z0: ETA0 / Math.sqrt(c * cAir), epsEff: c / cAir };
}
