import { describe, expect, it } from 'vitest';
import {
  edgeCoupled, lineParameters, singleEnded, spacingForZdiff, validityNotes, widthForZ0, type PairGeometry,
  type TraceGeometry,
} from '../../../core/stackup/index.js';
import { kByQuadrature } from './elliptic-quadrature.js';

const mil = 25.4e-6;

const geometries: TraceGeometry[] = [
  { structure: 'microstrip', width: 8 * mil, thickness: 1.4 * mil, below: 4.5 * mil, er: 4.2 },
  { structure: 'embedded-microstrip', width: 8 * mil, thickness: 1.4 * mil, below: 4.5 * mil, cover: 4 * mil, er: 4.2 },
  { structure: 'stripline', width: 5 * mil, thickness: 0.7 * mil, below: 5 * mil, er: 4 },
  { structure: 'offset-stripline', width: 5 * mil, thickness: 0.7 * mil, below: 5 * mil, above: 12 * mil, er: 4 },
  { structure: 'microstrip', width: 8 * mil, thickness: 1.4 * mil, below: 4.5 * mil, er: 4.2, model: 'ipc-2141a' },
  { structure: 'stripline', width: 5 * mil, thickness: 0, below: 5 * mil, er: 4, model: 'cohn-zero-thickness' },
];

describe('per-length line parameters', () => {
  // CODATA 2018 recommended values (NIST): vacuum permittivity and permeability, written here apart from
  // core/stackup/constants.ts (which holds c and η0 only).
  const EPS0 = 8.8541878128e-12; // F/m
  const MU0 = 1.25663706212e-6; // H/m

  it('give the conformal-mapping L and C of a zero-thickness centred stripline', () => {
    // Independent value: the conformal map of a zero-thickness strip between two planes gives the
    // capacitance per length C = 4·ε0·εr·K(k')/K(k), k = sech(πW/2b), k' = tanh(πW/2b) (S. B. Cohn,
    // "Characteristic Impedance of the Shielded-Strip Transmission Line", IRE Trans. MTT-2, 1954, pp. 52-57;
    // Z0 = sqrt(εr)/(c·C) there), and a homogeneous TEM line has L·C = μ0·ε0·εr (Pozar, Microwave
    // Engineering, §3.1, section from memory), so L = μ0·K(k)/(4·K(k')). K by the test-side quadrature, ε0 and μ0 from CODATA,
    // none of them from the code under test. Wide-strip check of the formula: W >> b gives C -> 4ε·W/b,
    // two parallel plates of spacing b/2 (hand calculation). Tolerance 1e-9: CODATA's 11-digit rounding
    // (ε0·μ0·c² = 1 to 1e-10) and the quadrature (1e-12); a wrong factor in L = Z0/vp or C = 1/(Z0·vp) is 100 % off.
    for (const [wOverB, er] of [[0.2, 4], [0.5, 3.5], [1, 4.3], [2, 2.2]]) {
      const b = 11 * mil;
      const p = singleEnded({ structure: 'stripline', width: wOverB * b, thickness: 0, below: b / 2, er, model: 'cohn-zero-thickness' });
      const x = (Math.PI * wOverB) / 2;
      const ratio = kByQuadrature(Math.tanh(x)) / kByQuadrature(1 / Math.cosh(x)); // K(k')/K(k)
      expect(Math.abs(p.capacitancePerMetre / (4 * EPS0 * er * ratio) - 1)).toBeLessThan(1e-9);
      expect(Math.abs(p.inductancePerMetre / (MU0 / (4 * ratio)) - 1)).toBeLessThan(1e-9);
    }
  });

  it('give an inductance per metre that does not depend on the dielectric (standard models)', () => {
    // Physics: a non-magnetic dielectric changes C, never L, of a TEM or quasi-TEM line; L equals that of
    // the same conductors in air, L = 1/(c²·C_air) (Pozar, Microwave Engineering, §3.8 on quasi-TEM microstrip, section from memory).
    // This fails if Z0 and eps_eff of a model do not scale together (e.g. a wrong exponent on εr, or the
    // thickness-corrected widths mixed up). The IPC-2141A forms are separate empirical fits of Z0 and of
    // eps_eff and do not satisfy it, so they are left out. Tolerance 1e-12: rounding only, the standard
    // models satisfy it exactly by construction of their formulas.
    const standard = geometries.filter((g) => g.model !== 'ipc-2141a');
    expect(standard).toHaveLength(5);
    for (const g of standard) {
      const inDielectric = singleEnded(g).inductancePerMetre;
      const inAir = singleEnded({ ...g, er: 1 }).inductancePerMetre;
      expect(Math.abs(inDielectric / inAir - 1)).toBeLessThan(1e-12);
    }
  });

  it('stripline at Dk 4 delays about 170 ps/in', () => {
    // docs/design.md §3 rule of thumb (common practice): ~170 ps/in; exactly sqrt(4)/c = 169.45 ps/in.
    const p = lineParameters(50, 4);
    expect(p.delayPerMetre * 0.0254 * 1e12).toBeCloseTo(169.45, 1);
    const s = singleEnded(geometries[2]);
    expect(Math.abs(s.delayPerMetre * 0.0254 * 1e12 / 170 - 1)).toBeLessThan(0.01);
  });
});

describe('inverse problems', () => {
  it('widthForZ0 round-trips to 0.01 Ω for every structure and model', () => {
    // Acceptance (docs/design.md §3.8): the inverse round-trips to 0.01 Ω. Converged to ~1e-9 Ω by construction.
    for (const g of geometries) {
      for (const target of [35, 50, 65]) {
        const { width: _ignored, ...rest } = g;
        const w = widthForZ0(target, rest, { solver: 'closed-form' }); // the closed-form search
        expect(Math.abs(singleEnded({ ...g, width: w }).z0 - target)).toBeLessThan(1e-6);
      }
    }
  });

  it('spacingForZdiff round-trips to 0.01 Ω for microstrip and stripline pairs', () => {
    // Acceptance (docs/design.md §3.8): round trip to 0.01 Ω.
    const pairs: Omit<PairGeometry, 'spacing'>[] = [
      { structure: 'microstrip', width: 5 * mil, thickness: 1.4 * mil, below: 4 * mil, er: 4.3 },
      { structure: 'stripline', width: 4 * mil, thickness: 0.6 * mil, below: 5 * mil, er: 3.8 },
    ];
    for (const g of pairs) {
      for (const target of [85, 90, 100]) {
        const s = spacingForZdiff(target, g, { solver: 'closed-form' }); // the closed-form search
        expect(Math.abs(edgeCoupled({ ...g, spacing: s }).zdiff - target)).toBeLessThan(1e-6);
      }
    }
  });

  it('reports an unreachable target as an InputError naming it', () => {
    // Zdiff cannot exceed 2·Z0 of the lone trace (uncoupled limit, Cohn 1955 / K&J 1984).
    const g = { structure: 'stripline' as const, width: 5 * mil, thickness: 0.6 * mil, below: 5 * mil, er: 4 };
    expect(() => spacingForZdiff(300, g)).toThrow(/target Zdiff/);
    expect(() => widthForZ0(1000, g)).toThrow(/target Z0/);
    expect(() => widthForZ0(-5, g)).toThrow(/target Z0/);
    expect(() => spacingForZdiff(100, { ...g, structure: 'offset-stripline', above: 9 * mil }, { solver: 'closed-form' })).toThrow(/structure/);
  });
});

describe('pairs', () => {
  it('reports Zdiff = 2·Zodd and Zcommon = Zeven/2', () => {
    // Definitions (docs/design.md §3).
    const p = edgeCoupled({ structure: 'microstrip', width: 5 * mil, thickness: 1.4 * mil, below: 4 * mil, er: 4.3, spacing: 5 * mil });
    expect(p.zdiff).toBe(2 * p.zodd);
    expect(p.zcommon).toBe(p.zeven / 2);
  });
});

describe('geometry validation names the field', () => {
  const base: TraceGeometry = { structure: 'microstrip', width: 8 * mil, thickness: 1.4 * mil, below: 4.5 * mil, er: 4.2 };
  const cases: [Partial<PairGeometry>, RegExp][] = [
    [{ width: 0 }, /trace width/],
    [{ width: Number.NaN }, /trace width/],
    [{ thickness: -1e-6 }, /trace thickness/],
    [{ below: 0 }, /trace below/],
    [{ er: 0.5 }, /trace er/],
    [{ above: 5 * mil }, /trace above/],
    [{ cover: 5 * mil }, /trace cover/],
    [{ structure: 'coax' as never }, /trace structure/],
    [{ model: 'magic' as never }, /trace model/],
    [{ model: 'cohn-zero-thickness' }, /trace model/],
    [{ structure: 'offset-stripline' }, /trace above/],
    [{ structure: 'embedded-microstrip' }, /trace cover/],
    [{ structure: 'stripline', above: 9 * mil }, /trace above/],
  ];
  for (const [patch, message] of cases) {
    it(`rejects ${JSON.stringify(patch)}`, () => {
      // Quality bar: bad input gets an error naming the field.
      expect(() => singleEnded({ ...base, ...patch } as TraceGeometry)).toThrow(message);
    });
  }
  it('rejects a bad spacing and pairs on unsupported structures', () => {
    expect(() => edgeCoupled({ ...base, spacing: 0 })).toThrow(/trace spacing/);
    expect(() => edgeCoupled({ ...base, structure: 'embedded-microstrip', cover: mil, spacing: mil })).toThrow(/trace spacing/);
    expect(() => edgeCoupled({ ...base, spacing: mil, model: 'ipc-2141a' })).toThrow(/trace model/);
  });
  it('rejects an IPC-2141A geometry whose logarithm turns negative instead of returning a negative Z0', () => {
    // Never NaN or nonsense in output (quality bar): 0.8W + T > 5.98h is outside the IPC form.
    expect(() => singleEnded({ ...base, width: 40 * mil, model: 'ipc-2141a' })).toThrow(/trace width/);
  });
});

describe('validity notes', () => {
  it('are empty inside the published ranges and name the source outside them', () => {
    // Ranges as stated by H&J 1980, IPC-2141A and K&J 1984 (see validityNotes).
    expect(validityNotes({ structure: 'microstrip', width: 8 * mil, thickness: 1.4 * mil, below: 4.5 * mil, er: 4.2 })).toEqual([]);
    expect(validityNotes({ structure: 'microstrip', width: 20 * mil, thickness: 1.4 * mil, below: 4 * mil, er: 4.2, model: 'ipc-2141a' }).join()).toMatch(/W\/h = 5 is outside 0.1-2 \(IPC-2141A\)/);
    expect(validityNotes({ structure: 'microstrip', width: 5 * mil, thickness: 0, below: 4 * mil, er: 4.2, spacing: 60 * mil }).join()).toMatch(/S\/h = 15 .*Kirschning & Jansen 1984/);
    expect(validityNotes({ structure: 'stripline', width: 8 * mil, thickness: 0.6 * mil, below: 5 * mil, er: 4, model: 'ipc-2141a' }).join()).toMatch(/W\/\(b-t\).*IPC-2141A/);
    expect(validityNotes({ structure: 'embedded-microstrip', width: 8 * mil, thickness: 1.4 * mil, below: 5 * mil, cover: 10e-6, er: 4 }).join()).toMatch(/cover thinner than 25 µm/);
  });

  it('check offset stripline against the ranges its model files state', () => {
    // IPC-2141A asymmetric form (ipc-2141a.ts): 0.1 <= W/h <= 2 and T/h < 0.25 with h the nearer plane,
    // not the symmetric form's W/(b-t) < 0.35. W/h = 5/4 = 1.25 is inside although W/(b-t) = 5/16 is too.
    const ipc = { structure: 'offset-stripline' as const, thickness: 0.6 * mil, below: 4 * mil, er: 4, model: 'ipc-2141a' as const };
    expect(validityNotes({ ...ipc, width: 5 * mil, above: 12 * mil })).toEqual([]);
    // W/h = 10/4 = 2.5 > 2 (the symmetric form's W/(b-t) = 10/16 = 0.625 would also trip, so use T/h too).
    expect(validityNotes({ ...ipc, width: 10 * mil, above: 12 * mil }).join()).toMatch(/W\/h \(nearer plane\) = 2.5 is outside 0.1-2 \(IPC-2141A asymmetric stripline\)/);
    // T/h = 1.2/4 = 0.3 > 0.25 while T/b = 1.2/17.2 = 0.07 is far inside the symmetric limit.
    expect(validityNotes({ ...ipc, width: 5 * mil, above: 12 * mil, thickness: 1.2 * mil }).join()).toMatch(/T\/h \(nearer plane\) = 0.3 is outside 0-0.25/);
    // Default parallel combination (offset-stripline.ts): rough past h2/h1 of 3 (reads +3 % at 3, +7 % at 5
    // against the moment-method solution in offset-stripline.test.ts). 12/4 = 3 is the limit, 13/4 past it.
    const standard = { structure: 'offset-stripline' as const, width: 5 * mil, thickness: 0.6 * mil, below: 4 * mil, er: 4 };
    expect(validityNotes({ ...standard, above: 12 * mil })).toEqual([]);
    expect(validityNotes({ ...standard, above: 13 * mil }).join()).toMatch(/h2\/h1 = 3.25 is past 3/);
    // The ratio is the farther over the nearer plane, whichever side is which.
    expect(validityNotes({ ...standard, below: 13 * mil, above: 4 * mil }).join()).toMatch(/h2\/h1 = 3.25 is past 3/);
  });
});
