/**
 * A search probe's evaluation without words (NetBudgetInputs.words = false, docs/design.md §6.3):
 * the margins, statuses and line-item values are those of the full evaluation, only the details and
 * reasons are left out. Board: the invented demo on its linear models (fixtures/demo/demo-project.ts);
 * nets of each kind the searches evaluate: source-synchronous data, a strobe over its data nets, and
 * common-clock data with a simulated clock net. Equality is exact (the same arithmetic; common
 * practice, no source).
 */
import { describe, expect, it } from 'vitest';
import { buildLinearDemoProject } from '../../../fixtures/demo/demo-project.js';
import { simulateNetMeasures } from '../../../core/engine/simulate-net.js';
import { netEvaluator, type Evaluation } from '../../../core/engine/net-evaluation.js';
import { longestSegment } from '../../../core/netbuild/index.js';
import { evaluationContext } from './net-context.js';

const demo = buildLinearDemoProject();

function evaluators(name: string) {
  const { project, net, kind, context } = evaluationContext(demo, name);
  return {
    project, net,
    full: netEvaluator(project, net, kind, context),
    probe: netEvaluator(project, net, kind, context, { words: false }),
  };
}

/** Everything of an evaluation but its words. */
function numbers(e: Evaluation) {
  const b = e.budget;
  return {
    setup: e.setup,
    hold: e.hold,
    status: b?.status,
    worstCorner: b?.worstCorner,
    corners: b?.corners.map((c) => ({
      ...c.timing,
      setupItems: c.timing.setupItems.map((i) => [i.name, i.value, i.source]),
      holdItems: c.timing.holdItems.map((i) => [i.name, i.value, i.source]),
    })),
  };
}

describe('probe evaluations without words', () => {
  for (const name of ['DQ0', 'DQS0', 'A0', 'LB_D0']) {
    it(`${name}: same margins, statuses and item values as the full evaluation; no details, no reasons`, () => {
      const { project, net, full, probe } = evaluators(name);
      const segment = longestSegment(net)!;
      // the present length and stretches until one is not a plain pass (a margin below zero or under
      // the guard band gives the budget reasons)
      let worded = false;
      for (const length of [1, 2.5, 5, 10].map((f) => f * segment.length)) {
        const ms = simulateNetMeasures(project, net, { length: { elementIndex: segment.elementIndex, length } });
        const a = full(ms);
        const b = probe(ms);
        expect(numbers(b)).toEqual(numbers(a));
        expect(a.budget!.corners.flatMap((c) => [...c.timing.setupItems, ...c.timing.holdItems]).every((i) => i.detail.length > 0)).toBe(true);
        expect(b.budget!.corners.flatMap((c) => [...c.timing.setupItems, ...c.timing.holdItems]).every((i) => i.detail === '')).toBe(true);
        expect(b.budget!.reasons).toEqual([]);
        if (a.budget!.status !== 'pass') {
          expect(a.budget!.reasons.length).toBeGreaterThan(0);
          worded = true;
          break;
        }
      }
      expect(worded).toBe(true);
    });
  }
});
