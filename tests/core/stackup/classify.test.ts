import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import type { Stackup, StackupLayer } from '../../../core/project/model.js';
import {
  classifyLayer, classifyStackup, layerProperties, singleEnded, stackupFromJson, traceOnLayer,
} from '../../../core/stackup/index.js';

const mil = 25.4e-6;
const d = (name: string, t: number, dk: number): StackupLayer => ({ name, kind: 'dielectric', thickness: t * mil, dk, df: 0.02 });
const cu = (name: string, role: 'signal' | 'plane', t = 1.2, w?: number): StackupLayer => ({
  name, kind: 'copper', role, thickness: t * mil, ...(w === undefined ? {} : { defaultWidth: w * mil }),
});

/** Invented for this test: six layers with mask, a covered layer and an offset pair of routing layers. */
function board(): Stackup {
  return {
    name: 'test board',
    layers: [
      { name: 'mask', kind: 'mask', thickness: 0.8 * mil, dk: 3.5 },
      cu('TOP', 'signal', 1.9, 8),
      d('pp1', 4, 4.0),
      cu('GND1', 'plane'),
      d('core1', 5, 4.0),
      cu('IN1', 'signal', 0.6, 5),
      d('pp2', 5, 4.0),
      cu('GND2', 'plane'),
      d('core2', 4, 3.6),
      cu('IN2', 'signal', 0.6, 5),
      d('pp3', 12, 4.2),
      cu('PWR', 'plane'),
      d('pp4', 4, 4.0),
      cu('BOT', 'signal', 1.9, 8),
      d('cover', 3, 3.8),
    ],
  };
}

describe('classifying routing layers', () => {
  it('finds microstrip, stripline, offset stripline and embedded microstrip with their heights', () => {
    // Definitions of docs/design.md §3.7 applied to an invented stack.
    const c = classifyStackup(board());
    expect(c.map((x) => [x.layer, x.structure])).toEqual([
      ['TOP', 'microstrip'], ['IN1', 'stripline'], ['IN2', 'offset-stripline'], ['BOT', 'embedded-microstrip'],
    ]);
    expect(c[0].below).toBeCloseTo(4 * mil, 15);
    expect(c[0].er).toBeCloseTo(4.0, 12);
    expect(c[1].below).toBeCloseTo(5 * mil, 15);
    expect(c[1].above).toBeCloseTo(5 * mil, 15);
    expect(c[2].above).toBeCloseTo(4 * mil, 15);
    expect(c[2].below).toBeCloseTo(12 * mil, 15);
    // Thickness-weighted Dk over both spans: (4·3.6 + 12·4.2)/16 = 4.05 (the stated approximation).
    expect(c[2].er).toBeCloseTo(4.05, 12);
    // Bottom layer: plane above is its reference (mirrored microstrip); cover = 3 mil below it.
    expect(c[3].below).toBeCloseTo(4 * mil, 15);
    expect(c[3].cover).toBeCloseTo(3 * mil, 15);
    expect(c[3].er).toBeCloseTo((4 * 4.0 + 3 * 3.8) / 7, 12);
  });

  it('counts another routing layer between the trace and a plane as height', () => {
    // Dual stripline: S1 and S2 between two planes (common practice: the other layer is not a reference).
    const s: Stackup = { name: 'dual', layers: [cu('P1', 'plane'), d('a', 5, 4), cu('S1', 'signal', 0.6, 4), d('b', 10, 4), cu('S2', 'signal', 0.6, 4), d('c', 5, 4), cu('P2', 'plane')] };
    const c = classifyLayer(s, 'S1');
    expect(c.structure).toBe('offset-stripline');
    expect(c.above).toBeCloseTo(5 * mil, 15);
    expect(c.below).toBeCloseTo(15.6 * mil, 15);
  });

  it('gives traceOnLayer the same numbers as singleEnded on the classified geometry', () => {
    // Consistency of the public API (the solver calls traceOnLayer per segment).
    const p = traceOnLayer(board(), 'IN2', 5 * mil, undefined, { solver: 'closed-form' }); // the closed form by name
    const q = singleEnded({ structure: 'offset-stripline', width: 5 * mil, thickness: 0.6 * mil, below: 12 * mil, above: 4 * mil, er: 4.05 });
    expect(p.z0).toBeCloseTo(q.z0, 10);
    expect(p.structure).toBe('offset-stripline');
  });

  it('applies corner adjustments: higher Dk slows the line, narrower etch raises Z0', () => {
    // Physics (common practice, no source): vp ∝ 1/sqrt(Dk) in stripline; Z0 falls with width.
    const nominal = traceOnLayer(board(), 'IN1', 5 * mil);
    const slow = traceOnLayer(board(), 'IN1', 5 * mil, { dkFactor: 1.1 });
    expect(slow.velocity * Math.sqrt(1.1)).toBeCloseTo(nominal.velocity, 3);
    const narrow = traceOnLayer(board(), 'IN1', 5 * mil, { widthDelta: -0.5 * mil });
    expect(narrow.z0).toBeGreaterThan(nominal.z0);
    expect(() => traceOnLayer(board(), 'IN1', 5 * mil, { widthDelta: -6 * mil })).toThrow(/layer "IN1" width/);
    expect(() => traceOnLayer(board(), 'IN1', 5 * mil, { dkFactor: 0 })).toThrow(/dk factor/);
  });

  it('lists every signal layer at its default width (LayerProperties)', () => {
    // Contract: LayerProperties (core/contract/api.ts); Z0 band 20-120 Ω is common practice, no source.
    const rows = layerProperties(board());
    expect(rows.map((r) => r.layer)).toEqual(['TOP', 'IN1', 'IN2', 'BOT']);
    expect(rows[1].width).toBeCloseTo(5 * mil, 15);
    for (const r of rows) expect(r.z0 > 20 && r.z0 < 120).toBe(true);
  });
});

describe('stackup errors name the layer and field', () => {
  const mutate = (f: (s: Stackup) => void): Stackup => {
    const s = board();
    f(s);
    return s;
  };
  const cases: [string, Stackup, RegExp][] = [
    ['no layers', { name: 'x', layers: [] }, /stackup: has no layers/],
    ['no plane', { name: 'x', layers: [cu('S', 'signal', 1, 5), d('a', 4, 4)] }, /has no plane/],
    ['zero thickness', mutate((s) => { s.layers[2].thickness = 0; }), /layer 3 "pp1" thickness/],
    ['negative thickness', mutate((s) => { s.layers[1].thickness = -1; }), /layer 2 "TOP" thickness/],
    ['Dk below 1', mutate((s) => { s.layers[4].dk = 0.9; }), /layer 5 "core1" dk/],
    ['missing Dk', mutate((s) => { delete s.layers[0].dk; }), /layer 1 "mask" dk/],
    ['bad Df', mutate((s) => { s.layers[2].df = 2; }), /"pp1" df/],
    ['copper without role', mutate((s) => { delete s.layers[3].role; }), /"GND1" role/],
    ['unknown kind', mutate((s) => { (s.layers[2] as { kind: string }).kind = 'glue'; }), /"pp1" kind/],
    ['duplicate name', mutate((s) => { s.layers[5].name = 'TOP'; }), /layer 6 "TOP": name repeats layer 2/],
    ['bad default width', mutate((s) => { s.layers[1].defaultWidth = -1; }), /"TOP" defaultWidth/],
  ];
  for (const [what, stackup, message] of cases) {
    it(`rejects ${what}`, () => {
      // Quality bar: every bad input names where.
      expect(() => layerProperties(stackup)).toThrow(message);
    });
  }

  it('rejects a signal layer with no dielectric between it and its plane, naming it', () => {
    // A routing layer touching a plane is not a transmission line; with at least one plane in the stack
    // every signal layer has a plane on some side, so this is the remaining reference error.
    const touching: Stackup = { name: 'x', layers: [cu('S', 'signal', 1, 5), d('a', 4, 4), cu('T', 'signal', 1, 5), cu('P', 'plane')] };
    expect(() => classifyStackup(touching)).toThrow(/layer 3 "T": touches a plane/);
    const copperOnly: Stackup = { name: 'x', layers: [cu('T', 'signal', 1, 5), cu('S', 'signal', 1, 5), cu('P', 'plane'), d('a', 4, 4)] };
    expect(() => traceOnLayer(copperOnly, 'T', 5 * mil)).toThrow(/layer 1 "T": has no dielectric between it and its reference plane/);
    const sandwiched: Stackup = { name: 'x', layers: [cu('P', 'plane'), cu('S', 'signal', 1, 5), d('a', 4, 4), cu('Q', 'plane')] };
    expect(() => traceOnLayer(sandwiched, 'S', 5 * mil)).toThrow(/layer 2 "S": touches a plane/);
  });

  it('rejects unknown, plane and non-copper layers in traceOnLayer, naming them', () => {
    // Quality bar: bad input names where.
    expect(() => traceOnLayer(board(), 'L9', 5 * mil)).toThrow(/layer "L9": is not in stackup/);
    expect(() => traceOnLayer(board(), 'GND1', 5 * mil)).toThrow(/layer "GND1": is a plane/);
    expect(() => traceOnLayer(board(), 'pp1', 5 * mil)).toThrow(/layer "pp1": is a dielectric layer/);
    expect(() => traceOnLayer(board(), 'TOP', 0)).toThrow(/layer "TOP" width/);
  });

  it('requires a default width for layerProperties', () => {
    // Quality bar: a missing input names the layer and field.
    const s = board();
    delete s.layers[5].defaultWidth;
    expect(() => layerProperties(s)).toThrow(/layer "IN1" defaultWidth/);
  });
});

describe('stackup JSON files', () => {
  it('reads both example fixtures with units and classifies them', () => {
    // fixtures/stackups: invented examples (see their README).
    const six = stackupFromJson(JSON.parse(readFileSync('fixtures/stackups/six-layer-dual-stripline.json', 'utf8')), 'six.json');
    expect(classifyStackup(six).map((c) => c.structure)).toEqual(['microstrip', 'offset-stripline', 'offset-stripline', 'microstrip']);
    const four = stackupFromJson(JSON.parse(readFileSync('fixtures/stackups/four-layer-covered.json', 'utf8')), 'four.json');
    expect(classifyStackup(four).map((c) => c.structure)).toEqual(['embedded-microstrip', 'stripline']);
    expect(four.layers[3].thickness).toBeCloseTo(35e-6, 15); // "1oz" -> 35 um (common practice, no source)
  });

  it('names the file, layer index, layer name and field on bad values', () => {
    // Quality bar: file, layer index, layer name and field in every message.
    const ok = { name: 's', layers: [{ name: 'P', kind: 'copper', role: 'plane', thickness: '1mil' }] };
    const bad = (layer: Record<string, unknown>): unknown => ({ name: 's', layers: [layer, ...ok.layers] });
    expect(() => stackupFromJson(null, 'f.json')).toThrow(/f.json: expected a JSON object/);
    expect(() => stackupFromJson({ name: 3, layers: [] }, 'f.json')).toThrow(/f.json name/);
    expect(() => stackupFromJson({ layers: [] }, 'f.json')).toThrow(/f.json layers/);
    expect(() => stackupFromJson(bad({ kind: 'copper' }), 'f.json')).toThrow(/f.json layers\[0\] name/);
    expect(() => stackupFromJson(bad({ name: 'D', kind: 'resin', thickness: '1mil' }), 'f.json')).toThrow(/layers\[0\] \("D"\) kind/);
    expect(() => stackupFromJson(bad({ name: 'D', kind: 'dielectric', thickness: '4 furlong', dk: 4 }), 'f.json')).toThrow(/\("D"\) thickness: unknown length unit/);
    expect(() => stackupFromJson(bad({ name: 'D', kind: 'dielectric', thickness: '0mil', dk: 4 }), 'f.json')).toThrow(/\("D"\) thickness/);
    expect(() => stackupFromJson(bad({ name: 'D', kind: 'dielectric', thickness: '4mil' }), 'f.json')).toThrow(/\("D"\) dk: missing/);
    expect(() => stackupFromJson(bad({ name: 'D', kind: 'dielectric', thickness: '4mil', dk: '0.5' }), 'f.json')).toThrow(/\("D"\) dk/);
    expect(() => stackupFromJson(bad({ name: 'D', kind: 'dielectric', thickness: '4mil', dk: 4, df: 3 }), 'f.json')).toThrow(/\("D"\) df/);
    expect(() => stackupFromJson(bad({ name: 'S', kind: 'copper', role: 'trace', thickness: '1mil' }), 'f.json')).toThrow(/\("S"\) role/);
    expect(() => stackupFromJson(bad({ name: 'S', kind: 'copper', role: 'signal', thickness: '1mil', defaultWidth: '-3mil' }), 'f.json')).toThrow(/\("S"\) defaultWidth/);
  });
});
