/**
 * Measurement definitions (docs/design.md §5) on hand-made piecewise-linear waveforms whose answers follow
 * from the definitions by hand (worked out in the comments), plus launch levels of simulated nets
 * against the closed form V+ = Vs·Z0/(Z0+Zs) (docs/design.md §2).
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { parseNetFile } from '../../../core/circuit/parse.js';
import type { Circuit } from '../../../core/circuit/types.js';
import { simulateNet, type Waveform } from '../../../core/solver/transient.js';
import { measureEdge } from '../../../core/measure/edge.js';
import { measureReceivers } from '../../../core/measure/net.js';
import { valueAt } from '../../../core/measure/crossings.js';
import { referenceLoadCrossing } from '../../../core/measure/reference-load.js';

const ns = 1e-9;
/**
 * Round-off bound for times, s. Every time below is built from at most ~10 double operations on values of
 * order 1e-9 s (samples at i·1 ps, linear interpolation of levels of order 1 V on slopes of order 1 V/ns),
 * each off by at most half an ulp (2^-53 ≈ 1.1e-16 relative), so code and hand value agree to about
 * 10 × 1.1e-16 × 5e-9 s ≈ 6e-24 s. 1e-21 s keeps a 100-fold margin over that and is still 1e9 times smaller
 * than a 1 ps slip, so any wrong sample, level or interval fails. (Common practice, no source.)
 */
const ROUND_OFF_S = 1e-21;

const circuit: Circuit = parseNetFile(
  {
    driver: { node: 'drv', vlow: 0, vhigh: 1.1, rout: 25, riseTime: '400ps', fallTime: '400ps' },
    elements: [{ kind: 'line', a: 'drv', b: 'rx', z0: 50, delay: '1ns' }],
    receivers: [{ node: 'rx', vil: 0.5, vih: 1.0, vmaxAbs: 1.15, vminAbs: -0.3 }],
    stop: '5ns',
  },
  'synthetic',
);

/** Samples piecewise-linear corners [[t, v], ...] every 1 ps from 0 to 5 ns. */
function pwl(corners: [number, number][]): Float64Array {
  const t = Float64Array.from(corners, (c) => c[0]);
  const v = Float64Array.from(corners, (c) => c[1]);
  return Float64Array.from({ length: 5001 }, (_, i) => valueAt(t, v, i * 1e-12));
}

function wave(rx: [number, number][], drv: [number, number][], final: number, edge: 'rising' | 'falling' = 'rising'): Waveform {
  const t = Float64Array.from({ length: 5001 }, (_, i) => i * 1e-12);
  const v = [pwl(drv), pwl(rx)];
  return { edge, t, nodes: ['drv', 'rx'], v, step: 1e-12, initial: Float64Array.from(v, (x) => x[0]), final: Float64Array.of(0.733, final) };
}

describe('measureEdge on a hand-made rising waveform with ringback into the band', () => {
  // rx: 0 V until 1 ns, ramp to 1.2 V at 1.5 ns, down to 0.9 V at 2 ns, up to 1.1 V at 2.5 ns, 1.05 V from 3 ns.
  const rx: [number, number][] = [[0, 0], [1 * ns, 0], [1.5 * ns, 1.2], [2 * ns, 0.9], [2.5 * ns, 1.1], [3 * ns, 1.05], [5 * ns, 1.05]];
  // Driver pin: ramp to 0.6 V over the 0.5 ns full ramp, then 0.9 V after the 2 ns return.
  const drv: [number, number][] = [[0, 0], [0.5 * ns, 0.6], [2 * ns, 0.6], [2.1 * ns, 0.9], [5 * ns, 0.9]];
  const m = measureEdge(wave(rx, drv, 1.05), circuit, 'rx', 'rising', { referenceCrossing: 0.3 * ns });
  const close = (x: number | null, y: number, tol: number) => expect(Math.abs((x ?? NaN) - y)).toBeLessThan(tol);

  it('finds interpolated crossings (exact on linear segments, to round-off)', () => {
    close(m.tFirstVil, 1 * ns + 0.5 * ns * (0.5 / 1.2), ROUND_OFF_S);
    close(m.tFirstVih, 1 * ns + 0.5 * ns * (1.0 / 1.2), ROUND_OFF_S);
    close(m.tLastVih, 2.25 * ns, ROUND_OFF_S); // 0.9 -> 1.1 V over 2..2.5 ns crosses 1.0 V half way
    expect(m.tNearFirst).toBe(m.tFirstVil);
    close(m.tFirstVref, 1 * ns + 0.5 * ns * (0.75 / 1.2), ROUND_OFF_S); // Vref absent: (VIL + VIH) / 2 = 0.75 V
    close(m.tLastVref, m.tFirstVref!, ROUND_OFF_S); // never returns below 0.75 V
    close(m.tFarLast, 2.25 * ns, ROUND_OFF_S);
  });

  it('peak, ringback margin, first incidence and monotonicity follow the definitions', () => {
    close(m.vmax, 1.2, 1e-12);
    close(m.vmin, 0, 1e-12);
    close(m.ringbackMargin, 0.9 - 1.0, 1e-12); // worst return after the first peak: 0.9 V against VIH 1.0 V
    expect(m.firstIncidence).toBe(false); // it falls back into the band
    expect(m.monotonic).toBe(false); // 1.0 -> 0.9 V inside the band is a 0.1 V reversal
    // The open end's echo comes back off the 25 Ω driver with Γ = −1/3 at 3 ns (opposing the edge); the
    // first echo of the edge's sign, +1/9, would arrive at 5 ns: the end of this 5 ns waveform.
    close(m.firstIncidenceWindow, 5 * ns, ROUND_OFF_S);
    close(m.vFirstIncidence, 1.2, 1e-12);
  });

  it('overshoot against the driver high level and its time-area; margins against absolute limits', () => {
    close(m.overshoot, 0.1, 1e-12);
    // Triangle above 1.1 V: from 1.4583 ns to 1.6667 ns, 0.1 V high: area = 0.5·0.1·0.20833e-9 V·s.
    // 1 % tolerance: the integral is trapezoidal over 1 ps samples that miss the exact 1.1 V crossings.
    const tUp = 1 * ns + 0.5 * ns * (1.1 / 1.2);
    const tDown = 1.5 * ns + 0.5 * ns * (0.1 / 0.3);
    const area = 0.5 * 0.1 * (tDown - tUp);
    expect(Math.abs(m.overshootArea - area) / area).toBeLessThan(0.01);
    close(m.undershoot, 0, 1e-12);
    close(m.overshootMargin, 1.15 - 1.2, 1e-12);
    close(m.undershootMargin, 0 - -0.3, 1e-12);
  });

  it('settling time: last exit from vFinal ± band (5 % of the 1.1 V swing = 0.055 V)', () => {
    // |v − 1.05| > 0.055 last holds on the 0.9 -> 1.1 V segment below 0.995 V, reached at 2.2375 ns.
    close(m.settlingTime, 2 * ns + 0.5 * ns * (0.095 / 0.2), ROUND_OFF_S);
  });

  it('launch level and compensated flight times', () => {
    close(m.vLaunch, 0.6, 1e-12); // pin at the end of the 0.5 ns ramp, before the 2 ns return
    close(m.vLaunchClosedForm, (1.1 * 50) / 75, 1e-12); // V+ = Vs·Z0/(Z0+Zs)
    close(m.flightTimeMin, m.tFirstVil! - 0.3 * ns, ROUND_OFF_S);
    close(m.flightTimeMax, 2.25 * ns - 0.3 * ns, ROUND_OFF_S);
  });
});

describe('measureEdge on a clean falling edge', () => {
  // rx: 1.1 V until 1 ns, falls linearly to 0 V at 1.5 ns, stays.
  const m = measureEdge(wave([[0, 1.1], [1 * ns, 1.1], [1.5 * ns, 0], [5 * ns, 0]], [[0, 1.1], [0.5 * ns, 0.4], [5 * ns, 0.4]], 0, 'falling'), circuit, 'rx', 'falling');
  it('switches on the first incident wave, monotonic, crossings in the falling direction', () => {
    expect(m.firstIncidence).toBe(true);
    expect(m.monotonic).toBe(true);
    expect(Math.abs(m.tFirstVih! - (1 * ns + 0.5 * ns * (0.1 / 1.1)))).toBeLessThan(ROUND_OFF_S);
    expect(Math.abs(m.tLastVil! - (1 * ns + 0.5 * ns * (0.6 / 1.1)))).toBeLessThan(ROUND_OFF_S);
    expect(m.ringbackMargin).toBeCloseTo(0.5, 12); // never returns: stays 0.5 V below VIL
    expect(m.tLastVih).not.toBeNull();
    expect(m.flightTimeMin).toBeNull(); // no reference crossing given
  });
  it('rejects a waveform of the other edge', () => {
    expect(() => measureEdge(wave([[0, 0]], [[0, 0]], 0, 'falling'), circuit, 'rx', 'rising')).toThrow(/falling edge/);
  });
});

describe('measurements of simulated fixture nets', () => {
  const names = ['cap-open-end', 'series-term', 'layer-change', 'flyby-4-stubs', 'thevenin-end', 't-branch-ac'];
  for (const name of names) {
    it(`${name}: every number is finite (never NaN); null only where a quantity does not exist`, () => {
      const c = parseNetFile(JSON.parse(readFileSync(new URL(`../../../fixtures/nets/${name}.json`, import.meta.url), 'utf8')), name);
      const result = measureReceivers(c, simulateNet(c));
      for (const r of result) {
        for (const m of [r.rising, r.falling]) {
          for (const [key, value] of Object.entries(m)) {
            if (typeof value === 'number') expect(Number.isFinite(value), `${r.node} ${m.edge} ${key}`).toBe(true);
          }
        }
      }
    });
  }

  it('cap-open-end: simulated launch equals the closed form Vs·Z0/(Z0+Zs) = 1.8·50/75 = 1.2 V', () => {
    // Before the first return (2 ns) the pin is a resistive divider of the ramp: exact up to round-off.
    const c = parseNetFile(JSON.parse(readFileSync(new URL('../../../fixtures/nets/cap-open-end.json', import.meta.url), 'utf8')), 'cap');
    const [r] = measureReceivers(c, simulateNet(c));
    expect(Math.abs(r.rising.vLaunch - 1.2)).toBeLessThan(1e-9);
    expect(Math.abs(r.rising.vLaunchClosedForm! - 1.2)).toBeLessThan(1e-12);
    expect(Math.abs(r.falling.vLaunch - 0.6)).toBeLessThan(1e-9); // 1.8 V − 1.2 V
    // The open end doubles the launched wave (docs/design.md §2), slowed by the 3 pF load: 2.4 V less the RC
    // tail of 3 pF·50 Ω (50 mV allowed). The 25 Ω source re-reflects with Γs = −1/3 at 3 ns, opposing the
    // edge, so the first-incidence window runs to the first echo of the edge's sign, +1/9 at 5 ns; the
    // capacitor's own echo starts negative, so the 3 ns return opens with a brief rise (2.44 V in the
    // simulation): allowed up to 2.5 V (1.2 V·(2 + 1/3·2·0.15), a bound by hand from the lattice).
    // The window moves by the lag of the incident edge's start (docs/design.md §5): the 3 pF load makes
    // the edge start late by less than its time constant Z0·C = 150 ps (an RC-slowed ramp's start,
    // extrapolated from its 2 % and 10 % points, lies inside one time constant: bound by hand).
    expect(r.rising.firstIncidenceWindow).toBeGreaterThan(5e-9);
    expect(r.rising.firstIncidenceWindow - 5e-9).toBeLessThan(150e-12);
    expect(r.rising.vFirstIncidence).toBeLessThanOrEqual(2.5);
    expect(r.rising.vFirstIncidence).toBeGreaterThan(2.4 - 0.05);
    expect(r.rising.firstIncidence).toBe(true);
  });

  it('series-term: reference-load crossing compensates the flight time (flight = receiver crossing − reference)', () => {
    const c = parseNetFile(JSON.parse(readFileSync(new URL('../../../fixtures/nets/series-term.json', import.meta.url), 'utf8')), 'st');
    const [r] = measureReceivers(c, simulateNet(c));
    expect(r.rising.flightTimeMin).not.toBeNull();
    expect(r.rising.flightTimeMin!).toBeLessThan(r.rising.tFirstVil!);
    const reference = referenceLoadCrossing(c.driver, 'rising');
    expect(Math.abs(r.rising.flightTimeMin! - (r.rising.tFirstVil! - reference))).toBeLessThan(ROUND_OFF_S);
    expect(Math.abs(r.rising.flightTimeMax! - (r.rising.tLastVih! - reference))).toBeLessThan(ROUND_OFF_S);
  });
});
