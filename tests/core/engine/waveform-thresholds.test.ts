/**
 * Each corner's waveforms carry that corner's own levels (docs/design.md §4): VREF and the rails scale
 * with the corner's rail factor, the AC offsets VIH − VREF and VREF − VIL stay fixed. Demo data
 * (fixtures/demo, invented): DQ0's receiver MEM-DQ has VREF 0.6 V, VIL 0.5 V, VIH 0.7 V; the driver
 * MC-DQ swings 0-1.2 V; corners rail 0.95 (slow), 1 (typical), 1.05 (fast).
 */
import { describe, expect, it } from 'vitest';
import { buildDemoProject } from '../../../fixtures/demo/demo-project.js';
import { netWaveforms } from '../../../core/engine/waveforms.js';

describe("per-corner thresholds of a net's waveforms", () => {
  const w = netWaveforms(buildDemoProject(), 'DQ0');
  // by hand: VIH = 0.6·rail + 0.1, VIL = 0.6·rail − 0.1, VOH = 1.2·rail
  const expected: Record<string, { vil: number; vih: number; vhigh: number }> = {
    slow: { vil: 0.47, vih: 0.67, vhigh: 1.14 },
    typical: { vil: 0.5, vih: 0.7, vhigh: 1.2 },
    fast: { vil: 0.53, vih: 0.73, vhigh: 1.26 },
  };
  it("draws the slow corner's waveform against the slow corner's VIL/VIH and rails (1e-12 V: two float operations)", () => {
    for (const c of w.corners) {
      const th = c.thresholds!.find((x) => x.receiver === 'U10')!;
      const e = expected[c.corner];
      expect(Math.abs(th.vil - e.vil), c.corner).toBeLessThan(1e-12);
      expect(Math.abs(th.vih - e.vih), c.corner).toBeLessThan(1e-12);
      expect(Math.abs(th.vhigh - e.vhigh), c.corner).toBeLessThan(1e-12);
      expect(th.vlow).toBe(0);
    }
  });
});
