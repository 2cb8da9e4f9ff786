/**
 * The potential over a cross-section on the solver's grid, for a picture of the field
 * (docs/field-solver.md §8): engineers check a solver by looking at its equipotentials. Superposes the
 * unit solutions of each conductor with the given voltages (linearity of Laplace's equation), with the
 * dielectrics in place. Pure: returns typed arrays, draws nothing.
 */
import { InputError } from '../errors.js';
import { validateCrossSection, type CrossSection } from './cross-section.js';
import { DEFAULT_CONTROL } from './capacitance.js';
import { buildGrid, DEFAULT_MESH, type MeshOptions } from './grid.js';
import { LaplaceSystem } from './laplace.js';

export interface PotentialMap {
  nx: number;
  ny: number;
  /** Grid lines, m (x across, y up from the bottom plane). */
  xs: Float64Array;
  ys: Float64Array;
  /** Potential per node, V, row-major nx·ny from the bottom-left. */
  potential: Float64Array;
  /** Node kind: -1 dielectric/air, 0 ground, k + 1 conductor k. */
  kind: Int32Array;
  /** Relative permittivity per cell, (nx − 1)·(ny − 1). */
  cellEr: Float64Array;
}

/**
 * Potential with conductor k at `volts[k]` (default: a pair driven differentially, +1/−1 V; one trace
 * at 1 V), on the level-`refine` grid of the full section.
 */
export function potentialMap(section: CrossSection, volts?: number[], refine = 1, mesh: Partial<MeshOptions> = {}): PotentialMap {
  validateCrossSection(section);
  const n = section.traces.length;
  const v = volts ?? (n === 2 ? [1, -1] : section.traces.map(() => 1));
  if (v.length !== n || !v.every(Number.isFinite)) throw new InputError('potential map volts', `needs one finite voltage per trace (${n}), got ${JSON.stringify(volts)}`);
  if (!(Number.isInteger(refine) && refine >= 0 && refine <= 4)) throw new InputError('potential map refine', `must be an integer 0-4, got ${refine}`);
  const grid = buildGrid(section, { ...DEFAULT_MESH, ...mesh }, refine);
  const system = new LaplaceSystem(grid);
  system.assemble(grid.cellEr);
  const potential = new Float64Array(grid.nx * grid.ny);
  const unit = new Float64Array(grid.nx * grid.ny);
  for (let k = 0; k < n; k++) {
    if (v[k] === 0) continue;
    system.solve(k, DEFAULT_CONTROL.tolerance, DEFAULT_CONTROL.maxIterations);
    system.potential(unit);
    for (let m = 0; m < unit.length; m++) potential[m] += v[k] * unit[m];
  }
  return { nx: grid.nx, ny: grid.ny, xs: grid.xs, ys: grid.ys, potential, kind: grid.kind, cellEr: grid.cellEr };
}

/**
 * The part of a map inside x0 <= x <= x1, y <= y1 (m), for a picture of the region that matters
 * (the open box reaches 40 structure heights out). Grid lines are kept as they are, not resampled.
 */
export function cropPotentialMap(map: PotentialMap, x0: number, x1: number, y1: number): PotentialMap {
  if (!(x1 > x0 && y1 > 0)) throw new InputError('potential map window', `needs x0 < x1 and y1 > 0, got ${x0}, ${x1}, ${y1}`);
  let i0 = 0;
  while (i0 < map.nx - 1 && map.xs[i0 + 1] <= x0) i0++;
  let i1 = map.nx - 1;
  while (i1 > i0 + 1 && map.xs[i1 - 1] >= x1) i1--;
  let j1 = map.ny - 1;
  while (j1 > 1 && map.ys[j1 - 1] >= y1) j1--;
  const nx = i1 - i0 + 1;
  const ny = j1 + 1;
  const potential = new Float64Array(nx * ny);
  const kind = new Int32Array(nx * ny);
  const cellEr = new Float64Array((nx - 1) * (ny - 1));
  for (let j = 0; j < ny; j++) {
    for (let i = 0; i < nx; i++) {
      potential[j * nx + i] = map.potential[j * map.nx + i0 + i];
      kind[j * nx + i] = map.kind[j * map.nx + i0 + i];
      if (i < nx - 1 && j < ny - 1) cellEr[j * (nx - 1) + i] = map.cellEr[j * (map.nx - 1) + i0 + i];
    }
  }
  return { nx, ny, xs: map.xs.slice(i0, i1 + 1), ys: map.ys.slice(0, ny), potential, kind, cellEr };
}
