/**
 * What-if sweep of one net (docs/design.md §6.5): one quantity of the net — a segment's length or a
 * resistor's value — is set to each value of a range, and the net is solved at each value exactly as
 * the budget solves it (solveNet: every corner and edge, the same evaluator, the same status rules),
 * with the rest of the net and bus as routed. Each value is the project with that one element changed
 * (what an edit to that element would give), so no budget arithmetic lives here.
 *
 * The work splits into independent jobs so the services can run them off the main thread:
 *   1. the measures the net's budget needs from other nets (its bus's strobe or clock, or, for a
 *      strobe, its data nets), each simulated once (runJob 'strobe-measures');
 *   2. one job per swept value, and one at the present value that also searches the engine's length
 *      window of the swept segment (length sweeps), through runSweepPoint.
 * sweepNet runs them in this thread, one after another.
 */
import { InputError } from '../errors.js';
import type { NetDefinition, NetElement, ProjectData } from '../project/model.js';
import type { LengthWindow, NetResult, QualityCheck, Status } from '../budget/results.js';
import type { ReceiverEdgeMeasure } from '../budget/measures.js';
import { busOf, clockOf, findNet, netKind, solveNet, strobeOf, type NetKind, type NetMeasures } from './solve-net.js';
import { projectForBus } from './corner-set.js';
import { allCrossed } from './net-evaluation.js';
import { simulateNetMeasures } from './simulate-net.js';

/** The swept quantity: the length of a segment (m) or the value of a resistor (Ω), by element index. */
export interface SweepQuantity {
  kind: 'length' | 'resistance';
  elementIndex: number;
}

export interface SweepRequest {
  quantity: SweepQuantity;
  /** First and last value, SI (m or Ω); either order. */
  start: number;
  stop: number;
  /** Number of values, start and stop included, 2..101. */
  points: number;
}

/** One failing signal-quality check at a sweep value: the worst instance of that check, and how many fail. */
export interface SweepCheck {
  name: QualityCheck['name'];
  count: number;
  receiver: string;
  edge: QualityCheck['edge'];
  corner: string;
  /** V (a yes/no check: 0 or 1) */
  value: number;
  /** V; null for a yes/no check */
  limit: number | null;
}

export interface SweepPoint {
  /** m or Ω */
  value: number;
  /**
   * Worst setup and hold margin over every corner and edge at this value, s, as the margin table
   * defines them; null when a receiver never crosses (unknown) or the net has no budget of its own.
   */
  setupMargin: number | null;
  holdMargin: number | null;
  /** The smaller of the two; null when either is unknown. */
  worstMargin: number | null;
  /** The net's status at this value (fail / tight against the guard band / pass). */
  status: Status;
  worstCorner: string;
  worstSetupCorner: string | null;
  worstHoldCorner: string | null;
  /** Every signal-quality check failing at this value, one entry per check name. */
  failingChecks: SweepCheck[];
  /** False when some receiver, edge and corner never crosses its thresholds. */
  crosses: boolean;
  /** The net's reasons at this value (as the net view lists them). */
  reasons: string[];
}

export interface NetSweep {
  net: string;
  quantity: SweepQuantity;
  /** 'm' for lengths, 'Ω' for resistances. */
  unit: 'm' | 'Ω';
  /** The element in words, e.g. "segment 2 on L3_SIG" or "resistor 1 (drv–s)". */
  element: string;
  /** The element's present value, m or Ω. */
  current: number;
  /** The net solved at its present value (the same numbers as its normal solve). */
  atCurrent: SweepPoint;
  points: SweepPoint[];
  /** s */
  guardBand: number;
  /** False for a net checked on signal quality only (its margins are not its own). */
  timed: boolean;
  /** The engine's length window of the swept segment (length sweeps of a timed net), else null. */
  lengthWindow: LengthWindow | null;
  /** Simulations run (for tests and benchmarks). */
  simulations: number;
}

/** Validated sweep: its values and what the net's budget needs from other nets. */
export interface SweepPlan {
  net: string;
  quantity: SweepQuantity;
  unit: 'm' | 'Ω';
  element: string;
  current: number;
  values: number[];
  kind: NetKind;
  /** Nets whose measures the budget needs: the bus's strobe or clock, or a strobe's data nets. */
  strobe: string | null;
  dataNets: string[];
}

/** Most values in one sweep: a chart of 101 points is already finer than the eye reads. */
export const SWEEP_MAX_POINTS = 101;
/** Lengths swept, m: 10 µm to 2 m (this program's choice: from a pad stub to a long backplane run). */
export const SWEEP_LENGTH_RANGE = { min: 10e-6, max: 2 } as const;
/** Resistances swept, Ω: 0.1 Ω to 1 MΩ (this program's choice: wider than any termination). */
export const SWEEP_RESISTANCE_RANGE = { min: 0.1, max: 1e6 } as const;

const elementWords = (net: NetDefinition, index: number, e: NetElement): string =>
  e.kind === 'segment' ? `segment ${index + 1} on ${e.layer}` : `${e.kind} ${index + 1} of ${net.name} (${'a' in e ? e.a : ''}–${'b' in e ? e.b : ''})`;

/** Checks a request and lists its values; every refusal names the field. */
export function planSweep(project: ProjectData, netName: string, request: SweepRequest): SweepPlan {
  const net = findNet(project, netName);
  const { quantity, start, stop, points } = request;
  if (quantity.kind !== 'length' && quantity.kind !== 'resistance') {
    throw new InputError('sweep quantity', `must be "length" or "resistance", got "${String(quantity.kind)}"`);
  }
  const where = `net ${net.name} element ${quantity.elementIndex + 1}`;
  if (!Number.isInteger(quantity.elementIndex) || quantity.elementIndex < 0 || quantity.elementIndex >= net.elements.length) {
    throw new InputError('sweep element', `net ${net.name} has elements 1 to ${net.elements.length}, got ${quantity.elementIndex + 1}`);
  }
  const element = net.elements[quantity.elementIndex];
  let current: number;
  if (quantity.kind === 'length') {
    if (element.kind !== 'segment') throw new InputError(where, `a length sweep needs a segment, this element is a ${element.kind}`);
    current = element.length;
  } else {
    if (element.kind !== 'resistor') throw new InputError(where, `a resistance sweep needs a resistor, this element is a ${element.kind}`);
    current = element.ohms;
  }
  if (!Number.isInteger(points) || points < 2 || points > SWEEP_MAX_POINTS) {
    throw new InputError('sweep points', `must be a whole number from 2 to ${SWEEP_MAX_POINTS}, got ${points}`);
  }
  const range = quantity.kind === 'length' ? SWEEP_LENGTH_RANGE : SWEEP_RESISTANCE_RANGE;
  const unit = quantity.kind === 'length' ? 'm' : 'Ω';
  const words = (v: number) => (quantity.kind === 'length' ? `${Number((v * 1e3).toPrecision(4))} mm` : `${Number(v.toPrecision(4))} Ω`);
  for (const [field, v] of [['sweep start', start], ['sweep stop', stop]] as const) {
    if (!Number.isFinite(v) || v <= 0) throw new InputError(field, `must be a positive ${quantity.kind === 'length' ? 'length' : 'resistance'}, got ${v} ${unit}`);
    if (v < range.min || v > range.max) throw new InputError(field, `must lie from ${words(range.min)} to ${words(range.max)}, got ${words(v)}`);
  }
  if (start === stop) throw new InputError('sweep stop', `must differ from the start (${words(start)})`);
  // evenly spaced, both ends exact
  const values = Array.from({ length: points }, (_, i) => (i === points - 1 ? stop : start + ((stop - start) * i) / (points - 1)));
  const bus = busOf(project, net);
  const kind = netKind(project, net);
  let strobe: string | null = null;
  let dataNets: string[] = [];
  if (kind === 'timed') strobe = (strobeOf(project, bus) ?? clockOf(project, bus))?.name ?? null;
  if (kind === 'strobe') dataNets = project.nets.filter((n) => n.bus === bus.name && n.name !== net.name && netKind(project, n) === 'timed').map((n) => n.name);
  return { net: net.name, quantity, unit, element: elementWords(net, quantity.elementIndex, element), current, values, kind, strobe, dataNets };
}

/** The project with one element of one net set to `value` (m or Ω); nothing else changes. */
export function withSweptValue(project: ProjectData, netName: string, quantity: SweepQuantity, value: number): ProjectData {
  const net = findNet(project, netName);
  const elements = net.elements.map((e, i) => {
    if (i !== quantity.elementIndex) return e;
    if (quantity.kind === 'length' && e.kind === 'segment') return { ...e, length: value };
    if (quantity.kind === 'resistance' && e.kind === 'resistor') return { ...e, ohms: value };
    throw new InputError(`net ${netName} element ${i + 1}`, `cannot take a ${quantity.kind}`);
  });
  return { ...project, nets: project.nets.map((n) => (n === net ? { ...net, elements } : n)) };
}

/** Measures of another net as the swept net's budget uses them: at its bus's corner set (as runJob's stage 1). */
export function contextMeasures(project: ProjectData, netName: string): NetMeasures {
  const net = findNet(project, netName);
  return { net: net.name, measures: simulateNetMeasures(projectForBus(project, busOf(project, net)), net) };
}

/**
 * The net solved at one swept value (`value` null: as it is, with the length window of the swept
 * segment when `window` is set). `strobe`: the strobe or clock measures; `dataNets`: a strobe's data nets.
 */
export function runSweepPoint(
  project: ProjectData, netName: string, quantity: SweepQuantity, value: number | null,
  context: { strobe: NetMeasures | null; dataNets: NetMeasures[]; window: boolean },
): { result: NetResult; measures: ReceiverEdgeMeasure[]; simulations: number } {
  const trial = value === null ? project : withSweptValue(project, netName, quantity, value);
  const solveContext = netKind(trial, findNet(trial, netName)) === 'strobe' ? { dataNets: context.dataNets } : { strobe: context.strobe };
  return solveNet(trial, netName, solveContext, {
    lengthWindow: context.window && quantity.kind === 'length',
    suggestion: false,
    windowSegment: quantity.elementIndex,
  });
}

/** A solved value as a sweep point. */
export function sweepPointOf(value: number, result: NetResult, measures: readonly ReceiverEdgeMeasure[], timed: boolean): SweepPoint {
  const failing = new Map<string, SweepCheck>();
  for (const q of result.quality) {
    if (q.pass) continue;
    const seen = failing.get(q.name);
    // the worst instance: furthest past its limit (a yes/no check keeps its first)
    const beyond = (c: { value: number; limit: number | null }) => (c.limit === null ? 0 : Math.abs(c.value - c.limit));
    if (!seen) failing.set(q.name, { name: q.name, count: 1, receiver: q.receiver, edge: q.edge, corner: q.corner, value: q.value, limit: q.limit });
    else {
      seen.count++;
      if (beyond(q) > beyond(seen)) Object.assign(seen, { receiver: q.receiver, edge: q.edge, corner: q.corner, value: q.value, limit: q.limit });
    }
  }
  const setupMargin = timed ? result.setupMargin : null;
  const holdMargin = timed ? result.holdMargin : null;
  return {
    value,
    setupMargin,
    holdMargin,
    worstMargin: setupMargin === null || holdMargin === null ? null : Math.min(setupMargin, holdMargin),
    status: result.status,
    worstCorner: result.worstCorner,
    worstSetupCorner: result.worstSetupCorner ?? null,
    worstHoldCorner: result.worstHoldCorner ?? null,
    failingChecks: [...failing.values()],
    crosses: allCrossed(measures),
    reasons: result.reasons,
  };
}

/** The sweep's answer from its solved points (`solved[i]` at plan.values[i]) and the present value's solve. */
export function assembleSweep(
  project: ProjectData, plan: SweepPlan,
  current: { result: NetResult; measures: readonly ReceiverEdgeMeasure[] },
  solved: readonly { result: NetResult; measures: readonly ReceiverEdgeMeasure[] }[],
  simulations: number,
): NetSweep {
  const timed = plan.kind !== 'quality-only';
  return {
    net: plan.net,
    quantity: plan.quantity,
    unit: plan.unit,
    element: plan.element,
    current: plan.current,
    atCurrent: sweepPointOf(plan.current, current.result, current.measures, timed),
    points: solved.map((s, i) => sweepPointOf(plan.values[i], s.result, s.measures, timed)),
    guardBand: project.info.guardBand,
    timed,
    lengthWindow: plan.quantity.kind === 'length' ? current.result.lengthWindow : null,
    simulations,
  };
}

/** The whole sweep in this thread (tests, the command line); the services split it into jobs. */
export function sweepNet(project: ProjectData, netName: string, request: SweepRequest, onProgress?: (done: number, total: number) => void): NetSweep {
  const plan = planSweep(project, netName, request);
  let simulations = 0;
  const strobe = plan.strobe ? contextMeasures(project, plan.strobe) : null;
  const dataNets = plan.dataNets.map((n) => contextMeasures(project, n));
  const corners = (name: string) => projectForBus(project, busOf(project, findNet(project, name))).corners.length * 2;
  simulations += (plan.strobe ? corners(plan.strobe) : 0) + plan.dataNets.reduce((sum, n) => sum + corners(n), 0);
  const total = plan.values.length + 1;
  const current = runSweepPoint(project, netName, plan.quantity, null, { strobe, dataNets, window: true });
  simulations += current.simulations;
  onProgress?.(1, total);
  const solved = plan.values.map((v, i) => {
    const s = runSweepPoint(project, netName, plan.quantity, v, { strobe, dataNets, window: false });
    simulations += s.simulations;
    onProgress?.(i + 2, total);
    return s;
  });
  return assembleSweep(project, plan, current, solved, simulations);
}
