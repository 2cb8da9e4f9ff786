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
import { isFixedNode, nodeNumber } from '../circuit/topology.js';

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

// Helpers at module level rather than closures: these run for every simulated net.
/** Union-find root of `x`, compressing the path. */
function findRoot(parent: Int32Array, x: number): number {
  let root = x;
  while (parent[root] !== root) root = parent[root];
  while (parent[x] !== root) {
    const next = parent[x];
    parent[x] = root;
    x = next;
  }
  return root;
}

function numberNodes(circuit: Circuit): NumberedNet {
  const index = new Map<string, number>();
  const names: string[] = [];
  for (const e of circuit.elements) for (const node of terminals(e)) nodeNumber(index, names, node);
  for (const r of circuit.receivers) nodeNumber(index, names, r.node);
  nodeNumber(index, names, circuit.driver.node);
  const fixed = Uint8Array.from(names, (node) => (isFixedNode(circuit, node) ? 1 : 0));
  const parent = new Int32Array(index.size);
  for (let i = 0; i < parent.length; i++) parent[i] = i;
  for (const e of circuit.elements) {
    if (e.kind === 'line' || e.kind === 'via') continue;
    const a = index.get(e.a)!;
    const b = index.get(e.b)!;
    if (fixed[a] || fixed[b]) continue;
    const ra = findRoot(parent, a);
    const rb = findRoot(parent, b);
    if (ra !== rb) parent[ra] = rb;
  }
  const junction = new Int32Array(index.size);
  for (let i = 0; i < junction.length; i++) junction[i] = findRoot(parent, i);
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

/** Resistive shunts per junction: conductance to fixed nodes (Infinity: a short), and whether any. */
interface Shunts {
  conductance: Float64Array;
  resistive: Uint8Array;
}

function addShunt(shunts: Shunts, j: number, ohms: number): void {
  shunts.resistive[j] = 1;
  shunts.conductance[j] += ohms > 0 ? 1 / ohms : Infinity;
}

/** Γ of a wave arriving at junction `j` over line `via` of `z0` (Zpar: every other line and the shunts there). */
function gammaAt(shunts: Shunts, j: number, ends: readonly LineEnd[], via: number, z0: number): number {
  let g = shunts.conductance[j];
  for (const end of ends) if (end.line !== via) g += 1 / end.z0;
  if (!Number.isFinite(g)) return -1;
  if (g === 0) return 1;
  const zpar = 1 / g;
  return (zpar - z0) / (zpar + z0);
}

/**
 * Storage of the queue's per-state tables, reused from search to search: a search runs to its end
 * before the next starts (one thread, no re-entry), and a queue clears the part it uses.
 */
let queueScratch = { best: new Float64Array(0), settled: new Uint8Array(0) };

/**
 * Dijkstra's queue of waves, with the best time known per state (a state as one number: junction,
 * line arrived by, turned back yet, sign); the earliest wave leaves first, the first pushed among equals.
 */
class WaveQueue {
  private readonly best: Float64Array;
  private readonly settled: Uint8Array;
  private readonly waiting: Wave[] = [];
  constructor(junctions: number, private readonly lines: number) {
    const states = junctions * (lines + 1) * 4;
    if (queueScratch.best.length < states) queueScratch = { best: new Float64Array(2 * states), settled: new Uint8Array(2 * states) };
    this.best = queueScratch.best.fill(Infinity, 0, states);
    this.settled = queueScratch.settled.fill(0, 0, states);
  }

  private key(w: Wave): number {
    return ((w.j * (this.lines + 1) + w.via + 1) * 2 + (w.turned ? 1 : 0)) * 2 + (w.amp > 0 ? 1 : 0);
  }

  /** Queues `w` unless it is below the smallest wave followed or no earlier than a wave of its state. */
  push(w: Wave): void {
    if (Math.abs(w.amp) < SMALLEST_WAVE) return;
    const key = this.key(w);
    if (this.best[key] <= w.t) return;
    this.best[key] = w.t;
    this.waiting.push(w);
  }

  /** The earliest wave of a state not settled yet (settling it), or null when none is left. */
  pop(): Wave | null {
    while (this.waiting.length > 0) {
      let i = 0;
      for (let k = 1; k < this.waiting.length; k++) if (this.waiting[k].t < this.waiting[i].t) i = k;
      const w = this.waiting.splice(i, 1)[0];
      const key = this.key(w);
      if (this.settled[key]) continue;
      this.settled[key] = 1;
      return w;
    }
    return null;
  }
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
  const shunts: Shunts = { conductance: new Float64Array(nodes), resistive: new Uint8Array(nodes) };
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
    if (fixed[a] !== fixed[b]) addShunt(shunts, junction[fixed[a] ? b : a], e.kind === 'resistor' ? e.ohms : 0);
  }
  for (const r of circuit.receivers) if (r.odt) addShunt(shunts, junction[index.get(r.node)!], r.odt.ohms);
  addShunt(shunts, junction[index.get(circuit.driver.node)!], driverRout);
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
      const capacitiveEnd = linesAt[jf] === 1 && !shunts.resistive[jf];
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

  // the junctions asked about (a stubbed receiver asks about its tap) and the first arrival at each
  const receiverJunction = circuit.receivers.map((r) => junction[index.get(r.node)!]);
  const target = receiverJunction.map((j) => (stubTap[j] >= 0 ? stubTap[j] : j));
  const firstAt = new Float64Array(nodes).fill(Infinity);
  const wanted = new Uint8Array(nodes);
  let unanswered = 0;
  for (const j of target) {
    if (!wanted[j]) unanswered++;
    wanted[j] = 1;
  }

  const queue = new WaveQueue(nodes, lines.length);
  queue.push({ t: 0, j: junction[index.get(circuit.driver.node)!], via: -1, turned: false, amp: 1 });
  for (let s = queue.pop(); s !== null && unanswered > 0; s = queue.pop()) {
    if (s.turned && s.amp > 0 && s.via >= 0 && wanted[s.j] && firstAt[s.j] === Infinity) {
      firstAt[s.j] = s.t;
      unanswered--;
    }
    const gamma = s.via >= 0 ? gammaAt(shunts, s.j, lineEnds[s.j], s.via, lines[s.via].z0) : 0;
    for (const end of lineEnds[s.j]) {
      const back = end.line === s.via;
      // the launch from the driver carries the whole incident step; later waves scatter by Γ and 1 + Γ
      const amp = s.via < 0 ? s.amp : s.amp * (back ? gamma : 1 + gamma);
      // a line ending on a rail or ground: the fixed end reflects (Γ = −1) straight back
      if (fixed[end.far]) queue.push({ t: s.t + 2 * end.delay, j: s.j, via: end.line, turned: true, amp: -amp });
      else queue.push({ t: s.t + end.delay, j: junction[end.far], via: end.line, turned: s.turned || back, amp });
    }
  }

  const out = new Map<string, number>();
  circuit.receivers.forEach((r, k) => {
    const j = receiverJunction[k];
    out.set(r.node, firstAt[target[k]] + (stubTap[j] >= 0 ? stubDelay[j] : 0));
  });
  return out;
}
