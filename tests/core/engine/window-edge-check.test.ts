/**
 * The check at each length-window edge (docs/design.md §6.3, "Length window"): the cases left out of
 * the search are simulated at an edge unless the linear bound rules them out, and one that limits
 * there makes the search run again at every case. The margins here are a model, not a simulation, so
 * the true window is known exactly: each (corner, edge) case's setup margin falls and its hold margin
 * grows by its corner's delay per metre of the searched segment (Td = length / vp, docs/design.md §2),
 * from values set at the present length. Signal quality is the real one of net DQ0 of the invented
 * demo on its linear models (fixtures/demo/demo-project.ts) at its present length, which passes; the
 * model is this test's own construction (no external source).
 */
import { describe, expect, it } from 'vitest';
import { buildLinearDemoProject } from '../../../fixtures/demo/demo-project.js';
import { netLengthWindow, type Simulate } from '../../../core/engine/net-window.js';
import { busOf, findNet } from '../../../core/engine/net-lookup.js';
import { projectForBus } from '../../../core/engine/corner-set.js';
import { simulateNetMeasures } from '../../../core/engine/simulate-net.js';
import { qualityMarginVolts } from '../../../core/budget/quality.js';
import { allCases, caseCorner, caseKey } from '../../../core/engine/cases.js';
import { longestSegment, routedLine } from '../../../core/netbuild/index.js';
import type { Evaluator } from '../../../core/engine/net-evaluation.js';
import type { ReceiverEdgeMeasure } from '../../../core/budget/measures.js';

const demo = buildLinearDemoProject();
const net = findNet(demo, 'DQ0');
const project = projectForBus(demo, busOf(demo, net));
const real = simulateNetMeasures(project, net);
const segment = longestSegment(net)!;
const L0 = segment.length;
const perMetre = new Map(project.corners.map((c) => [c.name, routedLine(project.stackup, segment.layer, segment.width, segment.spacing, c).delayPerMetre]));
// with no budget (the model's evaluator gives none) the search runs on the worst signal-quality case alone
const searchedCase = (() => {
  const m = real.reduce((a, b) => (qualityMarginVolts(b) < qualityMarginVolts(a) ? b : a));
  return caseKey(m.corner, m.edge);
})();

/** Window of the model whose margins at the present length are `at` (s, per case), and every case simulated. */
function windowOf(at: Record<string, { setup: number; hold: number }>) {
  const lengthOf = new Map<ReceiverEdgeMeasure, number>();
  const measuresAt = (length: number, cases: ReadonlySet<string> | null) =>
    real.filter((m) => !cases || cases.has(caseKey(m.corner, m.edge))).map((m) => {
      const copy = { ...m };
      lengthOf.set(copy, length);
      return copy;
    });
  const evaluate: Evaluator = (ms) => {
    let setup = Infinity;
    let hold = Infinity;
    for (const m of ms) {
      const k = caseKey(m.corner, m.edge);
      const shift = perMetre.get(m.corner)! * (lengthOf.get(m)! - L0);
      setup = Math.min(setup, at[k].setup - shift);
      hold = Math.min(hold, at[k].hold + shift);
    }
    return { budget: null, setup, hold, note: null };
  };
  const simulated = new Set<string>();
  const simulate: Simulate = (changes, cases) => {
    for (const k of cases ?? allCases(project)) simulated.add(k);
    return measuresAt(changes!.length!.length, cases ?? null);
  };
  const measures = measuresAt(L0, null);
  const window = netLengthWindow(project, net, 'timed', measures, evaluate(measures), evaluate, simulate)!;
  return { window, simulated };
}

const delayOfSearched = perMetre.get(caseCorner(searchedCase))!;
/** Setup margin of the searched case at the present length: its window's long edge 30 % longer. */
const M = 0.3 * delayOfSearched * L0;

describe('length-window edge check', () => {
  it('simulates a case whose setup reaches zero first at the long edge and searches again at every case', () => {
    const other = allCases(project).find((k) => caseCorner(k) !== caseCorner(searchedCase))!;
    const dpm = perMetre.get(caseCorner(other))!;
    const at: Record<string, { setup: number; hold: number }> = {};
    // hold never limits inside the search range (10 M > the 0.8 L0 of delay it can lose)
    for (const k of allCases(project)) at[k] = { setup: 3 * M, hold: 10 * M };
    at[searchedCase] = { setup: M, hold: 10 * M };
    // `other` reaches zero setup 1 ps of its delay short of the searched case's edge (about 0.14 mm)
    at[other] = { setup: (M / delayOfSearched - 1e-12 / dpm) * dpm, hold: 10 * M };
    const { window, simulated } = windowOf(at);
    const trueMax = L0 + at[other].setup / dpm;
    // a passing length within the 0.25 ps margin tolerance of the edge (docs/design.md §6.3)
    expect(window.max!).toBeLessThanOrEqual(trueMax);
    expect(trueMax - window.max!).toBeLessThan(0.3e-12 / dpm);
    expect(simulated).toContain(other);
  });

  it('leaves out cases whose margins stay above the edge once shifted, even with hold as close as 1 ps now', () => {
    const at: Record<string, { setup: number; hold: number }> = {};
    // every other case: setup far above; hold 1 ps above the searched case's, but growing toward the long edge
    for (const k of allCases(project)) at[k] = { setup: 3 * M, hold: 10 * M + 1e-12 };
    at[searchedCase] = { setup: M, hold: 10 * M };
    const { window, simulated } = windowOf(at);
    const trueMax = L0 + M / delayOfSearched;
    expect(window.max!).toBeLessThanOrEqual(trueMax);
    expect(trueMax - window.max!).toBeLessThan(0.3e-12 / delayOfSearched);
    expect(window.min).toBeCloseTo(0.2 * L0, 12); // open at the search's short limit: no edge to check there
    expect([...simulated]).toEqual([searchedCase]);
  });
});
