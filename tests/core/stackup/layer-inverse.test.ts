/**
 * Inverses on a stackup layer (core/stackup/layer-inverse.ts): the gap found for a target Zdiff and
 * the width found for a target Z0 must give that impedance back through the same forward model
 * within the stated 0.05 % (the requirement is 0.5 %), and out-of-reach targets must be refused
 * naming the target. Source: the forward model itself (a round trip: the inverse is checked against
 * pairOnLayer/traceOnLayer, whose own accuracy is checked in the field-solver and closed-form suites).
 */
import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { gapForZdiffOnLayer, pairOnLayer, stackupFromJson, traceOnLayer, widthForZ0OnLayer } from '../../../core/stackup/index.js';
import { InputError } from '../../../core/errors.js';

const stackup = stackupFromJson(JSON.parse(readFileSync(new URL('../../../fixtures/stackups/six-layer-dual-stripline.json', import.meta.url), 'utf8')), 'six-layer-dual-stripline.json');

describe('inverses on a stackup layer', () => {
  it('finds the pair gap for 100 Ω on a masked outer layer and on a stripline layer', () => {
    for (const [layer, width] of [['L1', 5 * 25.4e-6], ['L3', 4 * 25.4e-6]] as const) {
      const gap = gapForZdiffOnLayer(stackup, layer, width, 100);
      expect(Math.abs(pairOnLayer(stackup, layer, width, gap).zdiff - 100) / 100).toBeLessThan(5e-4);
      // a wider gap couples less and raises Zdiff (monotonic, so the root is unique)
      expect(pairOnLayer(stackup, layer, width, gap * 1.2).zdiff).toBeGreaterThan(100);
    }
  });

  it('finds the width for 50 Ω', () => {
    const w = widthForZ0OnLayer(stackup, 'L3', 50);
    expect(Math.abs(traceOnLayer(stackup, 'L3', w).z0 - 50) / 50).toBeLessThan(5e-4);
  });

  it('refuses a target out of reach, naming it', () => {
    // 300 Ω differential needs more than twice the single trace's Z0: no gap can give it
    expect(() => gapForZdiffOnLayer(stackup, 'L3', 4 * 25.4e-6, 300)).toThrow(InputError);
    expect(() => gapForZdiffOnLayer(stackup, 'L3', 4 * 25.4e-6, 300)).toThrow(/target Zdiff: 300 Ω is out of reach on layer "L3"/);
    expect(() => widthForZ0OnLayer(stackup, 'L3', -5)).toThrow(/target Z0: must be a positive impedance/);
  });
});
