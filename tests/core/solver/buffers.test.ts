/**
 * Reused sample storage (WaveformBuffers) changes no sample: every fixture net simulated with buffers
 * that a different, larger net used before gives bit-for-bit the waveforms of a fresh simulation.
 * Exact equality is the right check: the arithmetic is the same, only where the samples live differs
 * (common practice, no source).
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { parseNetFile } from '../../../core/circuit/parse.js';
import { simulateNet, WaveformBuffers } from '../../../core/solver/transient.js';

const FIXTURES = ['cap-open-end', 'series-term', 'layer-change', 'flyby-4-stubs', 'thevenin-end', 't-branch-ac', 'asymmetric-driver'];
const load = (name: string) =>
  parseNetFile(JSON.parse(readFileSync(new URL(`../../../fixtures/nets/${name}.json`, import.meta.url), 'utf8')), name);

describe('reused waveform buffers', () => {
  it('give the same samples as fresh storage, net after net', () => {
    const buffers = new WaveformBuffers();
    simulateNet(load('flyby-4-stubs'), { buffers }); // leaves longer, unrelated samples in every slot
    for (const name of FIXTURES) {
      const circuit = load(name);
      const fresh = simulateNet(circuit);
      const reused = simulateNet(circuit, { buffers });
      for (const edge of ['rising', 'falling'] as const) {
        expect(Array.from(reused[edge].t), `${name} ${edge} t`).toEqual(Array.from(fresh[edge].t));
        expect(reused[edge].v.map((w) => Array.from(w)), `${name} ${edge} v`).toEqual(fresh[edge].v.map((w) => Array.from(w)));
      }
    }
  });
});
