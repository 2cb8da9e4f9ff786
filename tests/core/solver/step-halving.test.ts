/**
 * Convergence of the automatic step (docs/design.md §2.2: convergence is proved by halving the step;
 * §2.3: halving the step changes no metric by more than 0.2 % of the swing). Voltage metrics are
 * compared directly against 0.2 % of the driver swing; time metrics are converted to volts along the
 * driver's own edge (swing / full ramp), i.e. they may move by at most 0.2 % of the full ramp — this
 * program's reading of "0.2 % of the swing" for a time. Settling time is left out on purpose: it is the
 * last exit from a band, so it jumps by a ringing period when a peak grazes the band edge.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { parseNetFile } from '../../../core/circuit/parse.js';
import { fullRamp } from '../../../core/circuit/topology.js';
import { chooseStep, chooseStop, simulateEdge } from '../../../core/solver/transient.js';
import { measureEdge, type EdgeMeasurements } from '../../../core/measure/edge.js';

const FIXTURES = ['cap-open-end', 'series-term', 'layer-change', 'flyby-4-stubs', 'thevenin-end', 't-branch-ac', 'asymmetric-driver'];
const VOLTAGE_KEYS = ['vLaunch', 'vFirstIncidence', 'vmax', 'vmin', 'ringbackMargin', 'overshoot', 'undershoot'] as const;
const TIME_KEYS = ['tFirstVil', 'tFirstVih', 'tLastVih', 'tLastVil'] as const;

describe('halving the automatic step', () => {
  for (const name of FIXTURES) {
    it(`changes no metric of ${name} by more than 0.2 % of the swing`, () => {
      const circuit = parseNetFile(JSON.parse(readFileSync(new URL(`../../../fixtures/nets/${name}.json`, import.meta.url), 'utf8')), name);
      const swing = circuit.driver.vhigh - circuit.driver.vlow;
      const stop = circuit.stop ?? chooseStop(circuit);
      for (const edge of ['rising', 'falling'] as const) {
        const h = chooseStep(circuit, edge, stop);
        const coarse = simulateEdge(circuit, edge, { step: h, stop });
        const fine = simulateEdge(circuit, edge, { step: h / 2, stop });
        const timeTolerance = 0.002 * fullRamp(circuit, edge);
        for (const r of circuit.receivers) {
          const a: EdgeMeasurements = measureEdge(coarse, circuit, r.node, edge);
          const b: EdgeMeasurements = measureEdge(fine, circuit, r.node, edge);
          for (const key of VOLTAGE_KEYS) {
            const x = a[key];
            const y = b[key];
            expect(x === null, `${r.node} ${edge} ${key} exists in both`).toBe(y === null);
            if (x !== null && y !== null) expect(Math.abs(x - y), `${r.node} ${edge} ${key}`).toBeLessThanOrEqual(0.002 * swing);
          }
          for (const key of TIME_KEYS) {
            const x = a[key];
            const y = b[key];
            expect(x === null, `${r.node} ${edge} ${key} exists in both`).toBe(y === null);
            if (x !== null && y !== null) expect(Math.abs(x - y), `${r.node} ${edge} ${key}`).toBeLessThanOrEqual(timeTolerance);
          }
          expect(a.firstIncidence, `${r.node} ${edge} firstIncidence`).toBe(b.firstIncidence);
          expect(a.monotonic, `${r.node} ${edge} monotonic`).toBe(b.monotonic);
        }
      }
    });
  }
});
