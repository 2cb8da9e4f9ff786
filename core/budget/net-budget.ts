/**
 * One net's budget from its receiver measurements: per corner, the worst setup and hold margin over
 * its receivers and both edges (each with its line items), the signal-quality checks, a status
 * (pass / tight / fail against the project's guard band) and the reasons in words.
 */
import type { BusDefinition, Corner, DriverModel, NetDefinition, PartModel, ReceiverModel } from '../project/model.js';
import type { BudgetLineItem, CornerTiming, QualityCheck, Status } from './results.js';
import { type Edge, type ReceiverEdgeMeasure, flightTimes } from './measures.js';
import { commonClockItems, sourceSyncItems, sumItems, tcoFor, type ClockTerms } from './timing.js';
import { qualityChecks, qualityMarginVolts } from './quality.js';
import { derate } from './derating.js';
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
  /**
   * The bus's clock net (common-clock buses with a clock net), else null: its measures, its driver's
   * model and designator. Its launch delay and flights replace the entered clock skew (§6.1).
   */
  clock?: { net: string; measures: readonly ReceiverEdgeMeasure[]; driver: DriverModel; driverPart: string; driverDesignator: string } | null;
  guardBand: number;
  /**
   * False: line items without their details and the budget without reasons, margins and status the
   * same (a length or termination search's probe, whose budget only its margins leave); default true.
   */
  words?: boolean;
}

/** What made one corner's setup or hold margin what it is (for the reasons in words). */
export interface MarginCause {
  receiver: string;
  edge: Edge;
  /** Source-synchronous: data minus strobe arrival (setup: data max - strobe min), s. */
  dataMinusStrobe?: number;
  /** Flight used, s; null when the receiver never crossed (then there is no margin). */
  flight: number | null;
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
  /** s; null when a flight some corner needs is missing (a receiver that never crosses). */
  setupMargin: number | null;
  holdMargin: number | null;
  flightMin: number | null;
  flightMax: number | null;
  worstCorner: string;
  status: Status;
  reasons: string[];
}

/** Smallest of the values, null when any is null (an unknown term makes the extreme unknown). */
export function minOrNull(values: readonly (number | null)[]): number | null {
  let out = Infinity;
  for (const v of values) {
    if (v === null) return null;
    out = Math.min(out, v);
  }
  return Number.isFinite(out) ? out : null;
}

/** Largest of the values, null when any is null. */
export function maxOrNull(values: readonly (number | null)[]): number | null {
  let out = -Infinity;
  for (const v of values) {
    if (v === null) return null;
    out = Math.max(out, v);
  }
  return Number.isFinite(out) ? out : null;
}

/** Strobe flight extremes at one corner for one receiver designator (any receiver when none matches); null flights when it never crosses. */
export function strobeFlights(
  measures: readonly ReceiverEdgeMeasure[],
  corner: string,
  receiver: string,
): { min: number | null; max: number | null; receiver: string } | null {
  let pool = measures.filter((m) => m.corner === corner && m.receiver === receiver);
  if (pool.length === 0) pool = measures.filter((m) => m.corner === corner);
  if (pool.length === 0) return null;
  const flights = pool.map(flightTimes);
  return { min: minOrNull(flights.map((f) => f.min)), max: maxOrNull(flights.map((f) => f.max)), receiver: pool[0].receiver };
}

/** Slowest slew of a reference net's measures at one corner and receiver (any receiver when none matches), V/s. */
function referenceSlew(measures: readonly ReceiverEdgeMeasure[], corner: string, receiver: string): number | null {
  let pool = measures.filter((m) => m.corner === corner && m.receiver === receiver);
  if (pool.length === 0) pool = measures.filter((m) => m.corner === corner);
  const slews = pool.map((m) => m.slew ?? null);
  return slews.length === 0 || slews.some((x) => x === null) ? null : Math.min(...(slews as number[]));
}

/**
 * Slew-rate derating items of one receiver edge (docs/design.md §6.4): the table's added setup and
 * hold at the signal's and the reference's slews, each its own line item; none without a table or
 * without both slews.
 */
function deratingItems(
  rx: ReceiverModel, m: ReceiverEdgeMeasure, referenceNet: string | null, refSlew: number | null, words: boolean,
): { setup: BudgetLineItem[]; hold: BudgetLineItem[] } {
  const d = rx.derating;
  if (!d || !referenceNet || refSlew === null || !m.slew) return { setup: [], hold: [] };
  const vns = (x: number) => `${(x * 1e-9).toFixed(2)} V/ns`;
  const item = (which: 'setup' | 'hold'): BudgetLineItem => {
    const r = derate(which === 'setup' ? d.setup : d.hold, d, m.slew!, refSlew);
    return {
      name: `ΔT${which} (slew derating)`, value: -r.value, source: 'part model',
      detail: words
        ? `derating table of ${m.receiver} at ${m.edge} signal slew ${vns(m.slew!)} and ${referenceNet} slew ${vns(refSlew)}, ` +
          `${m.corner} corner, interpolated${r.clamped ? '; outside the table: held at its edge' : ''}`
        : '',
    };
  };
  return { setup: [item('setup')], hold: [item('hold')] };
}

/** Line items of one margin, or null when a flight it needs is missing. */
export interface EdgeItems {
  setup: BudgetLineItem[] | null;
  hold: BudgetLineItem[] | null;
  setupCause: MarginCause;
  holdCause: MarginCause;
}

/**
 * Setup and hold line items of one receiver edge at one corner. Source-synchronous data is paired
 * with the strobe's flights at the same corner and receiver, extremes over both strobe edges. A
 * margin whose flight is missing (never crossed) has no items (null): it is never given a number.
 */
export function edgeItems(inputs: NetBudgetInputs, corner: Corner, m: ReceiverEdgeMeasure): EdgeItems {
  const rx = inputs.receivers.get(m.receiver);
  if (!rx) throw new Error(`budget: no receiver model for ${m.receiver} of net ${inputs.net.name}`);
  const f = flightTimes(m);
  const words = inputs.words !== false;
  const receiverDetail = words ? `${m.receiver} of net ${inputs.net.name}` : '';
  const flightDetail = words ? `${m.receiver}, ${m.edge} edge, ${corner.name} corner` : '';
  const timing = inputs.bus.timing;
  const cause = (flight: number | null, extra: Partial<MarginCause> = {}): MarginCause =>
    ({ receiver: m.receiver, edge: m.edge, flight, neverCrossed: flight === null, ...extra });
  if (timing.kind === 'common-clock') {
    const d = inputs.driverPart.model;
    const clock = inputs.clock ? clockTermsAt(inputs, corner, m.receiver) : null;
    const items = commonClockItems({
      cycleTime: timing.cycleTime,
      tcoSetup: tcoFor(d, 'setup'),
      tcoHold: tcoFor(d, 'hold'),
      driverDetail: words ? `${inputs.driverPart.part.name} into ${d.refLoad.ohms} Ω to ${volts(d.refLoad.vtt)}` : '',
      flightMin: f.min ?? 0,
      flightMax: f.max ?? 0,
      flightDetail,
      tsetup: rx.tsetup,
      thold: rx.thold,
      receiverDetail,
      clockSkew: timing.clockSkew,
      clock: clock && clock.setup && clock.hold ? { setup: clock.setup, hold: clock.hold } : null,
      jitter: timing.jitter,
      allowances: inputs.bus.allowances,
      words,
      corner: corner.name,
    });
    // a clock that never crosses at the receiver (or driver) leaves the margin unknown, like the data
    const setupKnown = f.max !== null && (!clock || clock.setup !== null);
    const holdKnown = f.min !== null && (!clock || clock.hold !== null);
    const derated = inputs.clock
      ? deratingItems(rx, m, inputs.clock.net, referenceSlew(inputs.clock.measures, corner.name, m.receiver), words)
      : { setup: [], hold: [] };
    return {
      setup: setupKnown ? [...items.setup, ...derated.setup] : null,
      hold: holdKnown ? [...items.hold, ...derated.hold] : null,
      setupCause: cause(f.max),
      holdCause: cause(f.min),
    };
  }
  const strobe = inputs.strobe ? strobeFlights(inputs.strobe.measures, corner.name, m.receiver) : null;
  if (!strobe || !inputs.strobe) throw new Error(`budget: no strobe flights for bus ${inputs.bus.name} at the ${corner.name} corner`);
  const items = sourceSyncItems({
    tValidBefore: timing.tValidBefore,
    tValidAfter: timing.tValidAfter,
    dataFlightMin: f.min ?? 0,
    dataFlightMax: f.max ?? 0,
    dataDetail: words ? `${inputs.net.name} at ${flightDetail}` : '',
    strobeFlightMin: strobe.min ?? 0,
    strobeFlightMax: strobe.max ?? 0,
    strobeDetail: words ? `strobe ${inputs.strobe.net} at ${strobe.receiver}, either edge, ${corner.name} corner` : '',
    tsetup: rx.tsetup,
    thold: rx.thold,
    receiverDetail,
    allowances: inputs.bus.allowances,
    words,
  });
  const setupKnown = f.max !== null && strobe.min !== null;
  const holdKnown = f.min !== null && strobe.max !== null;
  const derated = deratingItems(rx, m, inputs.strobe.net, referenceSlew(inputs.strobe.measures, corner.name, m.receiver), words);
  return {
    setup: setupKnown ? [...items.setup, ...derated.setup] : null,
    hold: holdKnown ? [...items.hold, ...derated.hold] : null,
    setupCause: cause(setupKnown ? f.max : null, setupKnown ? { dataMinusStrobe: f.max! - strobe.min! } : {}),
    holdCause: cause(holdKnown ? f.min : null, holdKnown ? { dataMinusStrobe: f.min! - strobe.max! } : {}),
  };
}

/**
 * The clock net's terms for one receiver at one corner (docs/design.md §6.1), per margin; null for a
 * margin whose clock flight is missing (never crossed). Setup takes the earliest capturing edge at the
 * receiver (its smallest flight, both clock edges) and the latest launch at the driver; hold the
 * reverse. Launch delay: when the clock leaves the same device as the data, the two outputs share its
 * internal clock edge and track, so the clock's Tco takes the same extreme as the data's in each
 * margin; from another device they are independent: setup takes the clock's Tco,min, hold its Tco,max
 * (this program's choice). Returns null when the clock net does not reach this receiver (the entered
 * skew then stays).
 */
function clockTermsAt(inputs: NetBudgetInputs, corner: Corner, receiver: string): { setup: ClockTerms | null; hold: ClockTerms | null } | null {
  const clock = inputs.clock!;
  const words = inputs.words !== false;
  const at = (designator: string) => clock.measures.filter((x) => x.corner === corner.name && x.receiver === designator);
  const toRx = at(receiver);
  if (toRx.length === 0) return null;
  const toDrv = at(clock.driverDesignator === inputs.net.driver.designator ? '\u0000' : inputs.net.driver.designator);
  const sameDevice = clock.driverDesignator === inputs.net.driver.designator;
  const rxFlights = toRx.map(flightTimes);
  const drvFlights = toDrv.map(flightTimes);
  const clockTco = (margin: 'setup' | 'hold') => {
    const c = clock.driver;
    const dataChoice = tcoFor(inputs.driverPart.model, margin).label;
    const choice = sameDevice ? dataChoice : margin === 'setup' ? 'Tco,min' : 'Tco,max';
    const value = choice === 'Tco,max' ? c.tcoMax : c.tcoMin;
    const label = choice;
    const why = sameDevice
      ? `the same extreme as the data's (${inputs.driverPart.part.name} drives both: they leave on one internal clock edge)`
      : margin === 'setup' ? 'the earliest capturing clock' : 'the latest capturing clock';
    return { value, label, detail: words ? `${label} of ${clock.driverPart} (clock ${clock.net}): ${why}` : '' };
  };
  const build = (margin: 'setup' | 'hold'): ClockTerms | null => {
    const early = margin === 'setup';
    const rx = early ? minOrNull(rxFlights.map((f) => f.min)) : maxOrNull(rxFlights.map((f) => f.max));
    const drv = toDrv.length === 0 ? null : early ? maxOrNull(drvFlights.map((f) => f.max)) : minOrNull(drvFlights.map((f) => f.min));
    if (rx === null || (toDrv.length > 0 && drv === null)) return null;
    return {
      net: clock.net,
      tco: clockTco(margin),
      toReceiver: rx,
      receiverDetail: words ? `at ${receiver}, ${early ? 'first near-threshold' : 'last far-threshold'} crossing of either edge, ${corner.name} corner` : '',
      toDriver: drv,
      driverDetail: words
        ? `at the driver ${inputs.net.driver.designator}, ${early ? 'last far-threshold' : 'first near-threshold'} crossing of either edge, ${corner.name} corner`
        : '',
    };
  };
  return { setup: build('setup'), hold: build('hold') };
}

/** The worst (smallest) margin of a corner's candidates; an unknown one (null items) wins: it fails. */
function worstOf(candidates: readonly { items: BudgetLineItem[] | null; cause: MarginCause }[]): { margin: number | null; items: BudgetLineItem[]; cause: MarginCause } {
  let best: { margin: number | null; items: BudgetLineItem[]; cause: MarginCause } | null = null;
  for (const c of candidates) {
    if (c.items === null) return { margin: null, items: [], cause: c.cause };
    const margin = sumItems(c.items);
    if (!best || margin < (best.margin as number)) best = { margin, items: c.items, cause: c.cause };
  }
  if (!best) throw new Error('budget: no candidates');
  return best;
}

/** Budget of one timed net (data, address, command, control) from its measurements at every corner. */
export function netBudget(inputs: NetBudgetInputs, measures: readonly ReceiverEdgeMeasure[]): NetBudget {
  const corners: CornerBudget[] = [];
  for (const corner of inputs.corners) {
    const own = measures.filter((m) => m.corner === corner.name);
    if (own.length === 0) throw new Error(`budget: no measurements of net ${inputs.net.name} at the ${corner.name} corner`);
    const flights = own.map(flightTimes);
    const edges = own.map((m) => edgeItems(inputs, corner, m));
    const setup = worstOf(edges.map((e) => ({ items: e.setup, cause: e.setupCause })));
    const hold = worstOf(edges.map((e) => ({ items: e.hold, cause: e.holdCause })));
    corners.push({
      timing: {
        corner: corner.name,
        flightMin: minOrNull(flights.map((f) => f.min)),
        flightMax: maxOrNull(flights.map((f) => f.max)),
        setupMargin: setup.margin,
        holdMargin: hold.margin,
        setupItems: setup.items,
        holdItems: hold.items,
      },
      setupCause: setup.cause,
      holdCause: hold.cause,
    });
  }
  const quality = measures.flatMap(qualityChecks);
  const qualityMargin = Math.min(...measures.map(qualityMarginVolts));
  return summarise(inputs, corners, quality, qualityMargin, measures);
}

/** Order key of a margin: unknown (null) is the worst of all. */
const rank = (margin: number | null): number => (margin === null ? -Infinity : margin);

function summarise(
  inputs: NetBudgetInputs,
  corners: CornerBudget[],
  quality: QualityCheck[],
  qualityMargin: number,
  measures: readonly ReceiverEdgeMeasure[],
): NetBudget {
  const worstSetup = corners.reduce((a, b) => (rank(b.timing.setupMargin) < rank(a.timing.setupMargin) ? b : a));
  const worstHold = corners.reduce((a, b) => (rank(b.timing.holdMargin) < rank(a.timing.holdMargin) ? b : a));
  const setupMargin = worstSetup.timing.setupMargin;
  const holdMargin = worstHold.timing.holdMargin;
  const worstCorner = rank(setupMargin) <= rank(holdMargin) ? worstSetup.timing.corner : worstHold.timing.corner;
  const words = inputs.words !== false;
  const reasons: string[] = [];
  const timingReasons = words ? marginReasons(inputs, worstSetup, worstHold) : { fail: [], tight: [] };
  if (words) reasons.push(...timingReasons.fail, ...qualityReasons(quality, measures), ...neverCrossedReasons(measures));
  const dataCrossed = measures.every((m) => m.tFarLast !== null && m.tNearFirst !== null);
  if (words && dataCrossed && (setupMargin === null || holdMargin === null)) {
    // the data crossed, so a reference (the clock net or the strobe) is what never did
    const c = setupMargin === null ? worstSetup : worstHold;
    const cause = setupMargin === null ? c.setupCause : c.holdCause;
    const ref = inputs.clock?.net ?? inputs.strobe?.net ?? 'the reference net';
    reasons.push(`${setupMargin === null ? 'setup' : 'hold'} margin unknown at the ${c.timing.corner} corner (${cause.receiver}): ${ref} never crosses its threshold there within the simulated window`);
  }
  const failing = setupMargin === null || holdMargin === null || setupMargin < 0 || holdMargin < 0 ||
    quality.some((q) => !q.pass) || measures.some((m) => m.tFarLast === null || m.tNearFirst === null);
  const tight = !failing && Math.min(setupMargin, holdMargin) < inputs.guardBand;
  if (tight) reasons.push(...timingReasons.tight);
  return {
    corners,
    quality,
    qualityMargin,
    setupMargin,
    holdMargin,
    flightMin: minOrNull(corners.map((c) => c.timing.flightMin)),
    flightMax: maxOrNull(corners.map((c) => c.timing.flightMax)),
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
    const flight = cause.flight ?? 0;
    return `${tco ? `${tco.name.split(' ')[0]} ${ps(-tco.value)} + ` : ''}flight ${ps(flight)} + setup, skew, jitter and allowances ${ps(used - (tco ? -tco.value : 0) - flight)} need ${ps(used)} of the ${ps(cycle)} cycle`;
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
    return `data changes ${ps(change)} after the capturing clock edge (flight ${ps(cause.flight ?? 0)}), hold needs ${ps(needs)}`;
  };
  const s = setup.timing.setupMargin;
  const h = hold.timing.holdMargin;
  // an unknown margin has its reason from neverCrossedReasons (the missing crossing itself)
  if (s === null || h === null) {
    if (s !== null && s < 0) fail.push(`setup margin ${ps(s)} ${where(setup, setup.setupCause)}: ${setupWhy(setup)}`);
    if (h !== null && h < 0) fail.push(`hold margin ${ps(h)} ${where(hold, hold.holdCause)}: ${holdWhy(hold)}`);
    return { fail, tight };
  }
  if (s < 0) fail.push(`setup margin ${ps(s)} ${where(setup, setup.setupCause)}: ${setupWhy(setup)}`);
  else if (s < inputs.guardBand) tight.push(`setup margin ${ps(s)} ${where(setup, setup.setupCause)} is under the ${ps(inputs.guardBand)} guard band: ${setupWhy(setup)}`);
  if (h < 0) fail.push(`hold margin ${ps(h)} ${where(hold, hold.holdCause)}: ${holdWhy(hold)}`);
  else if (h < inputs.guardBand) tight.push(`hold margin ${ps(h)} ${where(hold, hold.holdCause)} is under the ${ps(inputs.guardBand)} guard band: ${holdWhy(hold)}`);
  return { fail, tight };
}

/** One sentence per failing check kind: the worst instance and how many edges fail it. */
export function qualityReasons(quality: readonly QualityCheck[], measures: readonly ReceiverEdgeMeasure[]): string[] {
  const reasons: string[] = [];
  const kinds: QualityCheck['name'][] = ['first-incidence', 'overshoot', 'undershoot', 'ringback', 'monotonic', 'differential-level'];
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
      case 'differential-level':
        reasons.push(`the differential voltage holds only ${mV(worst.value)} ${at}, short of VIH,diff ${mV(worst.limit ?? NaN)}: the pair rings back into its threshold band or never reaches it${more}`);
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
    case 'differential-level':
      return (q.limit ?? 0) - q.value;
    default:
      return 0;
  }
}

/**
 * A missing crossing is a failure with its own reason (docs/design.md §5): which receiver, edge and
 * corner never reaches which threshold within the simulated window. One sentence per receiver edge.
 */
export function neverCrossedReasons(measures: readonly ReceiverEdgeMeasure[]): string[] {
  const reasons: string[] = [];
  for (const m of measures) {
    const rising = m.edge === 'rising';
    const missing: string[] = [];
    if (m.tNearFirst === null) missing.push(rising ? `VIL ${volts(m.vil)}` : `VIH ${volts(m.vih)}`);
    if (m.tFarLast === null) missing.push(rising ? `VIH ${volts(m.vih)}` : `VIL ${volts(m.vil)}`);
    if (missing.length === 0) continue;
    reasons.push(
      `${m.receiver} never reaches ${missing.join(' nor ')} on the ${m.edge} edge at the ${m.corner} corner within the ` +
        `${formatIn(m.tStop, 'ns', 1)} window (${rising ? 'highest' : 'lowest'} level ${volts(rising ? m.vmax : m.vmin)}): no flight time, no margin`,
    );
  }
  return reasons;
}
