/**
 * Arrival times of the waves of a net at a receiver (docs/design.md §5, first incidence): the incident
 * wave arrives after the shortest line delay from the driver; the first reflected wave that can carry
 * the receiver further in the edge's direction (another branch's open end, a mid-bus driver's far side)
 * arrives after the shortest path that turns back at least once with a reflection of the edge's sign.
 *
 * Lattice rules (docs/design.md §2.1): a wave on a line of Z0 meeting a junction whose other lines and
 * resistive shunts make Zpar is reflected with Γ = (Zpar − Z0)/(Zpar + Z0) and passed on into each
 * other line with 1 + Γ; an open end has Γ = 1, a line to a rail Γ = −1. Lumped elements between free
 * nodes carry no delay, so nodes joined by them form one junction (their own resistance is not seen).
 *
 * Set aside (this program's choices): capacitance (vias, receiver input capacitance, capacitors) and
 * capacitive stubs (a line with only capacitance at its far end — also behind series R or L, as an
 * IBIS pin's package — and a round trip shorter than the ramp, electrically short: it acts as a capacitor): a capacitor's reflection of an edge has no lasting
 * step, so it slows the incident edge but does not end it. A receiver at the end of a capacitive stub
 * gets the arrival at its tap plus the stub's delay. Waves below 10 % of the incident step are dropped
 * (bounces off small mismatches: a tenth of the step is under the width of the threshold band of the
 * I/O standards in core/project/io-standards.ts, so it cannot by itself carry a level across it), as
 * are reflections that oppose the edge: they can delay switching, never cause it.
 */
import { type Circuit, terminals } from '../circuit/types.js';
import { isFixedNode } from '../circuit/topology.js';

/** Smallest wave, relative to the incident step, followed through the net (this program's choice). */
const SMALLEST_WAVE = 0.1;

/**
 * The net as numbered nodes (the search below runs for every simulated net, so it keys no strings):
 * every node named by an element, a receiver or the driver gets an index; `junction` maps each to
 * its junction's representative (union-find over zero-delay elements between free nodes).
 */
interface NumberedNet {
  index: Map<string, number>;
  fixed: Uint8Array;
  junction: Int32Array;
}

function numberNodes(circuit: Circuit): NumberedNet {
  const index = new Map<string, number>();
  const add = (node: string) => {
    if (!index.has(node)) index.set(node, index.size);
  };
  for (const e of circuit.elements) for (const node of terminals(e)) add(node);
  for (const r of circuit.receivers) add(r.node);
  add(circuit.driver.node);
  const fixed = new Uint8Array(index.size);
  for (const [node, i] of index) fixed[i] = isFixedNode(circuit, node) ? 1 : 0;
  const parent = new Int32Array(index.size);
  for (let i = 0; i < parent.length; i++) parent[i] = i;
  const find = (x: number): number => {
    let root = x;
    while (parent[root] !== root) root = parent[root];
    while (parent[x] !== root) {
      const next = parent[x];
      parent[x] = root;
      x = next;
    }
    return root;
  };
  for (const e of circuit.elements) {
    if (e.kind === 'line' || e.kind === 'via') continue;
    const a = index.get(e.a)!;
    const b = index.get(e.b)!;
    if (fixed[a] || fixed[b]) continue;
    const ra = find(a);
    const rb = find(b);
    if (ra !== rb) parent[ra] = rb;
  }
  const junction = new Int32Array(index.size);
  for (let i = 0; i < junction.length; i++) junction[i] = find(i);
  return { index, fixed, junction };
}

interface LineEnd {
  line: number;
  /** Node index of the line's other end. */
  far: number;
  z0: number;
  delay: number;
}

/** A search state: at junction `j`, arrived over line `via` (−1: the launch), turned back yet, amplitude. */
interface Wave {
  t: number;
  j: number;
  via: number;
  turned: boolean;
  amp: number;
}

/**
 * Earliest time a reflected wave of the edge's sign reaches each receiver node, s from the start of
 * the ramp (Infinity when none can), for an edge whose full ramp is `ramp` driven through `rout`.
 * Dijkstra over (junction, line arrived by, turned back yet, sign) states; one search serves every
 * receiver (the order states are settled in does not depend on the receiver asked about).
 */
export function firstReflectionArrivals(circuit: Circuit, ramp: number, rout?: number): Map<string, number> {
  const { index, fixed, junction } = numberNodes(circuit);
  const nodes = index.size;
  const driverRout = rout ?? Math.min(circuit.driver.routHigh, circuit.driver.routLow);
  // resistive shunt conductance per junction: resistors and on-die terminations to fixed nodes, the driver
  const shunt = new Float64Array(nodes);
  const resistive = new Uint8Array(nodes);
  const addShunt = (node: number, ohms: number) => {
    const j = junction[node];
    resistive[j] = 1;
    shunt[j] += ohms > 0 ? 1 / ohms : Infinity;
  };
  const allLines: { a: number; b: number; z0: number; delay: number }[] = [];
  for (const e of circuit.elements) {
    if (e.kind === 'line') {
      allLines.push({ a: index.get(e.a)!, b: index.get(e.b)!, z0: e.z0, delay: e.delay });
      continue;
    }
    if (e.kind !== 'resistor' && e.kind !== 'inductor') continue;
    const a = index.get(e.a)!;
    const b = index.get(e.b)!;
    // a series part between free nodes (a package's R and L before its C) leaves the end reactive
    if (fixed[a] !== fixed[b]) addShunt(fixed[a] ? b : a, e.kind === 'resistor' ? e.ohms : 0);
  }
  for (const r of circuit.receivers) if (r.odt) addShunt(index.get(r.node)!, r.odt.ohms);
  addShunt(index.get(circuit.driver.node)!, driverRout);
  const linesAt = new Int32Array(nodes);
  for (const l of allLines) {
    if (!fixed[l.a]) linesAt[junction[l.a]]++;
    if (!fixed[l.b]) linesAt[junction[l.b]]++;
  }
  // capacitive stubs: set aside; their far end's receivers hang off the tap (−1: no stub ends here)
  const stubTap = new Int32Array(nodes).fill(-1);
  const stubDelay = new Float64Array(nodes);
  const lines = allLines.filter((l) => {
    for (const [tap, far] of [[l.a, l.b], [l.b, l.a]]) {
      if (fixed[far] || fixed[tap]) continue;
      const jf = junction[far];
      const capacitiveEnd = linesAt[jf] === 1 && !resistive[jf];
      if (capacitiveEnd && 2 * l.delay < ramp && junction[tap] !== jf) {
        stubTap[jf] = junction[tap];
        stubDelay[jf] = l.delay;
        return false;
      }
    }
    return true;
  });
  const lineEnds: LineEnd[][] = Array.from({ length: nodes }, () => []);
  lines.forEach((l, k) => {
    if (!fixed[l.a]) lineEnds[junction[l.a]].push({ line: k, far: l.b, z0: l.z0, delay: l.delay });
    if (!fixed[l.b]) lineEnds[junction[l.b]].push({ line: k, far: l.a, z0: l.z0, delay: l.delay });
  });
  /** Γ of a wave arriving at junction `j` over line `via` (Zpar: every other line and the shunts there). */
  const gammaAt = (j: number, via: number): number => {
    let g = shunt[j];
    for (const end of lineEnds[j]) if (end.line !== via) g += 1 / end.z0;
    if (!Number.isFinite(g)) return -1;
    if (g === 0) return 1;
    const zpar = 1 / g;
    const z0 = lines[via].z0;
    return (zpar - z0) / (zpar + z0);
  };

  // the junctions asked about (a stubbed receiver asks about its tap) and the first arrival at each
  const targetOf = (node: string): number => {
    const j = junction[index.get(node)!];
    return stubTap[j] >= 0 ? stubTap[j] : j;
  };
  const firstAt = new Float64Array(nodes).fill(Infinity);
  const wanted = new Uint8Array(nodes);
  let unanswered = 0;
  for (const r of circuit.receivers) {
    const target = targetOf(r.node);
    if (!wanted[target]) unanswered++;
    wanted[target] = 1;
  }

  const states = nodes * (lines.length + 1) * 4;
  const stateKey = (w: Wave): number => ((w.j * (lines.length + 1) + w.via + 1) * 2 + (w.turned ? 1 : 0)) * 2 + (w.amp > 0 ? 1 : 0);
  const best = new Float64Array(states).fill(Infinity);
  const done = new Uint8Array(states);
  const queue: Wave[] = [];
  const push = (w: Wave) => {
    if (Math.abs(w.amp) < SMALLEST_WAVE) return;
    const key = stateKey(w);
    if (best[key] <= w.t) return;
    best[key] = w.t;
    queue.push(w);
  };
  push({ t: 0, j: junction[index.get(circuit.driver.node)!], via: -1, turned: false, amp: 1 });
  while (queue.length > 0 && unanswered > 0) {
    let i = 0;
    for (let k = 1; k < queue.length; k++) if (queue[k].t < queue[i].t) i = k;
    const s = queue.splice(i, 1)[0];
    const key = stateKey(s);
    if (done[key]) continue;
    done[key] = 1;
    if (s.turned && s.amp > 0 && s.via >= 0 && wanted[s.j] && firstAt[s.j] === Infinity) {
      firstAt[s.j] = s.t;
      unanswered--;
    }
    const gamma = s.via >= 0 ? gammaAt(s.j, s.via) : 0;
    for (const end of lineEnds[s.j]) {
      const back = end.line === s.via;
      // the launch from the driver carries the whole incident step; later waves scatter by Γ and 1 + Γ
      const amp = s.via < 0 ? s.amp : s.amp * (back ? gamma : 1 + gamma);
      // a line ending on a rail or ground: the fixed end reflects (Γ = −1) straight back
      if (fixed[end.far]) push({ t: s.t + 2 * end.delay, j: s.j, via: end.line, turned: true, amp: -amp });
      else push({ t: s.t + end.delay, j: junction[end.far], via: end.line, turned: s.turned || back, amp });
    }
  }

  const out = new Map<string, number>();
  for (const r of circuit.receivers) {
    const j = junction[index.get(r.node)!];
    out.set(r.node, firstAt[targetOf(r.node)] + (stubTap[j] >= 0 ? stubDelay[j] : 0));
  }
  return out;
}
