/**
 * Termination suggestion (issue 5): on a deliberately ringing net it improves the worst-corner margin
 * over the unterminated net, with an E24 value (IEC 60063). Stackup and parts: the invented demo project.
 */
import { describe, expect, it } from 'vitest';
import { buildDemoProject } from '../../../fixtures/demo/demo-project.js';
import { solveNet } from '../../../core/engine/solve-net.js';
import { simulateNetMeasures } from '../../../core/engine/simulate-net.js';
import { qualityMarginVolts } from '../../../core/budget/quality.js';
import { E24, e24Values } from '../../../core/engine/termination.js';
import type { NetBuildChanges } from '../../../core/netbuild/index.js';
import type { BusDefinition, NetDefinition, ProjectData } from '../../../core/project/model.js';

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
