/**
 * Transient solver for a net: lossless lines by the method of characteristics, lumped R, C, L by
 * trapezoidal companion models, the whole network by nodal analysis at a fixed step.
 *
 * Method of characteristics (Branin, "Transient analysis of lossless transmission lines", Proc. IEEE
 * 55(11), 1967; the Bergeron form as in Dommel, "Digital computer solution of electromagnetic
 * transients in single- and multiphase networks", IEEE Trans. PAS-88(4), 1969): with i_k the current
 * flowing into the line at end k, each end obeys
 *     i_k(t) = v_k(t)/Z0 - Ih_k(t),   Ih_k(t) = v_m(t-T)/Z0 + i_m(t-T)
 * so each end is a conductance 1/Z0 to ground in parallel with a known current source built from the
 * other end one delay T earlier. The two ends are not coupled in the matrix at all. Ih is read from a
 * ring buffer of e_m = v_m/Z0 + i_m, linearly interpolated when T is not a whole number of steps.
 *
 * Trapezoidal companions (Dommel 1969, same paper): capacitor i(n+1) = (2C/h) v(n+1) - J,
 * J = (2C/h) v(n) + i(n); inductor i(n+1) = (h/2L) v(n+1) + J, J = i(n) + (h/2L) v(n).
 *
 * With a fixed step the nodal matrix is constant: it is LU-factored once per (circuit, step, driver
 * resistance) and every step is one forward/back substitution plus history updates, with no
 * allocation inside the loop. The substitution skips the zeros of the factors: line ends are not
 * coupled through the matrix, so most rows of a net hold only their diagonal.
 */
import { InputError } from '../errors.js';
import type { Circuit, Edge } from '../circuit/types.js';
import { fullRamp, fullRampTime, longestReceiverDelay, shortestLineDelay } from '../circuit/topology.js';
import { compileNetlist, type Netlist } from './netlist.js';
import { type DcPoint, type DcSolver, dcSolver } from './dc.js';
import { type SparseLu, luFactorInPlace, singularColumn, sparsify } from './lu.js';
import { singularPlace } from './singular.js';
import { type MarchLinear, type RunState, marchJs, marchKernel, marchWasm } from './march.js';
import { PAD_R0, type PadSolver, PadSolvers, hasPads, padDc, padTransient } from './pad.js';

export type { Edge };

export interface Waveform {
  edge: Edge;
  /** Sample times from the start of the driver's ramp, s (t[0] = 0). */
  t: Float64Array;
  /** Node names, in the order of `v` (every node except ground and rails). */
  nodes: string[];
  /** Voltage per node per sample, V. */
  v: Float64Array[];
  /** Time step, s. */
  step: number;
  /** DC voltage of each node before the edge (t = 0) and after it has settled (same order as nodes), V. */
  initial: Float64Array;
  final: Float64Array;
}

export interface SimulationOptions {
  /** Time step, s; default chooseStep. Must not exceed the shortest line delay. */
  step?: number;
  /** End time, s; default the circuit's stop, else chooseStop. */
  stop?: number;
  /**
   * Storage to reuse for the samples (see WaveformBuffers). The waveforms returned then live in it and
   * are overwritten by the next simulation given the same buffers: for callers that measure a waveform
   * and drop it before simulating again.
   */
  buffers?: WaveformBuffers;
  /**
   * Which time loop runs a linear net (core/solver/march.ts): 'auto' (default) the WebAssembly one
   * where the host can run it, 'js' the JavaScript reference. Both give the same samples; nets with
   * behavioural pads always run the JavaScript loop.
   */
  loop?: 'auto' | 'js';
}

/**
 * Reusable sample storage, so a caller that simulates many nets one after another (a board check)
 * allocates its waveform memory once instead of once per net and edge. Each slot keeps one growing
 * Float64Array; `take` hands out a zero-based view of the requested length.
 */
export class WaveformBuffers {
  private readonly slots: Float64Array[] = [];

  take(slot: number, length: number): Float64Array {
    let buffer = this.slots[slot];
    if (!buffer || buffer.length < length) {
      buffer = new Float64Array(Math.max(length, Math.ceil((buffer?.length ?? 0) * 1.5)));
      this.slots[slot] = buffer;
    }
    return buffer.subarray(0, length);
  }
}

/** Buffer slots: samples of the first and second edge, and the shared time axis. */
const SLOT_FIRST = 0;
const SLOT_SECOND = 1;
const SLOT_TIME = 2;

/** Largest waveform kept (samples × nodes, 8 bytes each: 160 MB). */
const MAX_SAMPLES = 2e7;
/** Samples per full ramp at most (step rule). */
const STEPS_PER_RAMP = 30;
/** Samples over the whole run at least (step rule, for nets without lines or with an ideal step). */
const STEPS_PER_RUN = 1000;

/**
 * Step rule (this program's choice, checked by the step-halving test): h = the largest step not above
 * the shortest line delay and the full ramp / 30 that divides the full ramp into whole steps, so the
 * ramp's corners fall on samples. The delay bound is required by the method (the history must come
 * from past samples); the ramp bound keeps the linear interpolation of the history and the trapezoidal
 * rule within 0.2 % of the swing when the step is halved (at /20 the fly-by fixture missed by 3 %
 * of that limit). An ideal step (ramp 0) uses the shortest delay, or stop / 1000 without lines.
 */
export function chooseStep(circuit: Circuit, edge: Edge, stop: number): number {
  // A behavioural driver: the same rule on its switching edge (docs/ibis.md §4).
  const pad = circuit.driver.pad;
  const ramp = pad ? fullRampTime(pad[edge].edgeTime) : fullRamp(circuit, edge);
  const lines = shortestLineDelay(circuit);
  if (ramp > 0) {
    const hmax = Math.min(lines, ramp / STEPS_PER_RAMP);
    return ramp / Math.ceil(ramp / hmax - 1e-9);
  }
  return Math.min(lines, stop / STEPS_PER_RUN);
}

/**
 * Default end time (this program's choice): the slower full ramp plus the larger of six round trips to
 * the farthest receiver, four full ramps and 2 ns, enough for reflections to settle on typical nets.
 */
export function chooseStop(circuit: Circuit): number {
  const ramp = Math.max(fullRamp(circuit, 'rising'), fullRamp(circuit, 'falling'));
  const longest = longestReceiverDelay(circuit);
  // ramp + 2·longest is shortestStop (core/circuit/topology.ts), written out to search the paths once.
  return Math.max(ramp + Math.max(12 * longest, 4 * ramp, 2e-9), ramp + 2 * longest);
}

/**
 * A circuit compiled once, with its LU factors cached per (step, driver resistance). It lives for one
 * simulateEdge / simulateNet call only, so a caller that edits a circuit in place never gets a stale
 * matrix; compiling costs far less than one edge.
 */
class PreparedNet {
  readonly net: Netlist;
  readonly shortestDelay: number;
  private stopByDefault: number | undefined;
  /** chooseStop of the circuit, found on first use: a circuit that names its stop never needs it (its search of the delays is per net). */
  get defaultStop(): number {
    return (this.stopByDefault ??= chooseStop(this.circuit));
  }
  /** Factors by (step, driver resistance), searched by value: a few entries at most. */
  private factorKeys: number[] = [];
  private factorValues: SparseLu[] = [];
  private dc = new Map<number, DcSolver>();
  /** Behavioural pads' solvers over this circuit's matrices (core/solver/pad.ts), made on first use. */
  private pads: PadSolvers | null = null;
  get padSolvers(): PadSolvers {
    return (this.pads ??= new PadSolvers());
  }
  constructor(readonly circuit: Circuit) {
    this.net = compileNetlist(circuit);
    this.shortestDelay = shortestLineDelay(circuit);
  }

  dcSolver(rout: number): DcSolver {
    let solver = this.dc.get(rout);
    if (!solver) {
      solver = dcSolver(this.net, rout, this.circuit);
      this.dc.set(rout, solver);
    }
    return solver;
  }

  /** Nodal matrix of the companion network over the free nodes; see the file comment. */
  factor(h: number, rout: number): SparseLu {
    const keys = this.factorKeys;
    for (let i = 0; i < keys.length; i += 2) if (keys[i] === h && keys[i + 1] === rout) return this.factorValues[i / 2];
    const n = this.net.nFree;
    // Factored in place in reused storage; sparsify copies the factors out.
    const f = luFactorInPlace(this.matrix(scratch.take(SCRATCH_MATRIX, n * n), h, rout), n);
    if (!f) {
      const place = singularPlace(this.net.names, singularColumn(this.matrix(new Float64Array(n * n), h, rout), n), this.circuit);
      throw new InputError('circuit', `the nodal matrix is singular ${place}: a floating node or a loop of ideal elements`);
    }
    const sparse = sparsify(f);
    if (keys.length > 16) {
      keys.length = 0;
      this.factorValues.length = 0;
    }
    keys.push(h, rout);
    this.factorValues.push(sparse);
    return sparse;
  }

  /** Writes the nodal matrix (row-major n×n over the free nodes) into G and returns G. */
  private matrix(G: Float64Array, h: number, rout: number): Float64Array {
    const net = this.net;
    const n = net.nFree;
    G.fill(0);
    const { resistors: r, capacitors: c, inductors: l, lines } = net;
    for (let k = 0; k < r.a.length; k++) stampNodal(G, n, r.a[k], r.b[k], 1 / r.value[k]);
    for (let k = 0; k < c.a.length; k++) stampNodal(G, n, c.a[k], c.b[k], (2 * c.value[k]) / h);
    for (let k = 0; k < l.a.length; k++) stampNodal(G, n, l.a[k], l.b[k], h / (2 * l.value[k]));
    for (let k = 0; k < lines.a.length; k++) {
      const g = 1 / lines.value[k];
      if (lines.a[k] < n) G[lines.a[k] * n + lines.a[k]] += g;
      if (lines.b[k] < n) G[lines.b[k] * n + lines.b[k]] += g;
    }
    G[net.driver * n + net.driver] += 1 / rout;
    return G;
  }
}

/** Conductance `g` between a and b in the nodal matrix G (n×n over the free nodes; fixed ends drop out). */
function stampNodal(G: Float64Array, n: number, a: number, b: number, g: number): void {
  if (a < n) G[a * n + a] += g;
  if (b < n) G[b * n + b] += g;
  if (a < n && b < n) {
    G[a * n + b] -= g;
    G[b * n + a] -= g;
  }
}

/** Conductance `g` between a and b toward a fixed node: its current into the free end, on the constant right-hand side. */
function stampToFixed(rhsConst: Float64Array, fixedV: Float64Array, n: number, a: number, b: number, g: number): void {
  if (a < n && b >= n) rhsConst[a] += g * fixedV[b];
  if (b < n && a >= n) rhsConst[b] += g * fixedV[a];
}

/** Compiles a circuit for one call (simulateEdge) or one pair of edges (simulateNet). */
function prepare(circuit: Circuit): PreparedNet {
  return new PreparedNet(circuit);
}

/**
 * Simulates one edge of the driver: a linear ramp from the other level's DC operating point (t = 0)
 * to the new level over the full ramp (10-90 % time / 0.8), behind the output resistance of the level
 * being driven to (see rampStart for where the ramp starts when the two resistances differ). `circuit` must be valid (parseNetFile or checkCircuit). Deterministic.
 */
export function simulateEdge(circuit: Circuit, edge: Edge, options: SimulationOptions = {}): Waveform {
  return simulatePrepared(prepare(circuit), edge, options, SLOT_FIRST);
}

function simulatePrepared(p: PreparedNet, edge: Edge, options: SimulationOptions, slot: number): Waveform {
  const circuit = p.circuit;
  const stop = options.stop ?? circuit.stop ?? p.defaultStop;
  if (!(stop > 0) || !Number.isFinite(stop)) throw new InputError('options.stop', `must be a positive time, got ${stop}`);
  const h = options.step ?? chooseStep(circuit, edge, stop);
  const tmin = p.shortestDelay;
  if (!(h > 0) || !Number.isFinite(h)) throw new InputError('options.step', `must be a positive time, got ${h}`);
  if (h > tmin * (1 + 1e-9)) {
    throw new InputError('options.step', `${h} s exceeds the shortest line delay ${tmin} s (the method needs step <= delay)`);
  }
  const net = p.net;
  const d = circuit.driver;
  const rising = edge === 'rising';
  const v0 = rising ? d.vlow : d.vhigh;
  const v1 = rising ? d.vhigh : d.vlow;
  const rOld = rising ? d.routLow : d.routHigh;
  const dcStart = p.dcSolver(rOld)(v0);
  const rout = rising ? d.routHigh : d.routLow;
  const dcEnd = p.dcSolver(rout)(v1);
  const lu = p.factor(h, rout);
  const ramp = fullRamp(circuit, edge);
  const steps = Math.max(1, Math.ceil(stop / h - 1e-9));
  if ((steps + 1) * net.nFree > MAX_SAMPLES) {
    throw new InputError(
      options.stop !== undefined ? 'options.stop' : 'stop',
      `${stop} s at a ${h} s step needs ${steps} steps for ${net.nFree} nodes, more than this program keeps in memory (${MAX_SAMPLES} samples); shorten the stop time`,
    );
  }
  const storage = sampleStorage(options.buffers, slot, steps + 1, net.nFree);
  if (hasPads(circuit)) return runWithPads(p, edge, h, steps, storage);
  const loop = options.loop === 'js' ? marchJs : marchKernel() !== null ? marchWasm : marchJs;
  return run(net, lu, h, steps, rampStart(dcStart.v[net.driver], v0, rOld, rout), v1, ramp, rout, dcStart, dcEnd, edge, storage, loop);
}

/**
 * An edge with behavioural pads (docs/ibis.md §4): DC points from the pads' static coefficients, the
 * matrix factored with PAD_R0 at a pad driver (or the linear driver's resistance), and the pad solver
 * hooked into the time loop. A pad driver's linear source is zero.
 */
function runWithPads(p: PreparedNet, edge: Edge, h: number, steps: number, storage: SampleStorage): Waveform {
  const { circuit, net } = p;
  const d = circuit.driver;
  const rising = edge === 'rising';
  const linear = d.pad === undefined;
  const [v0, v1] = linear ? (rising ? [d.vlow, d.vhigh] : [d.vhigh, d.vlow]) : [0, 0];
  const rOld = linear ? (rising ? d.routLow : d.routHigh) : PAD_R0;
  const rout = linear ? (rising ? d.routHigh : d.routLow) : PAD_R0;
  const dcStart = padDc(circuit, net, edge, 'before', p.dcSolver(rOld), v0, p.padSolvers);
  const dcEnd = padDc(circuit, net, edge, 'after', p.dcSolver(rout), v1, p.padSolvers);
  const lu = p.factor(h, rout);
  const pads = padTransient(circuit, net, edge, lu, dcStart, p.padSolvers);
  const ramp = linear ? fullRamp(circuit, edge) : 0;
  const start = linear ? rampStart(dcStart.v[net.driver], v0, rOld, rout) : 0;
  return run(net, lu, h, steps, start, v1, ramp, rout, dcStart, dcEnd, edge, storage, (...args) => marchJs(...args, pads));
}

/** Where one edge's samples go: one packed array, node after node (`stride` samples each), and the time axis. */
interface SampleStorage {
  packed: Float64Array;
  stride: number;
  t: Float64Array;
}

function sampleStorage(buffers: WaveformBuffers | undefined, slot: number, stride: number, nodes: number): SampleStorage {
  if (!buffers) return { packed: new Float64Array(stride * nodes), stride, t: new Float64Array(stride) };
  return { packed: buffers.take(slot, stride * nodes), stride, t: buffers.take(SLOT_TIME + slot, stride) };
}

/**
 * Where the source's ramp starts when the output resistance changes with the level (this program's
 * choice): the Thevenin voltage that, behind the new resistance, holds the pin at its DC operating
 * point, v0' = Vpin + (v0 − Vpin)·Rnew/Rold (Thevenin's theorem). The pin is then continuous at t = 0
 * (no step from swapping resistors) and the source still reaches the new level after the full ramp.
 * With equal resistances v0' = v0.
 */
export function rampStart(pinDc: number, v0: number, rOld: number, rNew: number): number {
  return rOld === rNew ? v0 : pinDc + ((v0 - pinDc) * rNew) / rOld;
}

/**
 * Storage of the time loop's state, reused from edge to edge: an edge runs to its end before the next
 * starts (one thread, no re-entry), so the line rings and node vectors of a board check are allocated
 * once, not once per net and edge. Every entry an edge uses is written in setUp before it is read.
 */
const scratch = new WaveformBuffers();
const SCRATCH_RING = 0;
const SCRATCH_X = 1;
const SCRATCH_RHS_CONST = 2;
const SCRATCH_RHS = 3;
const SCRATCH_MATRIX = 4;

function setUp(net: Netlist, h: number, dcStart: DcPoint): RunState {
  const n = net.nFree;
  const N = net.names.length;
  const rhsConst = scratch.take(SCRATCH_RHS_CONST, N); // conductances to fixed nodes: constant right-hand side
  rhsConst.fill(0);
  const fixedV = net.fixedV;
  const { resistors: R, capacitors: C, inductors: L, lines: T } = net;
  const x = scratch.take(SCRATCH_X, N);
  x.set(dcStart.v);
  for (let k = 0; k < R.a.length; k++) stampToFixed(rhsConst, fixedV, n, R.a[k], R.b[k], 1 / R.value[k]);
  const nc = C.value.length;
  const capG2 = new Float64Array(nc);
  const capJ = new Float64Array(nc);
  for (let k = 0; k < nc; k++) {
    const g = (2 * C.value[k]) / h;
    stampToFixed(rhsConst, fixedV, n, C.a[k], C.b[k], g);
    capG2[k] = 2 * g;
    // No current at DC: the first step's source is g·v; held as the J before it (2g·v − g·v = g·v exactly).
    capJ[k] = g * (x[C.a[k]] - x[C.b[k]]);
  }
  const ni = L.value.length;
  const indG2 = new Float64Array(ni);
  const indJ = new Float64Array(ni);
  for (let k = 0; k < ni; k++) {
    const g = h / (2 * L.value[k]);
    stampToFixed(rhsConst, fixedV, n, L.a[k], L.b[k], g);
    indG2[k] = 2 * g;
    // The DC current: the first step's source is i + g·v, held as the J before it (i − g·v).
    indJ[k] = dcStart.inductorCurrent[k] - g * (x[L.a[k]] - x[L.b[k]]);
  }
  // Line history: per end, a ring of e = v/Z0 + i (i into the line) long enough for delay + 1 sample.
  const nl = T.a.length;
  const lineG2 = new Float64Array(nl);
  const frac = new Float64Array(nl);
  // Per line: ring offset, ring mask, whole delay in samples, end a, end b. The ring length is a power
  // of two of at least delay + 2 samples, so the slot of sample m is m & mask (sample m is in slot
  // m mod length; no per-line slot counters or wrap-around tests in the loop); slot s of line k holds
  // [e_a, e_b] at its offset + 2s.
  const lineInt = new Int32Array(5 * nl);
  let total = 0;
  for (let k = 0; k < nl; k++) {
    lineG2[k] = 2 / T.value[k];
    const r = T.delay[k] / h;
    const whole = Math.max(1, Math.floor(r + 1e-9));
    frac[k] = Math.min(1, Math.max(0, r - whole));
    let len = 2;
    while (len < whole + 2) len *= 2;
    lineInt[5 * k] = total;
    lineInt[5 * k + 1] = len - 1;
    lineInt[5 * k + 2] = whole;
    lineInt[5 * k + 3] = T.a[k];
    lineInt[5 * k + 4] = T.b[k];
    total += 2 * len;
  }
  const ring = scratch.take(SCRATCH_RING, total);
  for (let k = 0; k < nl; k++) {
    const at = lineInt[5 * k];
    const len = lineInt[5 * k + 1] + 1;
    const g = 1 / T.value[k];
    const ia = dcStart.lineCurrent[k]; // DC current a->b: into the line at a, out of it at b
    const ea = x[T.a[k]] * g + ia;
    const eb = x[T.b[k]] * g - ia;
    for (let q = 0; q < len; q++) {
      ring[at + 2 * q] = ea;
      ring[at + 2 * q + 1] = eb;
    }
    // Slot 0 (t = 0) parks the Ih that the first step's completion turns back into the same e
    // (2v/Z0 − Ih with Ih = v/Z0 − i, to round-off).
    ring[at] = lineG2[k] * x[T.a[k]] - ea;
    ring[at + 1] = lineG2[k] * x[T.b[k]] - eb;
  }
  // Free rows are reset to their constant part as the substitution reads them; the entries of fixed
  // nodes (ground, rails) only collect the other side of grounded elements and are never read.
  const rhs = scratch.take(SCRATCH_RHS, N);
  rhs.set(rhsConst);
  return {
    n, x, rhs, rhsConst,
    capA: C.a, capB: C.b, capG2, capJ,
    indA: L.a, indB: L.b, indG2, indJ,
    lineInt, lineG2, frac, ring,
  };
}

function run(
  net: Netlist, lu: SparseLu, h: number, steps: number, v0: number, v1: number, ramp: number, rout: number,
  dcStart: DcPoint, dcEnd: DcPoint, edge: Edge, storage: SampleStorage, loop: MarchLinear,
): Waveform {
  const st = setUp(net, h, dcStart);
  const n = st.n;
  const { packed, stride, t } = storage;
  for (let i = 0; i < n; i++) packed[i * stride] = st.x[i];
  loop(st, lu, h, steps, v0, v1, ramp, 1 / rout, net.driver, packed, stride);
  const out: Float64Array[] = [];
  for (let i = 0; i < n; i++) out.push(packed.subarray(i * stride, (i + 1) * stride));
  t[0] = 0;
  for (let m = 1; m <= steps; m++) t[m] = m * h;
  return {
    edge,
    t,
    nodes: net.names.slice(0, n),
    v: out,
    step: h,
    initial: dcStart.v.slice(0, n),
    final: dcEnd.v.slice(0, n),
  };
}

/**
 * Both edges of a net, rising then falling. When the driver is symmetric (routHigh = routLow and
 * riseTime = fallTime) the network and its inputs are linear and identical up to sign, so the falling
 * edge is the superposition falling(t) = DC(vlow) + DC(vhigh) − rising(t) (the sum of both runs is a
 * constant DC state): one march serves both edges, exact up to round-off.
 */
export function simulateNet(circuit: Circuit, options: SimulationOptions = {}): { rising: Waveform; falling: Waveform } {
  const p = prepare(circuit);
  const rising = simulatePrepared(p, 'rising', options, SLOT_FIRST);
  const d = circuit.driver;
  if (hasPads(circuit) || d.routHigh !== d.routLow || d.riseTime !== d.fallTime) return { rising, falling: simulatePrepared(p, 'falling', options, SLOT_SECOND) };
  return { rising, falling: mirrored(rising, options.buffers) };
}

function mirrored(rising: Waveform, buffers: WaveformBuffers | undefined): Waveform {
  const n = rising.nodes.length;
  const stride = rising.t.length;
  const packed = buffers ? buffers.take(SLOT_SECOND, stride * n) : new Float64Array(stride * n);
  const v: Float64Array[] = [];
  for (let i = 0; i < n; i++) {
    const sum = rising.initial[i] + rising.final[i];
    const src = rising.v[i];
    const w = packed.subarray(i * stride, (i + 1) * stride);
    for (let m = 0; m < stride; m++) w[m] = sum - src[m];
    v.push(w);
  }
  return {
    edge: 'falling',
    t: rising.t,
    nodes: rising.nodes,
    v,
    step: rising.step,
    initial: rising.final,
    final: rising.initial,
  };
}
