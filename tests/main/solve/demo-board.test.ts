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

/**
 * The demo's timing is set so that the physics of docs/design.md §5-§6 gives exactly its list of
 * faults: the local bus's clock LB_CLK leaves the controller from its own clock output (MC-LBCLK, Tco
 * 0.10-0.25 ns, ahead of the data's 1-3.5 ns), so hold holds with the clock net in the budget; the
 * address outputs' Tco,min (0.40 ns) keeps hold outside the guard band against CK0; DQ12 and DQ58 are
 * routed long enough to stay tight and failing with strobes timed at their legs' crossing.
 */
describe('the demo board', () => {
  it('fails exactly the deliberately broken nets and shows the tight one as tight', async () => {
    const board = await service.solveBoardSync({});
    const nets = board.buses.flatMap((b) => b.nets);
    expect(nets.length).toBeGreaterThanOrEqual(100); // docs/design.md §1.2: 100+ nets
    const failing = nets.filter((n) => n.status === 'fail' && !n.marginsFrom).map((n) => n.net);
    // every deliberate fault fails, and nothing else does
    expect(failing.sort()).toEqual(Object.keys(DEMO_DELIBERATE_FAILURES).sort());
    for (const name of Object.keys(DEMO_DELIBERATE_TIGHT)) {
      expect(nets.find((n) => n.net === name)?.status, name).toBe('tight');
    }
    expect(nets.filter((n) => n.status === 'tight' && !n.marginsFrom).map((n) => n.net)).toEqual(Object.keys(DEMO_DELIBERATE_TIGHT));
    // the clock nets enter the common-clock budgets (docs/design.md §6.1): each hold budget of the
    // local bus carries a line item sourced from LB_CLK's simulation
    const local = board.buses.find((b) => b.bus === 'LOCAL')!.nets.find((n) => n.net === 'LB_D0')!;
    expect(local.corners.flatMap((c) => c.holdItems).some((i) => /LB_CLK/.test(`${i.name} ${i.detail}`))).toBe(true);
    for (const bus of board.buses) {
      if (!bus.worstNet) continue;
      const worst = bus.nets.find((n) => n.net === bus.worstNet)!;
      // A strobe row repeats its data nets' margins; the bus must name the data net that owns them.
      expect(worst.marginsFrom, `${bus.bus} names ${bus.worstNet}`).toBeUndefined();
    }
    // Every number is a real result, traceable to its budget (docs/design.md §6): each corner's margin is
    // the sum of its signed line items (BudgetLineItem: "margin = sum of signed values"), the net's margin
    // is the worst corner's, and the minimum flight never exceeds the maximum (§5: first crossing of the
    // near threshold vs last crossing of the far one). A NaN or a margin not built from its items fails
    // here. Tolerance 1e-15 s: the sums are of a handful of values of order 1e-9 s, so double rounding
    // stays below 1e-17 s; any real mismatch is picoseconds (1e-12 s).
    const timed = nets.filter((n) => !n.marginsFrom);
    expect(timed.length).toBeGreaterThan(0);
    for (const n of timed) {
      expect(n.corners.length, n.net).toBeGreaterThan(0);
      for (const c of n.corners) {
        const sum = (items: { value: number }[]) => items.reduce((total, item) => total + item.value, 0);
        // every demo receiver crosses its thresholds, so no margin or flight is unknown (null)
        expect(c.setupMargin, `${n.net} ${c.corner} setup`).not.toBeNull();
        expect(c.holdMargin, `${n.net} ${c.corner} hold`).not.toBeNull();
        expect(Math.abs(sum(c.setupItems) - c.setupMargin!), `${n.net} ${c.corner} setup`).toBeLessThan(1e-15);
        expect(Math.abs(sum(c.holdItems) - c.holdMargin!), `${n.net} ${c.corner} hold`).toBeLessThan(1e-15);
        expect(c.flightMin!, `${n.net} ${c.corner}`).toBeLessThanOrEqual(c.flightMax!);
      }
      expect(n.setupMargin, n.net).toBe(Math.min(...n.corners.map((c) => c.setupMargin!)));
      expect(n.holdMargin, n.net).toBe(Math.min(...n.corners.map((c) => c.holdMargin!)));
      expect(n.flightMin!, n.net).toBeLessThanOrEqual(n.flightMax!);
    }
  });
});
