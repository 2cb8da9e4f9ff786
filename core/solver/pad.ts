/**
 * Behavioural pads in the transient solver (docs/ibis.md §4, "Solving the pad"). The network stays
 * linear with its constant factored matrix; each pad is a current injection i_j at its node. With
 * x0 the step's solution without injections and Z = A⁻¹ restricted to the pad columns (computed once
 * per edge), the solution is x = x0 + Z·i (superposition), so the pads see the network's Thevenin
 * equivalent v_p = x0_p + Σ_j Z_pj·i_j. Newton's method solves that small system each step, then
 * one update of x. A pad separated from the others by lines is decoupled in Z (line ends are not
 * coupled through the matrix), so the usual case is one scalar Newton per pad.
 *
 * The driver pad also carries the conductance g0 = 1/PAD_R0 in the matrix (keeps it non-singular and
 * the Newton well conditioned); its injection is then i = −I_pin(v) + g0·v, exactly compensating.
 */
import { InputError } from '../errors.js';
import type { Circuit, DriverPad, Edge, PadSwitching, PadTables } from '../circuit/types.js';
import { type CompiledPad, compilePad } from './pad-curves.js';
import type { DcPoint, DcSolver } from './dc.js';
import { type SparseLu, sparseLuSolve } from './lu.js';
import type { Netlist } from './netlist.js';

/** Resistance that stands in the matrix at a behavioural driver's pad, ohm (compensated exactly; see above). */
export const PAD_R0 = 50;

/**
 * True when the circuit has a behavioural driver or receiver. Throws InputError for an `ibis`
 * reference the host has not resolved into a pad (core/ibis attachIbisModels).
 */
export function hasPads(circuit: Circuit): boolean {
  if (circuit.driver.ibis && !circuit.driver.pad) throw new InputError('driver.ibis', 'the IBIS model is not resolved (the host must attach the parsed models first)');
  circuit.receivers.forEach((r, i) => {
    if (r.ibis && !r.pad) throw new InputError(`receivers[${i}].ibis`, 'the IBIS model is not resolved (the host must attach the parsed models first)');
  });
  return circuit.driver.pad !== undefined || circuit.receivers.some((r) => r.pad !== undefined);
}

interface PadEntry {
  node: number;
  tables: PadTables;
  switching: PadSwitching | null;
  g0: number;
}

/** Newton tolerance on the pad voltage, V (far below any measured quantity). */
const TOL = 1e-10;
const MAX_ITER = 60;
/** Largest Newton step, V: keeps the iteration inside the tables' range on a steep clamp. */
const MAX_STEP = 0.5;

/** Per-edge pad state: Z columns, the Newton solve and the correction of x. */
export class PadSolver {
  readonly k: number;
  private readonly nodes: Int32Array;
  private readonly g0: Float64Array;
  private readonly curves: CompiledPad[];
  private readonly sw: (PadSwitching | null)[];
  /** Segment last used per pad (V-I grid) and per switching table: searches start there (the hunt of Press et al., Numerical Recipes 3rd ed. §3.1.1). */
  private readonly seg: Int32Array;
  private readonly kseg: Int32Array;
  /** Ku, Kd of each pad at the current step's time. */
  private readonly ku: Float64Array;
  private readonly kd: Float64Array;
  /** Z columns, n entries per pad (column j = response of every node to 1 A into pad j). */
  private readonly z: Float64Array;
  private readonly zpp: Float64Array;
  /** Pads coupled to no other pad through Z (solved alone by the segment walk), and the rest (solved together). */
  private readonly alone: Int32Array;
  private readonly group: Int32Array;
  private readonly lastSeg: Int32Array;
  readonly v: Float64Array;
  private readonly inj: Float64Array;
  private readonly d: Float64Array;
  private readonly jac: Float64Array;
  private readonly res: Float64Array;

  constructor(private readonly n: number, pads: PadEntry[], solveColumn: (j: number, out: Float64Array) => void, start: Float64Array) {
    const k = pads.length;
    this.k = k;
    this.nodes = Int32Array.from(pads, (p) => p.node);
    this.g0 = Float64Array.from(pads, (p) => p.g0);
    this.curves = pads.map((p) => compilePad(p.tables));
    this.sw = pads.map((p) => p.switching);
    this.seg = new Int32Array(k);
    this.kseg = new Int32Array(k);
    this.ku = new Float64Array(k);
    this.kd = new Float64Array(k);
    this.z = new Float64Array(n * k);
    const col = new Float64Array(n);
    for (let j = 0; j < k; j++) {
      solveColumn(this.nodes[j], col);
      this.z.set(col, j * n);
    }
    this.zpp = new Float64Array(k * k);
    let largest = 0;
    for (let p = 0; p < k; p++) for (let j = 0; j < k; j++) {
      const value = this.z[j * n + this.nodes[p]];
      this.zpp[p * k + j] = value;
      largest = Math.max(largest, Math.abs(value));
    }
    const alone: number[] = [];
    const group: number[] = [];
    for (let p = 0; p < k; p++) {
      let off = 0;
      for (let j = 0; j < k; j++) if (p !== j) off = Math.max(off, Math.abs(this.zpp[p * k + j]), Math.abs(this.zpp[j * k + p]));
      (off <= 1e-14 * largest ? alone : group).push(p);
    }
    this.alone = Int32Array.from(alone);
    this.group = Int32Array.from(group);
    this.lastSeg = new Int32Array(group.length);
    this.v = Float64Array.from(this.nodes, (node) => start[node]);
    this.inj = new Float64Array(k);
    this.d = new Float64Array(k);
    this.jac = new Float64Array(k * k);
    this.res = new Float64Array(k);
  }

  /** Ku, Kd of every pad at time t (switching tables held at their ends), once per step. */
  private setTime(t: number): void {
    for (let j = 0; j < this.k; j++) {
      const s = this.sw[j];
      if (s === null) {
        this.ku[j] = 0;
        this.kd[j] = 0;
        continue;
      }
      const tt = s.t;
      const last = tt.length - 1;
      if (t <= tt[0]) {
        this.ku[j] = s.ku[0];
        this.kd[j] = s.kd[0];
      } else if (t >= tt[last]) {
        this.ku[j] = s.ku[last];
        this.kd[j] = s.kd[last];
      } else {
        let q = this.kseg[j];
        while (q > 0 && tt[q] > t) q--;
        while (q < last - 1 && tt[q + 1] <= t) q++;
        this.kseg[j] = q;
        const w = (t - tt[q]) / (tt[q + 1] - tt[q]);
        this.ku[j] = s.ku[q] + w * (s.ku[q + 1] - s.ku[q]);
        this.kd[j] = s.kd[q] + w * (s.kd[q + 1] - s.kd[q]);
      }
    }
  }

  /** Injection of pad j at voltage v (into the node, A) and its derivative, written to inj/d. */
  private evaluate(j: number, v: number): void {
    const c = this.curves[j];
    const g = c.v;
    const last = g.length - 2;
    let q = this.seg[j];
    while (q > 0 && g[q] > v) q--;
    while (q < last && g[q + 1] <= v) q++;
    this.seg[j] = q;
    const h = 1 / (g[q + 1] - g[q]);
    const w = (v - g[q]) * h;
    const ku = this.ku[j];
    const kd = this.kd[j];
    const pu = c.pu;
    const pd = c.pd;
    const cl = c.clamp;
    const s = ku * (pu[q + 1] - pu[q]) + kd * (pd[q + 1] - pd[q]) + (cl[q + 1] - cl[q]);
    const i = ku * pu[q] + kd * pd[q] + cl[q] + w * s;
    this.inj[j] = -i + this.g0[j] * v;
    this.d[j] = -s * h + this.g0[j];
  }

  /**
   * On entry x holds the step's solution without pad currents (x0, first n entries); on exit the
   * solution with them, and out[i * stride + m] the same values.
   */
  correct(x: Float64Array, t: number, out: Float64Array, stride: number, m: number): void {
    this.solve(x, t);
    const { n, k, z, inj } = this;
    for (let j = 0; j < k; j++) {
      const a = inj[j];
      const base = j * n;
      for (let i = 0; i < n; i++) x[i] += a * z[base + i];
    }
    if (out.length > 0) for (let i = 0; i < n; i++) out[i * stride + m] = x[i];
  }

  /** The injection of pad j after the last solve, A. */
  injection(j: number): number {
    return this.inj[j];
  }

  /** Solves the pad voltages against x0 (no change to x). */
  solve(x0: Float64Array, t: number): void {
    this.setTime(t);
    const { k, v, zpp, inj, d, nodes, alone, group } = this;
    for (let a = 0; a < alone.length; a++) {
      const j = alone[a];
      v[j] = this.scalar(j, x0[nodes[j]], zpp[j * k + j], v[j]);
    }
    const g = group.length;
    if (g === 0) return;
    // Newton's method; the pad data is linear on each segment of its grid, so once an update leaves
    // every pad on the segments it was linearised on, the update was exact and the solve ends.
    const { jac, res, seg, lastSeg } = this;
    let clipped = true; // the last update was not a full Newton step (or there was none yet)
    for (let iter = 0; iter < MAX_ITER; iter++) {
      let same = !clipped;
      for (let a = 0; a < g; a++) {
        this.evaluate(group[a], v[group[a]]);
        if (seg[group[a]] !== lastSeg[a]) same = false;
        lastSeg[a] = seg[group[a]];
      }
      if (same) return;
      let worst = 0;
      for (let a = 0; a < g; a++) {
        const p = group[a];
        let f = v[p] - x0[nodes[p]];
        for (let b = 0; b < g; b++) {
          const j = group[b];
          f -= zpp[p * k + j] * inj[j];
          jac[a * g + b] = (a === b ? 1 : 0) - zpp[p * k + j] * d[j];
        }
        res[a] = -f;
      }
      gaussSolve(jac, res, g);
      clipped = false;
      for (let a = 0; a < g; a++) {
        if (Math.abs(res[a]) > MAX_STEP) clipped = true;
        const step = Math.max(-MAX_STEP, Math.min(MAX_STEP, res[a]));
        v[group[a]] += step;
        worst = Math.max(worst, Math.abs(step));
      }
      if (worst < TOL) break;
    }
    for (let a = 0; a < g; a++) this.evaluate(group[a], v[group[a]]);
  }

  /**
   * One pad: f(v) = v − x0 − zz·inj(v) = 0 with inj = −I(v) + g0·v. I is linear on each segment of
   * the merged grid, so f is too: the root on a segment is explicit, and the walk moves one segment
   * toward it until the root lies on the segment (f increases with v: the pad's dI/dV ≥ 0 and
   * zz·g0 ≤ 1). A root at a kink between two segments ends the walk there. Newton's method on a
   * piecewise-linear function is this walk; doing it explicitly avoids cycling at kinks.
   */
  private scalar(j: number, x0: number, zz: number, guess: number): number {
    const c = this.curves[j];
    const g = c.v;
    const last = g.length - 2;
    const ku = this.ku[j];
    const kd = this.kd[j];
    const g0 = this.g0[j];
    const { pu, pd, clamp: cl } = c;
    // The walk starts on the segment of the previous step's voltage (`guess`), where it usually ends.
    let q = this.seg[j];
    let v = guess;
    let moved = 0;
    let i0 = 0;
    let slope = 0;
    for (let iter = 0; iter <= last + 1; iter++) {
      const h = g[q + 1] - g[q];
      i0 = ku * pu[q] + kd * pd[q] + cl[q];
      slope = (ku * (pu[q + 1] - pu[q]) + kd * (pd[q + 1] - pd[q]) + (cl[q + 1] - cl[q])) / h;
      const denominator = 1 + zz * (slope - g0);
      v = (x0 - zz * (i0 - slope * g[q])) / denominator;
      if (!(denominator > 0)) break; // not expected for a passive pad; keep the segment's root
      if (q > 0 && v < g[q]) {
        if (moved > 0) { v = g[q]; break; } // root at the kink just crossed
        q--;
        moved = -1;
      } else if (q < last && v > g[q + 1]) {
        if (moved < 0) { v = g[q + 1]; break; }
        q++;
        moved = 1;
      } else break;
    }
    this.seg[j] = q;
    this.inj[j] = -(i0 + slope * (v - g[q])) + g0 * v;
    this.d[j] = -slope + g0;
    return v;
  }
}

/** Solves a small dense system in place (Gaussian elimination with partial pivoting); result in b. */
function gaussSolve(a: Float64Array, b: Float64Array, k: number): void {
  for (let c = 0; c < k; c++) {
    let p = c;
    for (let r = c + 1; r < k; r++) if (Math.abs(a[r * k + c]) > Math.abs(a[p * k + c])) p = r;
    if (p !== c) {
      for (let q = 0; q < k; q++) {
        const tmp = a[c * k + q];
        a[c * k + q] = a[p * k + q];
        a[p * k + q] = tmp;
      }
      const tb = b[c];
      b[c] = b[p];
      b[p] = tb;
    }
    const piv = a[c * k + c];
    for (let r = c + 1; r < k; r++) {
      const f = a[r * k + c] / piv;
      if (f === 0) continue;
      for (let q = c; q < k; q++) a[r * k + q] -= f * a[c * k + q];
      b[r] -= f * b[c];
    }
  }
  for (let r = k - 1; r >= 0; r--) {
    let acc = b[r];
    for (let q = r + 1; q < k; q++) acc -= a[r * k + q] * b[q];
    b[r] = acc / a[r * k + r];
  }
}

function entries(circuit: Circuit, net: Netlist, edge: Edge | null, when: 'before' | 'after' | 'run'): PadEntry[] {
  const index = new Map(net.names.map((name, i) => [name, i]));
  const out: PadEntry[] = [];
  const d: DriverPad | undefined = circuit.driver.pad;
  if (d && edge) {
    const sw = d[edge];
    let switching: PadSwitching = sw;
    if (when !== 'run') {
      // Static coefficients: the table's first (before) or last (after) values.
      const at = when === 'before' ? 0 : sw.t.length - 1;
      switching = { t: Float64Array.of(0), ku: Float64Array.of(sw.ku[at]), kd: Float64Array.of(sw.kd[at]), edgeTime: sw.edgeTime };
    }
    out.push({ node: net.driver, tables: d, switching, g0: 1 / PAD_R0 });
  }
  for (const r of circuit.receivers) if (r.pad) out.push({ node: index.get(r.node)!, tables: r.pad, switching: null, g0: 0 });
  return out;
}

/**
 * DC operating point with the pads at static coefficients: the DC network's responses to unit
 * injections at the pads give its Thevenin equivalent, the same Newton solves the pads, and one more
 * DC solve with the pad currents gives every node. `vs` is the linear driver's source (0 for a pad driver).
 */
export function padDc(circuit: Circuit, net: Netlist, edge: Edge, when: 'before' | 'after', dc: DcSolver, vs: number): DcPoint {
  const pads = entries(circuit, net, edge, when);
  const base = dc(vs);
  const nf = net.nFree;
  const unit = new Float64Array(net.names.length);
  const columns: Float64Array[] = pads.map((p) => {
    unit.fill(0);
    unit[p.node] = 1;
    const r = dc(vs, unit).v;
    const col = new Float64Array(nf);
    for (let i = 0; i < nf; i++) col[i] = r[i] - base.v[i];
    return col;
  });
  const solver = new PadSolver(nf, pads, (node, out) => out.set(columns[pads.findIndex((p) => p.node === node)]), base.v);
  const x = base.v.slice(0, nf);
  solver.correct(x, 0, new Float64Array(0), 0, 0);
  const inject = new Float64Array(net.names.length);
  pads.forEach((p, j) => (inject[p.node] = solver.injection(j)));
  return dc(vs, inject);
}

/** The per-edge pad solver over the transient matrix `lu`, starting from the DC point `start`. */
export function padTransient(circuit: Circuit, net: Netlist, edge: Edge, lu: SparseLu, start: DcPoint): PadSolver {
  const n = net.nFree;
  const e = new Float64Array(net.names.length);
  const xs = new Float64Array(n);
  return new PadSolver(n, entries(circuit, net, edge, 'run'), (node, out) => {
    e.fill(0);
    e[node] = 1;
    sparseLuSolve(lu, e, xs);
    out.set(xs);
  }, start.v);
}
