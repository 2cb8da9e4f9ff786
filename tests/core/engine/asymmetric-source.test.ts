/**
 * An asymmetric driver (pull-up and pull-down resistances differ) drives its reference load with the
 * same source waveform as the net (docs/design.md §5): the ideal source's ramp starts where it starts
 * in the net (rampStart of the net's own DC pin level, docs/design.md §2.2), not where it would start
 * in the reference load, so the compensation does not move with the net's DC load. Hand calculation
 * below (Ohm's and Kirchhoff's laws on the resistive divider); parts invented for the test.
 */
import { describe, expect, it } from 'vitest';
import { simulateNetMeasures } from '../../../core/engine/simulate-net.js';
import type { Corner, NetDefinition, PartModel } from '../../../core/project/model.js';

const parts: PartModel[] = [
  {
    name: 'ASYM', description: 'invented', ioStandard: '', receiver: null,
    driver: {
      vol: 0, voh: 1.2, routHigh: 22, routLow: 38, riseTime: 100e-12, fallTime: 100e-12,
      tcoMin: 0, tcoMax: 0, refLoad: { ohms: 50, vtt: 0.6, farads: 0 }, vmeas: 0.6,
    },
  },
  {
    name: 'RX', description: 'invented', ioStandard: '', driver: null,
    receiver: { cin: 0, vil: 0.5, vih: 0.7, vref: 0.6, odtOhms: null, odtVtt: 0.6, vmaxAbs: 3, vminAbs: -3, tsetup: 0, thold: 0 },
  },
];
const one: Corner = { name: 'nominal', driverStrength: 1, edgeRate: 1, dk: 1, widthDelta: 0, rail: 1, cin: 1, tco: 'typ' };
// a 50 Ω, 1 ns line matched by 50 Ω to ground at the receiver: the pin sees 50 Ω to ground throughout
const net: NetDefinition = {
  name: 'N', bus: 'B', role: 'data', driver: { part: 'ASYM', node: 'd', designator: 'U1' },
  receivers: [{ part: 'RX', node: 'r', designator: 'U2' }],
  elements: [{ kind: 'line', a: 'd', b: 'r', z0: 50, delay: 1e-9 }, { kind: 'resistor', a: 'r', b: 'gnd', ohms: 50 }],
  rails: {},
};

describe('reference-load crossing of an asymmetric driver', () => {
  const [rising] = simulateNetMeasures({ stackup: { name: 's', layers: [] }, parts, corners: [one] }, net).filter((m) => m.edge === 'rising');
  it('uses the net\'s source waveform: 62.5 ps, not the 56.25 ps of a source started for the reference load', () => {
    // Net, rising edge: the pin rests at 0 V (driven low into 50 Ω to ground), so the source starts at
    // v0' = 0 + (0 − 0)·22/38 = 0 V and ramps 0 -> 1.2 V over the full ramp 100 ps / 0.8 = 125 ps.
    // Reference load (50 Ω to 0.6 V) behind 22 Ω: v = (vs/22 + 0.6/50)/(1/22 + 1/50) = 0.6 V at vs = 0.6 V:
    // half the ramp, 62.5 ps. (Started for the reference load's own DC pin, 0.012/(1/38 + 1/50) = 0.2591 V,
    // the source would start at 0.2591 − 0.2591·22/38 = 0.1091 V and reach 0.6 V at
    // (0.6 − 0.1091)/(1.2 − 0.1091)·125 = 56.25 ps: 6.25 ps earlier, a wrong compensation.)
    // 1e-18 s: a closed form of a few operations.
    expect(Math.abs(rising.tReference - 62.5e-12)).toBeLessThan(1e-18);
  });
});
