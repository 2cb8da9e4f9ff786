/**
 * Timing budgets of docs/design.md §6 as lists of signed line items: margin = sum of the items' values.
 * Every item names its source (input, part model, simulation, corner) so a reviewer can trace it.
 * All values in seconds.
 */
import type { BudgetAllowance, Corner, DriverModel } from '../project/model.js';
import type { BudgetLineItem } from './results.js';
import { formatIn } from '../units/quantity.js';

const ps = (s: number): string => formatIn(s, 'ps', 0);

/** Sum of the signed line items, s. */
export function sumItems(items: readonly BudgetLineItem[]): number {
  let total = 0;
  for (const item of items) total += item.value;
  return total;
}

/**
 * The driver's clock-to-output time for one margin (docs/design.md §6.1): setup is limited by the
 * latest launch, Tco,max, and hold by the earliest, Tco,min, at every corner. A data sheet's Tco range
 * covers process, voltage and temperature, and the linear model does not tie it to the corner's
 * driver strength, so each margin takes its own extreme (this program's choice).
 */
export function tcoFor(driver: DriverModel, margin: 'setup' | 'hold'): { value: number; label: string } {
  return margin === 'setup' ? { value: driver.tcoMax, label: 'Tco,max' } : { value: driver.tcoMin, label: 'Tco,min' };
}

/**
 * The driver's clock-to-output time that a corner names (Corner.tco), for reports of the corner: 'max' at the slow corner,
 * 'min' at the fast corner; 'typ' is taken as the midpoint of min and max because the linear driver
 * model carries no typical value (our choice, stated in the line item).
 */
export function tcoAt(driver: DriverModel, corner: Corner): { value: number; label: string } {
  switch (corner.tco) {
    case 'max':
      return { value: driver.tcoMax, label: 'Tco,max' };
    case 'min':
      return { value: driver.tcoMin, label: 'Tco,min' };
    case 'typ':
      return { value: (driver.tcoMin + driver.tcoMax) / 2, label: 'Tco,typ (midpoint of min and max)' };
    default: {
      const never: never = corner.tco;
      throw new Error(`unknown Tco choice ${String(never)}`);
    }
  }
}

/** Allowances charged against one margin, as negative line items. */
function allowanceItems(allowances: readonly BudgetAllowance[], margin: 'setup' | 'hold', words: boolean): BudgetLineItem[] {
  return allowances
    .filter((a) => a.appliesTo === margin || a.appliesTo === 'both')
    .map((a) => ({
      name: a.name,
      value: -a.value,
      source: 'input' as const,
      detail: words ? `allowance "${a.name}" ${ps(a.value)}${a.note ? ` (${a.note})` : ''}, charged against ${margin}` : '',
    }));
}

export interface CommonClockTerms {
  /** Clock period, s. */
  cycleTime: number;
  /**
   * Clock-to-output of the driver per margin, s, with its label: setup takes Tco,max and hold Tco,min
   * at every corner (tcoFor), so each margin meets its own extreme whatever the corner set.
   */
  tcoSetup: { value: number; label: string };
  tcoHold: { value: number; label: string };
  /** Words naming the driver part and its reference load. */
  driverDetail: string;
  /** Compensated flight times at this receiver, edge and corner, s. */
  flightMin: number;
  flightMax: number;
  flightDetail: string;
  /** Receiver requirements, s. */
  tsetup: number;
  thold: number;
  receiverDetail: string;
  /** Clock flight to the driver minus clock flight to the receiver, s (entered; used without `clock`). */
  clockSkew: number;
  /**
   * The bus's simulated clock net, when it has one (docs/design.md §6.1): the capturing clock reaches
   * the receiver at Tcr = Tco,clk + Tflight,clk(receiver) and the launching clock the driver at
   * Tcd = Tco,clk + Tflight,clk(driver) when the clock is routed to the driver, else Tcd = 0 (the driver
   * is the clock's source and launches on its own internal edge). Per margin: setup takes the clock
   * terms that make it worst, hold likewise (ClockTerms). Replaces `clockSkew`.
   */
  clock?: { setup: ClockTerms; hold: ClockTerms } | null;
  jitter: number;
  allowances: readonly BudgetAllowance[];
  /** False: items without their details (a search probe keeps only the numbers); default true. */
  words?: boolean;
  corner: string;
}

/** Clock terms of one margin: the clock net's launch delay and flights, s, with their words. */
export interface ClockTerms {
  net: string;
  tco: { value: number; label: string; detail: string };
  /** Flight to the receiver (compensated), s. */
  toReceiver: number;
  receiverDetail: string;
  /** Flight to the data driver, s, or null when the clock is not routed to it (the driver is its source). */
  toDriver: number | null;
  driverDetail: string;
}

/**
 * Clock items of one margin, signed: setup gains Tcr − Tcd, hold loses it (setup = Tcycle + Tcr − Tcd − ...,
 * hold = Tcd − Tcr + ..., docs/design.md §6.1 derivation). When the clock is routed to the driver, its
 * launch delay enters Tcd and Tcr alike and cancels, so only the two flights are items.
 */
function clockItems(c: ClockTerms, margin: 'setup' | 'hold', words: boolean): BudgetLineItem[] {
  const sign = margin === 'setup' ? 1 : -1;
  const items: BudgetLineItem[] = [];
  if (c.toDriver === null) {
    items.push({ name: `${c.tco.label} of clock ${c.net}`, value: sign * c.tco.value, source: 'part model', detail: c.tco.detail });
  }
  items.push({
    name: `Tflight,clk to receiver`, value: sign * c.toReceiver, source: 'simulation',
    detail: words ? `clock ${c.net} ${c.receiverDetail}, compensated: the capturing clock edge arrives this much later` : '',
  });
  if (c.toDriver !== null) {
    items.push({
      name: `Tflight,clk to driver`, value: -sign * c.toDriver, source: 'simulation',
      detail: words ? `clock ${c.net} ${c.driverDetail}, compensated: the launching clock edge arrives this much later` : '',
    });
  }
  return items;
}

/**
 * Common-clock budget (docs/design.md §6; the common-clock timing model, e.g. Hall, Hall & McCall,
 * "High-Speed Digital System Design", Wiley 2000, ch. 8 "Digital Timing Analysis"):
 *   setup = Tcycle - (Tco + Tflight,max + Tsetup + skew + jitter + allowances)
 *   hold  = Tco + Tflight,min - Thold + skew - allowances
 * with skew = clock flight to the driver minus clock flight to the receiver. Sign of the skew in hold:
 * a driver clock that arrives `skew` later launches the data `skew` later against the same capturing
 * edge, so it adds to hold margin (hold = Tcd + Tco + Tflight - Tcr - Thold with skew = Tcd - Tcr).
 * docs/design.md §6.1 states the same form and its derivation.
 */
export function commonClockItems(t: CommonClockTerms): { setup: BudgetLineItem[]; hold: BudgetLineItem[] } {
  const w = t.words !== false;
  const setup: BudgetLineItem[] = [
    { name: 'Tcycle', value: t.cycleTime, source: 'input', detail: w ? `clock period ${ps(t.cycleTime)}` : '' },
    { name: t.tcoSetup.label, value: -t.tcoSetup.value, source: 'part model', detail: w ? `${t.tcoSetup.label} of ${t.driverDetail} (the latest launch, for setup at every corner)` : '' },
    { name: 'Tflight,max', value: -t.flightMax, source: 'simulation', detail: w ? `last far-threshold crossing, ${t.flightDetail}, compensated` : '' },
    { name: 'Tsetup', value: -t.tsetup, source: 'part model', detail: w ? `setup requirement of ${t.receiverDetail}` : '' },
    ...(t.clock ? clockItems(t.clock.setup, 'setup', w)
      : [{ name: 'clock skew', value: -t.clockSkew, source: 'input' as const, detail: w ? 'clock flight to driver minus clock flight to receiver' : '' }]),
    { name: 'jitter', value: -t.jitter, source: 'input', detail: w ? 'cycle-to-cycle clock jitter' : '' },
    ...allowanceItems(t.allowances, 'setup', w),
  ];
  const hold: BudgetLineItem[] = [
    { name: t.tcoHold.label, value: t.tcoHold.value, source: 'part model', detail: w ? `${t.tcoHold.label} of ${t.driverDetail} (the earliest launch, for hold at every corner)` : '' },
    { name: 'Tflight,min', value: t.flightMin, source: 'simulation', detail: w ? `first near-threshold crossing, ${t.flightDetail}, compensated` : '' },
    { name: 'Thold', value: -t.thold, source: 'part model', detail: w ? `hold requirement of ${t.receiverDetail}` : '' },
    ...(t.clock ? clockItems(t.clock.hold, 'hold', w)
      : [{ name: 'clock skew', value: t.clockSkew, source: 'input' as const, detail: w ? 'clock flight to driver minus clock flight to receiver: a later launch adds to hold' : '' }]),
    ...allowanceItems(t.allowances, 'hold', w),
  ];
  return { setup, hold };
}

export interface SourceSyncTerms {
  /** Data valid before / after the strobe edge at the driver, s. */
  tValidBefore: number;
  tValidAfter: number;
  /** Compensated flight times, s. */
  dataFlightMin: number;
  dataFlightMax: number;
  dataDetail: string;
  strobeFlightMin: number;
  strobeFlightMax: number;
  strobeDetail: string;
  tsetup: number;
  thold: number;
  receiverDetail: string;
  allowances: readonly BudgetAllowance[];
  /** False: items without their details (a search probe keeps only the numbers); default true. */
  words?: boolean;
}

/**
 * Source-synchronous budget (docs/design.md §6; the source-synchronous timing model, e.g. Hall, Hall &
 * McCall, "High-Speed Digital System Design", Wiley 2000, ch. 8 "Digital Timing Analysis"):
 *   setup = Tvalid,before - Tsetup - (Tflight,data,max - Tflight,strobe,min) - allowances
 *   hold  = Tvalid,after  - Thold  - (Tflight,strobe,max - Tflight,data,min) - allowances
 */
export function sourceSyncItems(t: SourceSyncTerms): { setup: BudgetLineItem[]; hold: BudgetLineItem[] } {
  const w = t.words !== false;
  const setup: BudgetLineItem[] = [
    { name: 'Tvalid,before', value: t.tValidBefore, source: 'input', detail: w ? 'data valid before the strobe edge at the driver' : '' },
    { name: 'Tsetup', value: -t.tsetup, source: 'part model', detail: w ? `setup requirement of ${t.receiverDetail}` : '' },
    { name: 'Tflight,data,max', value: -t.dataFlightMax, source: 'simulation', detail: w ? `last far-threshold crossing of ${t.dataDetail}, compensated` : '' },
    { name: 'Tflight,strobe,min', value: t.strobeFlightMin, source: 'simulation', detail: w ? `first near-threshold crossing of ${t.strobeDetail}, compensated` : '' },
    ...allowanceItems(t.allowances, 'setup', w),
  ];
  const hold: BudgetLineItem[] = [
    { name: 'Tvalid,after', value: t.tValidAfter, source: 'input', detail: w ? 'data valid after the strobe edge at the driver' : '' },
    { name: 'Thold', value: -t.thold, source: 'part model', detail: w ? `hold requirement of ${t.receiverDetail}` : '' },
    { name: 'Tflight,strobe,max', value: -t.strobeFlightMax, source: 'simulation', detail: w ? `last far-threshold crossing of ${t.strobeDetail}, compensated` : '' },
    { name: 'Tflight,data,min', value: t.dataFlightMin, source: 'simulation', detail: w ? `first near-threshold crossing of ${t.dataDetail}, compensated` : '' },
    ...allowanceItems(t.allowances, 'hold', w),
  ];
  return { setup, hold };
}
