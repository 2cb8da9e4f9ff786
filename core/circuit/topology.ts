/**
 * Structural checks and timing facts of a circuit: which nodes are fixed, that every node has a DC
 * path, that no loop of ideal elements makes the matrix singular, and the one-way delay from the
 * driver to each node (for first-incidence windows and the shortest sensible stop time).
 */
import { InputError } from '../errors.js';
import { type Circuit, type CircuitElement, GROUND, elementLabel, terminals } from './types.js';

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

/**
 * One-way delay from the driver to each node along the fastest path, s (Dijkstra over line delays;
 * lumped elements add no delay; paths do not pass through ground or rails). Unreached nodes are absent.
 */
export function delaysFromDriver(circuit: Circuit): Map<string, number> {
  const adjacency = new Map<string, { to: string; delay: number }[]>();
  const add = (from: string, to: string, delay: number) => {
    const list = adjacency.get(from) ?? [];
    list.push({ to, delay });
    adjacency.set(from, list);
  };
  for (const element of circuit.elements) {
    const [a, b] = terminals(element);
    const delay = element.kind === 'line' ? element.delay : 0;
    add(a, b, delay);
    add(b, a, delay);
  }
  const dist = new Map<string, number>([[circuit.driver.node, 0]]);
  const done = new Set<string>();
  for (;;) {
    let best: string | null = null;
    for (const [node, d] of dist) if (!done.has(node) && (best === null || d < dist.get(best)!)) best = node;
    if (best === null) break;
    done.add(best);
    if (isFixedNode(circuit, best)) continue;
    for (const { to, delay } of adjacency.get(best) ?? []) {
      const d = dist.get(best)! + delay;
      if (!dist.has(to) || d < dist.get(to)!) dist.set(to, d);
    }
  }
  for (const node of [...dist.keys()]) if (isFixedNode(circuit, node)) dist.delete(node);
  return dist;
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
