/**
 * Offset (asymmetric) stripline against an independent quasi-static moment-method (MoM) solution of a
 * zero-thickness strip between two ground planes in a homogeneous dielectric, written here from electrostatics.
 */
import { describe, expect, it } from 'vitest';
import {
  cohnStriplineZ0, ETA0, ipc2141aOffsetStriplineZ0, parallelCombinationOffsetStriplineZ0,
} from '../../../core/stackup/index.js';
import { solveLinear } from './dense-solve.js';

/*
 * Potential of a unit line charge at height y0 between grounded planes y = 0 and y = b (method of images
 * summed in closed form; any electrostatics text, e.g. Smythe, Static and Dynamic Electricity, value from memory):
 *   φ(x, y) = 1/(4π ε) · ln[(cosh(πx/b) - cos(π(y + y0)/b)) / (cosh(πx/b) - cos(π(y - y0)/b))].
 * It vanishes on both planes and tends to -ln r/(2π ε) near the charge (checked below against Cohn's exact
 * centred result). On the strip (y = y0), with cosh(πx/b) - 1 = 2 sinh²(πx/2b):
 *   4π ε φ(x) = -2 ln|x| + [ln(cosh(πx/b) - cos(2π y0/b)) - ln 2 - 2 ln(sinh(π|x|/2b)/|x|)],
 * the first term integrated exactly over each segment, the bracket (smooth) by 8-point Gauss-Legendre.
 * Pulse basis, cosine-graded segments, point matching at midpoints; C in units of ε (so Z = η0/(√εr·C)).
 */
const GAUSS8: [number, number][] = [
  [-0.9602898564975363, 0.1012285362903763], [-0.7966664774136267, 0.2223810344533745],
  [-0.525532409916329, 0.3137066458778873], [-0.1834346424956498, 0.362683783378362],
  [0.1834346424956498, 0.362683783378362], [0.525532409916329, 0.3137066458778873],
  [0.7966664774136267, 0.2223810344533745], [0.9602898564975363, 0.1012285362903763],
];


/** MoM Z0 (Ω) of a zero-thickness strip of width w, h1 above one plane and h2 below the other, Dk er. */
function momOffsetStripline(w: number, h1: number, h2: number, er: number, segments = 60): number {
  const b = h1 + h2;
  const cosT = Math.cos((2 * Math.PI * h1) / b);
  const smooth = (x: number): number => {
    const a = (Math.PI * Math.abs(x)) / (2 * b);
    const sinhOverX = a < 1e-8 ? Math.PI / (2 * b) : Math.sinh(a) / Math.abs(x);
    return Math.log(Math.cosh((Math.PI * x) / b) - cosT) - Math.LN2 - 2 * Math.log(sinhOverX);
  };
  const xLogX = (u: number): number => (u === 0 ? 0 : u * Math.log(Math.abs(u)) - u);
  const edges = Array.from({ length: segments + 1 }, (_, i) => (w * (1 - Math.cos((Math.PI * i) / segments))) / 2);
  const mids = edges.slice(0, segments).map((e, i) => 0.5 * (e + edges[i + 1]));
  const matrix = mids.map((x) => edges.slice(0, segments).map((a, j) => {
    const e = edges[j + 1];
    const half = 0.5 * (e - a);
    const centre = 0.5 * (e + a);
    let regular = 0;
    for (const [t, weight] of GAUSS8) regular += weight * smooth(x - (centre + half * t));
    const singular = -2 * (xLogX(x - a) - xLogX(x - e));
    return (regular * half + singular) / (4 * Math.PI);
  }));
  const density = solveLinear(matrix, new Array<number>(segments).fill(1));
  const c = density.reduce((q, s, j) => q + s * (edges[j + 1] - edges[j]), 0);
  return ETA0 / (Math.sqrt(er) * c);
}

const rel = (a: number, b: number): number => a / b - 1;

describe('MoM reference for stripline (self-check)', () => {
  it('reproduces Cohn 1954 exact centred stripline within 0.1 %', () => {
    // Cohn 1954 is exact for this geometry; measured MoM error 0.01-0.03 % at 60 segments; 0.1 % margin.
    for (const wb of [0.1, 0.35, 1, 2]) {
      expect(Math.abs(rel(momOffsetStripline(wb, 0.5, 0.5, 4), cohnStriplineZ0(wb, 1, 4)))).toBeLessThan(0.001);
    }
  });
});

describe('parallel-combination offset stripline against the MoM (zero thickness)', () => {
  it('is within 0.6 % when centred (the Wheeler 1978 error only)', () => {
    // Centred, the combination is exactly Wheeler 1978 (stated about 0.5 %) + MoM error (< 0.1 %).
    for (const w of [0.5, 1, 2]) {
      expect(Math.abs(rel(parallelCombinationOffsetStriplineZ0(w, 0, 1, 1, 4), momOffsetStripline(w, 1, 1, 4)))).toBeLessThan(0.006);
    }
  });

  it('reads high by a known, growing amount as the trace moves off centre', () => {
    // Measured against the MoM, W/h1 = 0.3-2: +1.4 % at h2/h1 = 2, +2.8 to +3.7 % at 3, +5.4 % at 4 (W/h1 = 0.3),
    // +7.0 % at 5. Bands below hold those figures with ~0.5 % margin so a regression in either model shows.
    const cases: [number, number, number, number][] = [
      // W/h1, h2/h1, lowest and highest accepted relative error
      [1, 2, 0.009, 0.019],
      [1.25, 2.4, 0.016, 0.027],
      [0.5, 3, 0.031, 0.042],
      [1, 3, 0.030, 0.040],
      [2, 3, 0.022, 0.033],
      [1, 5, 0.064, 0.075],
    ];
    for (const [w, h2, lo, hi] of cases) {
      const e = rel(parallelCombinationOffsetStriplineZ0(w, 0, 1, h2, 4), momOffsetStripline(w, 1, h2, 4));
      expect(e).toBeGreaterThan(lo);
      expect(e).toBeLessThan(hi);
    }
  });
});

describe('IPC-2141A asymmetric stripline form against the MoM (zero thickness)', () => {
  it('reads low by 4-10 % for W/h <= 1.25 and h2/h1 of 2-5, and far worse at W/h = 2', () => {
    // Measured when the band was set: -5.3 % (W/h1 = 1, h2/h1 = 2), -4.9 % (1, 3), -4.3 % (1, 5), -9.2 % (1.25, 2.4),
    // -23.5 % (2, 3). Documents why it is a labelled alternative only; the form itself is value from memory.
    for (const [w, h2] of [[1, 2], [1, 3], [1, 5], [1.25, 2.4]]) {
      const e = rel(ipc2141aOffsetStriplineZ0(w, 0, 1, h2, 4), momOffsetStripline(w, 1, h2, 4));
      expect(e).toBeLessThan(-0.035);
      expect(e).toBeGreaterThan(-0.10);
    }
    // W/h1 = 2, h2/h1 = 3 is at the edge of the form's stated W/h range: measured -23.5 %; band ±1.5 %
    // around it, so a regression of the form (or of the MoM) in either direction shows.
    const edge = rel(ipc2141aOffsetStriplineZ0(2, 0, 1, 3, 4), momOffsetStripline(2, 1, 3, 4));
    expect(edge).toBeLessThan(-0.22);
    expect(edge).toBeGreaterThan(-0.25);
  });
});
