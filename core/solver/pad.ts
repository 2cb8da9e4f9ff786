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

/**
 * What the pad solvers of one matrix share: the pads, their compiled V-I data and the Z columns.
 * It depends on the network, the matrix and the pads, not on the edge or the switching state, so it
 * is built once per matrix (DC or transient) and serves the DC points and runs of both edges.
 */
interface PadLayout {
  readonly k: number;
  readonly nodes: Int32Array;
  readonly g0: Float64Array;
  readonly curves: CompiledPad[];
  /**
   * Z columns without their zeros (column j = response of every node to 1 A into pad j): pad j moves
   * nodes zNode[zStart[j] .. zStart[j+1]) by zValue per ampere. Line ends are not coupled through the
   * matrix, so a column usually holds the pad's own node and the lumped parts around it only.
   */
  readonly zStart: Int32Array;
  readonly zNode: Int32Array;
  readonly zValue: Float64Array;
  /** Z between the pads, k×k row-major. */
  readonly zpp: Float64Array;
  /** Pads coupled to no other pad through Z (solved alone by the segment walk), and the rest (solved together). */
  readonly alone: Int32Array;
  readonly group: Int32Array;
}

function buildLayout(n: number, pads: PadEntry[], solveColumn: (j: number, out: Float64Array) => void): PadLayout {
  const k = pads.length;
  // Plain loops: Int32Array.from with a map function goes through the iterator protocol.
  const nodes = new Int32Array(k);
  const g0 = new Float64Array(k);
  const curves: CompiledPad[] = [];
  for (let j = 0; j < k; j++) {
    nodes[j] = pads[j].node;
    g0[j] = pads[j].g0;
    curves.push(compilePad(pads[j].tables));
  }
  const z = new Float64Array(n * k);
  const col = new Float64Array(n);
  let nonzero = 0;
  for (let j = 0; j < k; j++) {
    solveColumn(nodes[j], col);
    z.set(col, j * n);
    for (let i = 0; i < n; i++) if (col[i] !== 0) nonzero++;
  }
  const zStart = new Int32Array(k + 1);
  const zNode = new Int32Array(nonzero);
  const zValue = new Float64Array(nonzero);
  for (let j = 0, e = 0; j < k; j++) {
    zStart[j] = e;
    for (let i = 0; i < n; i++) if (z[j * n + i] !== 0) { zNode[e] = i; zValue[e++] = z[j * n + i]; }
  }
  zStart[k] = nonzero;
  const zpp = new Float64Array(k * k);
  let largest = 0;
  for (let p = 0; p < k; p++) for (let j = 0; j < k; j++) {
    const value = z[j * n + nodes[p]];
    zpp[p * k + j] = value;
    largest = Math.max(largest, Math.abs(value));
  }
  const alone: number[] = [];
  const group: number[] = [];
  for (let p = 0; p < k; p++) {
    let off = 0;
    for (let j = 0; j < k; j++) if (p !== j) off = Math.max(off, Math.abs(zpp[p * k + j]), Math.abs(zpp[j * k + p]));
    (off <= 1e-14 * largest ? alone : group).push(p);
  }
  return { k, nodes, g0, curves, zStart, zNode, zValue, zpp, alone: new Int32Array(alone), group: new Int32Array(group) };
}

/**
 * The pad solvers of one compiled circuit, by the matrix their layout was built for (a DcSolver or a
 * SparseLu of that circuit; one circuit always brings the same pads). The compiled circuit owns it
 * (core/solver/transient.ts PreparedNet), so it lives exactly as long as that circuit's simulation.
 * A solver serves one run at a time (runs are synchronous) and begin() resets it.
 */
export class PadSolvers {
  private readonly byMatrix = new Map<object, PadSolver>();
  get(matrix: object, n: number, pads: PadEntry[], solveColumn: (j: number, out: Float64Array) => void): PadSolver {
    let solver = this.byMatrix.get(matrix);
    if (!solver) this.byMatrix.set(matrix, (solver = new PadSolver(buildLayout(n, pads, solveColumn))));
    return solver;
  }
}

/** Numbers kept per pad for its present segment (see PadSolver.cache). */
const CACHE = 4;
const NO_INT = new Int32Array(0);
const NO_FLOAT = new Float64Array(0);

/** Per-edge pad state over a shared layout: the Newton solve and the correction of x. */
export class PadSolver {
  readonly k: number;
  private readonly nodes: Int32Array;
  private readonly g0: Float64Array;
  private readonly curves: CompiledPad[];
  private readonly sw: (PadSwitching | null)[];
  /** The pads that have switching tables: the first switchingCount entries. */
  private readonly switching: Int32Array;
  private switchingCount = 0;
  /** Segment last used per pad (V-I grid) and per switching table: searches start there (the hunt of Press et al., Numerical Recipes 3rd ed. §3.1.1). */
  private readonly seg: Int32Array;
  private readonly kseg: Int32Array;
  /** Ku, Kd of each pad at the current step's time. */
  private readonly ku: Float64Array;
  private readonly kd: Float64Array;
  private readonly zStart: Int32Array;
  private readonly zNode: Int32Array;
  private readonly zValue: Float64Array;
  private readonly zpp: Float64Array;
  private readonly alone: Int32Array;
  private readonly group: Int32Array;
  readonly v: Float64Array;
  private readonly inj: Float64Array;
  private readonly d: Float64Array;
  /**
   * Per pad alone in Z, the solution on the segment the last scalar solve ended on, as a function of
   * x0 at the coefficients it was solved with: there the injection is linear in x0, inj = γ·x0 + δ,
   * valid while x0 lies in [x0lo, x0hi] (the root on the segment). Stored per pad as
   * [x0lo, x0hi, γ, δ]; NaN bounds when there is none. While the coefficients hold (receivers
   * always; a driver outside its switching tables) a pad usually stays on its segment, and its step
   * is one multiply-add instead of the walk. (The step's v and dinj/dv of such a pad are not kept:
   * nothing reads them; only coupled pads use theirs.)
   */
  private readonly cache: Float64Array;
  /** Time after which every switching table is held at its end, s, and whether setTime has applied the end values. */
  private heldAfter = -Infinity;
  private held = false;
  /** Scratch of the coupled pads (empty when every pad is alone, the usual net). */
  private readonly lastSeg: Int32Array;
  private readonly jac: Float64Array;
  private readonly res: Float64Array;
  /** Each group pad's injection on its segment as cst + dg·v, and the walk's solution (per group pad). */
  private readonly cst: Float64Array;
  private readonly dg: Float64Array;
  private readonly sol: Float64Array;
  /** A group without switching tables keeps the inverse of its system per set of segments (walk). */
  private groupStatic = true;
  private inverseReady = false;
  private readonly inverseSeg: Int32Array;
  private readonly inverse: Float64Array;
  private readonly zc: Float64Array;
  /** Per group pad, the ends of its segment in the inverse's set of segments; and whether the last step's walk ended on that set. */
  private readonly groupBounds: Float64Array;
  private onInverse = false;

  /** Storage for the pads of `layout`; begin() sets a run up. */
  constructor(layout: PadLayout) {
    const k = layout.k;
    this.k = k;
    this.nodes = layout.nodes;
    this.g0 = layout.g0;
    this.curves = layout.curves;
    this.zStart = layout.zStart;
    this.zNode = layout.zNode;
    this.zValue = layout.zValue;
    this.zpp = layout.zpp;
    this.alone = layout.alone;
    this.group = layout.group;
    this.sw = new Array<PadSwitching | null>(k).fill(null);
    this.switching = new Int32Array(k);
    this.v = new Float64Array(k);
    this.seg = new Int32Array(k);
    this.kseg = new Int32Array(k);
    this.ku = new Float64Array(k);
    this.kd = new Float64Array(k);
    this.inj = new Float64Array(k);
    this.d = new Float64Array(k);
    this.cache = new Float64Array(CACHE * k);
    const g = layout.group.length;
    this.lastSeg = g > 0 ? new Int32Array(g) : NO_INT;
    this.jac = g > 0 ? new Float64Array(g * g) : NO_FLOAT;
    this.res = g > 0 ? new Float64Array(g) : NO_FLOAT;
    this.cst = g > 0 ? new Float64Array(g) : NO_FLOAT;
    this.dg = g > 0 ? new Float64Array(g) : NO_FLOAT;
    this.sol = g > 0 ? new Float64Array(g) : NO_FLOAT;
    this.inverseSeg = g > 0 ? new Int32Array(g) : NO_INT;
    this.inverse = g > 0 ? new Float64Array(g * g) : NO_FLOAT;
    this.zc = g > 0 ? new Float64Array(g) : NO_FLOAT;
    this.groupBounds = g > 0 ? new Float64Array(2 * g) : NO_FLOAT;
  }

  /**
   * Starts a run (a DC point or an edge) with the pads' switching tables `pads` (same pads as the
   * layout) from the node voltages `start`. Every piece of state is reset, so a run never depends on
   * the runs before it.
   */
  begin(pads: PadEntry[], start: Float64Array): this {
    const k = this.k;
    let switching = 0;
    let heldAfter = -Infinity;
    for (let j = 0; j < k; j++) {
      const sw = pads[j].switching;
      this.sw[j] = sw;
      const v = (this.v[j] = start[this.nodes[j]]);
      // The walks start on the segment of the starting voltage (bisection), usually the root's.
      const grid = this.curves[j].v;
      let lo = 0;
      let hi = grid.length - 2;
      while (lo < hi) {
        const mid = (lo + hi + 1) >> 1;
        if (grid[mid] <= v) lo = mid;
        else hi = mid - 1;
      }
      this.seg[j] = lo;
      if (sw) {
        this.switching[switching++] = j;
        heldAfter = Math.max(heldAfter, sw.t[sw.t.length - 1]);
      }
    }
    this.switchingCount = switching;
    this.heldAfter = heldAfter;
    this.held = false;
    this.kseg.fill(0);
    this.ku.fill(0);
    this.kd.fill(0);
    this.inj.fill(0);
    this.d.fill(0);
    this.cache.fill(NaN);
    this.lastSeg.fill(0);
    let groupStatic = true;
    for (let a = 0; a < this.group.length; a++) if (pads[this.group[a]].switching !== null) groupStatic = false;
    this.groupStatic = groupStatic;
    this.inverseReady = false;
    this.onInverse = false;
    return this;
  }

  /** Ku, Kd of every pad at time t (switching tables held at their ends), once per step. */
  private setTime(t: number): void {
    // Pads without switching tables (receivers) keep Ku = Kd = 0 from the constructor.
    for (let a = 0; a < this.switchingCount; a++) {
      const j = this.switching[a];
      const s = this.sw[j]!;
      const tt = s.t;
      const last = tt.length - 1;
      let ku: number;
      let kd: number;
      if (t <= tt[0]) {
        ku = s.ku[0];
        kd = s.kd[0];
      } else if (t >= tt[last]) {
        ku = s.ku[last];
        kd = s.kd[last];
      } else {
        let q = this.kseg[j];
        while (q > 0 && tt[q] > t) q--;
        while (q < last - 1 && tt[q + 1] <= t) q++;
        this.kseg[j] = q;
        const w = (t - tt[q]) / (tt[q + 1] - tt[q]);
        ku = s.ku[q] + w * (s.ku[q + 1] - s.ku[q]);
        kd = s.kd[q] + w * (s.kd[q + 1] - s.kd[q]);
      }
      if (ku !== this.ku[j] || kd !== this.kd[j]) {
        this.ku[j] = ku;
        this.kd[j] = kd;
        this.cache[CACHE * j] = NaN;
        this.cache[CACHE * j + 1] = NaN;
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
   * solution with them. A pad alone in Z reads only its own
   * node and its column touches no other pad's node, so its column is added as soon as it is solved.
   */
  correct(x: Float64Array, t: number): void {
    if (!this.held) {
      this.setTime(t);
      this.held = t >= this.heldAfter;
    }
    const { alone, nodes, zStart, cache, inj, zNode, zValue } = this;
    for (let a = 0; a < alone.length; a++) {
      const j = alone[a];
      const x0j = x[nodes[j]];
      const o = CACHE * j;
      let i: number;
      if (x0j >= cache[o] && x0j <= cache[o + 1]) {
        i = cache[o + 2] * x0j + cache[o + 3];
        inj[j] = i;
      } else {
        this.scalar(j, x0j, this.zpp[j * this.k + j]);
        i = inj[j];
      }
      for (let p = zStart[j], end = zStart[j + 1]; p < end; p++) x[zNode[p]] += i * zValue[p];
    }
    const group = this.group;
    if (group.length > 0) {
      if (!(this.onInverse && this.staysOnInverse(x))) this.solveGroup(x);
      for (let a = 0; a < group.length; a++) {
        const j = group[a];
        const i = inj[j];
        for (let p = zStart[j], end = zStart[j + 1]; p < end; p++) x[zNode[p]] += i * zValue[p];
      }
    }
  }

  /** The injection of pad j after the last solve, A. */
  injection(j: number): number {
    return this.inj[j];
  }

  /**
   * A group without switching tables on the segments of the last step: walk's first pass without
   * its bookkeeping (same numbers). False when a pad leaves its segment; the walk then takes over.
   */
  private staysOnInverse(x0: Float64Array): boolean {
    const { group, nodes, inverse, zc, res, sol, groupBounds } = this;
    const g = group.length;
    for (let a = 0; a < g; a++) res[a] = x0[nodes[group[a]]] + zc[a];
    for (let a = 0; a < g; a++) {
      let acc = 0;
      for (let b = 0; b < g; b++) acc += inverse[a * g + b] * res[b];
      if (!(acc >= groupBounds[2 * a] && acc <= groupBounds[2 * a + 1])) return false;
      sol[a] = acc;
    }
    const { v, inj, d, cst, dg } = this;
    for (let a = 0; a < g; a++) {
      const j = group[a];
      v[j] = sol[a];
      inj[j] = cst[a] + dg[a] * sol[a];
      d[j] = dg[a];
    }
    return true;
  }

  /** Solves the coupled pads' voltages against x0 (no change to x). */
  private solveGroup(x0: Float64Array): void {
    const { k, v, zpp, inj, d, nodes, group } = this;
    this.onInverse = false;
    const g = group.length;
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
        this.onInverse = this.groupStatic;
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
    const bounds = this.groupBounds;
    for (let a = 0; a < g; a++) {
      let acc = 0;
      for (let b = 0; b < g; b++) acc += zpp[group[a] * k + group[b]] * cst[b];
      zc[a] = acc;
      const q = seg[group[a]];
      inverseSeg[a] = q;
      // The walk keeps a solution on these segments; non-finite solutions fall outside (walk's test).
      const grid = this.curves[group[a]].v;
      bounds[2 * a] = q > 0 ? grid[q] : -Number.MAX_VALUE;
      bounds[2 * a + 1] = q < grid.length - 2 ? grid[q + 1] : Number.MAX_VALUE;
    }
    this.inverseReady = true;
  }

  /**
   * One pad: f(v) = v − x0 − zz·inj(v) = 0 with inj = −I(v) + g0·v. I is linear on each segment of
   * the merged grid, so f is too: the root on a segment is explicit, and the walk moves one segment
   * toward it until the root lies on the segment (f increases with v: the pad's dI/dV ≥ 0 and
   * zz·g0 ≤ 1). A root at a kink between two segments ends the walk there. Newton's method on a
   * piecewise-linear function is this walk; doing it explicitly avoids cycling at kinks. Writes the
   * pad's injection and its segment's numbers (cache); a lone pad's voltage itself is not kept.
   */
  private scalar(j: number, x0: number, zz: number): void {
    const c = this.curves[j];
    const g = c.v;
    const last = g.length - 2;
    const ku = this.ku[j];
    const kd = this.kd[j];
    const g0 = this.g0[j];
    const sg = c.segments;
    // The walk starts on the segment the previous step ended on, where it usually ends again.
    let q = this.seg[j];
    let v = 0;
    let moved = 0;
    let at0 = 0; // the segment's current at V = 0: I = at0 + slope·V
    let slope = 0;
    let denominator = 1;
    for (let iter = 0; iter <= last + 1; iter++) {
      const o = 6 * q;
      at0 = ku * sg[o + 3] + kd * sg[o + 4] + sg[o + 5];
      slope = ku * sg[o] + kd * sg[o + 1] + sg[o + 2];
      denominator = 1 + zz * (slope - g0);
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
    const o = CACHE * j;
    const cache = this.cache;
    if (denominator > 0) {
      // The segment's root as a function of x0 (see cache): v = (x0 − zz·at0)/denominator.
      const dinj = g0 - slope;
      cache[o] = (q > 0 ? g[q] : -Infinity) * denominator + zz * at0;
      cache[o + 1] = (q < last ? g[q + 1] : Infinity) * denominator + zz * at0;
      cache[o + 2] = dinj / denominator;
      cache[o + 3] = -at0 - (dinj * zz * at0) / denominator;
    } else {
      cache[o] = NaN;
      cache[o + 1] = NaN;
    }
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

/** A switching table held at its first (before) or last (after) values: the static coefficients of a DC point; kept per table. */
const held = new WeakMap<PadSwitching, { before: PadSwitching; after: PadSwitching }>();
function heldSwitching(sw: PadSwitching, when: 'before' | 'after'): PadSwitching {
  let both = held.get(sw);
  if (!both) {
    const at = (i: number): PadSwitching => ({ t: Float64Array.of(0), ku: Float64Array.of(sw.ku[i]), kd: Float64Array.of(sw.kd[i]), edgeTime: sw.edgeTime });
    held.set(sw, (both = { before: at(0), after: at(sw.t.length - 1) }));
  }
  return both[when];
}

function entries(circuit: Circuit, net: Netlist, edge: Edge | null, when: 'before' | 'after' | 'run'): PadEntry[] {
  const out: PadEntry[] = [];
  const d: DriverPad | undefined = circuit.driver.pad;
  if (d && edge) {
    const sw = d[edge];
    const switching = when === 'run' ? sw : heldSwitching(sw, when);
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
export function padDc(circuit: Circuit, net: Netlist, edge: Edge, when: 'before' | 'after', dc: DcSolver, vs: number, solvers: PadSolvers): DcPoint {
  const pads = entries(circuit, net, edge, when);
  const base = dc(vs);
  const nf = net.nFree;
  const solver = solvers.get(dc, nf, pads, (node, out) => unitResponse(dc, net, node, out)).begin(pads, base.v);
  const x = base.v.slice(0, nf);
  solver.correct(x, 0);
  const inject = new Float64Array(net.names.length);
  pads.forEach((p, j) => (inject[p.node] = solver.injection(j)));
  return dc(vs, inject);
}

/**
 * The DC network's response of every free node to 1 A into `node`, V, into `out` (the difference of
 * two solves: the network is linear). Needed once per DC solver and pad (the solver's layout keeps it).
 */
function unitResponse(dc: DcSolver, net: Netlist, node: number, out: Float64Array): void {
  const unit = new Float64Array(net.names.length);
  unit[node] = 1;
  const base = dc(0).v;
  const r = dc(0, unit).v;
  for (let i = 0; i < out.length; i++) out[i] = r[i] - base[i];
}

/** The per-edge pad solver over the transient matrix `lu`, starting from the DC point `start`. */
export function padTransient(circuit: Circuit, net: Netlist, edge: Edge, lu: SparseLu, start: DcPoint, solvers: PadSolvers): PadSolver {
  const n = net.nFree;
  const pads = entries(circuit, net, edge, 'run');
  const e = new Float64Array(net.names.length);
  return solvers.get(lu, n, pads, (node, out) => {
    e.fill(0);
    e[node] = 1;
    sparseLuSolve(lu, e, out);
  }).begin(pads, start.v);
}
