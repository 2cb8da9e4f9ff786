/**
 * A common-clock bus with a clock net (docs/design.md §6.1): the clock's own launch delay and its
 * simulated flight to each receiver (and to the driver where it is routed there) enter that receiver's
 * setup and hold, paired at the same corner, each as its own line item; the entered skew is not used.
 * Derivation (Hall, Hall & McCall, "High-Speed Digital System Design", Wiley 2000, ch. 8 — chapter from
 * memory): setup = Tcycle + Tcr − (Tcd + Tco + Tflight,max + Tsetup) − jitter − allowances,
 * hold = Tcd + Tco + Tflight,min − Tcr − Thold − allowances, with Tcr = Tco,clk + Tflight,clk(receiver)
 * and Tcd = Tco,clk + Tflight,clk(driver) when the clock is routed to the driver, else 0 (the driver
 * is the clock's source). Numbers invented for the test; every margin worked by hand below.
 */
import { describe, expect, it } from 'vitest';
import { netBudget, type NetBudgetInputs } from '../../../core/budget/net-budget.js';
import type { ReceiverEdgeMeasure } from '../../../core/budget/measures.js';
import { sumItems } from '../../../core/budget/timing.js';
import type { BusDefinition, Corner, DriverModel, NetDefinition, PartModel, ReceiverModel } from '../../../core/project/model.js';

const PS = 1e-12;
const NS = 1e-9;
/** Sums of a handful of values of order 1e-9 s: float error ~1e-24 s, far inside 0.5 ps. */
const expectPs = (actual: number | null, expectedPs: number): void => {
  expect(actual).not.toBeNull();
  expect(Math.abs((actual ?? NaN) - expectedPs * PS)).toBeLessThan(0.5 * PS);
};
const corner = (name: string, tco: Corner['tco']): Corner => ({ name, driverStrength: 1, edgeRate: 1, dk: 1, widthDelta: 0, rail: 1, cin: 1, tco });
const SLOW = corner('slow', 'max');
const FAST = corner('fast', 'min');

const dataDriver: DriverModel = {
  vol: 0, voh: 1.5, routHigh: 40, routLow: 40, riseTime: 0.4 * NS, fallTime: 0.4 * NS,
  tcoMin: 0.6 * NS, tcoMax: 1.8 * NS, refLoad: { ohms: 50, vtt: 0.75, farads: 0 }, vmeas: 0.75,
};
const clockDriver: DriverModel = { ...dataDriver, tcoMin: 0.05 * NS, tcoMax: 0.15 * NS };
const part: PartModel = { name: 'CTRL-IO', description: 'invented', ioStandard: '', driver: dataDriver, receiver: null };
const rx: ReceiverModel = {
  cin: 2e-12, vil: 0.65, vih: 0.85, vref: 0.75, odtOhms: null, odtVtt: 0.75, vmaxAbs: 1.9, vminAbs: -0.4, tsetup: 0.5 * NS, thold: 0.3 * NS,
};

/** A clean measure with the given times in ns. */
function measure(cornerName: string, edge: 'rising' | 'falling', tRef: number, near: number, far: number, receiver: string): ReceiverEdgeMeasure {
  return {
    receiver, node: 'rx', corner: cornerName, edge, tReference: tRef * NS, tNearFirst: near * NS, tFarLast: far * NS,
    vFirstIncidence: edge === 'rising' ? 1.2 : 0.3, firstIncidence: true, vmax: 1.6, vmin: -0.1, ringbackMargin: 0.2,
    monotonic: true, vil: 0.65, vih: 0.85, vmaxAbs: 1.9, vminAbs: -0.4, tStop: 10 * NS,
  };
}

const net: NetDefinition = {
  name: 'A3', bus: 'CA', role: 'address', driver: { part: 'CTRL-IO', node: 'drv', designator: 'U1' },
  receivers: [{ part: 'MEM', node: 'rx', designator: 'U2' }], elements: [], rails: {},
};
const bus: BusDefinition = {
  name: 'CA', kind: 'common-clock', description: '', referenceNet: 'CK',
  // the entered skew (100 ps) must not be used once the clock net is there
  timing: { kind: 'common-clock', cycleTime: 5 * NS, clockSkew: 0.1 * NS, jitter: 0.15 * NS },
  allowances: [{ name: 'crosstalk', value: 0.05 * NS, appliesTo: 'both', note: '' }],
};
// data at U2: slow rising Fmax = 1.62 − 0.35 = 1.27 ns (falling 1.40 − 0.35 = 1.05); fast Fmin: rising
// 0.62 − 0.20 = 0.42, falling 0.60 − 0.20 = 0.40 ns
const data = [
  measure('slow', 'rising', 0.35, 1.1, 1.62, 'U2'), measure('slow', 'falling', 0.35, 1.0, 1.4, 'U2'),
  measure('fast', 'rising', 0.2, 0.62, 0.95, 'U2'), measure('fast', 'falling', 0.2, 0.6, 0.8, 'U2'),
];
// clock at U2: slow rising 0.5 − 0.2 = 0.30 / 0.7 − 0.2 = 0.50, falling 0.35 / 0.60: earliest 0.30 ns;
//              fast rising 0.40 − 0.15 = 0.25 / 0.55 − 0.15 = 0.40, falling 0.27 / 0.45: latest 0.45 ns
const clockAtU2 = [
  measure('slow', 'rising', 0.2, 0.5, 0.7, 'U2'), measure('slow', 'falling', 0.2, 0.55, 0.8, 'U2'),
  measure('fast', 'rising', 0.15, 0.4, 0.55, 'U2'), measure('fast', 'falling', 0.15, 0.42, 0.6, 'U2'),
];
const base: NetBudgetInputs = {
  net, bus, corners: [SLOW, FAST], driverPart: { part, model: dataDriver }, receivers: new Map([['U2', rx]]),
  strobe: null, guardBand: 25 * PS,
};

describe('clock from the data driver itself (forwarded with the data, fly-by address/command)', () => {
  const r = netBudget({ ...base, clock: { net: 'CK', measures: clockAtU2, driver: clockDriver, driverPart: 'CTRL-CK', driverDesignator: 'U1' } }, data);
  const slow = r.corners.find((c) => c.timing.corner === 'slow')!.timing;
  const fast = r.corners.find((c) => c.timing.corner === 'fast')!.timing;

  it('setup (slow) = 5000 − 1800 − 1270 − 500 + 150 + 300 − 150 − 50 = 1680 ps: Tcr = Tco,clk,max 150 (tracks the data\'s Tco,max) + earliest clock flight 300', () => {
    expectPs(slow.setupMargin, 1680);
    expectPs(sumItems(slow.setupItems), 1680);
    expect(slow.setupItems.map((i) => i.name)).toEqual(['Tcycle', 'Tco,max', 'Tflight,max', 'Tsetup', 'Tco,max of clock CK', 'Tflight,clk to receiver', 'jitter', 'crosstalk']);
    expect(slow.setupItems.find((i) => i.name === 'Tflight,clk to receiver')!.source).toBe('simulation');
    expect(slow.setupItems.some((i) => i.name === 'clock skew')).toBe(false);
  });

  it('hold (fast) = 600 + 400 − 300 − 50 − 450 − 50 = 150 ps: Tcr = Tco,clk,min 50 + latest clock flight 450', () => {
    expectPs(fast.holdMargin, 150);
    expect(fast.holdItems.map((i) => [i.name, Math.round(i.value / PS)])).toEqual([
      ['Tco,min', 600], ['Tflight,min', 400], ['Thold', -300], ['Tco,min of clock CK', -50], ['Tflight,clk to receiver', -450], ['crosstalk', -50],
    ]);
  });
});

describe('clock from its own source, routed to the driver and the receiver (classic common clock)', () => {
  // clock at the driver U1: slow rising 0.45 − 0.2 = 0.25 / 0.65 − 0.2 = 0.45, falling 0.30 / 0.50: latest launch 0.50 ns;
  //                         fast rising 0.35 − 0.15 = 0.20 / 0.35, falling 0.22 / 0.37: earliest launch 0.20 ns
  const clockAtU1 = [
    measure('slow', 'rising', 0.2, 0.45, 0.65, 'U1'), measure('slow', 'falling', 0.2, 0.5, 0.7, 'U1'),
    measure('fast', 'rising', 0.15, 0.35, 0.5, 'U1'), measure('fast', 'falling', 0.15, 0.37, 0.52, 'U1'),
  ];
  const r = netBudget({ ...base, clock: { net: 'CK', measures: [...clockAtU2, ...clockAtU1], driver: clockDriver, driverPart: 'CLKBUF', driverDesignator: 'U9' } }, data);

  it('setup (slow) = 5000 − 1800 − 1270 − 500 + 300 − 500 − 150 − 50 = 1030 ps: the clock\'s Tco cancels (in Tcd and Tcr alike)', () => {
    const slow = r.corners.find((c) => c.timing.corner === 'slow')!.timing;
    expectPs(slow.setupMargin, 1030);
    expect(slow.setupItems.map((i) => i.name)).toEqual(['Tcycle', 'Tco,max', 'Tflight,max', 'Tsetup', 'Tflight,clk to receiver', 'Tflight,clk to driver', 'jitter', 'crosstalk']);
  });

  it('hold (fast) = 600 + 400 − 300 + 200 − 450 − 50 = 400 ps', () => {
    expectPs(r.corners.find((c) => c.timing.corner === 'fast')!.timing.holdMargin, 400);
  });
});

describe('a clock that never reaches the receiver\'s threshold', () => {
  it('leaves setup and hold unknown (null) and the net failing', () => {
    const dead = clockAtU2.map((m) => ({ ...m, tNearFirst: null, tFarLast: null }));
    const r = netBudget({ ...base, clock: { net: 'CK', measures: dead, driver: clockDriver, driverPart: 'CTRL-CK', driverDesignator: 'U1' } }, data);
    expect(r.setupMargin).toBeNull();
    expect(r.holdMargin).toBeNull();
    expect(r.status).toBe('fail');
    expect(r.reasons).toEqual(['setup margin unknown at the slow corner (U2): CK never crosses its threshold there within the simulated window']);
  });
});
