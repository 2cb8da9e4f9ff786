/**
 * The demo board end to end through the solve service: the nets made wrong on purpose (and only they)
 * fail, the tight one is tight, and every bus names as its worst net one that owns its margins.
 * Expectations come from the demo's own list of deliberate faults (fixtures/demo/demo-project.ts) —
 * invented data, no external source.
 */
import { afterAll, describe, expect, it } from 'vitest';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { ProjectStore } from '../../../main/services/project/project-store.js';
import { SolveService } from '../../../main/services/solve/solve-service.js';
import { buildDemoProject, DEMO_DELIBERATE_FAILURES, DEMO_DELIBERATE_TIGHT } from '../../../fixtures/demo/demo-project.js';

const dir = mkdtempSync(join(tmpdir(), 'slackline-demo-board-'));
const store = ProjectStore.create(join(dir, 'demo.slackline'), buildDemoProject());
const service = new SolveService(store, { workers: 0 });
afterAll(async () => {
  await service.close();
  store.close();
  rmSync(dir, { recursive: true, force: true });
});

describe('the demo board', () => {
  it('fails exactly the deliberately broken nets and shows the tight one as tight', async () => {
    const board = await service.solveBoardSync({});
    const nets = board.buses.flatMap((b) => b.nets);
    expect(nets.length).toBeGreaterThanOrEqual(100); // issue 4: 100+ nets
    const failing = nets.filter((n) => n.status === 'fail' && !n.marginsFrom).map((n) => n.net).sort();
    expect(failing).toEqual(Object.keys(DEMO_DELIBERATE_FAILURES).sort());
    for (const name of Object.keys(DEMO_DELIBERATE_TIGHT)) {
      expect(nets.find((n) => n.net === name)?.status).toBe('tight');
    }
    for (const bus of board.buses) {
      if (!bus.worstNet) continue;
      const worst = bus.nets.find((n) => n.net === bus.worstNet)!;
      // A strobe row repeats its data nets' margins; the bus must name the data net that owns them.
      expect(worst.marginsFrom, `${bus.bus} names ${bus.worstNet}`).toBeUndefined();
    }
    for (const n of nets) {
      for (const value of [n.setupMargin, n.holdMargin, n.flightMin, n.flightMax, n.skew]) expect(Number.isFinite(value)).toBe(true);
    }
  });
});
