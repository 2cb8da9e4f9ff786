/**
 * Simulations a whole-board check of the demo costs (docs/design.md §6.3, "Length window"): counted
 * through SolveService.lastStats, where each (corner, edge) case simulated counts one. Board: the
 * invented demo on its linear models (fixtures/demo/demo-project.ts), as bench/board-scale.bench.ts
 * generates its boards. The claim is this program's own (the search's design), no external source.
 */
import { describe, expect, it } from 'vitest';
import { buildLinearDemoProject } from '../../../fixtures/demo/demo-project.js';
import { SolveService } from '../../../main/services/solve/solve-service.js';
import { memoryStore } from '../../../bench/memory-store.js';

describe('simulations of a board check', () => {
  it('average at most 14.5 per net on the linear demo, windows and suggestions included; 6 without them', async () => {
    const nets = buildLinearDemoProject().nets.length;
    const full = new SolveService(memoryStore(buildLinearDemoProject()), { workers: 0 });
    const base = new SolveService(memoryStore(buildLinearDemoProject()), { workers: 0, solve: { lengthWindow: false, suggestion: false } });
    try {
      await base.solveBoardSync();
      await full.solveBoardSync();
      // every net at 3 corners x 2 edges, and each strobe once more for its bus's data nets (stage 1)
      expect(base.lastStats.simulations / nets).toBeGreaterThanOrEqual(6);
      expect(base.lastStats.simulations / nets).toBeLessThan(6.5);
      // the searches add about 8.2 per net (14.2 in all); 15.7 when each edge's first trial went past the
      // zero (engine revision 8), 17.8 when each window edge's check bounded the other cases by the
      // spread of delay per metre, 27.3 with the search before engine revision 8
      expect(full.lastStats.simulations / nets).toBeLessThanOrEqual(14.5);
    } finally {
      await full.close();
      await base.close();
    }
  });
});
