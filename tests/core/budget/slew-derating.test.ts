/**
 * Slew-rate derating of setup and hold (docs/design.md §6.4), applied where the receiver part gives a
 * table (as JEDEC DDR data sheets tabulate ΔtDS/ΔtDH against the data and strobe slew rates), as its own
 * line item; absent a table nothing changes. The table and every number are invented for the test; the
 * interpolation is worked by hand (bilinear between the four surrounding entries).
 */
import { describe, expect, it } from 'vitest';
import { netBudget, type NetBudgetInputs } from '../../../core/budget/net-budget.js';
import { derate } from '../../../core/budget/derating.js';
import type { ReceiverEdgeMeasure } from '../../../core/budget/measures.js';
import type { BusDefinition, Corner, PartModel, ReceiverModel, SlewDerating } from '../../../core/project/model.js';
import { validatePart } from '../../../core/project/validate.js';

const PS = 1e-12;
const NS = 1e-9;
const VNS = 1e9; // 1 V/ns in V/s
// rows: signal slew 1 and 2 V/ns; columns: strobe slew 2 and 4 V/ns; entries in ps
const table: SlewDerating = {
  signalSlews: [1 * VNS, 2 * VNS], strobeSlews: [2 * VNS, 4 * VNS],
  setup: [[40 * PS, 30 * PS], [20 * PS, 10 * PS]],
  hold: [[30 * PS, 26 * PS], [10 * PS, 6 * PS]],
};

describe('bilinear interpolation of the table, by hand', () => {
  it('at signal 1.5 V/ns, strobe 3 V/ns: setup (40 + 30 + 20 + 10)/4 = 25 ps, hold (30 + 26 + 10 + 6)/4 = 18 ps', () => {
    expect(Math.abs(derate(table.setup, table, 1.5 * VNS, 3 * VNS).value - 25 * PS)).toBeLessThan(1e-18);
    expect(Math.abs(derate(table.hold, table, 1.5 * VNS, 3 * VNS).value - 18 * PS)).toBeLessThan(1e-18);
  });
  it('at signal 1.25 V/ns, strobe 2 V/ns: setup 40 + 0.25·(20 − 40) = 35 ps; outside the table it holds the edge', () => {
    expect(Math.abs(derate(table.setup, table, 1.25 * VNS, 2 * VNS).value - 35 * PS)).toBeLessThan(1e-18);
    const out = derate(table.setup, table, 0.5 * VNS, 5 * VNS);
    expect(Math.abs(out.value - 30 * PS)).toBeLessThan(1e-18); // signal 1 V/ns row, strobe 4 V/ns column
    expect(out.clamped).toBe(true);
  });
  it('refuses a table whose rows do not match its slews, naming the part and the row', () => {
    const bad: PartModel = {
      name: 'MEM', description: '', ioStandard: '', driver: null,
      receiver: { ...rx, derating: { ...table, setup: [[40 * PS], [20 * PS, 10 * PS]] } },
    };
    expect(() => validatePart(bad)).toThrow(/part MEM receiver slew derating setup row 1.*one value per strobe slew \(2\), got 1/);
  });
});

const corner: Corner = { name: 'fast', driverStrength: 1, edgeRate: 1, dk: 1, widthDelta: 0, rail: 1, cin: 1, tco: 'min' };
const rx: ReceiverModel = { cin: 0, vil: 0.5, vih: 0.7, vref: 0.6, odtOhms: null, odtVtt: 0.6, vmaxAbs: 2, vminAbs: -1, tsetup: 100 * PS, thold: 120 * PS };
const part: PartModel = {
  name: 'CTRL', description: '', ioStandard: '', receiver: null,
  driver: { vol: 0, voh: 1.2, routHigh: 40, routLow: 40, riseTime: 0.1 * NS, fallTime: 0.1 * NS, tcoMin: 0, tcoMax: 0, refLoad: { ohms: 50, vtt: 0.6, farads: 0 }, vmeas: 0.6 },
};
function measure(edge: 'rising' | 'falling', tRef: number, near: number, far: number, slew: number): ReceiverEdgeMeasure {
  return {
    receiver: 'U2', node: 'rx', corner: 'fast', edge, tReference: tRef * NS, tNearFirst: near * NS, tFarLast: far * NS,
    vFirstIncidence: edge === 'rising' ? 1.2 : 0, firstIncidence: true, vmax: 1.2, vmin: 0, ringbackMargin: 0.3,
    monotonic: true, vil: 0.5, vih: 0.7, vmaxAbs: 2, vminAbs: -1, tStop: 10 * NS, slew,
  };
}
const bus: BusDefinition = {
  name: 'LANE0', kind: 'source-synchronous', description: '', referenceNet: 'DQS0',
  timing: { kind: 'source-synchronous', tValidBefore: 400 * PS, tValidAfter: 300 * PS }, allowances: [],
};
// data: min 0.50 − 0.15 = 350 ps, max 0.62 − 0.15 = 470 ps, slew 1.5 V/ns; strobe: min 390, max 510 ps, slews 3 and 3.5 V/ns (slowest 3)
const data = [measure('rising', 0.15, 0.5, 0.62, 1.5 * VNS)];
const strobe = [measure('rising', 0.15, 0.54, 0.66, 3 * VNS), measure('falling', 0.15, 0.54, 0.66, 3.5 * VNS)];
const inputs = (model: ReceiverModel): NetBudgetInputs => ({
  net: { name: 'DQ3', bus: 'LANE0', role: 'data', driver: { part: 'CTRL', node: 'd', designator: 'U1' }, receivers: [{ part: 'MEM', node: 'rx', designator: 'U2' }], elements: [], rails: {} },
  bus, corners: [corner], driverPart: { part, model: part.driver! }, receivers: new Map([['U2', model]]),
  strobe: { net: 'DQS0', measures: strobe }, guardBand: 0,
});

describe('derating in a source-synchronous budget', () => {
  it('without a table nothing changes: setup 400 − 100 − (470 − 390) = 220 ps, hold 300 − 120 − (510 − 350) = 20 ps', () => {
    const b = netBudget(inputs(rx), data);
    expect(Math.abs(b.setupMargin! - 220 * PS)).toBeLessThan(0.5 * PS);
    expect(Math.abs(b.holdMargin! - 20 * PS)).toBeLessThan(0.5 * PS);
    expect(b.corners[0].timing.setupItems.some((i) => i.name.includes('derating'))).toBe(false);
  });
  it('with the table: its own line items, 25 ps off setup and 18 ps off hold (signal 1.5 V/ns, slowest strobe 3 V/ns)', () => {
    const b = netBudget(inputs({ ...rx, derating: table }), data);
    expect(Math.abs(b.setupMargin! - 195 * PS)).toBeLessThan(0.5 * PS);
    expect(Math.abs(b.holdMargin! - 2 * PS)).toBeLessThan(0.5 * PS);
    const item = b.corners[0].timing.setupItems.find((i) => i.name === 'ΔTsetup (slew derating)')!;
    expect(Math.abs(item.value + 25 * PS)).toBeLessThan(1e-18);
    expect(item.source).toBe('part model');
    expect(item.detail).toMatch(/signal slew 1\.50 V\/ns and DQS0 slew 3\.00 V\/ns/);
  });
});
