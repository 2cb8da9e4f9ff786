import { describe, expect, it } from 'vitest';
import {
  LENGTH_TOLERANCE, planLengthImport, readLengthReport, summariseImport, type LengthRecord,
} from '../../../core/lengths/length-report.js';
import type { NetDefinition, Stackup } from '../../../core/project/model.js';

const MIL = 25.4e-6; // exact by definition of the inch

/** Records as a CSV tokeniser hands them over: header on line 1, then one row per line. */
function records(...lines: string[][]): LengthRecord[] {
  return lines.map((cells, i) => ({ line: i + 1, cells }));
}

const stackup: Stackup = {
  name: 'test',
  layers: [
    { name: 'TOP', kind: 'copper', thickness: 35e-6, role: 'signal', defaultWidth: 0.1e-3 },
    { name: 'D1', kind: 'dielectric', thickness: 0.1e-3, dk: 4 },
    { name: 'GND', kind: 'copper', thickness: 35e-6, role: 'plane' },
    { name: 'D2', kind: 'dielectric', thickness: 0.1e-3, dk: 4 },
    { name: 'IN1', kind: 'copper', thickness: 18e-6, role: 'signal', defaultWidth: 0.1e-3 },
  ],
};

/** Net X: TOP 2 mm, via, IN1 30 mm, via, TOP 1 mm, IN1 5 mm (element indices 0, 2, 4, 5). */
const netX: NetDefinition = {
  name: 'X', bus: 'B', role: 'data',
  driver: { part: 'P', node: 'a', designator: 'U1' },
  receivers: [{ part: 'P', node: 'e', designator: 'U2' }],
  rails: {},
  elements: [
    { kind: 'segment', a: 'a', b: 'b', layer: 'TOP', width: 0.1e-3, length: 2e-3 },
    { kind: 'via', a: 'b', farads: 0.4e-12 },
    { kind: 'segment', a: 'b', b: 'c', layer: 'IN1', width: 0.1e-3, length: 30e-3 },
    { kind: 'via', a: 'c', farads: 0.4e-12 },
    { kind: 'segment', a: 'c', b: 'd', layer: 'TOP', width: 0.1e-3, length: 1e-3 },
    { kind: 'segment', a: 'd', b: 'e', layer: 'IN1', width: 0.1e-3, length: 5e-3 },
  ],
};
const project = { stackup, nets: [netX] };

describe('reading a length report', () => {
  it('takes the unit from each value, in any length unit', () => {
    const { rows, errors } = readLengthReport('r.csv', records(
      ['net', 'layer', 'length', 'width'],
      ['X', 'TOP', '1250mil', '4mil'],
      ['X', 'IN1', '31.75 mm', ''],
      ['X', 'TOP', '1.25in', '0.1mm'],
    ));
    expect(errors).toEqual([]);
    // 1250 mil = 31.75 mm = 1.25 in exactly (1 in = 25.4 mm by definition); 1e-15 m covers float rounding.
    expect(rows[0].length).toBeCloseTo(31.75e-3, 15);
    expect(rows[1].length).toBeCloseTo(31.75e-3, 15);
    expect(rows[2].length).toBeCloseTo(31.75e-3, 15);
    expect(rows[0].width).toBeCloseTo(4 * MIL, 15);
    expect(rows[1].width).toBeNull();
    expect(rows.map((r) => r.line)).toEqual([2, 3, 4]);
  });

  it('takes the unit from the header in its usual spellings, and ignores other columns', () => {
    for (const [length, width] of [['length_mil', 'width_mil'], ['Length (mil)', 'Width [mil]'], ['LENGTH mil', 'width_MIL']]) {
      const { rows, errors } = readLengthReport('r.csv', records(['Net', 'net_class', 'Layer', length, width, 'comment'], ['X', 'DDR', 'TOP', '100', '4', 'ok']));
      expect(errors).toEqual([]);
      expect(rows[0]).toMatchObject({ net: 'X', layer: 'TOP' });
      expect(rows[0].length).toBeCloseTo(100 * MIL, 15);
      expect(rows[0].width).toBeCloseTo(4 * MIL, 15);
    }
  });

  it('names file, line, column and reason for every bad value, and keeps going', () => {
    const { rows, errors } = readLengthReport('r.csv', records(
      ['net', 'layer', 'length', 'width'],
      ['X', 'TOP', '1250', '4mil'],
      ['X', 'TOP', '12parsecs', ''],
      ['', 'TOP', '5mm', ''],
      ['X', 'TOP', '-5mm', ''],
      ['X', 'TOP', '5mm', '0mm'],
      ['X', 'TOP', '2m'],
      ['X'],
      ['X', 'TOP', '5mm'],
    ));
    expect(errors).toEqual([
      'r.csv line 2 column 3 (length): "1250" has no unit; write it as e.g. 1250mil or name the column length_mil',
      expect.stringMatching(/^r\.csv line 3 column 3 \(length\): unknown length unit "parsecs" in "12parsecs"/),
      'r.csv line 4 column 1 (net): the net name is empty',
      expect.stringMatching(/^r\.csv line 5 column 3 \(length\): -5 mm is out of range: must be greater than 0 mm/), // the solver refuses length 0 (core/netbuild/build-circuit.ts)
      expect.stringMatching(/^r\.csv line 6 column 4 \(width\): 0 mm is out of range: must be greater than 0 mm/),
      expect.stringMatching(/^r\.csv line 7 column 3 \(length\): 2000 mm is out of range: must be at most 1000 mm/),
      'r.csv line 8: has 1 column, the header needs at least 3',
    ]);
    expect(rows.map((r) => r.line)).toEqual([9]);
  });

  it('refuses a value whose unit contradicts the header', () => {
    const { errors } = readLengthReport('r.csv', records(['net', 'layer', 'length_mm'], ['X', 'TOP', '5mil'], ['X', 'TOP', '5mm']));
    expect(errors).toEqual(['r.csv line 2 column 3 (length_mm): "5mil" carries the unit mil but the column header says mm']);
  });

  it('names missing, doubled and badly united header columns', () => {
    expect(readLengthReport('r.csv', records(['net', 'len'], ['X', '5mm'])).errors).toEqual([
      'r.csv line 1: the header lacks the columns layer, length (found: net, len)',
    ]);
    expect(readLengthReport('r.csv', records(['net', 'layer', 'length', 'length_mm'])).errors).toEqual([
      'r.csv line 1 column 4 (length_mm): the column "length" appears twice',
    ]);
    expect(readLengthReport('r.csv', records(['net', 'layer', 'length_furlong'])).errors[0]).toMatch(
      /^r\.csv line 1 column 3 \(length_furlong\): unknown length unit "furlong"/,
    );
    expect(readLengthReport('r.csv', []).errors).toEqual(['r.csv: the file is empty (expected a header with net, layer, length)']);
  });
});

describe('mapping a report onto the nets', () => {
  const header = ['net', 'layer', 'length', 'width'];

  it('maps the Nth row of a net on a layer to its Nth segment on that layer', () => {
    const { rows, errors } = readLengthReport('r.csv', records(
      header,
      ['X', 'IN1', '30mm', ''], // 1st IN1 row -> element 2 (same length: matched)
      ['X', 'TOP', '2.5mm', ''], // 1st TOP row -> element 0 (changed)
      ['X', 'IN1', '6mm', ''], // 2nd IN1 row -> element 5 (changed)
      ['X', 'TOP', '1mm', '0.12mm'], // 2nd TOP row -> element 4 (width changed)
      ['X', 'TOP', '4mm', ''], // 3rd TOP row: no such segment -> new
      ['X', 'GND', '4mm', ''], // a plane is copper but X has no segment there -> new
      ['X', 'IN9', '4mm', ''], // not in the stackup -> unknown layer
      ['Y', 'TOP', '4mm', ''], // not in the project -> unknown net
    ));
    const plan = planLengthImport('r.csv', rows, errors, project);
    expect(plan.preview.rows.map((r) => [r.status, r.elementIndex, r.previous])).toEqual([
      ['matched', 2, null],
      ['changed', 0, 2e-3],
      ['changed', 5, 5e-3],
      ['changed', 4, 1e-3],
      ['new', null, null],
      ['new', null, null],
      ['unknown-layer', null, null],
      ['unknown-net', null, null],
    ]);
    expect(plan.preview.counts).toEqual({ matched: 1, changed: 3, new: 2, 'unknown-layer': 1, 'unknown-net': 1 });
    expect(plan.updates).toEqual([
      { net: 'X', elementIndex: 0, length: 2.5e-3, width: 0.1e-3 },
      { net: 'X', elementIndex: 5, length: expect.closeTo(6e-3, 15), width: 0.1e-3 },
      { net: 'X', elementIndex: 4, length: 1e-3, width: expect.closeTo(0.12e-3, 15) },
    ]);
    expect(summariseImport(plan.preview)).toBe('r.csv: 1 matched, 3 changed, 2 new, 1 unknown-layer, 1 unknown-net');
  });

  it('counts a length within the tolerance as matched, just outside as changed', () => {
    const { rows } = readLengthReport('r.csv', records(
      header,
      ['X', 'TOP', `${(2e-3 + LENGTH_TOLERANCE / 2) * 1e3}mm`, ''],
      ['X', 'TOP', `${(1e-3 + LENGTH_TOLERANCE * 3) * 1e3}mm`, ''],
    ));
    const plan = planLengthImport('r.csv', rows, [], project);
    expect(plan.preview.rows.map((r) => r.status)).toEqual(['matched', 'changed']);
  });

  it('plans no update at all when the report has an error', () => {
    const read = readLengthReport('r.csv', records(header, ['X', 'TOP', '3mm', ''], ['X', 'IN1', 'abc', '']));
    const plan = planLengthImport('r.csv', read.rows, read.errors, project);
    expect(plan.preview.rows.map((r) => r.status)).toEqual(['changed']);
    expect(plan.preview.errors).toHaveLength(1);
    expect(plan.updates).toEqual([]);
    expect(summariseImport(plan.preview)).toBe('r.csv: 1 changed, 1 error');
  });
});
