/**
 * A bus may check silicon corners crossed with board corners (docs/design.md §6.3) and the result
 * names the combination that is worst for setup and for hold. Demo data (fixtures/demo, invented).
 * Checks follow from the definitions (common practice, no source): the cross product of n corners has
 * n² members and contains the n corners as defined, so its worst margins are no better than theirs.
 */
import { describe, expect, it } from 'vitest';
import { buildDemoProject } from '../../../fixtures/demo/demo-project.js';
import { solveNet } from '../../../core/engine/solve-net.js';
import { busCorners, combineCorners } from '../../../core/engine/corner-set.js';
import { validateProject } from '../../../core/project/validate.js';
import type { ProjectData } from '../../../core/project/model.js';

const withPairing = (pairing: NonNullable<ProjectData['buses'][number]['cornerPairing']>): ProjectData => {
  const p = buildDemoProject();
  p.buses = p.buses.map((b) => (b.name === 'ADDR_CMD' ? { ...b, cornerPairing: pairing } : b));
  return p;
};
const options = { lengthWindow: false, suggestion: false } as const;

describe('silicon x board corners', () => {
  const demo = buildDemoProject();
  const slow = demo.corners.find((c) => c.name === 'slow')!;
  const fast = demo.corners.find((c) => c.name === 'fast')!;

  it('a combination takes the silicon of one corner and the board (Dk, etch) of the other', () => {
    const c = combineCorners(slow, fast);
    expect(c.name).toBe('slow silicon / fast board');
    expect([c.driverStrength, c.edgeRate, c.rail, c.cin, c.tco]).toEqual([slow.driverStrength, slow.edgeRate, slow.rail, slow.cin, slow.tco]);
    expect([c.dk, c.widthDelta]).toEqual([fast.dk, fast.widthDelta]);
    expect(busCorners(demo, { ...demo.buses[0], cornerPairing: 'cross' }).length).toBe(9);
  });

  it('checks all nine combinations, names the worst for setup and for hold, and is never better than the corners as defined', () => {
    const fixed = solveNet(buildDemoProject(), 'A0', {}, options).result;
    const cross = solveNet(withPairing('cross'), 'A0', {}, options).result;
    expect(cross.corners.length).toBe(9);
    expect(cross.corners.map((c) => c.corner)).toContain('fast silicon / slow board');
    expect(cross.worstSetupCorner).toBeDefined();
    expect(cross.worstHoldCorner).toBeDefined();
    expect(cross.corners.map((c) => c.corner)).toContain(cross.worstHoldCorner);
    expect(cross.setupMargin!).toBeLessThanOrEqual(fixed.setupMargin!);
    expect(cross.holdMargin!).toBeLessThanOrEqual(fixed.holdMargin!);
    const hold = cross.corners.find((c) => c.corner === cross.worstHoldCorner)!;
    expect(hold.holdMargin).toBe(cross.holdMargin);
  });

  it('a stated subset checks just those pairs; an unknown corner name is refused, naming the bus and the pair', () => {
    const one = solveNet(withPairing([{ silicon: 'fast', board: 'slow' }]), 'A0', {}, options).result;
    expect(one.corners.map((c) => c.corner)).toEqual(['fast silicon / slow board']);
    expect(() => validateProject(withPairing([{ silicon: 'fast', board: 'nominal' }]))).toThrow(/bus ADDR_CMD corner pairing 1 board.*"nominal" is not in the project/);
  });
});
