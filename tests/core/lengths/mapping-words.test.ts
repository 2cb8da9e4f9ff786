/**
 * The length import's preview in words (docs/design-file.md §6): each written row names its segment,
 * each other row its reason, the rule is stated, and a row on a layer the stackup lacks is an error
 * with its line that stops the whole import. Expected texts are the rule applied by hand to the rows.
 */
import { describe, expect, it } from 'vitest';
import { planLengthImport, readLengthReport } from '../../../core/lengths/length-report.js';
import { describeImportPlan, MAPPING_RULE, type DescribedRow } from '../../../core/lengths/mapping-words.js';
import type { NetDefinition, Stackup } from '../../../core/project/model.js';

const stackup: Stackup = {
  name: 's',
  layers: [
    { name: 'TOP', kind: 'copper', thickness: 35e-6, role: 'signal', defaultWidth: 0.1e-3 },
    { name: 'PP', kind: 'dielectric', thickness: 0.1e-3, dk: 4 },
    { name: 'GND', kind: 'copper', thickness: 35e-6, role: 'plane' },
  ],
};
const seg = (a: string, b: string, length: number) => ({ kind: 'segment' as const, a, b, layer: 'TOP', width: 0.1e-3, length });
const net: NetDefinition = {
  name: 'X', bus: 'B', role: 'data',
  driver: { part: 'D', node: 'drv', designator: 'U1' }, receivers: [{ part: 'R', node: 'n2', designator: 'U2' }],
  elements: [seg('drv', 'n1', 0), { kind: 'via', a: 'n1', farads: 0.4e-12 }, seg('n1', 'n2', 2e-3)],
  rails: {},
};

function plan(rows: string[][]) {
  const records = [{ line: 1, cells: ['net', 'layer', 'length'] }, ...rows.map((cells, i) => ({ line: i + 2, cells }))];
  const read = readLengthReport('r.csv', records);
  const project = { stackup, nets: [net] };
  return describeImportPlan(planLengthImport('r.csv', read.rows, read.errors, project), project);
}

describe('length import preview in words', () => {
  it('names the segment of each written row and the reason of each other row', () => {
    const p = plan([['X', 'TOP', '5mm'], ['X', 'TOP', '2mm'], ['X', 'TOP', '1mm'], ['X', 'PP', '1mm'], ['Y', 'TOP', '1mm']]);
    expect(p.preview.errors).toEqual([]);
    expect((p.preview as { rule?: string }).rule).toBe(MAPPING_RULE);
    const rows = p.preview.rows as DescribedRow[];
    expect(rows.map((r) => [r.status, r.target ?? null, r.reason ?? null])).toEqual([
      // 1st TOP row -> element 1 (an unrouted template trace, 0 mm): written.
      ['changed', 'segment 1 of X (1st on TOP)', null],
      ['matched', 'segment 3 of X (2nd on TOP)', 'equal to segment 3 of X (2nd on TOP) already; nothing to write'],
      ['new', null, 'X has 2 segments on TOP; this 3rd row has none to set (add the segment to the net or its template first)'],
      ['unknown-layer', null, 'PP is a dielectric layer of the stackup; segments run on copper layers'],
      ['unknown-net', null, 'Y is not a net of the project'],
    ]);
    expect(p.updates).toEqual([{ net: 'X', elementIndex: 0, length: 5e-3, width: 0.1e-3 }]);
  });

  it('refuses the whole report when a row names a layer the stackup does not have', () => {
    const p = plan([['X', 'TOP', '5mm'], ['X', 'L9', '2mm']]);
    expect(p.preview.errors).toEqual([
      'r.csv line 3: layer "L9" (net X) is not in the stackup (copper layers: TOP, GND); is the report from another board or stackup revision?',
    ]);
    expect(p.updates).toEqual([]); // nothing is written (docs/design.md §8: a failed import changes nothing)
  });
});
