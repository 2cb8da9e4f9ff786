import { describe, expect, it } from 'vitest';
import {
  C0, edgeCoupled, lineParameters, singleEnded, spacingForZdiff, validityNotes, widthForZ0, type PairGeometry,
  type TraceGeometry,
} from '../../../core/stackup/index.js';

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
  it('satisfy Z0 = sqrt(L/C) and vp = 1/sqrt(LC) = c/sqrt(eps_eff) for every structure', () => {
    // Telegrapher's equations for a lossless line (Pozar, Microwave Engineering §2.1); rounding only.
    for (const g of geometries) {
      const p = singleEnded(g);
      expect(Math.abs(Math.sqrt(p.inductancePerMetre / p.capacitancePerMetre) / p.z0 - 1)).toBeLessThan(1e-12);
      expect(Math.abs(1 / Math.sqrt(p.inductancePerMetre * p.capacitancePerMetre) / p.velocity - 1)).toBeLessThan(1e-12);
      expect(Math.abs(p.velocity * Math.sqrt(p.epsEff) / C0 - 1)).toBeLessThan(1e-12);
      expect(p.delayPerMetre * p.velocity).toBeCloseTo(1, 12);
    }
  });

  it('stripline at Dk 4 delays about 170 ps/in', () => {
    // DESIGN.md §3 rule of thumb (common practice): ~170 ps/in; exactly sqrt(4)/c = 169.45 ps/in.
    const p = lineParameters(50, 4);
    expect(p.delayPerMetre * 0.0254 * 1e12).toBeCloseTo(169.45, 1);
    const s = singleEnded(geometries[2]);
    expect(Math.abs(s.delayPerMetre * 0.0254 * 1e12 / 170 - 1)).toBeLessThan(0.01);
  });
});

describe('inverse problems', () => {
  it('widthForZ0 round-trips to 0.01 Ω for every structure and model', () => {
    // Acceptance (issue 2): the inverse round-trips to 0.01 Ω. Converged to ~1e-9 Ω by construction.
    for (const g of geometries) {
      for (const target of [35, 50, 65]) {
        const { width: _ignored, ...rest } = g;
        const w = widthForZ0(target, rest);
        expect(Math.abs(singleEnded({ ...g, width: w }).z0 - target)).toBeLessThan(1e-6);
      }
    }
  });

  it('spacingForZdiff round-trips to 0.01 Ω for microstrip and stripline pairs', () => {
    // Acceptance (issue 2): round trip to 0.01 Ω.
    const pairs: Omit<PairGeometry, 'spacing'>[] = [
      { structure: 'microstrip', width: 5 * mil, thickness: 1.4 * mil, below: 4 * mil, er: 4.3 },
      { structure: 'stripline', width: 4 * mil, thickness: 0.6 * mil, below: 5 * mil, er: 3.8 },
    ];
    for (const g of pairs) {
      for (const target of [85, 90, 100]) {
        const s = spacingForZdiff(target, g);
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
    expect(() => spacingForZdiff(100, { ...g, structure: 'offset-stripline', above: 9 * mil })).toThrow(/structure/);
  });
});

describe('pairs', () => {
  it('reports Zdiff = 2·Zodd and Zcommon = Zeven/2', () => {
    // Definitions (DESIGN.md §3).
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
});
