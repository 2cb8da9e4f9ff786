/**
 * Termination suggestion (docs/design.md §6.3): on a deliberately ringing net it improves the worst-corner margin
 * over the unterminated net, with an E24 value (IEC 60063). Stackup and parts: the invented demo project.
 */
import { describe, expect, it } from 'vitest';
import { buildDemoProject } from '../../../fixtures/demo/demo-project.js';
import { solveNet } from '../../../core/engine/solve-net.js';
import { simulateNetMeasures } from '../../../core/engine/simulate-net.js';
import { qualityMarginVolts } from '../../../core/budget/quality.js';
import { E24, e24Values, suggestTermination } from '../../../core/engine/termination.js';
import type { NetBuildChanges } from '../../../core/netbuild/index.js';
import type { BusDefinition, NetDefinition, ProjectData } from '../../../core/project/model.js';
import { netKind } from '../../../core/engine/net-lookup.js';
import { netEvaluator } from '../../../core/engine/net-evaluation.js';
import { netTerminationSuggestion } from '../../../core/engine/net-suggestion.js';

const demo = buildDemoProject();
const bus: BusDefinition = {
  name: 'LB', kind: 'common-clock', description: 'test bus', referenceNet: null,
  timing: { kind: 'common-clock', cycleTime: 10e-9, clockSkew: 0, jitter: 0 }, allowances: [],
};
// A strong 1.8 V CMOS driver (25 ohm) straight into 150 mm of ~50 ohm stripline and an open CMOS input:
// the open end doubles the wave and the source reflects it back: it rings past the 2.1 V limit.
const ringing: NetDefinition = {
  name: 'RING', bus: 'LB', role: 'data',
  driver: { part: 'MC-LB', node: 'drv', designator: 'U1' },
  receivers: [{ part: 'EXP-LB', node: 'rx', designator: 'U2' }],
  elements: [{ kind: 'segment', a: 'drv', b: 'rx', layer: 'L6_SIG', width: 105e-6, length: 0.15 }],
  rails: {},
};
const project: ProjectData = { ...demo, buses: [bus], nets: [ringing] };

describe('E24 values (IEC 60063:2015 table of the E24 series)', () => {
  it('lists the 24 mantissas per decade', () => {
    expect(E24.length).toBe(24);
    expect(e24Values(10, 99)).toEqual([10, 11, 12, 13, 15, 16, 18, 20, 22, 24, 27, 30, 33, 36, 39, 43, 47, 51, 56, 62, 68, 75, 82, 91]);
    expect(e24Values(100, 120)).toEqual([100, 110, 120]);
  });
});

describe('termination suggestion on a ringing net', () => {
  const solved = solveNet(project, 'RING', {}, { lengthWindow: false });
  const s = solved.result.suggestion;

  it('the unterminated net fails on signal quality (overshoot past the 2.1 V limit of EXP-LB, demo data)', () => {
    expect(solved.result.status).toBe('fail');
    expect(solved.result.quality.some((q) => q.name === 'overshoot' && !q.pass)).toBe(true);
  });

  it('suggests an E24 value that raises the worst-corner combined margin, and says by how much', () => {
    expect(s).not.toBeNull();
    if (!s) return;
    expect(e24Values(1, 1e6)).toContain(s.ohms);
    expect(s.marginAfter).toBeGreaterThan(s.marginBefore);
    expect(s.note).toMatch(new RegExp(`^${s.ohms} Ω \\(E24\\) `));
    expect(s.note).toMatch(/gain \d+ ps/);
  });

  it('re-simulated with the suggested termination, the worst signal-quality margin improves at every corner', () => {
    if (!s) throw new Error('no suggestion');
    const changes: NetBuildChanges = s.kind === 'series' ? { series: s.ohms } : { parallel: { node: 'rx', ohms: s.ohms, vtt: 0.9 } };
    const before = simulateNetMeasures(project, ringing);
    const after = simulateNetMeasures(project, ringing, changes);
    for (const corner of project.corners) {
      const worst = (ms: typeof before) => Math.min(...ms.filter((m) => m.corner === corner.name).map(qualityMarginVolts));
      expect(worst(after)).toBeGreaterThan(worst(before));
    }
    // and the overshoot limit now holds everywhere
    expect(Math.max(...after.map((m) => m.vmax))).toBeLessThan(2.1);
  });
});

describe('termination trials respect the bus\'s I/O standard and the board\'s rails', () => {
  /** Runs the suggestion with a simulate that records every trial's changes. */
  function trials(p: ProjectData, name: string): { changes: NetBuildChanges[]; note: string | null } {
    const net = p.nets.find((n) => n.name === name)!;
    const recorded: NetBuildChanges[] = [];
    const solved = solveNet(p, name, {}, { lengthWindow: false, suggestion: false });
    const kind = netKind(p, net);
    const evaluate = netEvaluator(p, net, kind, {});
    const simulate = (changes: NetBuildChanges = {}) => {
      recorded.push(changes);
      return simulateNetMeasures(p, net, changes);
    };
    const s = netTerminationSuggestion(p, net, kind, solved.measures, evaluate(solved.measures), evaluate, simulate);
    return { changes: recorded, note: s?.note ?? null };
  }

  it('a 1.8 V CMOS net without a termination rail gets no parallel trial (no invented mid-rail)', () => {
    const t = trials(project, 'RING');
    expect(t.changes.length).toBeGreaterThan(0);
    expect(t.changes.some((c) => c.parallel !== undefined)).toBe(false);
  });

  it('a net that already has a series resistor has that resistor re-valued, not a second one added', () => {
    const withSeries: NetDefinition = {
      ...ringing, name: 'RS',
      elements: [{ kind: 'resistor', a: 'drv', b: 's', ohms: 10 }, { kind: 'segment', a: 's', b: 'rx', layer: 'L6_SIG', width: 105e-6, length: 0.15 }],
    };
    const t = trials({ ...project, nets: [withSeries] }, 'RS');
    expect(t.changes.length).toBeGreaterThan(0);
    expect(t.changes.some((c) => c.series !== undefined)).toBe(false);
    expect(t.changes.every((c) => c.resistor?.elementIndex === 0)).toBe(true);
  });

  it('a parallel termination goes to the net\'s own VTT rail and its note states the DC power', () => {
    // the ringing net given a 0.9 V VTT rail: parallel trials allowed, to 0.9 V
    const withRail: NetDefinition = { ...ringing, name: 'RV', rails: { vtt: 0.9 } };
    const t = trials({ ...project, nets: [withRail] }, 'RV');
    const parallel = t.changes.filter((c) => c.parallel !== undefined);
    expect(parallel.length).toBeGreaterThan(0);
    expect(parallel.every((c) => c.parallel!.vtt === 0.9)).toBe(true);
  });

  it('states the DC power of a parallel choice and lets the option tried first win a tie (margins made up for the test)', () => {
    // 1.2 V driver, 40 Ω both ways, into R to a 0.6 V rail: high level (1.2/40 + 0.6/R)/(1/40 + 1/R);
    // at R = 51 Ω: 0.9363 V, P = (0.9363 − 0.6)²/51 = 2.216 mW; low 0.2637 V, the same 2.216 mW (Ohm, Joule)
    const power = (ohms: number) => {
      const at = (v: number) => (v / 40 + 0.6 / ohms) / (1 / 40 + 1 / ohms);
      return { high: (at(1.2) - 0.6) ** 2 / ohms, low: (at(0) - 0.6) ** 2 / ohms };
    };
    const ctx = { seriesAt: 'U1 pin', parallelAt: 'U2 (node rx)', vtt: 0.6, rail: 'vtt', power };
    const peakAt51 = (kind: string, ohms: number) => (kind === 'parallel-end' ? 50e-12 - Math.abs(ohms - 51) * 1e-12 : 0);
    const p = suggestTermination(peakAt51, 0, ctx)!;
    expect(p.kind).toBe('parallel-end');
    expect(p.ohms).toBe(51);
    expect(p.note).toMatch(/to the board's vtt rail at 0\.60 V \(DC power in the resistor about 2\.2 mW at 50 % duty: 2\.2 mW high, 2\.2 mW low\)/);
    // equal best margins: the kind tried first (here the parallel one, as if the net already had it) wins
    const flat = () => 10e-12;
    expect(suggestTermination(flat, 0, ctx, ['parallel-end', 'series'])!.kind).toBe('parallel-end');
    expect(suggestTermination(flat, 0, ctx, ['series', 'parallel-end'])!.kind).toBe('series');
  });
});
