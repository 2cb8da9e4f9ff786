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

/** Union-find over node names (junctions of zero-delay elements). */
function junctions(circuit: Circuit): (node: string) => string {
  const parent = new Map<string, string>();
  const find = (x: string): string => {
    const p = parent.get(x);
    if (p === undefined || p === x) return x;
    const root = find(p);
    parent.set(x, root);
    return root;
  };
  for (const e of circuit.elements) {
    if (e.kind === 'line' || e.kind === 'via') continue;
    const [a, b] = terminals(e);
    if (isFixedNode(circuit, a) || isFixedNode(circuit, b)) continue;
    const ra = find(a);
    const rb = find(b);
    if (ra !== rb) parent.set(ra, rb);
  }
  return find;
}

interface LineEnd {
  line: number;
  far: string;
  z0: number;
  delay: number;
}

/**
 * Earliest time a reflected wave of the edge's sign reaches each receiver node, s from the start of
 * the ramp (Infinity when none can), for an edge whose full ramp is `ramp` driven through `rout`.
 * Dijkstra over (junction, line arrived by, turned back yet, sign) states.
 */
export function firstReflectionArrivals(circuit: Circuit, ramp: number, rout?: number): Map<string, number> {
  const junctionOf = junctions(circuit);
  const driverRout = rout ?? Math.min(circuit.driver.routHigh, circuit.driver.routLow);
  const allLines = circuit.elements.flatMap((e) => (e.kind === 'line' ? [{ a: e.a, b: e.b, z0: e.z0, delay: e.delay }] : []));
  // resistive shunt conductance per junction: resistors and on-die terminations to fixed nodes, the driver
  const shunt = new Map<string, number>();
  const resistive = new Set<string>();
  const addShunt = (node: string, ohms: number) => {
    const j = junctionOf(node);
    resistive.add(j);
    shunt.set(j, (shunt.get(j) ?? 0) + (ohms > 0 ? 1 / ohms : Infinity));
  };
  for (const e of circuit.elements) {
    if (e.kind !== 'resistor' && e.kind !== 'inductor') continue;
    const [a, b] = terminals(e);
    const fa = isFixedNode(circuit, a);
    const fb = isFixedNode(circuit, b);
    // a series part between free nodes (a package's R and L before its C) leaves the end reactive
    if (fa !== fb) addShunt(fa ? b : a, e.kind === 'resistor' ? e.ohms : 0);
  }
  for (const r of circuit.receivers) if (r.odt) addShunt(r.node, r.odt.ohms);
  addShunt(circuit.driver.node, driverRout);
  const linesAt = new Map<string, number>();
  for (const l of allLines) for (const node of [l.a, l.b]) if (!isFixedNode(circuit, node)) linesAt.set(junctionOf(node), (linesAt.get(junctionOf(node)) ?? 0) + 1);
  // capacitive stubs: set aside; their far end's receivers hang off the tap
  const stubOf = new Map<string, { tap: string; delay: number }>();
  const lines = allLines.filter((l) => {
    for (const [tap, far] of [[l.a, l.b], [l.b, l.a]] as const) {
      if (isFixedNode(circuit, far) || isFixedNode(circuit, tap)) continue;
      const jf = junctionOf(far);
      const capacitiveEnd = (linesAt.get(jf) ?? 0) === 1 && !resistive.has(jf);
      if (capacitiveEnd && 2 * l.delay < ramp && junctionOf(tap) !== jf) {
        stubOf.set(jf, { tap: junctionOf(tap), delay: l.delay });
        return false;
      }
    }
    return true;
  });
  const lineEnds = new Map<string, LineEnd[]>();
  lines.forEach((l, k) => {
    for (const [here, far] of [[l.a, l.b], [l.b, l.a]] as const) {
      if (isFixedNode(circuit, here)) continue;
      const j = junctionOf(here);
      const list = lineEnds.get(j) ?? [];
      list.push({ line: k, far, z0: l.z0, delay: l.delay });
      lineEnds.set(j, list);
    }
  });
  /** Γ of a wave arriving at junction `j` over line `via` (Zpar: every other line and the shunts there). */
  const gammaAt = (j: string, via: number, z0: number): number => {
    let g = shunt.get(j) ?? 0;
    for (const end of lineEnds.get(j) ?? []) if (end.line !== via) g += 1 / end.z0;
    if (!Number.isFinite(g)) return -1;
    if (g === 0) return 1;
    const zpar = 1 / g;
    return (zpar - z0) / (zpar + z0);
  };
  const z0Of = (line: number) => lines[line].z0;

  // A search state (junction, line arrived by, turned back yet, sign) as one number, so the search
  // keys no strings (it runs for every simulated net).
  const junctionIds = new Map<string, number>();
  const stateKey = (j: string, via: number, turned: boolean, amp: number): number => {
    let id = junctionIds.get(j);
    if (id === undefined) junctionIds.set(j, (id = junctionIds.size));
    return ((id * (lines.length + 1) + via + 1) * 2 + (turned ? 1 : 0)) * 2 + (amp > 0 ? 1 : 0);
  };
  const reflectedArrival = (target: string): number => {
    const best = new Map<number, number>();
    const done = new Set<number>();
    const queue: { t: number; j: string; via: number; turned: boolean; amp: number }[] = [];
    const push = (t: number, j: string, via: number, turned: boolean, amp: number) => {
      if (Math.abs(amp) < SMALLEST_WAVE) return;
      const key = stateKey(j, via, turned, amp);
      const known = best.get(key);
      if (known !== undefined && known <= t) return;
      best.set(key, t);
      queue.push({ t, j, via, turned, amp });
    };
    push(0, junctionOf(circuit.driver.node), -1, false, 1);
    while (queue.length > 0) {
      let i = 0;
      for (let k = 1; k < queue.length; k++) if (queue[k].t < queue[i].t) i = k;
      const s = queue.splice(i, 1)[0];
      const key = stateKey(s.j, s.via, s.turned, s.amp);
      if (done.has(key)) continue;
      done.add(key);
      if (s.turned && s.amp > 0 && s.via >= 0 && s.j === target) return s.t;
      const gamma = s.via >= 0 ? gammaAt(s.j, s.via, z0Of(s.via)) : 0;
      for (const end of lineEnds.get(s.j) ?? []) {
        const back = end.line === s.via;
        // the launch from the driver carries the whole incident step; later waves scatter by Γ and 1 + Γ
        const amp = s.via < 0 ? s.amp : s.amp * (back ? gamma : 1 + gamma);
        // a line ending on a rail or ground: the fixed end reflects (Γ = −1) straight back
        if (isFixedNode(circuit, end.far)) push(s.t + 2 * end.delay, s.j, end.line, true, -amp);
        else push(s.t + end.delay, junctionOf(end.far), end.line, s.turned || back, amp);
      }
    }
    return Infinity;
  };

  const out = new Map<string, number>();
  const memo = new Map<string, number>();
  for (const r of circuit.receivers) {
    const j = junctionOf(r.node);
    const stub = stubOf.get(j);
    const target = stub ? stub.tap : j;
    let t = memo.get(target);
    if (t === undefined) memo.set(target, (t = reflectedArrival(target)));
    out.set(r.node, t + (stub ? stub.delay : 0));
  }
  return out;
}
