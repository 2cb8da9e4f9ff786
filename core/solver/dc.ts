/**
 * DC operating point: the driver holds one level behind its output resistance; capacitors are open,
 * inductors and lossless lines are short circuits (a lossless line at DC has equal end voltages and
 * carries its current unchanged). Modified nodal analysis (Ho, Ruehli & Brennan, "The modified nodal
 * approach to network analysis", IEEE Trans. Circuits Syst. 22(6), 1975): unknowns are the free node
 * voltages plus one current per short branch (line, inductor).
 */
import { InputError } from '../errors.js';
import { luFactorInPlace, luSolve, singularColumn } from './lu.js';
import { singularPlace } from './singular.js';
import type { Netlist } from './netlist.js';
import type { Circuit } from '../circuit/types.js';

export interface DcPoint {
  /** Voltage of every node (free and fixed), V. */
  v: Float64Array;
  /** Current through each line from end a to end b, A. */
  lineCurrent: Float64Array;
  /** Current through each inductor from a to b, A. */
  inductorCurrent: Float64Array;
}

/** Solves the DC point with the driver's source at `vs` behind `rout` ohm. */
export function solveDc(net: Netlist, vs: number, rout: number): DcPoint {
  return dcSolver(net, rout)(vs);
}

/**
 * DC point as a function of the source voltage, for a fixed `rout` (the matrix is factored once).
 * The point returned is shared (the last one without injections is returned again for the same
 * source): read it, do not modify it.
 * `inject` (optional, one entry per node) adds currents into free nodes, A: behavioural pads use it
 * (core/solver/pad.ts).
 */
export type DcSolver = (vs: number, inject?: Float64Array) => DcPoint;

/** The MNA matrix (m×m, row-major) being stamped over `nf` free nodes, and its right-hand side from fixed nodes. */
interface MnaSystem {
  A: Float64Array;
  m: number;
  nf: number;
  rhsFixed: Float64Array;
  fixedV: Float64Array;
}

/** Conductance `g` between nodes a and b (a fixed end goes to the right-hand side). */
function stampConductance(s: MnaSystem, a: number, b: number, g: number): void {
  const { A, m, nf } = s;
  if (a < nf) {
    A[a * m + a] += g;
    if (b < nf) A[a * m + b] -= g;
    else s.rhsFixed[a] += g * s.fixedV[b];
  }
  if (b < nf) {
    A[b * m + b] += g;
    if (a < nf) A[b * m + a] -= g;
    else s.rhsFixed[b] += g * s.fixedV[a];
  }
}

/** A short branch (line, inductor) with its current as unknown `row`: it leaves a, enters b, and forces v_a − v_b = 0. */
function stampShort(s: MnaSystem, row: number, a: number, b: number): void {
  const { A, m, nf } = s;
  if (a < nf) { A[a * m + row] += 1; A[row * m + a] += 1; } else s.rhsFixed[row] -= s.fixedV[a];
  if (b < nf) { A[b * m + row] -= 1; A[row * m + b] -= 1; } else s.rhsFixed[row] += s.fixedV[b];
}

/** The DC system of `net` with the driver behind `rout`: unknowns the free voltages, then line and inductor currents. */
function stampDc(net: Netlist, rout: number): MnaSystem {
  const nf = net.nFree;
  const nl = net.lines.a.length;
  const m = nf + nl + net.inductors.a.length;
  // rhsFixed: contributions of ground and rails
  const mna: MnaSystem = { A: new Float64Array(m * m), m, nf, rhsFixed: new Float64Array(m), fixedV: net.fixedV };
  for (let k = 0; k < net.resistors.a.length; k++) stampConductance(mna, net.resistors.a[k], net.resistors.b[k], 1 / net.resistors.value[k]);
  mna.A[net.driver * m + net.driver] += 1 / rout;
  for (let k = 0; k < nl; k++) stampShort(mna, nf + k, net.lines.a[k], net.lines.b[k]);
  for (let k = 0; k < net.inductors.a.length; k++) stampShort(mna, nf + nl + k, net.inductors.a[k], net.inductors.b[k]);
  return mna;
}

/** `circuit`, when given, lets a singular-matrix message list the elements at the node. */
export function dcSolver(net: Netlist, rout: number, circuit?: Circuit): DcSolver {
  const nf = net.nFree;
  const nl = net.lines.a.length;
  const fixedV = net.fixedV;
  const { A, m, rhsFixed } = stampDc(net, rout);
  // factored in place: the matrix is stamped again only to name a singular one
  const f = luFactorInPlace(A, m);
  if (!f) {
    const place = singularPlace(net.names.slice(0, nf), singularColumn(stampDc(net, rout).A, m), circuit);
    throw new InputError('circuit', `the DC nodal matrix is singular ${place}: a floating node or a loop of ideal elements`);
  }
  const rhs = new Float64Array(m); // reused by every solve of this solver
  const x = new Float64Array(m);
  const N = fixedV.length;
  // The last point without injections, by source voltage: the pads' DC points ask for the same one
  // several times per edge (core/solver/pad.ts). Callers read DC points, never write them.
  let lastVs = NaN;
  let lastPoint: DcPoint | null = null;
  return (vs: number, inject?: Float64Array) => {
    if (!inject && vs === lastVs && lastPoint) return lastPoint;
    rhs.set(rhsFixed);
    rhs[net.driver] += vs / rout;
    if (inject) for (let i = 0; i < nf; i++) rhs[i] += inject[i];
    // The unknowns (free voltages, branch currents) in reused storage, then copied into the point's
    // own small arrays (views of one allocation would cost more: a view needs its buffer off-heap).
    luSolve(f, rhs, x);
    const v = new Float64Array(N);
    v.set(fixedV);
    for (let i = 0; i < nf; i++) v[i] = x[i];
    const point = { v, lineCurrent: x.slice(nf, nf + nl), inductorCurrent: x.slice(nf + nl, m) };
    if (!inject) {
      lastVs = vs;
      lastPoint = point;
    }
    return point;
  };
}
