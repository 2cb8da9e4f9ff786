/**
 * Lays a net's stored topology out for drawing: the driver at the left, each series element (trace,
 * line, resistor, inductor, capacitor between two signal nodes) as a link one column to the right.
 * The longest chain from a node stays on its row (the fly-by trunk runs straight); shorter branches
 * drop below: a stub to one device hangs straight under its node, a longer branch takes the nearest
 * row below that is free over its columns. Parts to ground
 * or a rail (terminations, vias, capacitors) hang below their node. Pure function of the net.
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

  // Spanning tree from the driver (any loop-closing element is still drawn, as an extra link).
  const children = new Map<string, { index: number; child: string }[]>();
  const extraLinks: SeriesLink[] = [];
  const seen = new Set<string>();
  const usedElements = new Set<number>();
  function grow(root: string): void {
    seen.add(root);
    const stack = [root];
    while (stack.length) {
      const node = stack.pop()!;
      for (const { index, other } of adjacency.get(node) ?? []) {
        if (usedElements.has(index)) continue;
        usedElements.add(index);
        if (seen.has(other)) {
          extraLinks.push({ index, element: net.elements[index], from: node, to: other });
          continue;
        }
        seen.add(other);
        if (!children.has(node)) children.set(node, []);
        children.get(node)!.push({ index, child: other });
        stack.push(other);
      }
    }
  }
  const roots = [net.driver.node];
  grow(net.driver.node);
  for (const name of [...adjacency.keys(), ...shunts.map((s) => s.node), ...net.receivers.map((r) => r.node)]) {
    if (!seen.has(name)) {
      roots.push(name);
      grow(name);
    }
  }

  const depthMemo = new Map<string, number>();
  function depth(node: string): number {
    const known = depthMemo.get(node);
    if (known !== undefined) return known;
    const d = 1 + Math.max(0, ...(children.get(node) ?? []).map((c) => depth(c.child)));
    depthMemo.set(node, d);
    return d;
  }

  const occupied = new Map<number, Set<number>>();
  const isFree = (row: number, from: number, to: number) => {
    const cols = occupied.get(row);
    if (!cols) return true;
    for (let c = from; c <= to; c++) if (cols.has(c)) return false;
    return true;
  };
  const mark = (row: number, col: number) => {
    if (!occupied.has(row)) occupied.set(row, new Set());
    occupied.get(row)!.add(col);
  };

  const nodes = new Map<string, PlacedNode>();
  const links: SeriesLink[] = [];
  const receiverNodes = new Set(net.receivers.map((r) => r.node));
  function place(name: string, col: number, row: number): void {
    nodes.set(name, { name, col, row });
    mark(row, col);
    // Longest chain first; on a tie the chain that does not end at a device (the trunk running on to
    // its termination) keeps the row, and device stubs hang below.
    const kids = [...(children.get(name) ?? [])].sort(
      (a, b) => depth(b.child) - depth(a.child) || Number(receiverNodes.has(a.child)) - Number(receiverNodes.has(b.child)),
    );
    kids.forEach(({ index, child }, i) => {
      links.push({ index, element: net.elements[index], from: name, to: child });
      if (i === 0) {
        // The longest chain continues on this row.
        let r = row;
        while (!isFree(r, col + 1, col + depth(child))) r++;
        place(child, col + 1, r);
        return;
      }
      // A short branch (a stub to one device) hangs straight below its node; a longer one drops to
      // the first free row and runs right from there.
      const under = depth(child) === 1;
      const childCol = under ? col : col + 1;
      let r = row + 1;
      while (!isFree(r, childCol, under ? col : col + depth(child))) r++;
      for (let between = row + 1; between < r; between++) mark(between, col);
      place(child, childCol, r);
    });
  }
  let nextRootRow = 0;
  for (const root of roots) {
    let r = nextRootRow;
    while (!isFree(r, 0, depth(root))) r++;
    place(root, 0, r);
    nextRootRow = Math.max(...occupied.keys()) + 1;
  }

  let columns = 1;
  let rows = 1;
  for (const node of nodes.values()) {
    columns = Math.max(columns, node.col + 1);
    rows = Math.max(rows, node.row + 1);
  }
  return { nodes, links: [...links, ...extraLinks], shunts, columns, rows };
}
