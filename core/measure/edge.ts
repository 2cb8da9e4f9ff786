/**
 * Measurements of one receiver waveform for one edge (docs/design.md §5). Levels in V, times in s from the
 * start of the driver's ramp. A quantity that does not exist on this waveform (a threshold never
 * crossed, a waveform that never settles within the run) is null, never NaN.
 */
import { InputError } from '../errors.js';
import { type Circuit, otherTerminal, terminals } from '../circuit/types.js';
import { delaysFromDriver, fullRamp } from '../circuit/topology.js';
import type { Edge, Waveform } from '../solver/transient.js';
import { crossingTime, firstCrossing, valueAt } from './crossings.js';
import { firstReflectionArrivals } from './arrivals.js';

export interface EdgeMeasurements {
  node: string;
  edge: Edge;
  /** Driver-pin level once the first wave is launched (from the simulation), V. */
  vLaunch: number;
  /** Same from the closed form V+ = ΔVs·Z0/(Z0+Zs) when one line alone leaves the driver pin, else null, V. */
  vLaunchClosedForm: number | null;
  /** Extreme level (in the edge's direction) the receiver reaches before the first-incidence window ends, V. */
  vFirstIncidence: number;
  /**
   * End of the first-incidence window, s: the first arrival of a reflected wave at this receiver
   * (firstReflectionArrivals), but not before the incident ramp is over (d + full ramp).
   */
  firstIncidenceWindow: number;
  /** True when the first incident wave carries the pin past the far threshold and it never re-enters the band. */
  firstIncidence: boolean;
  vmax: number;
  vmin: number;
  /** Threshold crossings in the edge's direction (interpolated), s. */
  tFirstVil: number | null;
  tFirstVih: number | null;
  tLastVih: number | null;
  tLastVil: number | null;
  /** First and last crossing of the receiver's Vref in the edge's direction, s. */
  tFirstVref: number | null;
  tLastVref: number | null;
  /** Near threshold first crossing (VIL rising, VIH falling) and far threshold first/last crossing, s. */
  tNearFirst: number | null;
  tFarFirst: number | null;
  tFarLast: number | null;
  /** Distance kept from the far threshold after the first peak past it, V (negative: re-enters the band). */
  ringbackMargin: number | null;
  /** Peak above the driver's high level / below its low level, V (0 when none). */
  overshoot: number;
  undershoot: number;
  /** Time-area of the excursion above the high level / below the low level, V·s. */
  overshootArea: number;
  undershootArea: number;
  /** vmaxAbs − vmax and vmin − vminAbs when the receiver gives limits (negative = violated), V. */
  overshootMargin: number | null;
  undershootMargin: number | null;
  /**
   * No reversal larger than 0.1 % of the swing while inside the threshold band, and no ledge there
   * (a stretch gaining less than that for longer than the full ramp).
   */
  monotonic: boolean;
  /** Longest stretch inside the threshold band without progress (a ledge), s. */
  longestLedge: number;
  /** DC level after the edge, V, and the band used for settling, V. */
  vFinal: number;
  settleBand: number;
  /** Last time the pin is outside vFinal ± settleBand, s (0 if never); null if it is still outside at the end. */
  settlingTime: number | null;
  /** Compensated flight times against the reference-load crossing, s; null without a reference or a crossing. */
  flightTimeMin: number | null;
  flightTimeMax: number | null;
}

export interface MeasureOptions {
  /** Driver's crossing of Vmeas into its reference load, s (referenceLoadCrossing). */
  referenceCrossing?: number;
  /** Half-width of the settling band, V; default 5 % of the driver swing. */
  settleBand?: number;
  /** Delays from the driver (delaysFromDriver), when the caller already has them for this circuit. */
  delays?: Map<string, number>;
  /** firstReturnTime of this circuit, when the caller already has it. */
  firstReturn?: number;
  /**
   * firstReflectionArrivals of this circuit for this edge's full ramp, when the caller already has
   * them (every receiver of one circuit and edge shares them; reflectionArrivals).
   */
  reflected?: Map<string, number>;
}

/**
 * The reflected-wave arrivals measureEdge uses on each of `edges` of `circuit` (MeasureOptions.reflected),
 * found once per distinct full ramp (a symmetric driver's two edges share them).
 */
export function reflectionArrivals(circuit: Circuit, edges: readonly Edge[]): Partial<Record<Edge, Map<string, number>>> {
  const out: Partial<Record<Edge, Map<string, number>>> = {};
  const byRamp = new Map<number, Map<string, number>>();
  for (const edge of edges) {
    const ramp = fullRamp(circuit, edge);
    let arrivals = byRamp.get(ramp);
    if (!arrivals) byRamp.set(ramp, (arrivals = firstReflectionArrivals(circuit, ramp)));
    out[edge] = arrivals;
  }
  return out;
}

/** Share of the swing a reversal must exceed to count as non-monotonic (well above the solver's noise). */
const MONOTONIC_TOLERANCE = 1e-3;

/** What meets at a node: the Z0 of each line end there, and how many other elements. */
interface NodeTouches {
  lines: number[];
  other: number;
}

function touchesOf(touches: Map<string, NodeTouches>, node: string): NodeTouches {
  let t = touches.get(node);
  if (!t) touches.set(node, (t = { lines: [], other: 0 }));
  return t;
}

/**
 * Earliest time a wave reflected somewhere in the net can be back at the driver pin, s: twice the
 * delay to the nearest node that reflects (any node except a plain joint of two lines of equal Z0).
 */
export function firstReturnTime(circuit: Circuit, delays: Map<string, number> = delaysFromDriver(circuit)): number {
  const touches = new Map<string, NodeTouches>();
  for (const e of circuit.elements) {
    for (const node of terminals(e)) {
      if (e.kind === 'line') touchesOf(touches, node).lines.push(e.z0);
      else touchesOf(touches, node).other++;
    }
  }
  for (const r of circuit.receivers) if (r.cin > 0 || r.odt) touchesOf(touches, r.node).other++;
  let nearest = Infinity;
  for (const [node, d] of delays) {
    if (!(d > 0)) continue;
    const t = touches.get(node);
    const plainJoint = t !== undefined && t.other === 0 && t.lines.length === 2 && Math.abs(t.lines[0] - t.lines[1]) <= 1e-9 * t.lines[0];
    if (!plainJoint) nearest = Math.min(nearest, d);
  }
  return 2 * nearest;
}

/**
 * How much later than the line delay `delay` the incident edge starts at a receiver, s (≥ 0): its start
 * extrapolated back from its first crossings of 2 % and 10 % of the swing past the initial level (a
 * straight line through both: exact for a ramp, so an ideal net gets 0). Never later than the 2 %
 * crossing itself; 0 when the receiver never moves 10 % (this program's choice of levels).
 */
export function incidentLag(t: Float64Array, v: Float64Array, initial: number, sign: number, swing: number, delay: number): number {
  const dir = sign > 0 ? 'up' : 'down';
  const t2 = firstCrossing(t, v, initial + sign * 0.02 * Math.abs(swing), dir);
  const t10 = firstCrossing(t, v, initial + sign * 0.1 * Math.abs(swing), dir);
  if (t2 === null || t10 === null) return 0;
  return Math.max(0, t2 - (t10 - t2) / 4 - delay);
}

/** Measures `receiverNode` on `waveform` (which must hold that node and the driver pin). */
export function measureEdge(
  waveform: Waveform, circuit: Circuit, receiverNode: string, edge: Edge, options: MeasureOptions = {},
): EdgeMeasurements {
  if (waveform.edge !== edge) throw new InputError('measureEdge', `waveform is the ${waveform.edge} edge, asked for ${edge}`);
  const index = waveform.nodes.indexOf(receiverNode);
  if (index < 0) throw new InputError('measureEdge', `node "${receiverNode}" is not in the waveform`);
  const receiver = circuit.receivers.find((r) => r.node === receiverNode);
  if (!receiver) throw new InputError('measureEdge', `node "${receiverNode}" has no receiver`);
  const { t } = waveform;
  const v = waveform.v[index];
  const n = v.length;
  const d = circuit.driver;
  const rising = edge === 'rising';
  const swing = d.vhigh - d.vlow;
  const sign = rising ? 1 : -1;
  const dir = rising ? 'up' : 'down';
  const near = rising ? receiver.vil : receiver.vih;
  const far = rising ? receiver.vih : receiver.vil;
  const ramp = fullRamp(circuit, edge);

  // Launch level at the driver pin (see vLaunch).
  const pin = waveform.v[waveform.nodes.indexOf(d.node)];
  const pinInit = waveform.initial[waveform.nodes.indexOf(d.node)];
  const delays = options.delays ?? delaysFromDriver(circuit);
  const tReturn = options.firstReturn ?? firstReturnTime(circuit, delays);
  let vLaunch: number;
  if (ramp <= tReturn) {
    vLaunch = valueAt(t, pin, ramp > 0 ? ramp : Math.min(tReturn / 2, t[n - 1]));
  } else {
    // Before the first return the pin is a resistive divider of the ramp, so scale the partial step.
    vLaunch = pinInit + ((valueAt(t, pin, tReturn) - pinInit) * ramp) / tReturn;
  }
  const vLaunchClosedForm = closedFormLaunch(circuit, edge, pinInit);

  // First incidence: the level reached before any reflected wave can arrive (docs/design.md §5). When a
  // reflection arrives before the incident ramp is over, the two cannot be told apart (the net is
  // electrically short for this edge) and the window is the end of the incident ramp.
  // Lumped parts (packages, C_comp, loads) and a buffer's switching delay make the incident edge
  // start later than the line delays say; its reflections leave and travel just as late, so the
  // window moves by the observed lag of the incident edge's start.
  const delay = delays.get(receiverNode) ?? 0;
  const reflected = (options.reflected ?? firstReflectionArrivals(circuit, ramp)).get(receiverNode) ?? Infinity;
  const lag = incidentLag(t, v, waveform.initial[index], sign, swing, delay);
  const window = Math.min(Math.max(reflected, delay + ramp) + lag, t[n - 1]);
  const inWindow = sampleBefore(t, window + 1e-18) + 1; // samples 0 .. inWindow − 1 are at or before the window's end

  // Ringback (below): the first sample at or past the far threshold (i0, n when none) and the end of
  // the run that follows it in the edge's direction up to the first peak (j).
  let i0 = 0;
  while (i0 < n && sign * (v[i0] - far) < 0) i0++;
  const eps = 1e-9 * swing;
  let j = i0;
  while (j + 1 < n && sign * (v[j + 1] - v[j]) >= -eps) j++;

  // One forward pass: extremes; rail excursions (trapezoidal time-area, summed over every segment
  // without a branch: one with both ends inside the rails adds exactly 0, and a test per sample
  // mispredicts on a waveform ringing about a rail); the extreme before the
  // first-incidence window ends (samples before inWindow); the extremes from j on (ringback's tail);
  // the last crossings of VIL, VIH and Vref in the edge's direction (each as lastCrossing would find
  // it) and the last sample outside the settling band vFinal ± band.
  const vhigh = d.vhigh;
  const vlow = d.vlow;
  const { vil, vih } = receiver;
  const vref = receiver.vref ?? (vil + vih) / 2;
  const vFinal = waveform.final[index];
  const band = options.settleBand ?? 0.05 * swing;
  let vmax = v[0];
  let vmin = v[0];
  let windowMax = v[0];
  let windowMin = v[0];
  let tailMax = j === 0 ? v[0] : -Infinity;
  let tailMin = j === 0 ? v[0] : Infinity;
  let overArea = 0;
  let underArea = 0;
  let lastVil = -1; // segment (k, k + 1) of the last crossing; -1: none
  let lastVih = -1;
  let lastVref = -1;
  let outside = Math.abs(v[0] - vFinal) > band ? 0 : -1;
  let prev = v[0];
  let tPrev = t[0];
  let overPrev = v[0] > vhigh ? v[0] - vhigh : 0;
  let underPrev = v[0] < vlow ? vlow - v[0] : 0;
  for (let i = 1; i < n; i++) {
    const x = v[i];
    if (x > vmax) vmax = x;
    if (x < vmin) vmin = x;
    if (i < inWindow) {
      windowMax = vmax;
      windowMin = vmin;
    }
    if (i >= j) {
      if (x > tailMax) tailMax = x;
      if (x < tailMin) tailMin = x;
    }
    const over = x > vhigh ? x - vhigh : 0;
    const under = x < vlow ? vlow - x : 0;
    const ti = t[i];
    const dt = ti - tPrev;
    tPrev = ti;
    overArea += (0.5 * (over + overPrev)) * dt;
    underArea += (0.5 * (under + underPrev)) * dt;
    overPrev = over;
    underPrev = under;
    if (rising) {
      if (prev < vil && x >= vil) lastVil = i - 1;
      if (prev < vih && x >= vih) lastVih = i - 1;
      if (prev < vref && x >= vref) lastVref = i - 1;
    } else {
      if (prev > vil && x <= vil) lastVil = i - 1;
      if (prev > vih && x <= vih) lastVih = i - 1;
      if (prev > vref && x <= vref) lastVref = i - 1;
    }
    if (Math.abs(x - vFinal) > band) outside = i;
    prev = x;
  }
  // the level at the window's end itself, interpolated, so the result does not hang on the step
  const vAtWindow = valueAt(t, v, window);
  const vFirst = rising ? Math.max(vAtWindow, windowMax) : Math.min(vAtWindow, windowMin);

  const tFirstVil = firstCrossing(t, v, vil, dir);
  const tFirstVih = firstCrossing(t, v, vih, dir);
  const tFirstVref = firstCrossing(t, v, vref, dir);
  const tLastVil = lastVil < 0 ? null : crossingTime(t, v, lastVil, vil);
  const tLastVih = lastVih < 0 ? null : crossingTime(t, v, lastVih, vih);
  const tLastVref = lastVref < 0 ? null : crossingTime(t, v, lastVref, vref);
  const tNearFirst = rising ? tFirstVil : tFirstVih;
  const tFarFirst = rising ? tFirstVih : tFirstVil;
  const tFarLast = rising ? tLastVih : tLastVil;

  // Ringback: after the first far crossing and the first peak that follows, the worst return.
  let ringbackMargin: number | null = null;
  let staysOut = false;
  if (tFarFirst !== null) {
    // the crossing found above guarantees i0 < n. The least distance from i0 on is the least of
    // [i0, j) and of [j, n); over [j, n) it is the tail's extreme sample's distance (rounding of
    // v − far is monotone in v, so this is exact).
    const worst = rising ? tailMin - far : far - tailMax;
    let worstAfterCrossing = worst;
    for (let i = i0; i < j; i++) worstAfterCrossing = Math.min(worstAfterCrossing, sign * (v[i] - far));
    staysOut = worstAfterCrossing >= 0;
    ringbackMargin = worst;
  }
  const firstIncidence = sign * (vFirst - far) >= 0 && tFarFirst !== null && tFarFirst <= window && staysOut;

  // Monotonic inside the band, between the first near crossing and the last far crossing: no reversal,
  // and no ledge. A ledge is a stretch inside the band during which the edge gains less than the
  // tolerance for longer than the driver's full ramp (this program's choice: a pause longer than the
  // driver's own edge is not the edge's doing but a wave waiting for its reflection).
  const lo = Math.min(receiver.vil, receiver.vih);
  const hi = Math.max(receiver.vil, receiver.vih);
  const from = tNearFirst === null ? 0 : sampleBefore(t, tNearFirst);
  const to = tFarLast === null ? n - 1 : Math.min(n - 1, sampleBefore(t, tFarLast) + 1);
  let monotonic = true;
  const tol = MONOTONIC_TOLERANCE * swing;
  let extreme = clamp(v[from], lo, hi);
  let progressLevel = extreme;
  let progressTime = t[from];
  let longestLedge = 0;
  for (let i = from + 1; i <= to; i++) {
    const x = clamp(v[i], lo, hi);
    extreme = rising ? Math.max(extreme, x) : Math.min(extreme, x);
    if (sign * (extreme - x) > tol) monotonic = false;
    if (sign * (extreme - progressLevel) > tol || !(v[i] > lo && v[i] < hi)) {
      progressLevel = extreme;
      progressTime = t[i];
    } else {
      longestLedge = Math.max(longestLedge, t[i] - progressTime);
    }
  }
  if (longestLedge > ramp) monotonic = false;

  // Settling to the final DC level: `last` is the last sample outside the band (-1: none).
  const last = outside;
  let settlingTime: number | null;
  if (last < 0) settlingTime = 0;
  else if (last === n - 1) settlingTime = null;
  else {
    const edgeLevel = vFinal + Math.sign(v[last] - vFinal) * band;
    settlingTime = t[last] + ((edgeLevel - v[last]) / (v[last + 1] - v[last])) * (t[last + 1] - t[last]);
  }

  const ref = options.referenceCrossing;
  return {
    node: receiverNode,
    edge,
    vLaunch,
    vLaunchClosedForm,
    vFirstIncidence: vFirst,
    firstIncidenceWindow: window,
    firstIncidence,
    vmax,
    vmin,
    tFirstVil,
    tFirstVih,
    tLastVih,
    tLastVil,
    tFirstVref,
    tLastVref,
    tNearFirst,
    tFarFirst,
    tFarLast,
    ringbackMargin,
    overshoot: Math.max(0, vmax - d.vhigh),
    undershoot: Math.max(0, d.vlow - vmin),
    overshootArea: overArea,
    undershootArea: underArea,
    overshootMargin: receiver.vmaxAbs === null ? null : receiver.vmaxAbs - vmax,
    undershootMargin: receiver.vminAbs === null ? null : vmin - receiver.vminAbs,
    monotonic,
    longestLedge,
    vFinal,
    settleBand: band,
    settlingTime,
    flightTimeMin: ref === undefined || tNearFirst === null ? null : tNearFirst - ref,
    flightTimeMax: ref === undefined || tFarLast === null ? null : tFarLast - ref,
  };
}

function clamp(x: number, lo: number, hi: number): number {
  return x < lo ? lo : x > hi ? hi : x;
}

/** Index of the last sample at or before `time` (uniform or not; 0 when time is before t[1]). Bisection on the increasing times. */
function sampleBefore(t: Float64Array, time: number): number {
  let lo = 0;
  let hi = t.length;
  // invariant: t[i] <= time for every 0 < i <= lo; t[i] > time for every i >= hi
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (t[mid] <= time) lo = mid;
    else hi = mid;
  }
  return lo;
}

/**
 * Closed-form launch level when exactly one line and nothing else leaves the driver pin: the pin is the
 * source (Vs, R of the new level) against the line's Z0 with the history of the DC state, i.e.
 * v = (Vs/R + v0/Z0 − I0)/(1/R + 1/Z0), I0 the DC current into the line; with equal resistances this
 * is v0 + ΔVs·Z0/(Z0+Zs) (docs/design.md §2; Branin 1967). Null otherwise.
 */
function closedFormLaunch(circuit: Circuit, edge: Edge, pinInit: number): number | null {
  const d = circuit.driver;
  let line: Circuit['elements'][number] | null = null;
  for (const e of circuit.elements) {
    if (e.a !== d.node && otherTerminal(e) !== d.node) continue;
    if (line !== null) return null; // more than one element at the pin
    line = e;
  }
  if (line === null || line.kind !== 'line') return null;
  for (const r of circuit.receivers) if (r.node === d.node && (r.cin > 0 || r.odt)) return null;
  const rising = edge === 'rising';
  const [v0, v1] = rising ? [d.vlow, d.vhigh] : [d.vhigh, d.vlow];
  const [rStart, rEdge] = rising ? [d.routLow, d.routHigh] : [d.routHigh, d.routLow];
  const i0 = (v0 - pinInit) / rStart;
  return (v1 / rEdge + pinInit / line.z0 - i0) / (1 / rEdge + 1 / line.z0);
}
