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

/**
 * The unit-excitation potentials of one grid (index medium·n + j: medium 0 with dielectrics, 1 in
 * vacuum), kept to start the next, bisected grid from (docs/field-solver.md §4).
 */
export interface GridFields {
  nx: number;
  ny: number;
  fields: Float64Array[];
}

/** The potentials of every grid of one refinement level (the whole grid, or the two halves). */
export interface LevelFields {
  full?: GridFields;
  even?: GridFields;
  odd?: GridFields;
}

/**
 * Bilinear prolongation onto the bisected grid: node (2i, 2j) is coarse node (i, j), the others
 * the mean of their coarse neighbours (each new line is the midpoint of a coarse interval).
 */
function prolong(coarse: Float64Array, cnx: number, cny: number, fine: Float64Array, fnx: number, fny: number): void {
  for (let j = 0; j < fny; j++) {
    const cj = j >> 1;
    const cj2 = j & 1 ? cj + 1 : cj;
    for (let i = 0; i < fnx; i++) {
      const ci = i >> 1;
      const ci2 = i & 1 ? ci + 1 : ci;
      fine[j * fnx + i] = 0.25 * (coarse[cj * cnx + ci] + coarse[cj * cnx + ci2] + coarse[cj2 * cnx + ci] + coarse[cj2 * cnx + ci2]);
    }
  }
  void cny;
}

/**
 * Solves all excitations on one assembled system into `out` (column j = conductor j driven), starting
 * from the coarser grid's solution when one is given, and keeps each potential in `keep`.
 */
function matrixOn(
  system: LaplaceSystem, n: number, control: SolveControl, out: Float64Array, charge: Float64Array, warmFirst: boolean,
  start: Float64Array[] | undefined, keep: Float64Array[],
): number {
  let iterations = 0;
  for (let j = 0; j < n; j++) {
    // Warm start: from the coarser grid's solution; else from the previous solution in phi (the
    // previous excitation, or for the first vacuum solve of one conductor the dielectric one).
    if (start) system.seed(start[j]);
    iterations += system.solve(j, control.tolerance, control.maxIterations, start !== undefined || j > 0 || warmFirst).iterations;
    system.charges(charge);
    for (let i = 0; i < n; i++) out[i * n + j] = EPS0 * charge[i];
    const field = new Float64Array(system.grid.nx * system.grid.ny);
    system.potential(field);
    keep.push(field);
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
export function capacitanceOnGrid(
  section: CrossSection, mesh: MeshOptions, refine: number, control: SolveControl, previous?: LevelFields,
): CapacitanceOnGrid & { fields: LevelFields } {
  if (!mirrorSymmetric(section)) {
    const full = capacitanceOn(buildGrid(section, mesh, refine), control, previous?.full);
    return { ...full, fields: { full: full.fields } };
  }
  const even = capacitanceOn(buildGrid(section, mesh, refine, 'even'), control, previous?.even);
  if (section.traces.length === 1) {
    return { ...even, c: Float64Array.of(2 * even.c[0]), c0: Float64Array.of(2 * even.c0[0]), fields: { even: even.fields } };
  }
  const odd = capacitanceOn(buildGrid(section, mesh, refine, 'odd'), control, previous?.odd);
  const pair = (e: number, o: number): Float64Array => Float64Array.of((e + o) / 2, (e - o) / 2, (e - o) / 2, (e + o) / 2);
  return {
    n: 2, c: pair(even.c[0], odd.c[0]), c0: pair(even.c0[0], odd.c0[0]), nx: even.nx, ny: even.ny,
    iterations: even.iterations + odd.iterations, fields: { even: even.fields, odd: odd.fields },
  };
}

/**
 * C and C0 on a given grid. `coarser` (the potentials of the grid this one bisects) starts every
 * solve from their prolongation; the grid's own potentials come back in `fields`.
 */
export function capacitanceOn(grid: Grid, control: SolveControl, coarser?: GridFields): CapacitanceOnGrid & { fields: GridFields } {
  const n = grid.conductors;
  const system = new LaplaceSystem(grid);
  const c = new Float64Array(n * n);
  const c0 = new Float64Array(n * n);
  const charge = new Float64Array(n);
  let start: Float64Array[] | undefined;
  if (coarser && grid.nx === 2 * coarser.nx - 1 && grid.ny === 2 * coarser.ny - 1 && coarser.fields.length === 2 * n) {
    start = coarser.fields.map((f) => {
      const fine = new Float64Array(grid.nx * grid.ny);
      prolong(f, coarser.nx, coarser.ny, fine, grid.nx, grid.ny);
      return fine;
    });
  }
  const kept: Float64Array[] = [];
  system.assemble(grid.cellEr);
  let iterations = matrixOn(system, n, control, c, charge, false, start?.slice(0, n), kept);
  system.assemble(new Float64Array(grid.cellEr.length).fill(1));
  // One conductor: the dielectric solution still in phi is a better start than the coarse vacuum one
  // (identical for a homogeneous dielectric).
  iterations += matrixOn(system, n, control, c0, charge, n === 1, n === 1 ? undefined : start?.slice(n), kept);
  return { n, c, c0, nx: grid.nx, ny: grid.ny, iterations, fields: { nx: grid.nx, ny: grid.ny, fields: kept } };
}
