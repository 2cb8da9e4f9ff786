/**
 * The field solver's entry point (docs/field-solver.md §5): validates a cross-section, solves the
 * capacitance matrices on a sequence of nested meshes (each one the previous with every cell
 * bisected) and Richardson-extrapolates them (L. F. Richardson, Phil. Trans. R. Soc. A 210, 1911;
 * two meshes of ratio 2 and error order p: X ≈ X_fine + (X_fine − X_coarse)/(2^p − 1)).
 * The order p follows from the sharpest conductor corner (docs/field-solver.md §5). The convergence
 * estimate is how far the extrapolated impedances moved when the mesh pair was halved; meshes are
 * added until it is below the target.
 */
import { InputError } from '../errors.js';
import { capacitanceOnGrid, DEFAULT_CONTROL, type CapacitanceOnGrid, type LevelFields, type SolveControl } from './capacitance.js';
import { validateCrossSection, type CrossSection } from './cross-section.js';
import { inductanceMatrix } from './extract.js';
import { DEFAULT_MESH, type MeshOptions } from './grid.js';

/** The method, in words, as every result reports it. */
export const FIELD_METHOD = 'finite-difference Laplace solution (graded grid, MIC-CG), Richardson-extrapolated';

export interface FieldSolveOptions {
  /** Wanted relative convergence estimate of the impedances (default 0.005 = 0.5 %). */
  target?: number;
  /** Finest refinement level tried (default 4: the level-0 mesh bisected four times). */
  maxLevel?: number;
  /** Coarsest level used (default 0). */
  firstLevel?: number;
  mesh?: Partial<MeshOptions>;
  control?: Partial<SolveControl>;
}

export interface MeshLevel {
  level: number;
  nx: number;
  ny: number;
  iterations: number;
}

export interface Convergence {
  /** The meshes solved, coarsest first; the last two were extrapolated. */
  meshes: MeshLevel[];
  /** Error order p assumed for the extrapolation. */
  order: number;
  /**
   * Order seen on the three finest meshes, log2 of the ratio of successive changes of the first line's
   * impedance (a check that the meshes are in the asymptotic range: it should be near `order`);
   * null when the changes do not shrink monotonically.
   */
  observedOrder: number | null;
  /**
   * Relative change of the extrapolated impedances when the mesh pair was halved (the largest over
   * the impedances of the section): the convergence estimate reported with the result.
   */
  estimate: number;
}

export interface FieldSolution {
  method: string;
  /** Conductors N. */
  n: number;
  /** Maxwell capacitance matrix with the dielectrics, F/m, N×N. */
  capacitance: number[][];
  /** Capacitance matrix with every dielectric replaced by vacuum, F/m. */
  capacitanceVacuum: number[][];
  /** Inductance matrix L = μ0·ε0·C0⁻¹, H/m. */
  inductance: number[][];
  convergence: Convergence;
}

/**
 * Leading error order of the mesh capacitance: 2ν for the sharpest corner, where the potential near a
 * conductor corner of interior angle α grows like r^ν with ν = π/(2π − α) (J. Meixner, IEEE Trans.
 * AP-20, 1972, the edge condition): a thin strip (α = 0) gives 1, a rectangular corner 4/3, the foot
 * of an etched trace (α = atan(E)) in between.
 */
export function errorOrder(section: CrossSection): number {
  let p = Infinity;
  for (const t of section.traces) {
    const alpha = t.thickness === 0 ? 0 : t.etchFactor === undefined || t.etchFactor === Infinity ? Math.PI / 2 : Math.atan(t.etchFactor);
    p = Math.min(p, (2 * Math.PI) / (2 * Math.PI - alpha));
  }
  return p;
}

function extrapolate(fine: Float64Array, coarse: Float64Array, p: number): Float64Array {
  const out = new Float64Array(fine.length);
  const f = 1 / (2 ** p - 1);
  for (let k = 0; k < fine.length; k++) out[k] = fine[k] + (fine[k] - coarse[k]) * f;
  return out;
}

/**
 * Impedance-like quantities used for the convergence estimate: each line's self value 1/sqrt(Cii·C0ii)
 * and, for every two lines, the combinations that are the odd and even modes of a symmetric pair.
 */
function impedances(c: Float64Array, c0: Float64Array, n: number): number[] {
  const out: number[] = [];
  for (let i = 0; i < n; i++) {
    const ii = i * n + i;
    out.push(1 / Math.sqrt(c[ii] * c0[ii]));
    for (let j = i + 1; j < n; j++) {
      const ij = i * n + j;
      const jj = j * n + j;
      const s = 0.5 * (c[ii] + c[jj]);
      const s0 = 0.5 * (c0[ii] + c0[jj]);
      out.push(1 / Math.sqrt((s - c[ij]) * (s0 - c0[ij])), 1 / Math.sqrt((s + c[ij]) * (s0 + c0[ij])));
    }
  }
  return out;
}

function relativeChange(a: number[], b: number[]): number {
  let worst = 0;
  for (let k = 0; k < a.length; k++) worst = Math.max(worst, Math.abs(a[k] - b[k]) / Math.abs(b[k]));
  return worst;
}

function rows(m: Float64Array, n: number): number[][] {
  const out: number[][] = [];
  for (let i = 0; i < n; i++) out.push(Array.from(m.subarray(i * n, i * n + n)));
  return out;
}

/**
 * Capacitance and inductance matrices of a cross-section with a convergence estimate.
 * Throws InputError naming the field for invalid geometry, and 'field solver mesh' when the solve
 * does not converge or the estimate stays above ten times the target on the finest mesh allowed.
 */
export function solveCrossSection(section: CrossSection, options: FieldSolveOptions = {}): FieldSolution {
  validateCrossSection(section);
  const target = options.target ?? 0.005;
  if (!(target > 0)) throw new InputError('field solver target', `must be a positive relative error, got ${target}`);
  const mesh: MeshOptions = { ...DEFAULT_MESH, ...options.mesh };
  const control: SolveControl = { ...DEFAULT_CONTROL, ...options.control };
  const first = options.firstLevel ?? 0;
  const maxLevel = Math.max(first + 2, options.maxLevel ?? 4);
  const p = errorOrder(section);
  const n = section.traces.length;

  const solved: CapacitanceOnGrid[] = [];
  const meshes: MeshLevel[] = [];
  let fields: LevelFields | undefined;
  const solveLevel = (level: number): void => {
    const r = capacitanceOnGrid(section, mesh, level, control, fields);
    fields = r.fields;
    solved.push(r);
    meshes.push({ level, nx: r.nx, ny: r.ny, iterations: r.iterations });
  };
  solveLevel(first);
  solveLevel(first + 1);
  solveLevel(first + 2);
  let c: Float64Array;
  let c0: Float64Array;
  let estimate: number;
  for (;;) {
    const k = solved.length - 1;
    const [a, b, d] = [solved[k - 2], solved[k - 1], solved[k]];
    const cPrev = extrapolate(b.c, a.c, p);
    const c0Prev = extrapolate(b.c0, a.c0, p);
    c = extrapolate(d.c, b.c, p);
    c0 = extrapolate(d.c0, b.c0, p);
    estimate = relativeChange(impedances(cPrev, c0Prev, n), impedances(c, c0, n));
    if (!Number.isFinite(estimate)) throw new InputError('field solver mesh', 'the extrapolated capacitance is not finite: the mesh does not resolve the geometry');
    if (estimate <= target || meshes[meshes.length - 1].level >= maxLevel) break;
    solveLevel(meshes[meshes.length - 1].level + 1);
  }
  const k = solved.length - 1;
  const z = (r: CapacitanceOnGrid): number => impedances(r.c, r.c0, n)[0];
  const d1 = z(solved[k - 1]) - z(solved[k - 2]);
  const d2 = z(solved[k]) - z(solved[k - 1]);
  const observedOrder = d1 !== 0 && d2 !== 0 && d1 > 0 === d2 > 0 && Math.abs(d2) < Math.abs(d1) ? Math.log2(d1 / d2) : null;
  if (estimate > 10 * target) {
    throw new InputError('field solver mesh', `did not converge: the impedance still moves by ${(estimate * 100).toFixed(2)} % between the two finest meshes (target ${(target * 100).toFixed(2)} %)`);
  }
  return {
    method: FIELD_METHOD,
    n,
    capacitance: rows(c, n),
    capacitanceVacuum: rows(c0, n),
    inductance: rows(inductanceMatrix(c0, n), n),
    convergence: { meshes, order: p, observedOrder, estimate },
  };
}
