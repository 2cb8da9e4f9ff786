/**
 * One net's full result: measurements at every corner and edge, its budget, its length window and,
 * when it fails on signal quality, a termination suggestion. Three kinds of net:
 * - timed nets (data, address, command, control): DESIGN.md §6 budget against the bus's timing;
 * - the strobe of a source-synchronous bus: its margins are the worst its data nets get from it (for
 *   information: a failing budget is reported on the data net, so one long data net does not mark its
 *   strobe failed too), its status is its own signal quality, and its length window keeps every data
 *   net of the bus passing;
 * - other clock/strobe nets: signal quality only (a common-clock bus's clock enters its budget as the
 *   bus's clock-skew input, not through its routing); their margins are filled in per bus.
 */
import { InputError } from '../errors.js';
import type { BusDefinition, Corner, NetDefinition, ProjectData, ReceiverModel } from '../project/model.js';
import type { CornerTiming, LengthWindow, NetResult, Status, TerminationSuggestion } from '../budget/results.js';
import type { ReceiverEdgeMeasure } from '../budget/measures.js';
import { netBudget, type NetBudget, type NetBudgetInputs } from '../budget/net-budget.js';
import { qualityChecks, qualityMarginVolts } from '../budget/quality.js';
import { qualityReasons } from '../budget/net-budget.js';
import { simulateNetMeasures } from './simulate-net.js';
import { searchLengthWindow, type WindowProbe, type WindowSearchResult } from './length-window.js';
import { combinedMargin, suggestTermination } from './termination.js';
import { buildNetCircuit, longestSegment, netParts, routedLine, type NetBuildChanges } from '../netbuild/index.js';
import { delaysFromDriver, fullRampTime } from '../circuit/topology.js';
import { formatIn } from '../units/quantity.js';

export type NetKind = 'timed' | 'strobe' | 'quality-only';

export interface SolveOptions {
  /** Compute length windows (several re-simulations per net). Default true. */
  lengthWindow?: boolean;
  /** Compute termination suggestions for nets failing on signal quality. Default true. */
  suggestion?: boolean;
}

/** A net's measurements, as passed between solve stages. */
export interface NetMeasures {
  net: string;
  measures: ReceiverEdgeMeasure[];
}

export interface SolvedNet {
  result: NetResult;
  measures: ReceiverEdgeMeasure[];
  /** Simulations run for this result (for tests and benchmarks). */
  simulations: number;
}

export function busOf(project: ProjectData, net: NetDefinition): BusDefinition {
  const bus = project.buses.find((b) => b.name === net.bus);
  if (!bus) throw new InputError(`net ${net.name}`, `bus "${net.bus}" is not in the project`);
  return bus;
}

export function findNet(project: ProjectData, name: string): NetDefinition {
  const net = project.nets.find((n) => n.name === name);
  if (!net) throw new InputError(`net ${name}`, 'not in the project');
  return net;
}

/** The bus's strobe net when the bus is source-synchronous, else null. Throws when it is missing. */
export function strobeOf(project: ProjectData, bus: BusDefinition): NetDefinition | null {
  if (bus.timing.kind !== 'source-synchronous') return null;
  if (!bus.referenceNet) throw new InputError(`bus ${bus.name}`, 'a source-synchronous bus needs a strobe (reference net)');
  const strobe = project.nets.find((n) => n.name === bus.referenceNet);
  if (!strobe) throw new InputError(`bus ${bus.name}`, `strobe net "${bus.referenceNet}" is not in the project`);
  return strobe;
}

export function netKind(project: ProjectData, net: NetDefinition): NetKind {
  const bus = busOf(project, net);
  if (bus.timing.kind === 'source-synchronous' && bus.referenceNet === net.name) return 'strobe';
  if (net.role === 'strobe' || net.role === 'clock' || bus.referenceNet === net.name) return 'quality-only';
  return 'timed';
}

function budgetInputs(project: ProjectData, net: NetDefinition, strobe: NetMeasures | null): NetBudgetInputs {
  const parts = netParts(net, project.parts);
  const receivers = new Map<string, ReceiverModel>(parts.receivers.map((r) => [r.designator, r.model]));
  return {
    net,
    bus: busOf(project, net),
    corners: project.corners,
    driverPart: parts.driver,
    receivers,
    strobe: strobe ? { net: strobe.net, measures: strobe.measures } : null,
    guardBand: project.info.guardBand,
  };
}

const allCrossed = (ms: readonly ReceiverEdgeMeasure[]): boolean => ms.every((m) => m.tNearFirst !== null && m.tFarLast !== null);
const qualityPasses = (ms: readonly ReceiverEdgeMeasure[]): boolean =>
  allCrossed(ms) && ms.every((m) => qualityChecks(m).every((q) => q.pass));

/** Worst margins over the data nets of an SS bus, given the strobe's measures. */
function strobeMargins(
  project: ProjectData,
  data: readonly { inputs: NetBudgetInputs; measures: ReceiverEdgeMeasure[] }[],
  strobe: NetMeasures,
): { setup: number; hold: number; worst: { net: string; budget: NetBudget } | null } {
  let setup = Infinity;
  let hold = Infinity;
  let worst: { net: string; budget: NetBudget } | null = null;
  for (const d of data) {
    const b = netBudget({ ...d.inputs, strobe }, d.measures);
    setup = Math.min(setup, b.setupMargin);
    hold = Math.min(hold, b.holdMargin);
    if (!worst || Math.min(b.setupMargin, b.holdMargin) < Math.min(worst.budget.setupMargin, worst.budget.holdMargin)) {
      worst = { net: d.inputs.net.name, budget: b };
    }
  }
  return { setup, hold, worst };
}

/**
 * Solves one net. `strobe`: the bus strobe's measures (timed nets of a source-synchronous bus).
 * `dataNets`: the measures of every timed net of the bus (the strobe of a source-synchronous bus).
 * `ownMeasures`: this net's measures when already simulated (a strobe's, from stage 1 of a board solve).
 */
export function solveNet(
  project: ProjectData,
  netName: string,
  context: { strobe?: NetMeasures | null; dataNets?: NetMeasures[]; ownMeasures?: ReceiverEdgeMeasure[]; inputHash?: string },
  options: SolveOptions = {},
): SolvedNet {
  const net = findNet(project, netName);
  const bus = busOf(project, net);
  const kind = netKind(project, net);
  let simulations = 0;
  const simulate = (changes: NetBuildChanges = {}, cases: Cases | null = null): ReceiverEdgeMeasure[] => {
    if (cases === null) {
      simulations += project.corners.length * 2;
      return simulateNetMeasures(project, net, changes);
    }
    const corners = casesCorners(project, cases);
    simulations += cases.size;
    return simulateNetMeasures(project, net, changes, corners, (c) => EDGES.filter((e) => cases.has(caseKey(c.name, e))));
  };
  if (project.corners.length === 0) throw new InputError('corners', 'the project has no corners');
  const measures = context.ownMeasures ?? simulate();
  const driver = netParts(net, project.parts).driver.model;
  const slew = (driver.voh - driver.vol) / fullRampTime(Math.max(driver.riseTime, driver.fallTime));

  // ---- the evaluation of a measure set, per kind: margins and pass/fail
  // `corners`: the corners `ms` covers (a subset during the length search)
  let evaluate: (ms: ReceiverEdgeMeasure[], corners?: readonly Corner[]) => { budget: NetBudget | null; setup: number; hold: number; note: string | null };
  if (kind === 'timed') {
    const strobe = bus.timing.kind === 'source-synchronous' ? context.strobe ?? null : null;
    if (bus.timing.kind === 'source-synchronous' && !strobe) throw new Error(`solveNet: strobe measures missing for ${net.name}`);
    const inputs = budgetInputs(project, net, strobe);
    evaluate = (ms, corners = project.corners) => {
      const b = netBudget({ ...inputs, corners }, ms);
      return { budget: b, setup: b.setupMargin, hold: b.holdMargin, note: null };
    };
  } else if (kind === 'strobe') {
    const data = (context.dataNets ?? []).map((d) => ({ inputs: budgetInputs(project, findNet(project, d.net), null), measures: d.measures }));
    evaluate = (ms, corners = project.corners) => {
      if (data.length === 0) return { budget: null, setup: 0, hold: 0, note: 'no data nets use this strobe' };
      const subset = corners === project.corners ? data : data.map((d) => ({
        inputs: { ...d.inputs, corners },
        measures: d.measures.filter((m) => corners.some((c) => c.name === m.corner)),
      }));
      const r = strobeMargins(project, subset, { net: net.name, measures: ms });
      return {
        budget: r.worst?.budget ?? null, setup: r.setup, hold: r.hold,
        note: `margins are the worst the strobe gives its ${data.length} data net${data.length > 1 ? 's' : ''} (worst: ${r.worst?.net})`,
      };
    };
  } else {
    evaluate = () => ({ budget: null, setup: 0, hold: 0, note: 'signal quality only: margins shown are the bus worst' });
  }

  const own = evaluate(measures);
  const quality = measures.flatMap(qualityChecks);
  const qualityMargin = Math.min(...measures.map(qualityMarginVolts));
  const corners: CornerTiming[] = cornerTimings(project, measures, own.budget, kind);
  const reasons: string[] = [];
  let status: Status;
  if (kind === 'timed' && own.budget) {
    status = own.budget.status;
    reasons.push(...own.budget.reasons);
  } else {
    const qReasons = qualityReasons(quality, measures);
    const crossed = allCrossed(measures);
    if (!crossed) reasons.push(`a receiver never crosses its far threshold within the simulated ${formatIn(measures[0].tStop, 'ns', 1)}`);
    reasons.push(...qReasons);
    status = qReasons.length > 0 || !crossed ? 'fail' : 'pass';
  }

  // ---- length window of the longest routed segment
  let lengthWindow: LengthWindow | null = null;
  const segment = longestSegment(net);
  if (options.lengthWindow !== false && segment && kind !== 'quality-only') {
    // Probes simulate only the corners that limit the net now (worst setup, worst hold, worst signal
    // quality). Each edge found is then accepted when a linear bound shows no other corner can limit
    // it, else checked by simulating the other corners there; if one of them limits, the search is
    // redone at every corner.
    // (corner, edge) cases: a timed net's data edges are independent, so only the limiting edges are
    // simulated; a strobe's both edges enter every budget (extremes over its edges), so it keeps both.
    const limiting = limitingCases(project, measures, own.budget, kind);
    const others = new Set(allCases(project).filter((k) => !limiting.has(k)));
    const probeAt = (cases: Cases) => {
      const seen = new Map<number, WindowProbe>();
      const corners = casesCorners(project, cases);
      return (length: number): WindowProbe => {
        let p = seen.get(length);
        if (!p) {
          const ms = simulate({ length: { elementIndex: segment.elementIndex, length } }, cases);
          const e = evaluate(ms, corners);
          p = { setupMargin: e.setup, holdMargin: e.hold, qualityPass: qualityPasses(ms) };
          seen.set(length, p);
        }
        return p;
      };
    };
    const onSubset = probeAt(limiting);
    let w = searchLengthWindow(onSubset, segment.length);
    const othersCannotLimit = (edge: number): boolean => {
      // Linear bound: stretching the segment by dL shifts each corner's margins by its delay per metre
      // x dL, so corners drift apart by at most (spread of delay per metre) x dL. A case left out of
      // the search cannot limit the edge when it starts that far (plus 5 ps for reflections) above the
      // searched cases at the present length, in both margins, with its signal quality passing.
      const dpm = project.corners.map((c) => routedLine(project.stackup, segment.layer, segment.width, segment.spacing, c).delayPerMetre);
      const needed = (Math.max(...dpm) - Math.min(...dpm)) * Math.abs(edge - segment.length) + 5e-12;
      const at = (cases: Cases) => casesCorners(project, cases).map((c) => {
        const ms = measures.filter((m) => m.corner === c.name && cases.has(caseKey(m.corner, m.edge)));
        return { ...evaluate(ms, [c]), quality: qualityPasses(ms) };
      });
      const subset = at(limiting);
      const setupFloor = Math.min(...subset.map((e) => e.setup));
      const holdFloor = Math.min(...subset.map((e) => e.hold));
      return at(others).every((e) => e.quality && e.setup - setupFloor >= needed && e.hold - holdFloor >= needed);
    };
    const settled = (edge: number | null, open: boolean) => open || edge === null || othersCannotLimit(edge);
    const skipConfirm = settled(w.min, w.minOpen) && settled(w.max, w.maxOpen);
    if (others.size > 0 && !skipConfirm && !confirmEdges(w, onSubset, probeAt(others))) {
      w = searchLengthWindow(probeAt(new Set(allCases(project))), segment.length);
    }
    lengthWindow = {
      elementIndex: segment.elementIndex,
      layer: segment.layer,
      current: segment.length,
      min: w.min,
      max: w.max,
      note: `segment ${segment.elementIndex + 1} on ${segment.layer} (the net's longest), the rest of the net and bus as routed: ${w.note}`,
    };
  }

  // ---- termination suggestion for a signal-quality failure
  let suggestion: TerminationSuggestion | null = null;
  if (options.suggestion !== false && !qualityPasses(measures)) {
    const timingOf = (e: { setup: number; hold: number }): number => (kind === 'quality-only' ? Infinity : Math.min(e.setup, e.hold));
    const before = combinedMargin(timingOf(own), qualityMargin, slew);
    const typical = project.corners.find((c) => c.rail === 1 && c.driverStrength === 1) ?? project.corners[0];
    const circuit = buildNetCircuit(net, project.stackup, project.parts, typical);
    const delays = delaysFromDriver(circuit);
    const farEnd = net.receivers.reduce((a, b) => ((delays.get(b.node) ?? 0) > (delays.get(a.node) ?? 0) ? b : a));
    const vtt = (driver.vol + driver.voh) / 2;
    suggestion = suggestTermination(
      (trialKind, ohms) => {
        const changes: NetBuildChanges = trialKind === 'series' ? { series: ohms } : { parallel: { node: farEnd.node, ohms, vtt } };
        const ms = simulate(changes);
        const e = evaluate(ms);
        return combinedMargin(timingOf(e), Math.min(...ms.map(qualityMarginVolts)), slew);
      },
      before,
      { seriesAt: `${net.driver.designator} pin`, parallelAt: `${farEnd.designator} (node ${farEnd.node})`, vtt },
    );
  }

  const flights = measures.map((m) => ({ min: m.tNearFirst === null ? null : m.tNearFirst - m.tReference, max: m.tFarLast === null ? null : m.tFarLast - m.tReference }));
  const ownBudget = kind === 'timed' ? own.budget : null;
  const flightMin = ownBudget?.flightMin ?? Math.min(...flights.map((f) => f.min ?? Infinity));
  const flightMax = ownBudget?.flightMax ?? Math.max(...flights.map((f) => f.max ?? -Infinity));
  const result: NetResult = {
    net: net.name,
    bus: bus.name,
    role: net.role,
    status,
    reasons,
    worstCorner: own.budget?.worstCorner ?? worstQualityCorner(measures),
    flightMin: Number.isFinite(flightMin) ? flightMin : 0,
    flightMax: Number.isFinite(flightMax) ? flightMax : 0,
    skew: 0,
    setupMargin: own.setup,
    holdMargin: own.hold,
    corners,
    quality,
    lengthWindow,
    suggestion,
    inputHash: context.inputHash ?? '',
  };
  if (own.note) result.marginsFrom = own.note;
  return { result, measures, simulations };
}

/** Per-corner timing rows. Timed nets: their own budget; others: their flights with the margins given. */
function cornerTimings(project: ProjectData, measures: readonly ReceiverEdgeMeasure[], budget: NetBudget | null, kind: NetKind): CornerTiming[] {
  if (kind === 'timed' && budget) return budget.corners.map((c) => c.timing);
  return project.corners.map((corner) => {
    const own = measures.filter((m) => m.corner === corner.name);
    const mins = own.map((m) => (m.tNearFirst ?? m.tStop) - m.tReference);
    const maxs = own.map((m) => (m.tFarLast ?? m.tStop) - m.tReference);
    const fromBudget = budget?.corners.find((c) => c.timing.corner === corner.name)?.timing;
    return {
      corner: corner.name,
      flightMin: Math.min(...mins),
      flightMax: Math.max(...maxs),
      setupMargin: fromBudget?.setupMargin ?? 0,
      holdMargin: fromBudget?.holdMargin ?? 0,
      setupItems: fromBudget?.setupItems ?? [],
      holdItems: fromBudget?.holdItems ?? [],
    };
  });
}

/** A (corner, edge) simulation case, as "corner|edge". */
type Cases = ReadonlySet<string>;
const EDGES = ['rising', 'falling'] as const;
const caseKey = (corner: string, edge: string): string => `${corner}|${edge}`;
const allCases = (project: ProjectData): string[] => project.corners.flatMap((c) => EDGES.map((e) => caseKey(c.name, e)));
/** The corners a case set touches, in project order. */
function casesCorners(project: ProjectData, cases: Cases): Corner[] {
  return project.corners.filter((c) => EDGES.some((e) => cases.has(caseKey(c.name, e))));
}

/**
 * Cases that set the net's margins and signal quality now: the worst setup and worst hold (corner and
 * data edge) and the worst signal-quality measure. A strobe keeps both edges of each such corner.
 */
function limitingCases(project: ProjectData, measures: readonly ReceiverEdgeMeasure[], budget: NetBudget | null, kind: NetKind): Set<string> {
  const worstQuality = measures.reduce((a, b) => (qualityMarginVolts(b) < qualityMarginVolts(a) ? b : a));
  const cases = new Set<string>([caseKey(worstQuality.corner, worstQuality.edge)]);
  if (budget) {
    const setup = budget.corners.reduce((a, b) => (b.timing.setupMargin < a.timing.setupMargin ? b : a));
    const hold = budget.corners.reduce((a, b) => (b.timing.holdMargin < a.timing.holdMargin ? b : a));
    cases.add(caseKey(setup.timing.corner, setup.setupCause.edge));
    cases.add(caseKey(hold.timing.corner, hold.holdCause.edge));
  }
  if (kind === 'strobe') {
    for (const c of casesCorners(project, cases)) for (const e of EDGES) cases.add(caseKey(c.name, e));
  }
  return cases;
}

/**
 * True when every closed edge of a window found on a corner subset holds at the other corners too:
 * they pass there, with margins no smaller than the subset's (within 0.1 ps), so no other corner
 * limits the edge. Margins are minima over corners, so subset and complement combine exactly.
 */
function confirmEdges(w: WindowSearchResult, subset: (length: number) => WindowProbe, others: (length: number) => WindowProbe): boolean {
  for (const [edge, open] of [[w.min, w.minOpen], [w.max, w.maxOpen]] as const) {
    if (edge === null || open) continue;
    const a = subset(edge);
    const b = others(edge);
    const ok = b.qualityPass && Math.min(b.setupMargin, b.holdMargin) >= Math.min(a.setupMargin, a.holdMargin) - 0.1e-12;
    if (!ok) return false;
  }
  return true;
}

function worstQualityCorner(measures: readonly ReceiverEdgeMeasure[]): string {
  let worst = measures[0];
  for (const m of measures) if (qualityMarginVolts(m) < qualityMarginVolts(worst)) worst = m;
  return worst.corner;
}
