/**
 * Largest |a − b| over every node and sample of two runs of one net, in units of the driver swing;
 * asserts that both hold the same nodes and sample counts. Shared by the time-loop tests.
 */
import { expect } from 'vitest';
import type { Circuit } from '../../../core/circuit/types.js';

export function swingDeviation(circuit: Circuit, a: { nodes: string[]; v: Float64Array[] }, b: { nodes: string[]; v: Float64Array[] }): number {
  expect(a.nodes).toEqual(b.nodes);
  const swing = Math.abs(circuit.driver.vhigh - circuit.driver.vlow);
  let worst = 0;
  a.v.forEach((w, i) => {
    expect(w.length).toBe(b.v[i].length);
    for (let m = 0; m < w.length; m++) worst = Math.max(worst, Math.abs(w[m] - b.v[i][m]) / swing);
  });
  return worst;
}
