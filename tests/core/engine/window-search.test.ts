/**
 * The length-window search at its stated resolution (docs/design.md §6.3, "Length window"): each edge
 * it reports lies inside the window and within 0.25 ps of margin, or 25 um of length, of the boundary;
 * and it costs the simulations claimed. The reference is the engine's own definition of the window,
 * evaluated independently here: a length passes when, re-simulated at every corner and both edges,
 * both margins are >= 0 (>= the guard band for the guard window) and every signal-quality check
 * passes; the boundary is bisected on that yes/no to 1 um. Board: the invented demo on its linear
 * models (fixtures/demo/demo-project.ts).
 */
import { describe, expect, it } from 'vitest';
import { buildLinearDemoProject } from '../../../fixtures/demo/demo-project.js';
import { searchLengthWindow } from '../../../core/engine/length-window.js';
import { findNet } from '../../../core/engine/net-lookup.js';
import { simulateNetMeasures } from '../../../core/engine/simulate-net.js';
import { netEvaluator, qualityPasses } from '../../../core/engine/net-evaluation.js';
import { solveNet } from '../../../core/engine/solve-net.js';
import { routedLine } from '../../../core/netbuild/index.js';
import type { LengthWindow } from '../../../core/budget/results.js';
import type { ProjectData } from '../../../core/project/model.js';
import { evaluationContext } from './net-context.js';

const demo = buildLinearDemoProject();

/** Margins and quality of `name` with element `index` at `length`, every corner and edge; and its context. */
function netProbe(name: string) {
  const { project, net, kind, context } = evaluationContext(demo, name);
  const evaluate = netEvaluator(project, net, kind, context);
  const at = (index: number, length: number) => {
    const ms = simulateNetMeasures(project, net, { length: { elementIndex: index, length } });
    const e = evaluate(ms);
    return { setup: e.setup, hold: e.hold, quality: qualityPasses(ms) };
  };
  return { project, net, context, at };
}

/** The boundary of "passes with margins >= floor" between a passing and a failing length, to 1 um. */
function boundary(passes: (length: number) => boolean, inside: number, outside: number): number {
  expect(passes(inside)).toBe(true);
  expect(passes(outside)).toBe(false);
  let a = inside;
  let b = outside;
  while (Math.abs(b - a) > 1e-6) {
    const x = (a + b) / 2;
    if (passes(x)) a = x;
    else b = x;
  }
  return (a + b) / 2;
}

/** Slowest delay per metre of the searched segment over the corners, s/m (the margins' smallest slope). */
function slowestSlope(project: ProjectData, w: LengthWindow, name: string): number {
  const segment = findNet(project, name).elements[w.elementIndex];
  if (segment.kind !== 'segment') throw new Error('window segment is not a segment');
  return Math.min(...project.corners.map((c) => routedLine(project.stackup, segment.layer, segment.width, segment.spacing, c).delayPerMetre));
}

describe('length windows of demo nets against the definition, at the stated resolution', () => {
  // data nets of two byte lanes and layers, the tight and a failing one, a strobe, fly-by address, local bus
  const names = ['DQ0', 'DQ12', 'DQ45', 'DQ63', 'DQS0', 'A0', 'LB_D0'];
  for (const name of names) {
    it(name, () => {
      const probe = netProbe(name);
      const solved = solveNet(probe.project, name, { strobe: probe.context.strobe ?? null, dataNets: probe.context.dataNets });
      const w = solved.result.lengthWindow!;
      expect(w).not.toBeNull();
      // 0.25 ps of margin at the slowest slope (90 %: reflections bend the line), or 25 um, plus the
      // reference's own 1 um
      const resolution = Math.max(0.25e-12 / (0.9 * slowestSlope(probe.project, w, name)), 25e-6) + 1e-6;
      const gb = w.guardBand ?? 0;
      const edges: [number | null, number, -1 | 1][] = [[w.min, 0, -1], [w.max, 0, 1], [w.guardMin ?? null, gb, -1], [w.guardMax ?? null, gb, 1]];
      let checked = 0;
      for (const [edge, floor, s] of edges) {
        // an edge at the 0.2x / 3x search limit is open (the window may go on): nothing to bisect
        if (edge === null || Math.abs(edge - 0.2 * w.current) < 1e-9 || Math.abs(edge - 3 * w.current) < 1e-9) continue;
        const passes = (length: number) => {
          const p = probe.at(w.elementIndex, length);
          return p.quality && p.setup >= floor && p.hold >= floor;
        };
        const reference = boundary(passes, edge - s * 2e-3, edge + s * 2e-3);
        const inward = s * (reference - edge); // >= 0: the reported edge is inside the window
        expect(inward, `${name} edge at ${edge} vs ${reference}`).toBeGreaterThanOrEqual(-1e-6);
        expect(inward, `${name} edge at ${edge} vs ${reference}`).toBeLessThanOrEqual(resolution);
        checked++;
      }
      expect(checked).toBeGreaterThanOrEqual(2);
    });
  }
});

describe('simulations the search costs', () => {
  it('linear margins with stated slopes: the present length and one trial per closed edge (hand calculation)', () => {
    // setup = 100 ps - (L - 50 mm) * 7 ps/mm (zero at 64.2857 mm), hold = (L - 30 mm) * 7 ps/mm (zero at
    // 30 mm): each edge's first trial goes where the stated slopes put the margin at +0.125 ps, half the
    // 0.25 ps band; on a linear margin it lands there and is the edge: 1 + 1 + 1 evaluations.
    let calls = 0;
    const w = searchLengthWindow((L) => {
      calls++;
      return { setupMargin: 100e-12 - (L - 0.05) * 7e-9, holdMargin: (L - 0.03) * 7e-9, qualityPass: true };
    }, 0.05, { slopes: { setup: -7e-9, hold: 7e-9 } });
    expect(calls).toBe(3);
    expect(w.evaluations).toBe(3);
    // 0.125 ps / 7 ps/mm = 17.857 um inside each root
    expect(w.max!).toBeCloseTo(0.05 + 100 / 7 / 1000 - 0.125 / 7 / 1000, 9);
    expect(w.min!).toBeCloseTo(0.03 + 0.125 / 7 / 1000, 9);
    expect([w.minBound, w.maxBound, w.minOpen, w.maxOpen]).toEqual(['hold', 'setup', false, false]);
  });

  it('a margin bending away from the extrapolation: stepped again, or bracketed and refined (hand calculation)', () => {
    // setup = 100 ps - 7 ps/mm * d +/- 0.1 ps/mm^2 * d^2 beyond the present 50 mm (d in mm, linear below):
    // roots at d = 20 mm (+) and d = (-7 + sqrt(89)) / 0.2 = 12.170 mm (-). The first trial, on the
    // slope measured from the short side, goes to d = 14.27 mm: 20.5 ps above the band for +, which is
    // stepped from again on the slope measured between the lengths; -20.4 ps below zero for -, which
    // brackets the edge. Either way the edge passes within the 0.25 ps band of the root.
    for (const [bend, d0] of [[0.1, 20], [-0.1, (-7 + Math.sqrt(89)) / 0.2]] as const) {
      const setup = (L: number) => {
        const d = Math.max(0, (L - 0.05) * 1e3);
        return 100e-12 - (L - 0.05) * 7e-9 + bend * 1e-12 * d * d;
      };
      const w = searchLengthWindow((L) => ({ setupMargin: setup(L), holdMargin: 1e-9, qualityPass: true }), 0.05,
        { slopes: { setup: -7e-9, hold: 0 }, highFactor: 2 });
      const root = 0.05 + d0 / 1000;
      expect(root - w.max!, `bend ${bend}`).toBeGreaterThanOrEqual(0);
      expect(setup(w.max!), `bend ${bend}`).toBeGreaterThanOrEqual(0);
      expect(setup(w.max!), `bend ${bend}`).toBeLessThanOrEqual(0.25e-12);
      expect([w.maxBound, w.maxOpen, w.minOpen]).toEqual(['setup', false, true]);
    }
  });

  it('a later search on the same probe reuses the lengths an earlier one evaluated (hand calculation)', () => {
    // the guard window (margins >= 25 ps) of the same linear net: seeded with the first search's
    // lengths, of which one on each side lies between the guard edge and the zero edge (fails the guard,
    // passes zero), so each guard edge is bracketed at once; one secant step each
    const f = (L: number) => ({ setupMargin: 100e-12 - (L - 0.05) * 7e-9, holdMargin: (L - 0.03) * 7e-9, qualityPass: true });
    const slopes = { setup: -7e-9, hold: 7e-9 };
    const first = searchLengthWindow(f, 0.05, { slopes });
    let calls = 0;
    const guard = 25e-12;
    const less = (p: ReturnType<typeof f>) => ({ ...p, setupMargin: p.setupMargin - guard, holdMargin: p.holdMargin - guard });
    const g = searchLengthWindow((L) => {
      calls++;
      return less(f(L));
    }, 0.05, { slopes, known: first.points.map((k) => ({ x: k.x, p: less(k.p) })) });
    expect(calls).toBe(2);
    expect(g.max!).toBeLessThan(0.05 + 75 / 7 / 1000);
    expect(g.max!).toBeGreaterThan(0.05 + 75 / 7 / 1000 - 35.8e-6);
  });

});
