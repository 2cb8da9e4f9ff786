/**
 * Layout of a net's stored topology for drawing (renderer/src/lib/topology.ts). docs/design.md §1.1: the
 * topology is drawn from the stored segments. Expected positions follow the layout rules in topology.ts's header
 * (driver at the left, trunk on its row, device stubs straight below, parts to ground or a rail hang below).
 */
import { describe, expect, it } from 'vitest';
import { layoutTopology } from '../../renderer/src/lib/topology.js';
import type { NetDefinition, NetElement } from '../../core/project/model.js';

const seg = (a: string, b: string, length = 0.01): NetElement => ({ kind: 'segment', a, b, layer: 'L1', width: 100e-6, length });

// Invented fly-by net: driver d, trunk d-n1-n2-n3 with stubs to r1 and r2, end termination to vtt.
function flyBy(extra: NetElement[] = []): NetDefinition {
  return {
    name: 'A0', bus: 'ADDR', role: 'address',
    driver: { part: 'CTL', node: 'd', designator: 'U1' },
    receivers: [{ part: 'MEMX', node: 'r1', designator: 'U2' }, { part: 'MEMX', node: 'r2', designator: 'U3' }],
    elements: [
      seg('d', 'n1'), // 0
      seg('n1', 'r1', 0.002), // 1
      seg('n1', 'n2'), // 2
      seg('n2', 'r2', 0.002), // 3
      seg('n2', 'n3'), // 4
      { kind: 'resistor', a: 'n3', b: 'vtt', ohms: 39 }, // 5
      { kind: 'via', a: 'n1', farads: 0.3e-12 }, // 6
      ...extra,
    ],
    rails: { vtt: 0.6 },
  };
}
const at = (layout: ReturnType<typeof layoutTopology>, node: string) => {
  const n = layout.nodes.get(node);
  return n ? [n.col, n.row] : null;
};

describe('layoutTopology', () => {
  it('runs the trunk along row 0 to the termination and hangs each device stub under its node', () => {
    // topology.ts layout rules (docs/design.md §1.1: topology drawn from the stored segments)
    const layout = layoutTopology(flyBy());
    expect(at(layout, 'd')).toEqual([0, 0]);
    expect(at(layout, 'n1')).toEqual([1, 0]);
    expect(at(layout, 'n2')).toEqual([2, 0]);
    expect(at(layout, 'n3')).toEqual([3, 0]);
    expect(at(layout, 'r2')).toEqual([2, 1]);
    expect(at(layout, 'r1')).toEqual([1, 1]);
    expect(layout.columns).toBe(4);
    expect(layout.rows).toBe(2);
    expect(layout.nodes.has('vtt')).toBe(false);
    expect(layout.nodes.has('gnd')).toBe(false);
  });

  it('draws every series element once as a link and every part to a rail or ground as a shunt', () => {
    // topology.ts: rails and gnd are fixed nodes, not drawn as nodes
    const layout = layoutTopology(flyBy());
    expect(layout.links.map((l) => [l.index, l.from, l.to])).toEqual([
      [0, 'd', 'n1'], [2, 'n1', 'n2'], [4, 'n2', 'n3'], [3, 'n2', 'r2'], [1, 'n1', 'r1'],
    ]);
    expect(layout.shunts.map((s) => [s.index, s.node, s.to, s.slot])).toEqual([[5, 'n3', 'vtt', 0], [6, 'n1', 'gnd', 0]]);
  });

  it('numbers several shunts on one node, keeps a loop-closing element as an extra link, and places an island below', () => {
    // topology.ts: "any loop-closing element is still drawn, as an extra link"; unconnected parts get their own root
    const layout = layoutTopology(flyBy([
      { kind: 'capacitor', a: 'n1', b: 'gnd', farads: 1e-12 }, // 7: second shunt on n1
      { kind: 'resistor', a: 'r1', b: 'r2', ohms: 1000 }, // 8: closes a loop
      seg('x1', 'x2'), // 9: not connected to the driver
    ]));
    expect(layout.shunts.filter((s) => s.node === 'n1').map((s) => [s.index, s.slot])).toEqual([[6, 0], [7, 1]]);
    expect(layout.links.filter((l) => l.index === 8)).toHaveLength(1);
    expect(layout.links.map((l) => l.index).sort((a, b) => a - b)).toEqual([0, 1, 2, 3, 4, 8, 9]);
    const island = at(layout, 'x1')!;
    expect(island[0]).toBe(0);
    expect(island[1]).toBeGreaterThan(Math.max(...['d', 'n1', 'n2', 'n3', 'r1', 'r2'].map((n) => at(layout, n)![1])));
    expect(at(layout, 'x2')).toEqual([1, island[1]]);
  });
});
