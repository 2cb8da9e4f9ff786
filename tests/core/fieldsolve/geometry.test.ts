/**
 * Solder mask, etch profile, embedded and offset structures, bad input and the potential map of the
 * field solver (core/fieldsolve).
 */
import { describe, expect, it } from 'vitest';
import { InputError } from '../../../core/errors.js';
import {
  fieldPair, fieldSingleLine, pcbCrossSection, potentialMap, solveCrossSection, validateCrossSection, type CrossSection,
} from '../../../core/fieldsolve/index.js';

const mil = 25.4e-6;
const rel = (a: number, b: number): number => Math.abs(a / b - 1);
const outer = { width: 8 * mil, thickness: 1.4 * mil, below: 4 * mil, er: 4.3 };

describe('solder mask', () => {
  it('lowers Z0 and raises eps_eff the thicker the coat', () => {
    // A dielectric coat replaces air in the fringing field: C rises, C0 is unchanged (Gupta, Garg, Bahl,
    // Microstrip Lines and Slotlines, 2nd ed. 1996, §2.4 on covered microstrip). Monotone; no tolerance.
    const bare = fieldSingleLine(pcbCrossSection(outer));
    const thin = fieldSingleLine(pcbCrossSection({ ...outer, mask: { thickness: 0.5 * mil, er: 3.5 } }));
    const thick = fieldSingleLine(pcbCrossSection({ ...outer, mask: { thickness: 1 * mil, er: 3.5 } }));
    expect(thin.z0).toBeLessThan(bare.z0);
    expect(thick.z0).toBeLessThan(thin.z0);
    expect(thin.epsEff).toBeGreaterThan(bare.epsEff);
    expect(thick.epsEff).toBeGreaterThan(thin.epsEff);
    // Inductance depends on the conductors only (L = μ0ε0/C0, Paul 2008 §3.2): equal within the
    // convergence estimates (a few 0.01 %), so 0.3 %.
    expect(rel(thick.inductancePerMetre, bare.inductancePerMetre)).toBeLessThan(0.003);
    // A few percent for a 0.5-1 mil coat of Dk 3.5 over 4 mil FR-4: the size quoted for common masks
    // (value from memory: 1-3 Ω on 50 Ω); bound it to 1-10 % so a missing mask or a flooded box fails.
    expect(1 - thick.z0 / bare.z0).toBeGreaterThan(0.01);
    expect(1 - thick.z0 / bare.z0).toBeLessThan(0.1);
  });

  it('a very thick coat of the substrate Dk is a buried trace', () => {
    // Consistency of two geometries: a 30 mil conformal coat of Dk 4.3 and a flat 30 mil cover of Dk 4.3
    // differ only by the bump over the trace, far above it. 0.3 %: the two convergence estimates.
    const coated = fieldSingleLine(pcbCrossSection({ ...outer, mask: { thickness: 30 * mil, er: 4.3 } }));
    const buried = fieldSingleLine(pcbCrossSection({ ...outer, above: 30 * mil }));
    expect(rel(coated.z0, buried.z0)).toBeLessThan(0.003);
    expect(rel(coated.epsEff, buried.epsEff)).toBeLessThan(0.003);
  });
});

describe('etch profile', () => {
  it('an etch factor narrows the top and raises Z0; an infinite factor is the rectangle', () => {
    // Less copper, less capacitance (Dirichlet principle: C grows with the conductor). Monotone in E.
    const rect = fieldSingleLine(pcbCrossSection(outer));
    const inf = fieldSingleLine(pcbCrossSection({ ...outer, etchFactor: Infinity }));
    expect(inf.z0).toBe(rect.z0);
    const e4 = fieldSingleLine(pcbCrossSection({ ...outer, etchFactor: 4 }));
    const e1 = fieldSingleLine(pcbCrossSection({ ...outer, etchFactor: 1 }));
    expect(e4.z0).toBeGreaterThan(rect.z0);
    expect(e1.z0).toBeGreaterThan(e4.z0);
    // Bounded by the rectangles of the foot width and of the top width (W − 2T/E = 5.2 mil at E = 1).
    const narrow = fieldSingleLine(pcbCrossSection({ ...outer, width: outer.width - 2 * outer.thickness }));
    expect(e1.z0).toBeLessThan(narrow.z0);
  });
});

describe('stripline structures', () => {
  it('an offset trace is lower in Z0 than the parallel combination of two half-striplines predicts', () => {
    // The parallel-combination estimate (Wadell 1991) reads high by a few percent at h2/h1 = 3 (see
    // core/stackup/offset-stripline.ts): the field solution must be lower, by 0.5-6 %.
    // Wheeler 1978 Z(b) halves: computed here by the field solver too, so the comparison is solver vs solver.
    const g = { width: 5 * mil, thickness: 0.6 * mil, er: 4, topPlane: true };
    const offset = fieldSingleLine(pcbCrossSection({ ...g, below: 4 * mil, above: 12 * mil }));
    const z = (h: number): number => fieldSingleLine(pcbCrossSection({ ...g, below: h, above: h })).z0;
    const za = z(4 * mil);
    const zb = z(12 * mil);
    const parallel = (2 * za * zb) / (za + zb);
    expect(offset.z0).toBeLessThan(parallel);
    expect(1 - offset.z0 / parallel).toBeGreaterThan(0.005);
    expect(1 - offset.z0 / parallel).toBeLessThan(0.06);
  });

  it('two dielectrics between the planes give eps_eff between them', () => {
    // Mixed dielectric: C/C0 is a field-weighted mean of the two Dk (bounded by them). No tolerance.
    const r = fieldSingleLine(pcbCrossSection({ width: 5 * mil, thickness: 0.6 * mil, below: 5 * mil, er: 3.5, above: 5 * mil, erAbove: 4.5, topPlane: true }));
    expect(r.epsEff).toBeGreaterThan(3.5);
    expect(r.epsEff).toBeLessThan(4.5);
  });
});

describe('bad input', () => {
  const base = (): CrossSection => pcbCrossSection({ width: 5 * mil, thickness: 1.4 * mil, below: 4 * mil, er: 4.3, spacing: 5 * mil });
  const cases: [string, (s: CrossSection) => void, RegExp][] = [
    ['overlapping traces', (s) => { s.traces[1].centre = s.traces[0].centre + 3 * mil; }, /trace 2 centre: overlaps or touches trace 1/],
    ['trace in the air', (s) => { s.traces[0].base = 6 * mil; }, /trace 1 base: .*above the dielectric surface/],
    ['zero width', (s) => { s.traces[0].width = 0; }, /trace 1 width: must be a positive length, got 0/],
    ['negative thickness', (s) => { s.traces[1].thickness = -1e-6; }, /trace 2 thickness: must be zero or a positive length/],
    ['NaN layer', (s) => { s.layers[0].thickness = Number.NaN; }, /layer 1 thickness: must be a positive length, got NaN/],
    ['Dk below 1', (s) => { s.layers[0].er = 0.5; }, /layer 1 er: relative permittivity must be at least 1/],
    ['trace on the plane', (s) => { s.traces[0].base = 0; }, /trace 1 base: must lie above the bottom plane/],
    ['etched away', (s) => { s.traces[0].etchFactor = 0.5; }, /trace 1 etch factor: .*undercuts/],
    ['mask under a plane', (s) => { s.topPlane = true; s.layers.push({ thickness: 5 * mil, er: 4 }); s.mask = { thickness: 1e-5, er: 3.5 }; }, /mask: a solder mask coats an outer layer/],
  ];
  for (const [name, mutate, message] of cases) {
    it(`names the field: ${name}`, () => {
      // Contract of core/errors.ts: InputError naming the field; never a NaN result.
      const s = base();
      mutate(s);
      expect(() => validateCrossSection(s)).toThrow(InputError);
      expect(() => fieldPair(s)).toThrow(message);
    });
  }

  it('a trace through the top plane of a stripline is rejected', () => {
    // A trace must lie inside the dielectric between the planes.
    const s = pcbCrossSection({ width: 5 * mil, thickness: 1.4 * mil, below: 4 * mil, above: 2 * mil, er: 4, topPlane: true });
    s.traces[0].thickness = 4 * mil; // top at 8 mil, the top plane at 4 + 1.4 + 2 = 7.4 mil
    expect(() => fieldSingleLine(s)).toThrow(/trace 1 base: the trace .* reaches the top plane/);
  });

  it('says so when the iterative solve cannot converge', () => {
    // Two CG iterations cannot reach a 1e-6 residual on any of these grids.
    expect(() => solveCrossSection(base(), { control: { maxIterations: 2 } })).toThrow(/field solver mesh: the iterative solve did not converge/);
  });

  it('says so when the mesh sequence cannot reach the target', () => {
    // A target of 1e-9 is beyond three meshes; the estimate stays above ten times the target.
    expect(() => solveCrossSection(base(), { target: 1e-9, maxLevel: 2 })).toThrow(/field solver mesh: did not converge/);
  });
});

describe('potential map', () => {
  it('holds each conductor at its voltage, the planes at 0 V, and is odd for a differential drive', () => {
    // Boundary conditions of the Dirichlet problem; odd symmetry of the odd mode (Cohn 1955). The
    // maximum principle keeps every potential between −1 and 1 V. 1e-6: the CG tolerance.
    const m = potentialMap(pcbCrossSection({ width: 5 * mil, thickness: 1.4 * mil, below: 4 * mil, er: 4.3, spacing: 5 * mil }));
    let maxAbs = 0;
    for (let j = 0; j < m.ny; j++) {
      for (let i = 0; i < m.nx; i++) {
        const n = j * m.nx + i;
        const v = m.potential[n];
        maxAbs = Math.max(maxAbs, Math.abs(v));
        if (m.kind[n] === 1) expect(v).toBe(1);
        if (m.kind[n] === 2) expect(v).toBe(-1);
        if (m.kind[n] === 0) expect(v).toBe(0);
      }
    }
    expect(maxAbs).toBeLessThanOrEqual(1);
    // Grid is symmetric about x = 0 (built from mirrored traces): φ(−x) = −φ(x).
    const j = m.ys.findIndex((y) => Math.abs(y - 4 * mil) < 1e-12) + 1;
    for (let i = 0; i < m.nx; i++) {
      expect(Math.abs(m.xs[i] + m.xs[m.nx - 1 - i])).toBeLessThan(1e-12);
      expect(m.potential[j * m.nx + i]).toBeCloseTo(-m.potential[j * m.nx + m.nx - 1 - i], 5);
    }
  });

  it('rejects a wrong number of voltages', () => {
    expect(() => potentialMap(pcbCrossSection(outer), [1, 2])).toThrow(/potential map volts/);
  });
});
