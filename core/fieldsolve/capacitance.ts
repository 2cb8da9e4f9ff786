/**
 * Maxwell capacitance matrices of a cross-section on one grid (docs/field-solver.md §4): for each
 * conductor j held at 1 V with every other conductor and the planes at 0 V, Laplace's equation is
 * solved and the charge on each conductor i (Gauss's law) gives C[i][j]. The same grid is solved
 * once with the dielectrics (C) and once in vacuum (C0), which gives the inductance.
 */
import { EPS0 } from './constants.js';
import { buildGrid, type Grid, type MeshOptions } from './grid.js';
import { LaplaceSystem } from './laplace.js';
import type { CrossSection } from './cross-section.js';

export interface CapacitanceOnGrid {
  /** Conductors N. */
  n: number;
  /** Maxwell capacitance matrix with the dielectrics, F/m, row-major N·N (symmetrised). */
  c: Float64Array;
  /** The same in vacuum, F/m. */
  c0: Float64Array;
  nx: number;
  ny: number;
  /** CG iterations summed over all solves. */
  iterations: number;
}

export interface SolveControl {
  /** CG stops at ‖r‖/‖b‖ below this. */
  tolerance: number;
  maxIterations: number;
}

export const DEFAULT_CONTROL: SolveControl = { tolerance: 1e-6, maxIterations: 5000 };

function symmetrise(m: Float64Array, n: number): void {
  for (let i = 0; i < n; i++) {
    for (let j = i + 1; j < n; j++) {
      const v = 0.5 * (m[i * n + j] + m[j * n + i]);
      m[i * n + j] = v;
      m[j * n + i] = v;
    }
  }
}

/** Solves all excitations on one assembled system into `out` (column j = conductor j driven). */
function matrixOn(system: LaplaceSystem, n: number, control: SolveControl, out: Float64Array, charge: Float64Array): number {
  let iterations = 0;
  for (let j = 0; j < n; j++) {
    // Warm start from the previous excitation's solution: same operator, nearby field far away.
    iterations += system.solve(j, control.tolerance, control.maxIterations, j > 0).iterations;
    system.charges(charge);
    for (let i = 0; i < n; i++) out[i * n + j] = EPS0 * charge[i];
  }
  symmetrise(out, n);
  return iterations;
}

/** Relative tolerance for mirror symmetry (rounding of the inputs). */
const MIRROR = 1e-9;

/** One trace centred on x = 0, or two equal traces mirrored about it. */
export function mirrorSymmetric(section: CrossSection): boolean {
  const t = section.traces;
  const same = (a: number, b: number): boolean => Math.abs(a - b) <= MIRROR * Math.max(Math.abs(a), Math.abs(b), t[0].width);
  if (t.length === 1) return same(t[0].centre, 0);
  if (t.length !== 2) return false;
  const [a, b] = t;
  return same(a.centre, -b.centre) && same(a.width, b.width) && same(a.thickness, b.thickness) && same(a.base, b.base)
    && (a.etchFactor ?? Infinity) === (b.etchFactor ?? Infinity);
}

/**
 * C and C0 of a valid section on the grid of the given refinement. A mirror-symmetric section is
 * solved on half the grid (docs/field-solver.md §4): one trace on the even half, charge doubled; a
 * pair on the even and the odd half, C11 = (Ce + Co)/2, C12 = (Ce − Co)/2.
 */
export function capacitanceOnGrid(section: CrossSection, mesh: MeshOptions, refine: number, control: SolveControl): CapacitanceOnGrid {
  if (!mirrorSymmetric(section)) return capacitanceOn(buildGrid(section, mesh, refine), control);
  const even = capacitanceOn(buildGrid(section, mesh, refine, 'even'), control);
  if (section.traces.length === 1) {
    return { ...even, c: Float64Array.of(2 * even.c[0]), c0: Float64Array.of(2 * even.c0[0]) };
  }
  const odd = capacitanceOn(buildGrid(section, mesh, refine, 'odd'), control);
  const pair = (e: number, o: number): Float64Array => Float64Array.of((e + o) / 2, (e - o) / 2, (e - o) / 2, (e + o) / 2);
  return { n: 2, c: pair(even.c[0], odd.c[0]), c0: pair(even.c0[0], odd.c0[0]), nx: even.nx, ny: even.ny, iterations: even.iterations + odd.iterations };
}

/** C and C0 on a given grid. */
export function capacitanceOn(grid: Grid, control: SolveControl): CapacitanceOnGrid {
  const n = grid.conductors;
  const system = new LaplaceSystem(grid);
  const c = new Float64Array(n * n);
  const c0 = new Float64Array(n * n);
  const charge = new Float64Array(n);
  system.assemble(grid.cellEr);
  let iterations = matrixOn(system, n, control, c, charge);
  system.assemble(new Float64Array(grid.cellEr.length).fill(1));
  iterations += matrixOn(system, n, control, c0, charge);
  return { n, c, c0, nx: grid.nx, ny: grid.ny, iterations };
}
