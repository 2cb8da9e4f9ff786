/**
 * simulateNet derives the falling edge of a symmetric driver by superposition (linear network:
 * falling(t) = DC(vlow) + DC(vhigh) − rising(t)). Checked against a direct falling run; the two differ
 * by round-off only (1e-12 V: the rounding of a few thousand steps of double arithmetic).
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { parseNetFile } from '../../../core/circuit/parse.js';
import { simulateEdge, simulateNet } from '../../../core/solver/transient.js';

describe('falling edge by superposition', () => {
  for (const name of ['flyby-4-stubs', 'thevenin-end', 't-branch-ac']) {
    it(`${name}: equals a direct falling simulation`, () => {
      const c = parseNetFile(JSON.parse(readFileSync(new URL(`../../../fixtures/nets/${name}.json`, import.meta.url), 'utf8')), name);
      const { falling } = simulateNet(c);
      const direct = simulateEdge(c, 'falling');
      expect(falling.t.length).toBe(direct.t.length);
      let worst = 0;
      falling.v.forEach((w, i) => w.forEach((x, m) => (worst = Math.max(worst, Math.abs(x - direct.v[i][m])))));
      expect(worst).toBeLessThan(1e-12);
      direct.final.forEach((x, i) => expect(Math.abs(falling.final[i] - x)).toBeLessThan(1e-12));
    });
  }

  it('an asymmetric driver is simulated edge by edge (no superposition)', () => {
    const c = parseNetFile(JSON.parse(readFileSync(new URL('../../../fixtures/nets/series-term.json', import.meta.url), 'utf8')), 'st');
    const { falling } = simulateNet(c);
    const direct = simulateEdge(c, 'falling');
    expect(falling.step).toBe(direct.step); // 450 ps fall vs 500 ps rise: its own step
    expect(falling.step).not.toBe(simulateEdge(c, 'rising').step);
  });
});
