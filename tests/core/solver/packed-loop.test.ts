/**
 * The packed time loop (core/solver/march.ts, as the product runs it: one pass per element kind per step, sources
 * completed from the previous solution, rings and vectors reused from edge to edge, the diagonal fast
 * path) against the plain reference solver of reference-march.ts on every fixture net, both edges, at
 * the automatic step and at other steps. The two do the same arithmetic in a different order, so they
 * agree to round-off: 1e-12 of the driver swing is a hundred times the largest difference seen
 * (9e-15 V on these nets) and far below any measured quantity (common practice, no source).
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { parseNetFile } from '../../../core/circuit/parse.js';
import type { Edge } from '../../../core/circuit/types.js';
import { chooseStep, chooseStop, simulateEdge, simulateNet, WaveformBuffers } from '../../../core/solver/transient.js';
import { referenceEdge } from './reference-march.js';
import { swingDeviation } from './deviation.js';

const FIXTURES = ['cap-open-end', 'series-term', 'layer-change', 'flyby-4-stubs', 'thevenin-end', 't-branch-ac', 'asymmetric-driver'];
const load = (name: string) =>
  parseNetFile(JSON.parse(readFileSync(new URL(`../../../fixtures/nets/${name}.json`, import.meta.url), 'utf8')), name);

describe('packed time loop against the plain reference solver', () => {
  for (const name of FIXTURES) {
    it(`${name}: both edges at the automatic step within 1e-12 of the swing`, () => {
      const circuit = load(name);
      for (const edge of ['rising', 'falling'] as Edge[]) {
        expect(swingDeviation(circuit, simulateEdge(circuit, edge), referenceEdge(circuit, edge)), edge).toBeLessThan(1e-12);
      }
    });
  }

  it('agrees at steps that split the delays differently (0.37 and 0.5 of the automatic step)', () => {
    for (const name of ['layer-change', 'flyby-4-stubs', 't-branch-ac']) {
      const circuit = load(name);
      const stop = chooseStop(circuit);
      for (const share of [0.37, 0.5]) {
        const step = share * chooseStep(circuit, 'rising', stop);
        const options = { step, stop };
        expect(swingDeviation(circuit, simulateEdge(circuit, 'rising', options), referenceEdge(circuit, 'rising', options)), `${name} ${share}`).toBeLessThan(1e-12);
      }
    }
  });

  it('state left from a larger net in the reused storage changes nothing (simulateNet with buffers)', () => {
    const buffers = new WaveformBuffers();
    simulateNet(load('flyby-4-stubs'), { buffers }); // longer rings, more nodes, other values
    for (const name of FIXTURES) {
      const circuit = load(name);
      const both = simulateNet(circuit, { buffers });
      expect(swingDeviation(circuit, both.rising, referenceEdge(circuit, 'rising')), name).toBeLessThan(1e-12);
      // a symmetric driver's falling edge is the superposition of the rising one (docs/design.md §2.2)
      expect(swingDeviation(circuit, both.falling, referenceEdge(circuit, 'falling')), name).toBeLessThan(1e-12);
    }
  });
});
