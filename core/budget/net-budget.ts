/**
 * One net's budget from its receiver measurements: per corner, the worst setup and hold margin over
 * its receivers and both edges (each with its line items), the signal-quality checks, a status
 * (pass / tight / fail against the project's guard band) and the reasons in words.
 */
import type { BusDefinition, Corner, DriverModel, NetDefinition, PartModel, ReceiverModel } from '../project/model.js';
import type { BudgetLineItem, CornerTiming, QualityCheck, Status } from './results.js';
import { type Edge, type ReceiverEdgeMeasure, flightTimes } from './measures.js';
import { commonClockItems, sourceSyncItems, sumItems, tcoAt } from './timing.js';
import { qualityChecks, qualityMarginVolts } from './quality.js';
import { formatIn } from '../units/quantity.js';

const ps = (s: number): string => formatIn(s, 'ps', 0);
const volts = (v: number): string => formatIn(v, 'V', 2);
const mV = (v: number): string => formatIn(v, 'mV', 0);

/** Everything the budget of one data net needs besides its measurements. */
export interface NetBudgetInputs {
  net: NetDefinition;
  bus: BusDefinition;
  corners: readonly Corner[];
  driverPart: { part: PartModel; model: DriverModel };
  /** Receiver parts by designator. */
  receivers: ReadonlyMap<string, ReceiverModel>;
  /** The bus's strobe measurements (source-synchronous buses), else null. */
  strobe: { net: string; measures: readonly ReceiverEdgeMeasure[] } | null;
  guardBand: number;
}

/** What made one corner's setup or hold margin what it is (for the reasons in words). */
export interface MarginCause {
  receiver: string;
  edge: Edge;
  /** Source-synchronous: data minus strobe arrival (setup: data max - strobe min), s. */
  dataMinusStrobe?: number;
  /** Flight used, s; and whether the receiver never crossed (then flight is a bound). */
  flight: number;
  neverCrossed: boolean;
}

export interface CornerBudget {
  timing: CornerTiming;
  setupCause: MarginCause;
  holdCause: MarginCause;
}

export interface NetBudget {
  corners: CornerBudget[];
  quality: QualityCheck[];
  /** Worst quality margin over all measures, V (see qualityMarginVolts). */
  qualityMargin: number;
  setupMargin: number;
  holdMargin: number;
  flightMin: number;
  flightMax: number;
  worstCorner: string;
  status: Status;
  reasons: string[];
}

function flightsOf(m: ReceiverEdgeMeasure): { min: number; max: number; neverCrossed: boolean } {
  const f = flightTimes(m);
  const bound = m.tStop - m.tReference;
  return { min: f.min ?? bound, max: f.max ?? bound, neverCrossed: f.min === null || f.max === null };
}

/** Strobe flight extremes at one corner for one receiver designator (any receiver when none matches). */
export function strobeFlights(
  measures: readonly ReceiverEdgeMeasure[],
  corner: string,
  receiver: string,
): { min: number; max: number; receiver: string } | null {
  let pool = measures.filter((m) => m.corner === corner && m.receiver === receiver);
  if (pool.length === 0) pool = measures.filter((m) => m.corner === corner);
  if (pool.length === 0) return null;
  let min = Infinity;
  let max = -Infinity;
  for (const m of pool) {
    const f = flightsOf(m);
    min = Math.min(min, f.min);
    max = Math.max(max, f.max);
  }
  return { min, max, receiver: pool[0].receiver };
}

/**
 * Setup and hold line items of one receiver edge at one corner. Source-synchronous data is paired
 * with the strobe's flights at the same corner and receiver, extremes over both strobe edges.
 */
export function edgeItems(
  inputs: NetBudgetInputs,
  corner: Corner,
  m: ReceiverEdgeMeasure,
): { setup: BudgetLineItem[]; hold: BudgetLineItem[]; setupCause: MarginCause; holdCause: MarginCause } {
  const rx = inputs.receivers.get(m.receiver);
  if (!rx) throw new Error(`budget: no receiver model for ${m.receiver} of net ${inputs.net.name}`);
  const f = flightsOf(m);
  const receiverDetail = `${m.receiver} of net ${inputs.net.name}`;
  const flightDetail = `${m.receiver}, ${m.edge} edge, ${corner.name} corner`;
  const timing = inputs.bus.timing;
  if (timing.kind === 'common-clock') {
    const d = inputs.driverPart.model;
    const items = commonClockItems({
      cycleTime: timing.cycleTime,
      tco: tcoAt(d, corner),
      driverDetail: `${inputs.driverPart.part.name} into ${d.refLoad.ohms} Ω to ${volts(d.refLoad.vtt)}`,
      flightMin: f.min,
      flightMax: f.max,
      flightDetail,
      tsetup: rx.tsetup,
      thold: rx.thold,
      receiverDetail,
      clockSkew: timing.clockSkew,
      jitter: timing.jitter,
      allowances: inputs.bus.allowances,
      corner: corner.name,
    });
    const cause = (flight: number): MarginCause => ({ receiver: m.receiver, edge: m.edge, flight, neverCrossed: f.neverCrossed });
    return { ...items, setupCause: cause(f.max), holdCause: cause(f.min) };
  }
  const strobe = inputs.strobe ? strobeFlights(inputs.strobe.measures, corner.name, m.receiver) : null;
  if (!strobe || !inputs.strobe) throw new Error(`budget: no strobe flights for bus ${inputs.bus.name} at the ${corner.name} corner`);
  const items = sourceSyncItems({
    tValidBefore: timing.tValidBefore,
    tValidAfter: timing.tValidAfter,
    dataFlightMin: f.min,
    dataFlightMax: f.max,
    dataDetail: `${inputs.net.name} at ${flightDetail}`,
    strobeFlightMin: strobe.min,
    strobeFlightMax: strobe.max,
    strobeDetail: `strobe ${inputs.strobe.net} at ${strobe.receiver}, either edge, ${corner.name} corner`,
    tsetup: rx.tsetup,
    thold: rx.thold,
    receiverDetail,
    allowances: inputs.bus.allowances,
  });
  return {
    ...items,
    setupCause: { receiver: m.receiver, edge: m.edge, flight: f.max, neverCrossed: f.neverCrossed, dataMinusStrobe: f.max - strobe.min },
    holdCause: { receiver: m.receiver, edge: m.edge, flight: f.min, neverCrossed: f.neverCrossed, dataMinusStrobe: f.min - strobe.max },
  };
}

/** Budget of one timed net (data, address, command, control) from its measurements at every corner. */
export function netBudget(inputs: NetBudgetInputs, measures: readonly ReceiverEdgeMeasure[]): NetBudget {
  const corners: CornerBudget[] = [];
  for (const corner of inputs.corners) {
    const own = measures.filter((m) => m.corner === corner.name);
    if (own.length === 0) throw new Error(`budget: no measurements of net ${inputs.net.name} at the ${corner.name} corner`);
    let best: CornerBudget | null = null;
    let flightMin = Infinity;
    let flightMax = -Infinity;
    let setupBest: { margin: number; items: BudgetLineItem[]; cause: MarginCause } | null = null;
    let holdBest: { margin: number; items: BudgetLineItem[]; cause: MarginCause } | null = null;
    for (const m of own) {
      const f = flightsOf(m);
      flightMin = Math.min(flightMin, f.min);
      flightMax = Math.max(flightMax, f.max);
      const e = edgeItems(inputs, corner, m);
      const s = sumItems(e.setup);
      const h = sumItems(e.hold);
      if (!setupBest || s < setupBest.margin) setupBest = { margin: s, items: e.setup, cause: e.setupCause };
      if (!holdBest || h < holdBest.margin) holdBest = { margin: h, items: e.hold, cause: e.holdCause };
    }
    if (!setupBest || !holdBest) continue;
    best = {
      timing: {
        corner: corner.name,
        flightMin,
        flightMax,
        setupMargin: setupBest.margin,
        holdMargin: holdBest.margin,
        setupItems: setupBest.items,
        holdItems: holdBest.items,
      },
      setupCause: setupBest.cause,
      holdCause: holdBest.cause,
    };
    corners.push(best);
  }
  const quality = measures.flatMap(qualityChecks);
  const qualityMargin = Math.min(...measures.map(qualityMarginVolts));
  return summarise(inputs, corners, quality, qualityMargin, measures);
}

function summarise(
  inputs: NetBudgetInputs,
  corners: CornerBudget[],
  quality: QualityCheck[],
  qualityMargin: number,
  measures: readonly ReceiverEdgeMeasure[],
): NetBudget {
  const worstSetup = corners.reduce((a, b) => (b.timing.setupMargin < a.timing.setupMargin ? b : a));
  const worstHold = corners.reduce((a, b) => (b.timing.holdMargin < a.timing.holdMargin ? b : a));
  const setupMargin = worstSetup.timing.setupMargin;
  const holdMargin = worstHold.timing.holdMargin;
  const worstCorner = setupMargin <= holdMargin ? worstSetup.timing.corner : worstHold.timing.corner;
  const reasons: string[] = [];
  const timingReasons = marginReasons(inputs, worstSetup, worstHold);
  reasons.push(...timingReasons.fail, ...qualityReasons(quality, measures), ...neverCrossedReasons(measures));
  const failing = setupMargin < 0 || holdMargin < 0 || quality.some((q) => !q.pass) ||
    measures.some((m) => m.tFarLast === null || m.tNearFirst === null);
  const tight = !failing && Math.min(setupMargin, holdMargin) < inputs.guardBand;
  if (tight) reasons.push(...timingReasons.tight);
  return {
    corners,
    quality,
    qualityMargin,
    setupMargin,
    holdMargin,
    flightMin: Math.min(...corners.map((c) => c.timing.flightMin)),
    flightMax: Math.max(...corners.map((c) => c.timing.flightMax)),
    worstCorner,
    status: failing ? 'fail' : tight ? 'tight' : 'pass',
    reasons,
  };
}

/** Words for failing (< 0) and tight (< guard band) margins, naming corner, receiver and the cause. */
function marginReasons(inputs: NetBudgetInputs, setup: CornerBudget, hold: CornerBudget): { fail: string[]; tight: string[] } {
  const fail: string[] = [];
  const tight: string[] = [];
  const ss = inputs.bus.timing.kind === 'source-synchronous';
  const where = (c: CornerBudget, cause: MarginCause): string => `at ${c.timing.corner} corner (${cause.receiver}, ${cause.edge} edge)`;
  const setupWhy = (c: CornerBudget): string => {
    const cause = c.setupCause;
    if (ss && cause.dataMinusStrobe !== undefined) {
      const d = cause.dataMinusStrobe;
      return d >= 0 ? `data arrives ${ps(d)} after strobe` : `data arrives ${ps(-d)} before strobe`;
    }
    // common clock: what the cycle has to hold, from the line items
    const items = c.timing.setupItems;
    const cycle = items.find((i) => i.name === 'Tcycle')?.value ?? 0;
    const used = -items.filter((i) => i.name !== 'Tcycle').reduce((sum, i) => sum + i.value, 0);
    const tco = items.find((i) => i.name.startsWith('Tco'));
    return `${tco ? `${tco.name.split(' ')[0]} ${ps(-tco.value)} + ` : ''}flight ${ps(cause.flight)} + setup, skew, jitter and allowances ${ps(used - (tco ? -tco.value : 0) - cause.flight)} need ${ps(used)} of the ${ps(cycle)} cycle`;
  };
  const holdWhy = (c: CornerBudget): string => {
    const cause = c.holdCause;
    if (ss && cause.dataMinusStrobe !== undefined) {
      const d = -cause.dataMinusStrobe;
      return d >= 0 ? `strobe arrives ${ps(d)} after data` : `strobe arrives ${ps(-d)} before data`;
    }
    // common clock: data change after the capturing edge (positive items) against what hold needs
    const items = c.timing.holdItems;
    const change = items.filter((i) => i.value > 0).reduce((sum, i) => sum + i.value, 0);
    const needs = -items.filter((i) => i.value < 0).reduce((sum, i) => sum + i.value, 0);
    return `data changes ${ps(change)} after the capturing clock edge (flight ${ps(cause.flight)}), hold needs ${ps(needs)}`;
  };
  const s = setup.timing.setupMargin;
  const h = hold.timing.holdMargin;
  if (s < 0) fail.push(`setup margin ${ps(s)} ${where(setup, setup.setupCause)}: ${setupWhy(setup)}`);
  else if (s < inputs.guardBand) tight.push(`setup margin ${ps(s)} ${where(setup, setup.setupCause)} is under the ${ps(inputs.guardBand)} guard band: ${setupWhy(setup)}`);
  if (h < 0) fail.push(`hold margin ${ps(h)} ${where(hold, hold.holdCause)}: ${holdWhy(hold)}`);
  else if (h < inputs.guardBand) tight.push(`hold margin ${ps(h)} ${where(hold, hold.holdCause)} is under the ${ps(inputs.guardBand)} guard band: ${holdWhy(hold)}`);
  return { fail, tight };
}

/** One sentence per failing check kind: the worst instance and how many edges fail it. */
export function qualityReasons(quality: readonly QualityCheck[], measures: readonly ReceiverEdgeMeasure[]): string[] {
  const reasons: string[] = [];
  const kinds: QualityCheck['name'][] = ['first-incidence', 'overshoot', 'undershoot', 'ringback', 'monotonic'];
  for (const kind of kinds) {
    const failed = quality.filter((q) => q.name === kind && !q.pass);
    if (failed.length === 0) continue;
    const worst = failed.reduce((a, b) => (severity(b) > severity(a) ? b : a));
    const at = `at ${worst.receiver} (${worst.edge} edge, ${worst.corner} corner)`;
    const more = failed.length > 1 ? `; ${failed.length} receiver edges fail it` : '';
    const m = measures.find((x) => x.receiver === worst.receiver && x.edge === worst.edge && x.corner === worst.corner);
    switch (kind) {
      case 'first-incidence': {
        const far = worst.edge === 'rising' ? `VIH ${volts(m?.vih ?? NaN)}` : `VIL ${volts(m?.vil ?? NaN)}`;
        reasons.push(`no first-incidence switching ${at}: the first wave reaches ${volts(m?.vFirstIncidence ?? NaN)}, short of ${far}${more}`);
        break;
      }
      case 'overshoot':
        reasons.push(`overshoot to ${volts(worst.value)} ${at} exceeds the ${volts(worst.limit ?? NaN)} absolute limit${more}`);
        break;
      case 'undershoot':
        reasons.push(`undershoot to ${volts(worst.value)} ${at} is below the ${volts(worst.limit ?? NaN)} absolute limit${more}`);
        break;
      case 'ringback':
        reasons.push(`ringback margin ${mV(worst.value)} ${at}: the edge rings back into the threshold band${more}`);
        break;
      case 'monotonic':
        reasons.push(`non-monotonic edge in the threshold band ${at}${more}`);
        break;
      default: {
        const never: never = kind;
        throw new Error(`unknown check ${String(never)}`);
      }
    }
  }
  return reasons;
}

/** How badly a check fails, for picking the one to name (larger = worse). */
function severity(q: QualityCheck): number {
  switch (q.name) {
    case 'overshoot':
      return q.value - (q.limit ?? 0);
    case 'undershoot':
      return (q.limit ?? 0) - q.value;
    case 'ringback':
      return -q.value;
    default:
      return 0;
  }
}

function neverCrossedReasons(measures: readonly ReceiverEdgeMeasure[]): string[] {
  const never = measures.filter((m) => m.tFarLast === null || m.tNearFirst === null);
  if (never.length === 0) return [];
  const m = never[0];
  const far = m.edge === 'rising' ? 'VIH' : 'VIL';
  return [`${m.receiver} never crosses ${far} on the ${m.edge} edge at the ${m.corner} corner within ${ps(m.tStop)}${never.length > 1 ? ` (${never.length} receiver edges)` : ''}`];
}
