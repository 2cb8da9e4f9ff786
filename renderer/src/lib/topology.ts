/**
 * Lays a net's stored topology out for drawing: the driver at the left, each series element (trace,
 * line, resistor, inductor, capacitor between two signal nodes) as a link one column to the right,
 * branches on new rows, and parts to ground or a rail (terminations, vias, capacitors) hung below
 * their node. Pure function of the net definition; the component only draws it.
 */
import type { NetDefinition, NetElement } from '../../../core/project/model.js';

export interface PlacedNode { name: string; col: number; row: number }
export interface SeriesLink { index: number; element: NetElement; from: string; to: string }
export interface ShuntPart { index: number; element: NetElement; node: string; to: string; slot: number }
export interface TopologyLayout {
  nodes: Map<string, PlacedNode>;
  links: SeriesLink[];
  shunts: ShuntPart[];
  columns: number;
  rows: number;
}

function ends(element: NetElement): [string, string] {
  return element.kind === 'via' ? [element.a, 'gnd'] : [element.a, element.b];
}

export function layoutTopology(net: NetDefinition): TopologyLayout {
  const fixed = new Set(['gnd', '0', ...Object.keys(net.rails)]);
  const adjacency = new Map<string, { index: number; other: string }[]>();
  const links: SeriesLink[] = [];
  const shunts: ShuntPart[] = [];
  const shuntCount = new Map<string, number>();

  net.elements.forEach((element, index) => {
    const [a, b] = ends(element);
    if (fixed.has(a) && fixed.has(b)) return;
    if (fixed.has(a) || fixed.has(b)) {
      const node = fixed.has(a) ? b : a;
      const slot = shuntCount.get(node) ?? 0;
      shuntCount.set(node, slot + 1);
      shunts.push({ index, element, node, to: fixed.has(a) ? a : b, slot });
      return;
    }
    for (const [x, y] of [[a, b], [b, a]] as const) {
      if (!adjacency.has(x)) adjacency.set(x, []);
      adjacency.get(x)!.push({ index, other: y });
    }
  });

  const nodes = new Map<string, PlacedNode>();
  const seenLinks = new Set<number>();
  let nextRow = 0;

  function place(name: string, col: number, row: number): void {
    nodes.set(name, { name, col, row });
    let first = true;
    for (const { index, other } of adjacency.get(name) ?? []) {
      if (seenLinks.has(index)) continue;
      seenLinks.add(index);
      if (nodes.has(other)) {
        links.push({ index, element: net.elements[index], from: name, to: other });
        continue;
      }
      const childRow = first ? row : ++nextRow;
      first = false;
      links.push({ index, element: net.elements[index], from: name, to: other });
      place(other, col + 1, childRow);
    }
  }

  place(net.driver.node, 0, 0);
  // Anything not reachable from the driver still gets drawn, on rows of its own.
  for (const name of [...adjacency.keys(), ...shunts.map((s) => s.node), ...net.receivers.map((r) => r.node)]) {
    if (!nodes.has(name)) place(name, 0, ++nextRow);
  }
  let columns = 1;
  for (const node of nodes.values()) columns = Math.max(columns, node.col + 1);
  return { nodes, links, shunts, columns, rows: nextRow + 1 };
}
