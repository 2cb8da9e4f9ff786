/**
 * AppService.layerFieldMap (main/services/api/app-service.ts): the stackup view's field picture comes
 * through the service API as plain arrays, the same numbers as core's layerPotentialMap
 * (docs/field-solver.md §8), and its arguments are checked like every other method's.
 */
import { describe, expect, it } from 'vitest';
import { AppService } from '../../main/services/api/app-service.js';
import { API_ARGUMENTS } from '../../main/services/api/schemas.js';
import { layerPotentialMap } from '../../core/stackup/layer-section.js';
import { buildDemoProject } from '../../fixtures/demo/demo-project.js';

function service(): AppService {
  const unused = () => { throw new Error('not used'); };
  return new AppService({
    project: {
      path: 'unused.slackline', load: unused, updateInfo: unused, updateStackup: unused, upsertPart: unused, updateBus: unused,
      updateNetElement: unused, updateCorners: unused, previewImport: unused, applyImport: unused,
    },
    solve: { solveBoard: unused, solveNet: unused, freshResults: () => null, latestSolveAt: () => null, netWaveforms: unused },
    layerProperties: () => [],
    exportReport: unused,
  });
}

const stackup = buildDemoProject().stackup;
const signal = stackup.layers.find((l) => l.kind === 'copper' && l.role === 'signal')!;

describe('layerFieldMap', () => {
  it('returns core\'s potential map as plain arrays that survive JSON (every transport)', async () => {
    const width = signal.defaultWidth ?? 0.1e-3;
    const map = await service().layerFieldMap(stackup, signal.name, width);
    const core = layerPotentialMap(stackup, signal.name, width);
    // Same computation, copied element for element: exact equality (no arithmetic in between).
    expect(map.xs).toEqual(Array.from(core.xs));
    expect(map.potential).toEqual(Array.from(core.potential));
    expect(map.kind).toEqual(Array.from(core.kind));
    expect(map.cellEr).toEqual(Array.from(core.cellEr));
    expect(map.potential.length).toBe(map.nx * map.ny);
    expect(map.spacing).toBeNull();
    // JSON keeps a finite double exactly (ECMA-262 Number::toString gives the shortest round-tripping text).
    expect(JSON.parse(JSON.stringify(map))).toEqual(map);
    // One trace at 1 V (docs/field-solver.md §8): its nodes sit at exactly 1 V.
    const traceNodes = map.kind.map((k, i) => (k === 1 ? map.potential[i] : null)).filter((v) => v !== null);
    expect(traceNodes.length).toBeGreaterThan(0);
    expect(new Set(traceNodes)).toEqual(new Set([1]));
  });

  it('drives a pair at +1/−1 V when a spacing is given', async () => {
    const width = signal.defaultWidth ?? 0.1e-3;
    const map = await service().layerFieldMap(stackup, signal.name, width, width);
    expect(map.spacing).toBe(width);
    expect(map.kind.some((k, i) => k === 2 && map.potential[i] === -1)).toBe(true); // Dirichlet data of the odd drive
  });

  it('checks its arguments: a width must be a positive length, the layer a routing layer', async () => {
    expect(API_ARGUMENTS.layerFieldMap.safeParse([stackup, signal.name, 0.1e-3]).success).toBe(true);
    expect(API_ARGUMENTS.layerFieldMap.safeParse([stackup, signal.name, -1]).success).toBe(false);
    expect(API_ARGUMENTS.layerFieldMap.safeParse([stackup, signal.name, 0.1e-3, null]).success).toBe(false);
    const plane = stackup.layers.find((l) => l.kind === 'copper' && l.role === 'plane')!;
    await expect(service().layerFieldMap(stackup, plane.name, 0.1e-3)).rejects.toThrow(new RegExp(`layer "${plane.name}"`));
  });
});
