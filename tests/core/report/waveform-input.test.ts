import { describe, expect, it } from 'vitest';
import { edgeCrossings, pickWaveform } from '../../../core/report/waveform-input.js';
import { latticeRising, latticeNetWaveforms, type LatticeNet } from '../../main/report/lattice-waveforms.js';
import { loadResult } from './fixture.js';

function sampled(p: LatticeNet, stop: number, step: number) {
  const t: number[] = [];
  for (let x = 0; x <= stop + 1e-18; x += step) t.push(Math.round(x / step) * step);
  return { t, v: t.map((x) => latticeRising(p, x)) };
}

describe('edgeCrossings', () => {
  it('finds the flight-time crossings of a clean edge where the lattice closed form puts them', () => {
    // Lattice diagram: V+ = 1.2·50/75 = 0.8 V, open end doubles it: a 1.6 V ramp over 0.2 ns from Td = 0.5 ns,
    // slope 8 V/ns, so VIL = 0.5 V at 0.5625 ns and VIH = 0.7 V at 0.5875 ns. The edge is linear between
    // samples, so interpolation is exact; tolerance covers float rounding only.
    const p = { vdd: 1.2, rs: 25, z0: 50, td: 0.5e-9, ramp: 0.2e-9 };
    const { t, v } = sampled(p, 4e-9, 5e-12);
    const rising = edgeCrossings('rising', t, v, 0.5, 0.7);
    expect(rising.map((c) => c.level)).toEqual(['VIL', 'VIH']); // first and last VIH coincide: one marker
    expect(rising[0].t).toBeCloseTo(0.5625e-9, 15);
    expect(rising[1].t).toBeCloseTo(0.5875e-9, 15);
    const falling = edgeCrossings('falling', t, v.map((x) => 1.2 - x), 0.5, 0.7);
    expect(falling.map((c) => c.level)).toEqual(['VIH', 'VIL']);
    expect(falling[0].t).toBeCloseTo(0.5625e-9, 15);
  });

  it('marks the last far-threshold crossing after ringback re-enters the band', () => {
    // Γs = (10-50)/(10+50) = -2/3, V+ = 1 V. Arrivals: +2 V at 0.5 ns, -4/3 V at 1.5 ns (level 0.667 V,
    // back inside the band), +8/9 V at 2.5 ns with slope (8/9)/0.2 ns: VIH again at 2.5 + (0.7-2/3)/4.444 ns.
    const p = { vdd: 1.2, rs: 10, z0: 50, td: 0.5e-9, ramp: 0.2e-9 };
    const { t, v } = sampled(p, 4e-9, 5e-12);
    const rising = edgeCrossings('rising', t, v, 0.5, 0.7);
    const vih = rising.filter((c) => c.level === 'VIH');
    expect(vih).toHaveLength(2);
    expect(vih[1].t).toBeCloseTo((2.5 + (0.7 - 2 / 3) / (8 / 9 / 0.2)) * 1e-9, 15);
  });
});

describe('pickWaveform', () => {
  it('plots the receiver and corner of the failing check, both edges, with the driver rails', () => {
    const dq3 = loadResult().buses[0].nets.find((n) => n.net === 'DQ3')!; // overshoot fails at U5, fast corner
    const w = latticeNetWaveforms('DQ3', 'U5', { vdd: 1.2, rs: 18, z0: 50, td: 0.35e-9, ramp: 0.19e-9 }, ['slow', 'fast'],
      { vil: 0.5, vih: 0.7, vmaxAbs: 1.5, vminAbs: -0.3 });
    const pick = pickWaveform(dq3, w, { low: 0, high: 1.26 })!;
    expect(pick.receiver).toBe('U5');
    expect(pick.corner).toBe('fast');
    expect(pick.input.traces.map((tr) => tr.edge)).toEqual(['rising', 'falling']);
    expect(pick.input.levels).toEqual({ vil: 0.5, vih: 0.7, vmaxAbs: 1.5, vminAbs: -0.3, railLow: 0, railHigh: 1.26 });
    expect(pick.input.crossings!.length).toBeGreaterThanOrEqual(4);
  });

  it('returns null when the waveforms hold no trace for any receiver', () => {
    const dq3 = loadResult().buses[0].nets.find((n) => n.net === 'DQ3')!;
    expect(pickWaveform(dq3, { net: 'DQ3', corners: [], thresholds: [] }, null)).toBeNull();
  });
});
