/**
 * Embedded microstrip (IPC-2141A cover correction) against an independent quasi-static moment-method
 * (MoM) solution: zero-thickness strip on a substrate h over ground, under a cover c of the same Dk, air above.
 */
import { describe, expect, it } from 'vitest';
import {
  ETA0, hammerstadJensenMicrostrip, ipc2141aEmbeddedEpsEff, singleEnded,
} from '../../../core/stackup/index.js';
import { solveLinear } from './dense-solve.js';

/*
 * Spectral-domain Green's function, written here from Laplace's equation (h = 1, units of ε0): a unit line
 * charge on the strip plane y = h gives, along that plane, φ̃(k) = 1/(k·(εr·coth(kh) + Y(k))), with the
 * cover-plus-air "admittance" Y(k) = εr(1 + εr·tanh(kc))/(εr + tanh(kc)) (Y = 1 with no cover).
 * The part with the same k -> ∞ limit, (1 - e^{-2kh})/((εr + Y∞)k), is the charge and its ground image in a
 * uniform medium and is integrated exactly in space (logarithms); the smooth remainder is integrated over k
 * by composite 8-point Gauss-Legendre. Pulse basis, cosine-graded segments, point matching at midpoints.
 */
const GAUSS8: [number, number][] = [
  [-0.9602898564975363, 0.1012285362903763], [-0.7966664774136267, 0.2223810344533745],
  [-0.525532409916329, 0.3137066458778873], [-0.1834346424956498, 0.362683783378362],
  [0.1834346424956498, 0.362683783378362], [0.525532409916329, 0.3137066458778873],
  [0.7966664774136267, 0.2223810344533745], [0.9602898564975363, 0.1012285362903763],
];

function logAntiderivative(u: number, d: number): number {
  if (d === 0) return u === 0 ? 0 : u * Math.log(Math.abs(u)) - u;
  return 0.5 * u * Math.log(u * u + d * d) - u + d * Math.atan(u / d);
}
const segmentLog = (x: number, a: number, b: number, d: number): number => logAntiderivative(x - a, d) - logAntiderivative(x - b, d);


/** C/ε0 of a strip of width u (h = 1) under a cover of thickness c (0 = none), all dielectric Dk er. */
function stripCapacitance(u: number, c: number, er: number, segments = 32, panels = 160): number {
  const yInf = c > 0 ? er : 1;
  const kMax = 40 / Math.min(1, c > 0 ? c : 1); // remainder ~ e^{-2k·min(h, c)}: e^{-80} at kMax
  const ks: number[] = [];
  const weights: number[] = [];
  const step = kMax / panels;
  for (let p = 0; p < panels; p++) {
    for (const [t, w] of GAUSS8) {
      const k = step * (p + 0.5 + 0.5 * t);
      const th = Math.tanh(k * c);
      const y = (er * (1 + er * th)) / (er + th);
      const remainder = 1 / (k * (er / Math.tanh(k) + y)) - (1 - Math.exp(-2 * k)) / ((er + yInf) * k);
      ks.push(k);
      weights.push(0.5 * step * w * remainder);
    }
  }
  const edges = Array.from({ length: segments + 1 }, (_, i) => (u * (1 - Math.cos((Math.PI * i) / segments))) / 2 - u / 2);
  const mids = edges.slice(0, segments).map((e, i) => 0.5 * (e + edges[i + 1]));
  const matrix = mids.map((x) => edges.slice(0, segments).map((a, j) => {
    const b = edges[j + 1];
    let spectral = 0;
    for (let m = 0; m < ks.length; m++) spectral += (weights[m] * (Math.sin(ks[m] * (x - a)) - Math.sin(ks[m] * (x - b)))) / ks[m];
    return spectral / Math.PI + (segmentLog(x, a, b, 2) - segmentLog(x, a, b, 0)) / (Math.PI * (er + yInf));
  }));
  const density = solveLinear(matrix, new Array<number>(segments).fill(1));
  return density.reduce((q, s, j) => q + s * (edges[j + 1] - edges[j]), 0);
}

const solved = new Map<string, { z0: number; epsEff: number }>();

/** Z0 and εeff from the MoM (memoised: several tests use the same geometries). */
function mom(u: number, c: number, er: number): { z0: number; epsEff: number } {
  const key = `${u}/${c}/${er}`;
  let result = solved.get(key);
  if (!result) {
    const cDk = stripCapacitance(u, c, er);
    const cAir = stripCapacitance(u, c, 1);
    result = { z0: ETA0 / Math.sqrt(cDk * cAir), epsEff: cDk / cAir };
    solved.set(key, result);
  }
  return result;
}

const rel = (a: number, b: number): number => a / b - 1;

describe('spectral MoM reference (self-check)', () => {
  it('without a cover reproduces Hammerstad & Jensen 1980 within 0.2 %', () => {
    // H&J 1980 state < 0.2 % for εeff and < 0.01 % for Z01; measured here 0.03-0.05 % (εeff), 0.02-0.04 % (Z0).
    for (const [u, er] of [[1, 4.3], [2, 4]]) {
      const ref = mom(u, 0, er);
      const hj = hammerstadJensenMicrostrip(u, 0, 1, er);
      expect(Math.abs(rel(hj.epsEff, ref.epsEff))).toBeLessThan(0.002);
      expect(Math.abs(rel(hj.z0, ref.z0))).toBeLessThan(0.002);
    }
  });

  it('tends to the fully embedded value εeff -> εr under a thick cover', () => {
    // Physics: with dielectric everywhere the line is TEM in εr (Pozar, Microwave Engineering §3.7); c = 20h leaves
    // a little field in air (measured εeff = 0.9993 εr).
    expect(Math.abs(rel(mom(1, 20, 4.3).epsEff, 4.3))).toBeLessThan(0.002);
  });
});

describe('embedded microstrip against the MoM (zero thickness, cover Dk = substrate Dk)', () => {
  // W/h, cover/h, εr
  const cases: [number, number, number][] = [[1, 0.1, 4.3], [1, 0.5, 4.3], [1, 2, 4.3], [2, 0.1, 4], [2, 0.5, 4], [2, 2, 4]];

  it('IPC-2141A εr′ reads 0-5.5 % above the field solution for covers of 0.1-2 h', () => {
    // Measured when the band was set: +4.7, +2.3, +2.0 % (W/h = 1) and +1.4, +2.7, +2.8 % (W/h = 2). The band documents the
    // accuracy of the form (itself value from memory) and catches a changed coefficient.
    for (const [u, c, er] of cases) {
      const e = rel(ipc2141aEmbeddedEpsEff(0, 1, c, er), mom(u, c, er).epsEff);
      expect(e).toBeGreaterThan(0);
      expect(e).toBeLessThan(0.055);
    }
  });

  it('the default embedded model (H&J air line over √εr′) reads Z0 0-3 % low', () => {
    // Measured when the band was set: -2.3, -1.2, -1.0 % (W/h = 1) and -0.7, -1.4, -1.4 % (W/h = 2); band 0 to -3 %.
    for (const [u, c, er] of cases) {
      const model = singleEnded({ structure: 'embedded-microstrip', width: u, thickness: 0, below: 1, cover: c, er });
      const e = rel(model.z0, mom(u, c, er).z0);
      expect(e).toBeLessThan(0);
      expect(e).toBeGreaterThan(-0.03);
    }
  });
});
