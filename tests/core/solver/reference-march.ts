/**
 * A plain transient solver for linear nets, kept as the reference the packed time loop of
 * core/solver/march.ts is checked against (tests/core/solver/packed-loop.test.ts). It follows
 * docs/design.md §2.2 literally and is written for reading, not speed: the dense nodal matrix solved
 * with lu.ts every step, each companion source recomputed from the element's current and voltage of
 * the previous step (Dommel 1969), each line end's history e = v/Z0 + i kept for every sample
 * (Branin 1967), and the history at t − Td interpolated linearly between the two samples around it with
 * the solver's rule for the whole and fractional part of Td/h. Shares with the product only the
 * netlist, the DC point, the step and stop rules and the ramp start (each tested on its own).
 */
import type { Circuit, Edge } from '../../../core/circuit/types.js';
import { fullRamp } from '../../../core/circuit/topology.js';
import { compileNetlist } from '../../../core/solver/netlist.js';
import { solveDc } from '../../../core/solver/dc.js';
import { luFactor, luSolve } from '../../../core/solver/lu.js';
import { chooseStep, chooseStop, rampStart } from '../../../core/solver/transient.js';

export interface ReferenceWave {
  nodes: string[];
  /** v[i][m]: node i at t = m·h, V. */
  v: Float64Array[];
  step: number;
}

export function referenceEdge(circuit: Circuit, edge: Edge, options: { step?: number; stop?: number } = {}): ReferenceWave {
  const net = compileNetlist(circuit);
  const n = net.nFree;
  const d = circuit.driver;
  const rising = edge === 'rising';
  const stop = options.stop ?? circuit.stop ?? chooseStop(circuit);
  const h = options.step ?? chooseStep(circuit, edge, stop);
  const steps = Math.max(1, Math.ceil(stop / h - 1e-9));
  const [v0, v1] = rising ? [d.vlow, d.vhigh] : [d.vhigh, d.vlow];
  const [rOld, rNew] = rising ? [d.routLow, d.routHigh] : [d.routHigh, d.routLow];
  const dc = solveDc(net, v0, rOld);
  const vStart = rampStart(dc.v[net.driver], v0, rOld, rNew);
  const ramp = fullRamp(circuit, edge);
  const { resistors: R, capacitors: C, inductors: L, lines: T } = net;

  // Nodal matrix of the companion network (free nodes only).
  const G = new Float64Array(n * n);
  const stamp = (a: number, b: number, g: number) => {
    if (a < n) G[a * n + a] += g;
    if (b < n) G[b * n + b] += g;
    if (a < n && b < n) {
      G[a * n + b] -= g;
      G[b * n + a] -= g;
    }
  };
  for (let k = 0; k < R.a.length; k++) stamp(R.a[k], R.b[k], 1 / R.value[k]);
  for (let k = 0; k < C.a.length; k++) stamp(C.a[k], C.b[k], (2 * C.value[k]) / h);
  for (let k = 0; k < L.a.length; k++) stamp(L.a[k], L.b[k], h / (2 * L.value[k]));
  for (let k = 0; k < T.a.length; k++) {
    stamp(T.a[k], net.names.length, 1 / T.value[k]); // to a fixed node: the diagonal only
    stamp(T.b[k], net.names.length, 1 / T.value[k]);
  }
  G[net.driver * n + net.driver] += 1 / rNew;
  const lu = luFactor(G, n);
  if (!lu) throw new Error('reference: singular matrix');

  const v = dc.v.slice(); // every node, fixed ones at their voltage
  const capI = new Float64Array(C.a.length); // current a -> b through each capacitor; none at DC
  const indI = dc.inductorCurrent.slice(); // current a -> b through each inductor
  // e of each line end for every sample (index m); before t = 0 the DC value.
  const eA: number[][] = [];
  const eB: number[][] = [];
  for (let k = 0; k < T.a.length; k++) {
    const i = dc.lineCurrent[k];
    eA.push([v[T.a[k]] / T.value[k] + i]);
    eB.push([v[T.b[k]] / T.value[k] - i]);
  }
  const historyOf = (e: number[], m: number, delay: number): number => {
    const r = delay / h;
    const whole = Math.max(1, Math.floor(r + 1e-9));
    const f = Math.min(1, Math.max(0, r - whole));
    const at = (s: number) => (s < 0 ? e[0] : e[s]);
    return (1 - f) * at(m - whole) + f * at(m - whole - 1);
  };

  const out = Array.from({ length: n }, (_, i) => {
    const w = new Float64Array(steps + 1);
    w[0] = v[i];
    return w;
  });
  const rhs = new Float64Array(net.names.length);
  const x = new Float64Array(n);
  for (let m = 1; m <= steps; m++) {
    const t = m * h;
    const vs = ramp > 0 && t < ramp ? vStart + ((v1 - vStart) * t) / ramp : v1;
    rhs.fill(0);
    rhs[net.driver] += vs / rNew;
    const toFixed = (a: number, b: number, g: number) => {
      if (b >= n && a < n) rhs[a] += g * v[b];
      if (a >= n && b < n) rhs[b] += g * v[a];
    };
    for (let k = 0; k < R.a.length; k++) toFixed(R.a[k], R.b[k], 1 / R.value[k]);
    const capJ = Array.from(capI, (i, k) => {
      const g = (2 * C.value[k]) / h;
      toFixed(C.a[k], C.b[k], g);
      const j = g * (v[C.a[k]] - v[C.b[k]]) + i;
      rhs[C.a[k]] += j;
      rhs[C.b[k]] -= j;
      return j;
    });
    const indJ = Array.from(indI, (i, k) => {
      const g = h / (2 * L.value[k]);
      toFixed(L.a[k], L.b[k], g);
      const j = i + g * (v[L.a[k]] - v[L.b[k]]);
      rhs[L.a[k]] -= j;
      rhs[L.b[k]] += j;
      return j;
    });
    const hA = T.delay.map((delay, k) => historyOf(eB[k], m, delay));
    const hB = T.delay.map((delay, k) => historyOf(eA[k], m, delay));
    for (let k = 0; k < T.a.length; k++) {
      rhs[T.a[k]] += hA[k];
      rhs[T.b[k]] += hB[k];
    }
    luSolve(lu, rhs, x);
    for (let i = 0; i < n; i++) {
      v[i] = x[i];
      out[i][m] = x[i];
    }
    for (let k = 0; k < C.a.length; k++) capI[k] = ((2 * C.value[k]) / h) * (v[C.a[k]] - v[C.b[k]]) - capJ[k];
    for (let k = 0; k < L.a.length; k++) indI[k] = (h / (2 * L.value[k])) * (v[L.a[k]] - v[L.b[k]]) + indJ[k];
    for (let k = 0; k < T.a.length; k++) {
      // e = v/Z0 + i with i = v/Z0 − Ih
      eA[k][m] = (2 * v[T.a[k]]) / T.value[k] - hA[k];
      eB[k][m] = (2 * v[T.b[k]]) / T.value[k] - hB[k];
    }
  }
  return { nodes: net.names.slice(0, n), v: out, step: h };
}
