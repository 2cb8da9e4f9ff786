/**
 * Worked budgets computed by hand (arithmetic in the comments), matched to the picosecond.
 * Source of the formulas: docs/design.md §6; Hall, Hall & McCall, "High-Speed Digital System Design",
 * Wiley 2000, ch. 8 (common-clock and source-synchronous timing). Input numbers are invented for the test.
 */
import { describe, expect, it } from 'vitest';
import { netBudget, type NetBudgetInputs } from '../../../core/budget/net-budget.js';
import type { ReceiverEdgeMeasure } from '../../../core/budget/measures.js';
import { sumItems } from '../../../core/budget/timing.js';
import { solveNet } from '../../../core/engine/solve-net.js';
import type { BusDefinition, Corner, NetDefinition, PartModel, ReceiverModel } from '../../../core/project/model.js';

const PS = 1e-12;
const NS = 1e-9;
/** "Matched to the picosecond": float sums of a few terms err by ~1e-25 s, far inside 0.5 ps. */
const expectPs = (actual: number | null, expectedPs: number): void => {
  expect(actual).not.toBeNull();
  expect(Math.abs((actual ?? NaN) - expectedPs * PS)).toBeLessThan(0.5 * PS);
};

const corner = (name: string, tco: Corner['tco']): Corner => ({
  name, driverStrength: 1, edgeRate: 1, dk: 1, widthDelta: 0, rail: 1, cin: 1, tco,
});
const SLOW = corner('slow', 'max');
const FAST = corner('fast', 'min');

const driverPart: PartModel = {
  name: 'CTRL-IO', description: 'invented for the test', ioStandard: '',
  driver: {
    vol: 0, voh: 1.5, routHigh: 40, routLow: 40, riseTime: 0.4 * NS, fallTime: 0.4 * NS,
    tcoMin: 0.6 * NS, tcoMax: 1.8 * NS, refLoad: { ohms: 50, vtt: 0.75, farads: 0 }, vmeas: 0.75,
  },
  receiver: null,
};
const rx: ReceiverModel = {
  cin: 2e-12, vil: 0.65, vih: 0.85, vref: 0.75, odtOhms: null, odtVtt: 0.75,
  vmaxAbs: 1.9, vminAbs: -0.4, tsetup: 0.5 * NS, thold: 0.3 * NS,
};

/** A clean measure (all quality checks pass) with the given times in ns. */
function measure(cornerName: string, edge: 'rising' | 'falling', tRef: number, near: number, far: number, receiver = 'U2'): ReceiverEdgeMeasure {
  return {
    receiver, node: 'rx', corner: cornerName, edge, tReference: tRef * NS, tNearFirst: near * NS, tFarLast: far * NS,
    vFirstIncidence: edge === 'rising' ? 1.2 : 0.3, firstIncidence: true, vmax: 1.6, vmin: -0.1, ringbackMargin: 0.2,
    monotonic: true, vil: 0.65, vih: 0.85, vmaxAbs: 1.9, vminAbs: -0.4, tStop: 10 * NS,
  };
}

const net: NetDefinition = {
  name: 'A3', bus: 'LOCAL', role: 'address',
  driver: { part: 'CTRL-IO', node: 'drv', designator: 'U1' },
  receivers: [{ part: 'MEM', node: 'rx', designator: 'U2' }],
  elements: [], rails: {},
};

describe('common-clock budget worked by hand', () => {
  const bus: BusDefinition = {
    name: 'LOCAL', kind: 'common-clock', description: '', referenceNet: null,
    timing: { kind: 'common-clock', cycleTime: 5 * NS, clockSkew: 0.1 * NS, jitter: 0.15 * NS },
    allowances: [{ name: 'crosstalk', value: 0.05 * NS, appliesTo: 'both', note: '' }],
  };
  const inputs: NetBudgetInputs = {
    net, bus, corners: [SLOW, FAST], driverPart: { part: driverPart, model: driverPart.driver! },
    receivers: new Map([['U2', rx]]), strobe: null, guardBand: 0.1 * NS,
  };
  // slow: flight min = 1.10 - 0.35 = 0.75 ns, flight max = 1.62 - 0.35 = 1.27 ns (rising, the worse edge)
  //       falling edge: min = 1.00 - 0.35 = 0.65 ns, max = 1.40 - 0.35 = 1.05 ns
  // fast: rising min = 0.62 - 0.20 = 0.42 ns, max = 0.95 - 0.20 = 0.75 ns; falling 0.60-0.20=0.40, 0.80-0.20=0.60
  const measures = [
    measure('slow', 'rising', 0.35, 1.1, 1.62), measure('slow', 'falling', 0.35, 1.0, 1.4),
    measure('fast', 'rising', 0.2, 0.62, 0.95), measure('fast', 'falling', 0.2, 0.6, 0.8),
  ];
  const result = netBudget(inputs, measures);
  const slow = result.corners.find((c) => c.timing.corner === 'slow')!.timing;
  const fast = result.corners.find((c) => c.timing.corner === 'fast')!.timing;

  it('setup at the slow corner: 5000 - 1800 - 1270 - 500 - 100 - 150 - 50 = 1130 ps', () => {
    expectPs(slow.setupMargin, 1130);
    expect(slow.setupItems.map((i) => i.name)).toEqual(['Tcycle', 'Tco,max', 'Tflight,max', 'Tsetup', 'clock skew', 'jitter', 'crosstalk']);
    expectPs(sumItems(slow.setupItems), 1130);
    expect(slow.setupItems.find((i) => i.name === 'Tflight,max')!.source).toBe('simulation');
    expect(slow.setupItems.find((i) => i.name === 'Tco,max')!.source).toBe('part model');
  });

  // Hold takes Tco,min and setup Tco,max at every corner, whatever the corner's own Tco choice
  // (docs/design.md §6.1): the slow corner's hold still meets the earliest launch.
  it('hold at the slow corner: Tco,min 600 + 650 - 300 + 100 - 50 = 1000 ps (falling edge has the shorter flight)', () => {
    expectPs(slow.holdMargin, 1000);
    expect(slow.holdItems[0].name).toBe('Tco,min');
  });

  it('setup at the fast corner: 5000 - Tco,max 1800 - 750 - 500 - 100 - 150 - 50 = 1650 ps', () => {
    expectPs(fast.setupMargin, 1650);
    expect(fast.setupItems[1].name).toBe('Tco,max');
  });

  it('hold at the fast corner: 600 + 400 - 300 + 100 - 50 = 750 ps, the net worst', () => {
    expectPs(fast.holdMargin, 750);
    expectPs(result.holdMargin, 750);
    expectPs(result.setupMargin, 1130);
    expectPs(result.flightMin, 400);
    expectPs(result.flightMax, 1270);
    expect(result.status).toBe('pass');
    expect(result.reasons).toEqual([]);
  });
});

describe('source-synchronous budget worked by hand', () => {
  const bus: BusDefinition = {
    name: 'LANE0', kind: 'source-synchronous', description: '', referenceNet: 'DQS0',
    timing: { kind: 'source-synchronous', tValidBefore: 400 * PS, tValidAfter: 300 * PS },
    allowances: [{ name: 'strobe jitter', value: 30 * PS, appliesTo: 'both', note: '' }],
  };
  const rxSs: ReceiverModel = { ...rx, tsetup: 100 * PS, thold: 120 * PS };
  // data (fast corner): rising min = 0.50 - 0.15 = 350 ps, max = 0.62 - 0.15 = 470 ps
  //                     falling min = 0.52 - 0.15 = 370 ps, max = 0.60 - 0.15 = 450 ps
  // strobe at U2: rising min = 0.54 - 0.15 = 390 ps, max = 0.66 - 0.15 = 510 ps
  //               falling min = 0.555 - 0.16 = 395 ps, max = 0.70 - 0.16 = 540 ps
  //   -> strobe min 390 ps, strobe max 540 ps (extremes over both strobe edges)
  const data = [measure('fast', 'rising', 0.15, 0.5, 0.62), measure('fast', 'falling', 0.15, 0.52, 0.6)];
  const strobe = [measure('fast', 'rising', 0.15, 0.54, 0.66), measure('fast', 'falling', 0.16, 0.555, 0.7)];
  const inputs: NetBudgetInputs = {
    net: { ...net, name: 'DQ3', bus: 'LANE0', role: 'data' }, bus, corners: [FAST],
    driverPart: { part: driverPart, model: driverPart.driver! }, receivers: new Map([['U2', rxSs]]),
    strobe: { net: 'DQS0', measures: strobe }, guardBand: 25 * PS,
  };
  const result = netBudget(inputs, data);

  it('setup = 400 - 100 - (470 - 390) - 30 = 190 ps', () => {
    expectPs(result.setupMargin, 190);
    const items = result.corners[0].timing.setupItems;
    expect(items.map((i) => [i.name, Math.round(i.value / PS)])).toEqual([
      ['Tvalid,before', 400], ['Tsetup', -100], ['Tflight,data,max', -470], ['Tflight,strobe,min', 390], ['strobe jitter', -30],
    ]);
  });

  it('hold = 300 - 120 - (540 - 350) - 30 = -40 ps: fails, and says why in words', () => {
    expectPs(result.holdMargin, -40);
    expect(result.status).toBe('fail');
    expect(result.reasons).toEqual(['hold margin -40 ps at fast corner (U2, rising edge): strobe arrives 190 ps after data']);
  });

  it('is tight, not failing, when the hold margin sits under the guard band', () => {
    // tValidAfter 350 ps: hold = 350 - 120 - 190 - 30 = 10 ps < 25 ps guard band
    const tight = netBudget({ ...inputs, bus: { ...bus, timing: { ...bus.timing, tValidAfter: 350 * PS } as typeof bus.timing } }, data);
    expectPs(tight.holdMargin, 10);
    expect(tight.status).toBe('tight');
    expect(tight.reasons[0]).toMatch(/^hold margin 10 ps at fast corner \(U2, rising edge\) is under the 25 ps guard band/);
  });
});

describe('signal-quality reasons', () => {
  it('names the overshoot, its limit and where (limits from the receiver model)', () => {
    const bus: BusDefinition = {
      name: 'LOCAL', kind: 'common-clock', description: '', referenceNet: null,
      timing: { kind: 'common-clock', cycleTime: 5 * NS, clockSkew: 0, jitter: 0 }, allowances: [],
    };
    const m = { ...measure('fast', 'rising', 0.2, 0.6, 0.9), vmax: 2.05 };
    const r = netBudget({
      net, bus, corners: [FAST], driverPart: { part: driverPart, model: driverPart.driver! },
      receivers: new Map([['U2', rx]]), strobe: null, guardBand: 0,
    }, [m, measure('fast', 'falling', 0.2, 0.6, 0.9)]);
    expect(r.status).toBe('fail');
    expect(r.reasons).toEqual(['overshoot to 2.05 V at U2 (rising edge, fast corner) exceeds the 1.90 V absolute limit']);
    expect(r.quality.filter((q) => !q.pass).map((q) => q.name)).toEqual(['overshoot']);
  });
});

describe('common-clock budget end to end through the solver, worked by hand', () => {
  // Invented parts: a 50 ohm source-matched driver, 0 -> 1.2 V, 100 ps 10-90 % (full ramp 125 ps),
  // Tco 0.2 / 0.5 ns into 50 ohm to 0.6 V measured at 0.6 V; a receiver with no capacitance, VIL 0.5 V,
  // VIH 0.7 V; one explicit 50 ohm line of 400 ps. One corner with every factor 1 and Tco,max.
  const NSx = 1e-9;
  const parts: PartModel[] = [
    {
      name: 'SRC', description: 'invented', ioStandard: '', receiver: null,
      driver: { vol: 0, voh: 1.2, routHigh: 50, routLow: 50, riseTime: 0.1 * NSx, fallTime: 0.1 * NSx, tcoMin: 0.2 * NSx, tcoMax: 0.5 * NSx, refLoad: { ohms: 50, vtt: 0.6, farads: 0 }, vmeas: 0.6 },
    },
    {
      name: 'DST', description: 'invented', ioStandard: '', driver: null,
      receiver: { cin: 0, vil: 0.5, vih: 0.7, vref: 0.6, odtOhms: null, odtVtt: 0.6, vmaxAbs: 2.5, vminAbs: -1.3, tsetup: 0.3 * NSx, thold: 0.1 * NSx },
    },
  ];
  const one: Corner = { name: 'nominal', driverStrength: 1, edgeRate: 1, dk: 1, widthDelta: 0, rail: 1, cin: 1, tco: 'max' };
  const bus: BusDefinition = {
    name: 'B', kind: 'common-clock', description: '', referenceNet: null,
    timing: { kind: 'common-clock', cycleTime: 2 * NSx, clockSkew: 0.05 * NSx, jitter: 0.03 * NSx }, allowances: [],
  };
  const line: NetDefinition = {
    name: 'L', bus: 'B', role: 'data', driver: { part: 'SRC', node: 'd', designator: 'U1' },
    receivers: [{ part: 'DST', node: 'r', designator: 'U2' }],
    elements: [{ kind: 'line', a: 'd', b: 'r', z0: 50, delay: 0.4 * NSx }], rails: {},
  };
  const project = {
    info: { name: 't', boardRevision: '', description: '', guardBand: 25 * PS, settleBand: 0.05 },
    stackup: { name: 's', layers: [] }, parts, buses: [bus], nets: [line], corners: [one],
  };

  it('flight and margins agree with the lattice diagram and the hand budget to the picosecond', () => {
    // Reference load: 50 ohm source into 50 ohm to 0.6 V swings 0.3 -> 0.9 V along the ramp; it
    // crosses Vmeas 0.6 V at half the 125 ps ramp: 62.5 ps.
    // Net: matched source launches V+ = Vs/2 (docs/design.md §2), the open end doubles it: the receiver
    // follows the source ramp 400 ps late. It crosses VIL 0.5 V at 400 + 125 x 0.5/1.2 = 452.083 ps and
    // VIH 0.7 V at 400 + 125 x 0.7/1.2 = 472.917 ps (rising; falling is the mirror image).
    // Compensated: flight min = 452.083 - 62.5 = 389.583 ps, flight max = 472.917 - 62.5 = 410.417 ps.
    // setup = 2000 - 500 - 410.417 - 300 - 50 - 30 = 709.583 ps
    // hold  = 200 + 389.583 - 100 + 50 = 539.583 ps   (Tco,min: hold meets the earliest launch at every corner)
    const solved = solveNet(project, 'L', {}, { lengthWindow: false, suggestion: false });
    const r = solved.result;
    // Tolerance 0.5 ps ("to the picosecond"): the solver's steps divide the ramp exactly, so linear
    // interpolation of the piecewise-linear waveform is exact up to float rounding.
    expectPs(r.flightMin, 389.583);
    expectPs(r.flightMax, 410.417);
    expectPs(r.setupMargin, 709.583);
    expectPs(r.holdMargin, 539.583);
    expect(r.status).toBe('pass');
    expect(r.corners[0].setupItems.map((i) => i.source)).toEqual(['input', 'part model', 'simulation', 'part model', 'input', 'input']);
  });
});

describe('common-clock failures in words, worked by hand', () => {
  it('says what the cycle has to hold and when the data changes', () => {
    const bus: BusDefinition = {
      name: 'B', kind: 'common-clock', description: '', referenceNet: null,
      timing: { kind: 'common-clock', cycleTime: 3.2 * NS, clockSkew: 0.1 * NS, jitter: 0.05 * NS }, allowances: [],
    };
    const slowRx: ReceiverModel = { ...rx, thold: 0.9 * NS };
    const r = netBudget({
      net, bus, corners: [SLOW, FAST], driverPart: { part: driverPart, model: driverPart.driver! },
      receivers: new Map([['U2', slowRx]]), strobe: null, guardBand: 25 * PS,
    }, [measure('slow', 'rising', 0.35, 1.1, 1.62), measure('fast', 'rising', 0.2, 0.3, 0.5)]);
    // setup (slow): 3200 - 1800 - 1270 - 500 - 100 - 50 = -520 ps; the items other than Tcycle sum to 3720 ps
    // hold (fast): 600 + (0.30 - 0.20 = 100) - 900 + 100 = -100 ps; data changes 600 + 100 + 100 = 800 ps after the edge
    expect(r.reasons).toEqual([
      'setup margin -520 ps at slow corner (U2, rising edge): Tco,max 1800 ps + flight 1270 ps + setup, skew, jitter and allowances 650 ps need 3720 ps of the 3200 ps cycle',
      'hold margin -100 ps at fast corner (U2, rising edge): data changes 800 ps after the capturing clock edge (flight 100 ps), hold needs 900 ps',
    ]);
  });
});
