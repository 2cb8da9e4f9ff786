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
import { type SparseLu, eliminate, sparseLuSolve, substitute } from './lu.js';
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
/** Linear solves the coupled pads' segment walk tries before Newton's method takes over. */
const WALK_STEPS = 8;

/** Per-edge pad state: Z columns, the Newton solve and the correction of x. */
export class PadSolver {
  readonly k: number;
  private readonly nodes: Int32Array;
  private readonly g0: Float64Array;
  private readonly curves: CompiledPad[];
  private readonly sw: (PadSwitching | null)[];
  /** The pads that have switching tables. */
  private readonly switching: Int32Array;
  /** Segment last used per pad (V-I grid) and per switching table: searches start there (the hunt of Press et al., Numerical Recipes 3rd ed. §3.1.1). */
  private readonly seg: Int32Array;
  private readonly kseg: Int32Array;
  /** Ku, Kd of each pad at the current step's time. */
  private readonly ku: Float64Array;
  private readonly kd: Float64Array;
  /**
   * Z columns without their zeros (column j = response of every node to 1 A into pad j): pad j moves
   * nodes zNode[zStart[j] .. zStart[j+1]) by zValue per ampere. Line ends are not coupled through the
   * matrix, so a column usually holds the pad's own node and the lumped parts around it only.
   */
  private readonly zStart: Int32Array;
  private readonly zNode: Int32Array;
  private readonly zValue: Float64Array;
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
  /** Each group pad's injection on its segment as cst + dg·v, and the walk's solution (per group pad). */
  private readonly cst: Float64Array;
  private readonly dg: Float64Array;
  private readonly sol: Float64Array;
  /** A group without switching tables keeps the inverse of its system per set of segments (walk). */
  private readonly groupStatic: boolean;
  private inverseReady = false;
  private readonly inverseSeg: Int32Array;
  private readonly inverse: Float64Array;
  private readonly zc: Float64Array;

  constructor(private readonly n: number, pads: PadEntry[], solveColumn: (j: number, out: Float64Array) => void, start: Float64Array) {
    const k = pads.length;
    this.k = k;
    // Plain loops: Int32Array.from with a map function goes through the iterator protocol, and
    // three solvers are built per edge.
    this.nodes = new Int32Array(k);
    this.g0 = new Float64Array(k);
    this.curves = [];
    this.sw = [];
    this.v = new Float64Array(k);
    for (let j = 0; j < k; j++) {
      this.nodes[j] = pads[j].node;
      this.g0[j] = pads[j].g0;
      this.curves.push(compilePad(pads[j].tables));
      this.sw.push(pads[j].switching);
      this.v[j] = start[pads[j].node];
    }
    let switching = 0;
    for (let j = 0; j < k; j++) if (pads[j].switching) switching++;
    this.switching = new Int32Array(switching);
    for (let j = 0, a = 0; j < k; j++) if (pads[j].switching) this.switching[a++] = j;
    this.seg = new Int32Array(k);
    this.kseg = new Int32Array(k);
    this.ku = new Float64Array(k);
    this.kd = new Float64Array(k);
    const z = new Float64Array(n * k);
    const col = new Float64Array(n);
    for (let j = 0; j < k; j++) {
      solveColumn(this.nodes[j], col);
      z.set(col, j * n);
    }
    this.zStart = new Int32Array(k + 1);
    const zNode: number[] = [];
    const zValue: number[] = [];
    for (let j = 0; j < k; j++) {
      this.zStart[j] = zNode.length;
      for (let i = 0; i < n; i++) if (z[j * n + i] !== 0) { zNode.push(i); zValue.push(z[j * n + i]); }
    }
    this.zStart[k] = zNode.length;
    this.zNode = new Int32Array(zNode);
    this.zValue = new Float64Array(zValue);
    this.zpp = new Float64Array(k * k);
    let largest = 0;
    for (let p = 0; p < k; p++) for (let j = 0; j < k; j++) {
      const value = z[j * n + this.nodes[p]];
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
    this.alone = new Int32Array(alone);
    this.group = new Int32Array(group);
    this.lastSeg = new Int32Array(group.length);
    this.inj = new Float64Array(k);
    this.d = new Float64Array(k);
    this.jac = new Float64Array(k * k);
    this.res = new Float64Array(k);
    this.cst = new Float64Array(k);
    this.dg = new Float64Array(k);
    this.sol = new Float64Array(k);
    this.groupStatic = group.every((j) => pads[j].switching === null);
    this.inverseSeg = new Int32Array(group.length);
    this.inverse = new Float64Array(group.length * group.length);
    this.zc = new Float64Array(group.length);
  }

  /** Ku, Kd of every pad at time t (switching tables held at their ends), once per step. */
  private setTime(t: number): void {
    // Pads without switching tables (receivers) keep Ku = Kd = 0 from the constructor.
    for (let a = 0; a < this.switching.length; a++) {
      const j = this.switching[a];
      const s = this.sw[j]!;
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

  /** Injection of pad j at voltage v (into the node, A) and its derivative, written to inj/d (segment as a straight line, see CompiledPad). */
  private evaluate(j: number, v: number): void {
    const c = this.curves[j];
    const g = c.v;
    const last = g.length - 2;
    let q = this.seg[j];
    while (q > 0 && g[q] > v) q--;
    while (q < last && g[q + 1] <= v) q++;
    this.seg[j] = q;
    const ku = this.ku[j];
    const kd = this.kd[j];
    const sg = c.segments;
    const o = 6 * q;
    const slope = ku * sg[o] + kd * sg[o + 1] + sg[o + 2];
    const i = ku * sg[o + 3] + kd * sg[o + 4] + sg[o + 5] + slope * v;
    this.inj[j] = -i + this.g0[j] * v;
    this.d[j] = -slope + this.g0[j];
  }

  /**
   * On entry x holds the step's solution without pad currents (x0, first n entries); on exit the
   * solution with them, and out[i * stride + m] the same values.
   */
  correct(x: Float64Array, t: number, out: Float64Array, stride: number, m: number): void {
    this.solve(x, t);
    const { k, zStart, zNode, zValue, inj } = this;
    for (let j = 0; j < k; j++) {
      const a = inj[j];
      for (let p = zStart[j], end = zStart[j + 1]; p < end; p++) x[zNode[p]] += a * zValue[p];
    }
    if (out.length > 0) for (let p = 0, end = zStart[k]; p < end; p++) out[zNode[p] * stride + m] = x[zNode[p]];
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
    if (this.walk(x0)) return;
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
   * The coupled pads by the segment walk of `scalar` in several unknowns: on the grid segments of the
   * previous step each pad's injection is linear, inj_j = c_j + D_j·v_j, so v = x0 + Z·inj is one
   * small linear system. When every solved voltage lies on its segment that is the root (the data is
   * exactly linear there); else each pad outside moves one segment toward its voltage and the system
   * is solved again. Gives up (false: Newton's method below decides) after WALK_STEPS tries, e.g.
   * at a root on a kink. v, inj and d of the group are written only on success.
   */
  private walk(x0: Float64Array): boolean {
    const { k, v, zpp, inj, d, nodes, group, jac, res, seg, cst, dg, sol } = this;
    const g = group.length;
    for (let attempt = 0; attempt < WALK_STEPS; attempt++) {
      if (this.groupStatic) {
        // Coefficients fixed (no switching tables): the system changes only when a segment does.
        let same = this.inverseReady;
        for (let a = 0; a < g; a++) if (seg[group[a]] !== this.inverseSeg[a]) same = false;
        if (!same) this.refreshInverse();
        const { inverse, zc } = this;
        for (let a = 0; a < g; a++) res[a] = x0[nodes[group[a]]] + zc[a];
        for (let a = 0; a < g; a++) {
          let acc = 0;
          for (let b = 0; b < g; b++) acc += inverse[a * g + b] * res[b];
          sol[a] = acc;
        }
      } else {
        this.linearise();
        for (let a = 0; a < g; a++) {
          const p = group[a];
          let r = x0[nodes[p]];
          for (let b = 0; b < g; b++) {
            const zz = zpp[p * k + group[b]];
            r += zz * cst[b];
            jac[a * g + b] = (a === b ? 1 : 0) - zz * dg[b];
          }
          sol[a] = r;
        }
        gaussSolve(jac, sol, g);
      }
      let moved = false;
      for (let a = 0; a < g; a++) {
        const j = group[a];
        const grid = this.curves[j].v;
        const q = seg[j];
        const x = sol[a];
        if (!Number.isFinite(x)) return false;
        if (q > 0 && x < grid[q]) {
          seg[j] = q - 1;
          moved = true;
        } else if (q < grid.length - 2 && x > grid[q + 1]) {
          seg[j] = q + 1;
          moved = true;
        }
      }
      if (!moved) {
        for (let a = 0; a < g; a++) {
          const j = group[a];
          v[j] = sol[a];
          inj[j] = cst[a] + dg[a] * sol[a];
          d[j] = dg[a];
        }
        return true;
      }
    }
    return false;
  }

  /** Each group pad's injection on its present segment as cst + dg·v (the walk's linearisation). */
  private linearise(): void {
    const { group, seg, cst, dg } = this;
    for (let a = 0; a < group.length; a++) {
      const j = group[a];
      const sg = this.curves[j].segments;
      const o = 6 * seg[j];
      const ku = this.ku[j];
      const kd = this.kd[j];
      cst[a] = -(ku * sg[o + 3] + kd * sg[o + 4] + sg[o + 5]);
      dg[a] = -(ku * sg[o] + kd * sg[o + 1] + sg[o + 2]) + this.g0[j];
    }
  }

  /** For a group without switching: the inverse of I − Zgg·D and Zgg·cst on the present segments. */
  private refreshInverse(): void {
    const { k, zpp, group, seg, cst, dg, jac, inverse, zc, inverseSeg, res } = this;
    const g = group.length;
    this.linearise();
    for (let col = 0; col < g; col++) {
      for (let a = 0; a < g; a++) {
        for (let b = 0; b < g; b++) jac[a * g + b] = (a === b ? 1 : 0) - zpp[group[a] * k + group[b]] * dg[b];
        res[a] = a === col ? 1 : 0;
      }
      gaussSolve(jac, res, g);
      for (let a = 0; a < g; a++) inverse[a * g + col] = res[a];
    }
    for (let a = 0; a < g; a++) {
      let acc = 0;
      for (let b = 0; b < g; b++) acc += zpp[group[a] * k + group[b]] * cst[b];
      zc[a] = acc;
      inverseSeg[a] = seg[group[a]];
    }
    this.inverseReady = true;
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
    const sg = c.segments;
    // The walk starts on the segment of the previous step's voltage (`guess`), where it usually ends.
    let q = this.seg[j];
    let v = guess;
    let moved = 0;
    let at0 = 0; // the segment's current at V = 0: I = at0 + slope·V
    let slope = 0;
    for (let iter = 0; iter <= last + 1; iter++) {
      const o = 6 * q;
      at0 = ku * sg[o + 3] + kd * sg[o + 4] + sg[o + 5];
      slope = ku * sg[o] + kd * sg[o + 1] + sg[o + 2];
      const denominator = 1 + zz * (slope - g0);
      v = (x0 - zz * at0) / denominator;
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
    this.inj[j] = -(at0 + slope * v) + g0 * v;
    this.d[j] = -slope + g0;
    return v;
  }
}

/**
 * Solves the small dense system a·x = b (a is overwritten by its factors), result in b: the
 * elimination and substitution of lu.ts, no threshold (a zero pivot gives non-finite values, which
 * the callers check). Scratch for the row order and the solution grows as needed.
 */
let smallPerm = new Int32Array(4);
let smallX = new Float64Array(4);
function gaussSolve(a: Float64Array, b: Float64Array, k: number): void {
  if (smallPerm.length < k) {
    smallPerm = new Int32Array(k);
    smallX = new Float64Array(k);
  }
  eliminate(a, k, smallPerm, 0);
  substitute(a, k, smallPerm, b, smallX);
  for (let i = 0; i < k; i++) b[i] = smallX[i];
}

function entries(circuit: Circuit, net: Netlist, edge: Edge | null, when: 'before' | 'after' | 'run'): PadEntry[] {
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
  for (const r of circuit.receivers) if (r.pad) out.push({ node: net.names.indexOf(r.node), tables: r.pad, switching: null, g0: 0 });
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
  const solver = new PadSolver(nf, pads, (node, out) => out.set(unitResponse(dc, net, node)), base.v);
  const x = base.v.slice(0, nf);
  solver.correct(x, 0, new Float64Array(0), 0, 0);
  const inject = new Float64Array(net.names.length);
  pads.forEach((p, j) => (inject[p.node] = solver.injection(j)));
  return dc(vs, inject);
}

/**
 * The DC network's response of every free node to 1 A into `node`, V (the difference of two solves:
 * the network is linear). It depends on the solver and the node only, not on the source or the edge,
 * so it is kept per solver: the DC points before and after both edges share it.
 */
const responses = new WeakMap<DcSolver, Map<number, Float64Array>>();
function unitResponse(dc: DcSolver, net: Netlist, node: number): Float64Array {
  let byNode = responses.get(dc);
  if (!byNode) responses.set(dc, (byNode = new Map()));
  let col = byNode.get(node);
  if (!col) {
    const unit = new Float64Array(net.names.length);
    unit[node] = 1;
    const base = dc(0).v;
    const r = dc(0, unit).v;
    col = new Float64Array(net.nFree);
    for (let i = 0; i < col.length; i++) col[i] = r[i] - base[i];
    byNode.set(node, col);
  }
  return col;
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
