/**
 * Structural checks and timing facts of a circuit: which nodes are fixed, that every node has a DC
 * path, that no loop of ideal elements makes the matrix singular, and the one-way delay from the
 * driver to each node (for first-incidence windows and the shortest sensible stop time).
 */
import { InputError } from '../errors.js';
import { type Circuit, type CircuitElement, GROUND, elementLabel, otherTerminal, terminals } from './types.js';

/** Union-find over node names. */
class Groups {
  private parent = new Map<string, string>();
  find(x: string): string {
    let p = this.parent.get(x) ?? x;
    if (p === x) return x;
    p = this.find(p);
    this.parent.set(x, p);
    return p;
  }
  union(x: string, y: string): void {
    const rx = this.find(x);
    const ry = this.find(y);
    if (rx !== ry) this.parent.set(rx, ry);
  }
}

/** True for nodes whose voltage is fixed (ground and rails). */
export function isFixedNode(circuit: Circuit, node: string): boolean {
  return node === GROUND || Object.prototype.hasOwnProperty.call(circuit.rails, node);
}

/** Lines and inductors are short circuits at DC; resistors conduct; capacitors do not. */
function conductsAtDc(element: CircuitElement): boolean {
  return element.kind === 'line' || element.kind === 'resistor' || element.kind === 'inductor';
}

/**
 * Checks the structure of a circuit whose fields are already valid numbers. Throws InputError naming
 * the element or field for: an element between a node and itself, a lumped element with a dead end
 * (a node used nowhere else and not a rail: an unknown node), a floating node (no DC path to ground,
 * a rail or the driver), a loop of ideal elements (lines, inductors) through fixed nodes or around
 * itself (singular DC matrix), a driver or receiver on no element, a stop time shorter than one
 * round trip. `where` prefixes field names (e.g. the file name).
 */
export function checkCircuit(circuit: Circuit, where = 'net'): void {
  const at = (field: string) => `${where}: ${field}`;
  const uses = new Map<string, number[]>();
  circuit.elements.forEach((element, index) => {
    const [a, b] = terminals(element);
    if (a === b) throw new InputError(at(elementLabel(index, element)), `connects node "${a}" to itself`);
    for (const node of [a, b]) {
      const list = uses.get(node) ?? [];
      list.push(index);
      uses.set(node, list);
    }
  });
  const { driver } = circuit;
  if (isFixedNode(circuit, driver.node)) {
    throw new InputError(at('driver.node'), `"${driver.node}" is ground or a rail; the driver needs a node of its own`);
  }
  if (!uses.has(driver.node)) throw new InputError(at('driver.node'), `node "${driver.node}" is on no element`);
  const receiverNodes = new Set<string>();
  circuit.receivers.forEach((receiver, index) => {
    const field = at(`receivers[${index}].node`);
    if (isFixedNode(circuit, receiver.node)) throw new InputError(field, `"${receiver.node}" is ground or a rail`);
    if (!uses.has(receiver.node)) throw new InputError(field, `receiver node "${receiver.node}" is on no element`);
    if (receiverNodes.has(receiver.node)) throw new InputError(field, `a second receiver on node "${receiver.node}"`);
    receiverNodes.add(receiver.node);
  });
  // A lumped element ending on a node nothing else touches is almost always a misspelt rail.
  circuit.elements.forEach((element, index) => {
    if (element.kind === 'line') return;
    for (const node of terminals(element)) {
      if (isFixedNode(circuit, node) || node === driver.node || receiverNodes.has(node)) continue;
      if ((uses.get(node) ?? []).length === 1) {
        throw new InputError(
          at(elementLabel(index, element)),
          `unknown node "${node}": it is not a rail, not ground and no other element uses it`,
        );
      }
    }
  });
  // Floating nodes: no DC path to a fixed node or the driver (which sits behind its output resistance).
  const dc = new Groups();
  const anchor = '\u0000anchor';
  dc.union(driver.node, anchor);
  dc.union(GROUND, anchor);
  for (const rail of Object.keys(circuit.rails)) dc.union(rail, anchor);
  circuit.elements.forEach((element) => {
    if (conductsAtDc(element)) dc.union(...terminals(element));
  });
  for (const [node, list] of uses) {
    if (dc.find(node) !== dc.find(anchor)) {
      throw new InputError(
        at(elementLabel(list[0], circuit.elements[list[0]])),
        `node "${node}" is floating: no DC path to ground, a rail or the driver`,
      );
    }
  }
  // Ideal loops: lines and inductors short their ends at DC; a loop of them, or a chain of them
  // between fixed nodes (all fixed nodes are tied together through their sources), leaves the DC
  // branch currents undetermined: the nodal matrix is singular.
  const shorts = new Groups();
  const fixed = '\u0000fixed';
  shorts.union(GROUND, fixed);
  for (const rail of Object.keys(circuit.rails)) shorts.union(rail, fixed);
  circuit.elements.forEach((element, index) => {
    if (element.kind !== 'line' && element.kind !== 'inductor') return;
    const [a, b] = terminals(element);
    if (shorts.find(a) === shorts.find(b)) {
      throw new InputError(
        at(elementLabel(index, element)),
        'closes a loop of ideal elements (lines and inductors are short circuits at DC) through ' +
          'ground, rails or other lines/inductors, which makes the matrix singular; add resistance to the loop',
      );
    }
    shorts.union(a, b);
  });
  if (circuit.stop !== null) {
    const need = shortestStop(circuit);
    if (circuit.stop < need) {
      throw new InputError(
        at('stop'),
        `${(circuit.stop * 1e9).toPrecision(3)} ns is too short: one edge plus one round trip to the farthest receiver takes ${(need * 1e9).toPrecision(3)} ns`,
      );
    }
  }
}

/** Number of node `name` in `index`, numbering it next (and appending it to `names`) when new. */
export function nodeNumber(index: Map<string, number>, names: string[], name: string): number {
  let k = index.get(name);
  if (k === undefined) {
    k = names.length;
    index.set(name, k);
    names.push(name);
  }
  return k;
}

/**
 * One-way delay from the driver to each node along the fastest path, s (Dijkstra over line delays;
 * lumped elements add no delay; paths do not pass through ground or rails). Unreached nodes are absent.
 */
export function delaysFromDriver(circuit: Circuit): Map<string, number> {
  // Nodes numbered in order of first appearance, elements as index pairs: the search allocates a few
  // small arrays, not a list per node (it runs for every simulated net).
  const index = new Map<string, number>();
  const names: string[] = [];
  const m = circuit.elements.length;
  const ends = new Int32Array(2 * m);
  const delays = new Float64Array(m);
  for (let k = 0; k < m; k++) {
    const e = circuit.elements[k];
    ends[2 * k] = nodeNumber(index, names, e.a);
    ends[2 * k + 1] = nodeNumber(index, names, otherTerminal(e));
    delays[k] = e.kind === 'line' ? e.delay : 0;
  }
  const start = nodeNumber(index, names, circuit.driver.node);
  const count = names.length;
  const dist = new Float64Array(count).fill(Infinity);
  const done = new Uint8Array(count);
  // reached nodes in the order they were first reached (the order of the returned map; ties go to the earlier)
  const reached: number[] = [start];
  dist[start] = 0;
  for (;;) {
    let best = -1;
    for (const k of reached) if (!done[k] && (best < 0 || dist[k] < dist[best])) best = k;
    if (best < 0) break;
    done[best] = 1;
    if (isFixedNode(circuit, names[best])) continue;
    for (let k = 0; k < m; k++) {
      for (let side = 0; side < 2; side++) {
        if (ends[2 * k + side] !== best) continue;
        const to = ends[2 * k + 1 - side];
        const d = dist[best] + delays[k];
        if (dist[to] === Infinity) reached.push(to);
        if (d < dist[to]) dist[to] = d;
      }
    }
  }
  const out = new Map<string, number>();
  for (const k of reached) if (!isFixedNode(circuit, names[k])) out.set(names[k], dist[k]);
  return out;
}

/**
 * Full duration of a linear ramp whose 10-90 % time is `tenToNinety`: the 10-90 % part is 0.8 of the
 * whole ramp (docs/design.md §4). The one place this rule lives.
 */
export function fullRampTime(tenToNinety: number): number {
  return tenToNinety / 0.8;
}

/** Full ramp duration of an edge of the circuit's driver, s. */
export function fullRamp(circuit: Circuit, edge: 'rising' | 'falling'): number {
  return fullRampTime(edge === 'rising' ? circuit.driver.riseTime : circuit.driver.fallTime);
}

/** Longest driver-to-receiver one-way delay, s (0 without receivers). */
export function longestReceiverDelay(circuit: Circuit): number {
  const delays = delaysFromDriver(circuit);
  let longest = 0;
  for (const r of circuit.receivers) longest = Math.max(longest, delays.get(r.node) ?? 0);
  return longest;
}

/** The shortest acceptable stop time: the slower full ramp plus one round trip to the farthest receiver. */
export function shortestStop(circuit: Circuit): number {
  return Math.max(fullRamp(circuit, 'rising'), fullRamp(circuit, 'falling')) + 2 * longestReceiverDelay(circuit);
}

/** Shortest line delay in the circuit, s (Infinity without lines). */
export function shortestLineDelay(circuit: Circuit): number {
  let shortest = Infinity;
  for (const element of circuit.elements) if (element.kind === 'line') shortest = Math.min(shortest, element.delay);
  return shortest;
}
