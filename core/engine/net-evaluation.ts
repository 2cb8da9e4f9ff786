/**
 * How a set of measures of one net turns into margins and a pass/fail, per kind of net
 * (docs/design.md §6): a timed net's own budget; a strobe's worst margins over its data nets; a
 * quality-only net's signal quality.
 */
import type { Corner, NetDefinition, ProjectData, ReceiverModel } from '../project/model.js';
import type { CornerTiming } from '../budget/results.js';
import type { ReceiverEdgeMeasure } from '../budget/measures.js';
import { maxOrNull, minOrNull, netBudget, type NetBudget, type NetBudgetInputs } from '../budget/net-budget.js';
import { flightTimes } from '../budget/measures.js';
import { qualityChecks, qualityMarginVolts } from '../budget/quality.js';
import { netParts } from '../netbuild/index.js';
import { busOf, findNet, type NetKind } from './net-lookup.js';

/** A net's measurements, as passed between solve stages. */
export interface NetMeasures {
  net: string;
  measures: ReceiverEdgeMeasure[];
}

/**
 * Margins of one evaluation; `budget` is the budget that sets them (null for quality-only nets).
 * An unknown margin (a receiver that never crosses) is -Infinity here, so every search treats it as
 * the worst failure; results show it as null (marginOut).
 */
export interface Evaluation {
  budget: NetBudget | null;
  setup: number;
  hold: number;
  note: string | null;
}

/** Evaluates a measure set; `corners`: the corners it covers (a subset during a search). */
export type Evaluator = (measures: ReceiverEdgeMeasure[], corners?: readonly Corner[]) => Evaluation;

/** A budget margin as the searches rank it: unknown (null) is the worst, -Infinity. */
export const marginIn = (margin: number | null): number => (margin === null ? -Infinity : margin);
/** A search margin as results show it: -Infinity (unknown) is null, never a number. */
export const marginOut = (margin: number): number | null => (Number.isFinite(margin) ? margin : null);

export const allCrossed = (ms: readonly ReceiverEdgeMeasure[]): boolean => ms.every((m) => m.tNearFirst !== null && m.tFarLast !== null);
export const qualityPasses = (ms: readonly ReceiverEdgeMeasure[]): boolean =>
  allCrossed(ms) && ms.every((m) => qualityChecks(m).every((q) => q.pass));

/**
 * Budget inputs of a timed net. `reference`: the measures of the bus's strobe (source synchronous) or
 * clock net (common clock, docs/design.md §6.1); null when the bus has neither.
 */
export function budgetInputs(project: ProjectData, net: NetDefinition, reference: NetMeasures | null): NetBudgetInputs {
  const parts = netParts(net, project.parts);
  const receivers = new Map<string, ReceiverModel>(parts.receivers.map((r) => [r.designator, r.model]));
  const bus = busOf(project, net);
  const ss = bus.timing.kind === 'source-synchronous';
  let clock: NetBudgetInputs['clock'] = null;
  if (!ss && reference) {
    const clockNet = findNet(project, reference.net);
    const clockDriver = netParts(clockNet, project.parts).driver;
    clock = {
      net: clockNet.name, measures: reference.measures, driver: clockDriver.model, driverPart: clockDriver.part.name,
      driverDesignator: clockNet.driver.designator,
    };
  }
  return {
    net,
    bus,
    corners: project.corners,
    driverPart: parts.driver,
    receivers,
    strobe: ss && reference ? { net: reference.net, measures: reference.measures } : null,
    clock,
    guardBand: project.info.guardBand,
  };
}

/** Worst margins over the data nets of a source-synchronous bus, given the strobe's measures. */
function strobeMargins(
  data: readonly { inputs: NetBudgetInputs; measures: ReceiverEdgeMeasure[] }[],
  strobe: NetMeasures,
): { setup: number; hold: number; worst: { net: string; budget: NetBudget } | null } {
  let setup = Infinity;
  let hold = Infinity;
  let worst: { net: string; budget: NetBudget } | null = null;
  for (const d of data) {
    const b = netBudget({ ...d.inputs, strobe }, d.measures);
    setup = Math.min(setup, marginIn(b.setupMargin));
    hold = Math.min(hold, marginIn(b.holdMargin));
    const smaller = (x: NetBudget) => Math.min(marginIn(x.setupMargin), marginIn(x.holdMargin));
    if (!worst || smaller(b) < smaller(worst.budget)) {
      worst = { net: d.inputs.net.name, budget: b };
    }
  }
  return { setup, hold, worst };
}

/**
 * The evaluator of a net. `strobe`: the bus strobe's measures (timed nets of a source-synchronous
 * bus); `dataNets`: the measures of every timed net of the bus (for the strobe itself). `words`
 * false: budgets without details and reasons, for searches that keep only the margins (NetBudgetInputs).
 */
export function netEvaluator(
  project: ProjectData, net: NetDefinition, kind: NetKind,
  context: { strobe?: NetMeasures | null; dataNets?: NetMeasures[] },
  options: { words?: boolean } = {},
): Evaluator {
  const words = options.words !== false;
  const bus = busOf(project, net);
  if (kind === 'timed') {
    const reference = context.strobe ?? null;
    if (bus.timing.kind === 'source-synchronous' && !reference) throw new Error(`netEvaluator: strobe measures missing for ${net.name}`);
    const inputs = { ...budgetInputs(project, net, reference), words };
    return (ms, corners = project.corners) => {
      const b = netBudget({ ...inputs, corners }, ms);
      return { budget: b, setup: marginIn(b.setupMargin), hold: marginIn(b.holdMargin), note: null };
    };
  }
  if (kind === 'strobe') {
    const data = (context.dataNets ?? []).map((d) => ({ inputs: { ...budgetInputs(project, findNet(project, d.net), null), words }, measures: d.measures }));
    return (ms, corners = project.corners) => {
      if (data.length === 0) return { budget: null, setup: 0, hold: 0, note: 'no data nets use this strobe' };
      const subset = corners === project.corners ? data : data.map((d) => ({
        inputs: { ...d.inputs, corners },
        measures: d.measures.filter((m) => corners.some((c) => c.name === m.corner)),
      }));
      const r = strobeMargins(subset, { net: net.name, measures: ms });
      return {
        budget: r.worst?.budget ?? null, setup: r.setup, hold: r.hold,
        note: `margins are the worst the strobe gives its ${data.length} data net${data.length > 1 ? 's' : ''} (worst: ${r.worst?.net})`,
      };
    };
  }
  return () => ({ budget: null, setup: 0, hold: 0, note: 'signal quality only: margins shown are the bus worst' });
}

/** Per-corner timing rows. Timed nets: their own budget; others: their flights with the margins given. */
export function cornerTimings(project: ProjectData, measures: readonly ReceiverEdgeMeasure[], budget: NetBudget | null, kind: NetKind): CornerTiming[] {
  if (kind === 'timed' && budget) return budget.corners.map((c) => c.timing);
  return project.corners.map((corner) => {
    const own = measures.filter((m) => m.corner === corner.name);
    const flights = own.map(flightTimes);
    const fromBudget = budget?.corners.find((c) => c.timing.corner === corner.name)?.timing;
    return {
      corner: corner.name,
      flightMin: minOrNull(flights.map((f) => f.min)),
      flightMax: maxOrNull(flights.map((f) => f.max)),
      setupMargin: fromBudget ? fromBudget.setupMargin : null,
      holdMargin: fromBudget ? fromBudget.holdMargin : null,
      setupItems: fromBudget?.setupItems ?? [],
      holdItems: fromBudget?.holdItems ?? [],
    };
  });
}

export function worstQualityCorner(measures: readonly ReceiverEdgeMeasure[]): string {
  let worst = measures[0];
  for (const m of measures) if (qualityMarginVolts(m) < qualityMarginVolts(worst)) worst = m;
  return worst.corner;
}
