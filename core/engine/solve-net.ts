/**
 * One net's full result (docs/design.md §5, §6): its measurements at every corner and edge, its
 * budget or signal-quality verdict, its length window and, when it fails on signal quality, a
 * termination suggestion. The kinds of net and how each is evaluated: core/engine/net-evaluation.ts.
 */
import { InputError } from '../errors.js';
import type { ProjectData } from '../project/model.js';
import type { NetResult, Status } from '../budget/results.js';
import type { ReceiverEdgeMeasure } from '../budget/measures.js';
import { maxOrNull, minOrNull, neverCrossedReasons, qualityReasons } from '../budget/net-budget.js';
import { flightTimes } from '../budget/measures.js';
import { qualityChecks } from '../budget/quality.js';
import type { NetBuildChanges } from '../netbuild/index.js';
import { simulateNetMeasures } from './simulate-net.js';
import { EDGES, caseKey, casesCorners, type Cases } from './cases.js';
import { busOf, clockOf, findNet, netKind } from './net-lookup.js';
import { allCrossed, cornerTimings, marginOut, netEvaluator, qualityPasses, worstQualityCorner, type NetMeasures } from './net-evaluation.js';
import { netLengthWindow } from './net-window.js';
import { projectForBus } from './corner-set.js';
import { netTerminationSuggestion } from './net-suggestion.js';

export { busOf, clockOf, findNet, netKind, referenceOf, strobeOf, type NetKind } from './net-lookup.js';
export type { NetMeasures } from './net-evaluation.js';

export interface SolveOptions {
  /** Compute length windows (several re-simulations per net). Default true. */
  lengthWindow?: boolean;
  /** Compute termination suggestions for nets failing on signal quality. Default true. */
  suggestion?: boolean;
  /** The segment (element index) whose length window is searched; default the net's longest. */
  windowSegment?: number;
}

export interface SolvedNet {
  result: NetResult;
  measures: ReceiverEdgeMeasure[];
  /** Simulations run for this result (for tests and benchmarks). */
  simulations: number;
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
  // the bus's corner set: as defined, or silicon corners crossed with board corners (docs/design.md §6.3)
  project = projectForBus(project, bus);
  const kind = netKind(project, net);
  if (project.corners.length === 0) throw new InputError('corners', 'the project has no corners');
  let simulations = 0;
  const simulate = (changes: NetBuildChanges = {}, cases: Cases | null = null): ReceiverEdgeMeasure[] => {
    // a length trial keeps the topology the net's own simulation checked (its measures exist by then),
    // and the builder's stop time grows with the net's delay; a trial termination adds an element
    const sameTopology = changes.length !== undefined && Object.keys(changes).length === 1;
    const corners = cases === null ? project.corners : casesCorners(project, cases);
    simulations += cases === null ? project.corners.length * 2 : cases.size;
    const edgesAt = cases === null ? undefined : (c: { name: string }) => EDGES.filter((e) => cases.has(caseKey(c.name, e)));
    return simulateNetMeasures(project, net, changes, corners, edgesAt, sameTopology);
  };
  const measures = context.ownMeasures ?? simulate();
  // a common-clock bus's clock net enters its timed nets' budgets (docs/design.md §6.1): simulated here
  // when the caller (a board solve's first stage) has not passed its measures
  let reference = context.strobe ?? null;
  const clock = kind === 'timed' ? clockOf(project, bus) : null;
  if (clock && !reference) {
    reference = { net: clock.name, measures: simulateNetMeasures(project, clock) };
    simulations += project.corners.length * 2;
  }
  const evaluation = { ...context, strobe: reference };
  const evaluate = netEvaluator(project, net, kind, evaluation);
  const own = evaluate(measures);
  // the searches' probes keep only margins: their budgets are built without words
  const probe = netEvaluator(project, net, kind, evaluation, { words: false });
  const quality = measures.flatMap(qualityChecks);

  const reasons: string[] = [];
  let status: Status;
  if (kind === 'timed' && own.budget) {
    status = own.budget.status;
    reasons.push(...own.budget.reasons);
  } else {
    const qReasons = qualityReasons(quality, measures);
    const crossed = allCrossed(measures);
    reasons.push(...neverCrossedReasons(measures), ...qReasons);
    status = qReasons.length > 0 || !crossed ? 'fail' : 'pass';
  }

  const lengthWindow = options.lengthWindow === false ? null : netLengthWindow(project, net, kind, measures, own, probe, simulate, options.windowSegment);
  const suggestion = options.suggestion !== false && !qualityPasses(measures)
    ? netTerminationSuggestion(project, net, kind, measures, own, probe, simulate)
    : null;

  // A missing crossing leaves the flight unknown (null), never 0 (docs/design.md §5).
  const flights = measures.map(flightTimes);
  const ownBudget = kind === 'timed' ? own.budget : null;
  const flightMin = ownBudget ? ownBudget.flightMin : minOrNull(flights.map((f) => f.min));
  const flightMax = ownBudget ? ownBudget.flightMax : maxOrNull(flights.map((f) => f.max));
  const result: NetResult = {
    net: net.name,
    bus: bus.name,
    role: net.role,
    status,
    reasons,
    worstCorner: own.budget?.worstCorner ?? worstQualityCorner(measures),
    flightMin,
    flightMax,
    skew: null,
    setupMargin: marginOut(own.setup),
    holdMargin: marginOut(own.hold),
    corners: cornerTimings(project, measures, own.budget, kind),
    quality,
    lengthWindow,
    suggestion,
    inputHash: context.inputHash ?? '',
  };
  if (own.note) result.marginsFrom = own.note;
  if (own.budget) {
    // which corner (or silicon/board combination) is worst for each margin
    const rank = (m: number | null) => (m === null ? -Infinity : m);
    const cs = own.budget.corners.map((c) => c.timing);
    result.worstSetupCorner = cs.reduce((a, b) => (rank(b.setupMargin) < rank(a.setupMargin) ? b : a)).corner;
    result.worstHoldCorner = cs.reduce((a, b) => (rank(b.holdMargin) < rank(a.holdMargin) ? b : a)).corner;
  }
  return { result, measures, simulations };
}
