import { describe, expect, it } from 'vitest';
import {
  cohnCoupledStripline, cohnStriplineZ0, ETA0, ipc2141aOffsetStriplineZ0, ipc2141aStriplineZ0,
  parallelCombinationOffsetStriplineZ0, wheelerStriplineZ0,
} from '../../../core/stackup/index.js';
import { kByQuadrature } from './elliptic-quadrature.js';

const mil = 25.4e-6;

/** K(k) by quadrature of A&S 17.3.1 (independent of the AGM code under test), 100 000 panels. */
const kQuad = (k: number): number => kByQuadrature(k, 100_000);

describe('Cohn exact zero-thickness stripline', () => {
  it('matches Cohn 1954 evaluated with quadrature-computed K to 1e-6 relative', () => {
    // Reference: Z0 = (η0/4)/√εr · K(sech x)/K(tanh x), x = πW/2b (Cohn 1954), K by quadrature here.
    for (const wb of [0.1, 0.3, 0.5, 1, 2]) {
      const x = (Math.PI * wb) / 2;
      const ref = (ETA0 / 4 / Math.sqrt(4.2)) * (kQuad(1 / Math.cosh(x)) / kQuad(Math.tanh(x)));
      expect(Math.abs(cohnStriplineZ0(wb * 1e-3, 1e-3, 4.2) / ref - 1)).toBeLessThan(1e-6);
    }
  });

  it('has the wide-strip limit Z0 -> (η0/4)/√εr · (π/2)/(πW/2b + ln 2)', () => {
    // For W >> b, k = sech(x) -> 2e^-x and K(k)/K(k') -> (π/2)/ln(4/k) (A&S 17.3.11, 17.3.26) in Cohn 1954:
    // the parallel-plate term η0·b/(4W) plus the edge fringing ln 2. At W/b = 6 the neglected terms are ~1e-8.
    const wb = 6;
    const approx = (ETA0 / 4) * (Math.PI / 2) / ((Math.PI * wb) / 2 + Math.log(2));
    expect(Math.abs(cohnStriplineZ0(wb, 1, 1) / approx - 1)).toBeLessThan(1e-6);
  });

  it('scales as 1/√εr (homogeneous dielectric, TEM)', () => {
    // Physics of a TEM line in a homogeneous dielectric (Pozar, Microwave Engineering §3.7).
    expect(cohnStriplineZ0(1, 2, 4) * 2).toBeCloseTo(cohnStriplineZ0(1, 2, 1), 10);
  });
});

describe('Wheeler 1978 thickness-corrected stripline', () => {
  it('stays within 0.5 % of Cohn exact at zero thickness for 0.05 <= W/b <= 5', () => {
    // Wheeler 1978 states about 0.5 % accuracy; docs/design.md §3.8 acceptance: within 0.5 % of Cohn exact.
    for (const wb of [0.05, 0.1, 0.2, 0.35, 0.5, 1, 2, 3, 5]) {
      const rel = wheelerStriplineZ0(wb, 0, 1, 4) / cohnStriplineZ0(wb, 1, 4) - 1;
      expect(Math.abs(rel)).toBeLessThan(0.005);
    }
  });

  it('lowers Z0 as the strip gets thicker (more fringing capacitance)', () => {
    // Physics, common practice, no source: a thicker strip has more capacitance to the planes.
    const z = [0, 0.35, 0.7, 1.4].map((t) => wheelerStriplineZ0(5 * mil, t * mil, 10 * mil + t * mil, 4));
    for (let i = 1; i < z.length; i++) expect(z[i]).toBeLessThan(z[i - 1]);
  });

  it('gives about 50 Ω for 5 mil in 0.7 mil copper between 5 mil dielectrics at Dk 4', () => {
    // Common practice, no source: this is a typical 50-Ω inner-layer geometry; a band of ±10 %.
    const z = wheelerStriplineZ0(5 * mil, 0.7 * mil, 10.7 * mil, 4);
    expect(z).toBeGreaterThan(40);
    expect(z).toBeLessThan(52);
  });
});

describe('offset stripline (parallel combination)', () => {
  it('reduces to the symmetric stripline when h1 = h2', () => {
    // Identity of the parallel-combination form (Wadell 1991): two equal halves in parallel.
    expect(parallelCombinationOffsetStriplineZ0(5 * mil, 0.7 * mil, 6 * mil, 6 * mil, 4)).toBeCloseTo(
      wheelerStriplineZ0(5 * mil, 0.7 * mil, 12.7 * mil, 4), 10);
  });

  it('is symmetric in h1 and h2 and lower than the centred trace for the same plane spacing', () => {
    // Physics: flipping the board cannot change Z0; moving towards one plane adds capacitance.
    const a = parallelCombinationOffsetStriplineZ0(5 * mil, 0.7 * mil, 4 * mil, 12 * mil, 4);
    const b = parallelCombinationOffsetStriplineZ0(5 * mil, 0.7 * mil, 12 * mil, 4 * mil, 4);
    expect(a).toBeCloseTo(b, 12);
    expect(a).toBeLessThan(wheelerStriplineZ0(5 * mil, 0.7 * mil, 16.7 * mil, 4));
  });

  it('lies between the two symmetric striplines it combines', () => {
    // Property of a harmonic-mean style combination (Wadell 1991 form).
    const z = parallelCombinationOffsetStriplineZ0(5 * mil, 0.7 * mil, 4 * mil, 12 * mil, 4);
    expect(z).toBeGreaterThan(wheelerStriplineZ0(5 * mil, 0.7 * mil, 8.7 * mil, 4));
    expect(z).toBeLessThan(wheelerStriplineZ0(5 * mil, 0.7 * mil, 24.7 * mil, 4));
  });
});

describe('IPC-2141A stripline forms', () => {
  it('symmetric: hand evaluation of 60/√εr · ln(1.9b/(0.8W+T))', () => {
    // Hand evaluation of the IPC-2141A §4.2.3 form: W=5, T=0.7, b=10.7 mil, εr=4:
    // 30 · ln(20.33/4.7) = 30 · 1.464587 = 43.936 Ω.
    expect(ipc2141aStriplineZ0(5 * mil, 0.7 * mil, 10.7 * mil, 4)).toBeCloseTo(43.936, 2);
  });

  it('asymmetric: hand evaluation and continuity with the symmetric form at h1 = h2', () => {
    // Hand evaluation of the IPC-2141A asymmetric form: W=5, T=0.7, h=5, h2=10 mil, εr=4:
    // 40 · ln(1.9·10.7/4.7) · (1 - 5/40) = 40 · 1.464587 · 0.875 = 51.261 Ω.
    expect(ipc2141aOffsetStriplineZ0(5 * mil, 0.7 * mil, 5 * mil, 10 * mil, 4)).toBeCloseTo(51.261, 2);
    // At h1 = h2: 80·(1 - 1/4) = 60, the symmetric form exactly (identity of the two published forms).
    expect(ipc2141aOffsetStriplineZ0(5 * mil, 0.7 * mil, 5 * mil, 5 * mil, 4)).toBeCloseTo(
      ipc2141aStriplineZ0(5 * mil, 0.7 * mil, 10.7 * mil, 4), 10);
  });

  it('drifts from the thickness-corrected form past W/(b-t) = 0.35 (docs/design.md §3)', () => {
    // docs/design.md §3: the simple form drifts past W/(b-t) = 0.35. Inside: within 5 %; at W/(b-t)=1.5: off by more.
    const inside = ipc2141aStriplineZ0(3 * mil, 0.7 * mil, 10.7 * mil, 4) / wheelerStriplineZ0(3 * mil, 0.7 * mil, 10.7 * mil, 4);
    const outside = ipc2141aStriplineZ0(15 * mil, 0.7 * mil, 10.7 * mil, 4) / wheelerStriplineZ0(15 * mil, 0.7 * mil, 10.7 * mil, 4);
    expect(Math.abs(inside - 1)).toBeLessThan(0.05);
    expect(Math.abs(outside - 1)).toBeGreaterThan(Math.abs(inside - 1));
  });
});

describe('Cohn 1955 coupled stripline (zero thickness)', () => {
  it('matches the even/odd moduli evaluated with quadrature K to 1e-6', () => {
    // Reference: Cohn 1955, ke = tanh(πW/2b)·tanh(π(W+S)/2b), ko = tanh(πW/2b)·coth(π(W+S)/2b),
    // Z = (η0/4)/√εr · K(k′)/K(k); K by quadrature here. Moduli kept below 0.999 so quadrature is exact enough.
    const [w, s, b, er] = [0.4, 0.3, 1, 3.5];
    const a = Math.tanh((Math.PI * w) / (2 * b));
    const c = Math.tanh((Math.PI * (w + s)) / (2 * b));
    const z = (k: number): number => (ETA0 / 4 / Math.sqrt(er)) * (kQuad(Math.sqrt(1 - k * k)) / kQuad(k));
    const r = cohnCoupledStripline(w, s, b, er);
    expect(Math.abs(r.zeven / z(a * c) - 1)).toBeLessThan(1e-6);
    expect(Math.abs(r.zodd / z(a / c) - 1)).toBeLessThan(1e-6);
  });

  it('tends to the single-strip Cohn Z0 for a wide gap, with Zodd < Z0 < Zeven', () => {
    // Cohn 1955 limit: uncoupled strips (tanh -> 1) give back Cohn 1954; coupling splits the modes.
    const single = cohnStriplineZ0(0.5, 1, 4);
    const wide = cohnCoupledStripline(0.5, 10, 1, 4);
    expect(Math.abs(wide.zodd / single - 1)).toBeLessThan(1e-9);
    expect(Math.abs(wide.zeven / single - 1)).toBeLessThan(1e-9);
    const near = cohnCoupledStripline(0.5, 0.2, 1, 4);
    expect(near.zodd).toBeLessThan(single);
    expect(near.zeven).toBeGreaterThan(single);
  });

  it('stays finite and ordered for very close and very wide strips', () => {
    // Numerical robustness (k -> 1 in both modes), common practice, no source.
    const r = cohnCoupledStripline(5, 1e-4, 1, 4);
    expect(Number.isFinite(r.zodd) && r.zodd > 0).toBe(true);
    expect(r.zodd).toBeLessThan(r.zeven);
  });
});
