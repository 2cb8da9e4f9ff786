/**
 * The WebAssembly time loop (core/solver/march.wat, run by marchWasm) against the JavaScript one
 * (marchJs, the reference) on every fixture net, both edges, at the automatic step and at steps that
 * split the delays differently, and on a net whose factors are not diagonal (series elements). Both do
 * the same IEEE-754 operations in the same order, so they should agree to the last bit; the check
 * allows 1e-12 of the driver swing (common practice, no source: far below any measured quantity).
 * Also: the kernel is really instantiated under Node (else both runs would be the JavaScript loop),
 * and the committed bytes are what the source assembles to.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { parseNetFile } from '../../../core/circuit/parse.js';
import type { Edge } from '../../../core/circuit/types.js';
import { chooseStep, chooseStop, simulateEdge, simulateNet, WaveformBuffers } from '../../../core/solver/transient.js';
import { marchKernel } from '../../../core/solver/march.js';
import { assemble } from '../../../scripts/build-wasm.mjs';
import { swingDeviation } from './deviation.js';

const FIXTURES = ['cap-open-end', 'series-term', 'layer-change', 'flyby-4-stubs', 'thevenin-end', 't-branch-ac', 'asymmetric-driver'];
const load = (name: string) =>
  parseNetFile(JSON.parse(readFileSync(new URL(`../../../fixtures/nets/${name}.json`, import.meta.url), 'utf8')), name);

describe('WebAssembly time loop against the JavaScript loop', () => {
  it('is instantiated under Node (unless SLACKLINE_MARCH=js asks for the JavaScript loop)', () => {
    expect(marchKernel() !== null).toBe(process.env.SLACKLINE_MARCH !== 'js');
  });

  for (const name of FIXTURES) {
    it(`${name}: both edges at the automatic step, same samples`, () => {
      const circuit = load(name);
      for (const edge of ['rising', 'falling'] as Edge[]) {
        const js = simulateEdge(circuit, edge, { loop: 'js' });
        const wasm = simulateEdge(circuit, edge);
        expect(js.v.some((v) => v.some((x, m) => x !== v[0] && m > 0)), `${name} moves`).toBe(true);
        expect(swingDeviation(circuit, wasm, js), `${name} ${edge}`).toBeLessThan(1e-12);
      }
    });
  }

  it('same samples at 0.37 and 0.5 of the automatic step (other splits of the delays into whole steps)', () => {
    for (const name of ['layer-change', 'flyby-4-stubs', 't-branch-ac', 'series-term']) {
      const circuit = load(name);
      const stop = chooseStop(circuit);
      for (const share of [0.37, 0.5]) {
        const options = { step: share * chooseStep(circuit, 'rising', stop), stop };
        const js = simulateEdge(circuit, 'rising', { ...options, loop: 'js' });
        expect(swingDeviation(circuit, simulateEdge(circuit, 'rising', options), js), `${name} ${share}`).toBeLessThan(1e-12);
      }
    }
  });

  it('same samples from reused storage after a larger net (the kernel memory keeps no state between runs)', () => {
    const buffers = new WaveformBuffers();
    simulateNet(load('flyby-4-stubs'), { buffers });
    for (const name of FIXTURES) {
      const circuit = load(name);
      const js = simulateNet(circuit, { loop: 'js' });
      const wasm = simulateNet(circuit, { buffers });
      expect(swingDeviation(circuit, wasm.rising, js.rising), name).toBeLessThan(1e-12);
      expect(swingDeviation(circuit, wasm.falling, js.falling), name).toBeLessThan(1e-12);
    }
  });

  it('the committed module is what core/solver/march.wat assembles to', async () => {
    const committed = readFileSync(new URL('../../../core/solver/march-wasm.ts', import.meta.url), 'utf8');
    expect(committed).toBe(await assemble());
  });
});
