/**
 * Graded rectangular grid over a cross-section and its rasterisation (docs/field-solver.md §3):
 * grid lines pass through every conductor corner, dielectric interface and mask surface; between
 * them the spacing follows a size function that is finest at conductor edges and corners (where the
 * field is singular) and grows geometrically away from them, so an open microstrip box can sit tens of
 * heights away for a few dozen extra lines. Refinement bisects every cell (mesh halving), which is
 * what Richardson extrapolation between two meshes needs (docs/field-solver.md §5).
 */
import { InputError } from '../errors.js';
import { stackHeight, topWidth, type CrossSection } from './cross-section.js';

/** Node kinds: FREE is solved for; GROUND is held at 0 V; conductor k (0-based) is stored as k + 1. */
export const FREE = -1;
export const GROUND = 0;

export interface MeshOptions {
  /** Cells across the smallest feature at a conductor edge, at refinement 0. */
  edgeCells: number;
  /** Cells across the smallest feature away from edges but near the conductors, at refinement 0. */
  coreCells: number;
  /** Growth of the cell size per unit distance (geometric grading ratio minus one). */
  growth: number;
  /** Open (microstrip) sections: the grounded box sits this many structure heights from the traces. */
  boxHeights: number;
  /** Closed (stripline) sections: the side walls (zero normal field) sit this many plane spacings away. */
  sideSpacings: number;
}

export const DEFAULT_MESH: MeshOptions = { edgeCells: 6, coreCells: 3, growth: 0.45, boxHeights: 40, sideSpacings: 3 };

export interface Grid {
  nx: number;
  ny: number;
  /** Node coordinates, m, ascending. */
  xs: Float64Array;
  ys: Float64Array;
  /** Relative permittivity of each cell (nx - 1)·(ny - 1), row-major from the bottom-left. */
  cellEr: Float64Array;
  /** Node kind per node nx·ny, row-major: FREE, GROUND or conductor index + 1. */
  kind: Int32Array;
  conductors: number;
}

/** Sorted, de-duplicated coordinates (values closer than `tol` merge). */
function uniqueSorted(values: number[], tol: number): number[] {
  const v = values.slice().sort((a, b) => a - b);
  const out: number[] = [];
  for (const x of v) if (out.length === 0 || x - out[out.length - 1] > tol) out.push(x);
  return out;
}

/**
 * Lines through every key coordinate; inside each interval the spacing follows `size`, placed at
 * equal steps of ∫dx/size so that the grading is smooth and each interval gets at least one cell.
 */
function gradedLines(keys: number[], size: (x: number, a: number, b: number) => number): number[] {
  const out: number[] = [keys[0]];
  const SAMPLES = 48;
  const cumulative = new Float64Array(SAMPLES + 1);
  for (let k = 1; k < keys.length; k++) {
    const a = keys[k - 1];
    const b = keys[k];
    const step = (b - a) / SAMPLES;
    cumulative[0] = 0;
    for (let s = 0; s < SAMPLES; s++) cumulative[s + 1] = cumulative[s] + step / size(a + (s + 0.5) * step, a, b);
    const total = cumulative[SAMPLES];
    const n = Math.max(1, Math.ceil(total - 1e-6));
    let s = 0;
    for (let m = 1; m < n; m++) {
      const target = (total * m) / n;
      while (cumulative[s + 1] < target) s++;
      const f = (target - cumulative[s]) / (cumulative[s + 1] - cumulative[s]);
      out.push(a + (s + f) * step);
    }
    out.push(b);
  }
  return out;
}

function bisect(lines: number[], times: number): Float64Array {
  let cur = lines;
  for (let t = 0; t < times; t++) {
    const next: number[] = [cur[0]];
    for (let i = 1; i < cur.length; i++) next.push(0.5 * (cur[i - 1] + cur[i]), cur[i]);
    cur = next;
  }
  return Float64Array.from(cur);
}

function distanceTo(points: number[], x: number): number {
  let d = Infinity;
  for (const p of points) d = Math.min(d, Math.abs(x - p));
  return d;
}

/** x of the left and right side of an etched trace at height y (linear between foot and top). */
function sidesAt(t: CrossSection['traces'][number], y: number): [number, number] {
  const wt = topWidth(t);
  const f = t.thickness > 0 ? Math.min(1, Math.max(0, (y - t.base) / t.thickness)) : 0;
  const half = 0.5 * (t.width + (wt - t.width) * f);
  return [t.centre - half, t.centre + half];
}

/** The extent of the box the solver works in, and which walls are grounded. */
export interface Domain {
  x0: number;
  x1: number;
  y1: number;
  /** True when the top is a plane or a far grounded box wall (always: the top row is held at 0 V). */
  open: boolean;
}

export function domainOf(section: CrossSection, mesh: MeshOptions): Domain {
  const height = stackHeight(section);
  let xmin = Infinity;
  let xmax = -Infinity;
  let top = height;
  for (const t of section.traces) {
    xmin = Math.min(xmin, t.centre - t.width / 2);
    xmax = Math.max(xmax, t.centre + t.width / 2);
    top = Math.max(top, t.base + t.thickness);
  }
  if (section.mask) top += section.mask.thickness;
  if (section.topPlane) {
    const m = mesh.sideSpacings * height;
    return { x0: xmin - m, x1: xmax + m, y1: height, open: false };
  }
  const m = mesh.boxHeights * top;
  return { x0: xmin - m, x1: xmax + m, y1: top + m, open: true };
}

/**
 * Builds the level-0 grid of a valid cross-section and bisects it `refine` times.
 * Feature sizes: ℓx the smallest trace width or edge gap, ℓy the smallest trace-to-plane distance;
 * cells near the conductors are at most (interval between key lines)/coreCells, at conductor edges
 * min(ℓx, ℓy, thinnest copper)/edgeCells both ways, growing by `growth` per unit distance. `half` keeps the
 * x >= 0 half for a symmetric solve; `axisLine` puts a grid line on x = 0 in a whole grid (the same
 * lines as the two halves, for comparing them).
 */
export function buildGrid(section: CrossSection, mesh: MeshOptions, refine: number, half?: HalfDomain, axisLine = false): Grid {
  const height = stackHeight(section);
  const dom = domainOf(section, mesh);
  const c = section.mask?.thickness ?? 0;

  const xEdges: number[] = [];
  const yEdges: number[] = [];
  const xKeys: number[] = [dom.x0, dom.x1];
  const yKeys: number[] = [0, dom.y1];
  let xFeature = Infinity;
  let yFeature = Infinity;
  let thinnest = Infinity;
  let xLargest = 0;
  let yLargest = 0;
  let y = 0;
  for (const l of section.layers) {
    y += l.thickness;
    yKeys.push(y);
  }
  let xmin = Infinity;
  let xmax = -Infinity;
  let ymax = 0;
  section.traces.forEach((t, i) => {
    const wt = topWidth(t);
    const top = t.base + t.thickness;
    xEdges.push(t.centre - t.width / 2, t.centre + t.width / 2, t.centre - wt / 2, t.centre + wt / 2);
    yEdges.push(t.base, top);
    xFeature = Math.min(xFeature, wt);
    yFeature = Math.min(yFeature, t.base);
    xLargest = Math.max(xLargest, t.width);
    yLargest = Math.max(yLargest, t.base, section.topPlane ? height - top : 0);
    if (t.thickness > 0) thinnest = Math.min(thinnest, t.thickness);
    if (section.topPlane) yFeature = Math.min(yFeature, height - top);
    if (i > 0) {
      const p = section.traces[i - 1];
      xFeature = Math.min(xFeature, t.centre - t.width / 2 - (p.centre + p.width / 2));
      xLargest = Math.max(xLargest, t.centre - t.width / 2 - (p.centre + p.width / 2));
    }
    xmin = Math.min(xmin, t.centre - t.width / 2);
    xmax = Math.max(xmax, t.centre + t.width / 2);
    ymax = Math.max(ymax, top);
    if (c > 0) {
      xKeys.push(t.centre - t.width / 2 - c, t.centre + t.width / 2 + c, t.centre - wt / 2 - c, t.centre + wt / 2 + c);
      yKeys.push(top + c);
    }
  });
  if (c > 0) yKeys.push(height + c);
  if (half || axisLine) xKeys.push(0);
  xKeys.push(...xEdges);
  yKeys.push(...yEdges);

  const hEdge = Math.min(xFeature, yFeature, thinnest) / mesh.edgeCells;
  const g = mesh.growth;
  const reach = Math.max(height, ymax);
  // Near the conductors the cells are at most (interval between key lines)/coreCells, the interval
  // capped by the largest feature, so a narrow gap refines only itself.
  const xSize = (x: number, a: number, b: number): number => {
    const core = x < xmin - reach ? xmin - reach - x : x > xmax + reach ? x - xmax - reach : 0;
    return Math.min(hEdge + g * distanceTo(xEdges, x), Math.min(b - a, xLargest) / mesh.coreCells + g * core);
  };
  const ySize = (yy: number, a: number, b: number): number => {
    const core = yy > reach * 2 ? yy - reach * 2 : 0;
    return Math.min(hEdge + g * distanceTo(yEdges, yy), Math.min(b - a, yLargest) / mesh.coreCells + g * core);
  };
  const tol = 1e-9 * (dom.x1 - dom.x0);
  const full = bisect(gradedLines(uniqueSorted(xKeys, tol), xSize), refine);
  const ys = bisect(gradedLines(uniqueSorted(yKeys, 1e-9 * dom.y1), ySize), refine);
  if (!half) return rasterise(section, full, ys, dom, section.traces, undefined);
  // The half x >= 0 of the same grid (x = 0 is a key line, so it survives bisection exactly).
  let first = 0;
  while (full[first] < -tol) first++;
  const xs = full.subarray(first).slice();
  xs[0] = 0;
  return rasterise(section, xs, ys, dom, section.traces.filter((t) => t.centre > -tol), half);
}

/** Relative permittivity at a point outside every conductor. */
function materialAt(section: CrossSection, x: number, yy: number, height: number): number {
  const mask = section.mask;
  if (yy < height) {
    let top = 0;
    for (const l of section.layers) {
      top += l.thickness;
      if (yy < top) return l.er;
    }
  }
  if (mask) {
    if (yy < height + mask.thickness) return mask.er;
    // The coating grows each trace outline by its thickness sideways and upward (square corners).
    for (const t of section.traces) {
      const top = t.base + t.thickness;
      if (yy > top + mask.thickness) continue;
      const [l, r] = sidesAt(t, Math.min(yy, top));
      if (x > l - mask.thickness && x < r + mask.thickness) return mask.er;
    }
  }
  return 1;
}

/**
 * Mirror symmetry about x = 0: the even half (symmetry line free, zero normal field) or the odd half
 * (symmetry line held at 0 V) of a section whose traces mirror each other (docs/field-solver.md §4).
 */
export type HalfDomain = 'even' | 'odd';

/**
 * Cell permittivities from the whole section; conductor nodes from `conductors` (the traces inside
 * the domain solved); walls per the domain and the half-domain symmetry.
 */
function rasterise(
  section: CrossSection, xs: Float64Array, ys: Float64Array, dom: Domain, conductors: CrossSection['traces'], half: HalfDomain | undefined,
): Grid {
  const nx = xs.length;
  const ny = ys.length;
  const height = stackHeight(section);
  const cellEr = new Float64Array((nx - 1) * (ny - 1));
  for (let j = 0; j < ny - 1; j++) {
    const yc = 0.5 * (ys[j] + ys[j + 1]);
    for (let i = 0; i < nx - 1; i++) cellEr[j * (nx - 1) + i] = materialAt(section, 0.5 * (xs[i] + xs[i + 1]), yc, height);
  }
  const kind = new Int32Array(nx * ny).fill(FREE);
  const tolX = 1e-9 * (dom.x1 - dom.x0);
  const tolY = 1e-9 * dom.y1;
  conductors.forEach((t, k) => {
    const top = t.base + t.thickness;
    for (let j = 0; j < ny; j++) {
      const yy = ys[j];
      if (yy < t.base - tolY || yy > top + tolY) continue;
      const [l, r] = sidesAt(t, yy);
      for (let i = 0; i < nx; i++) if (xs[i] >= l - tolX && xs[i] <= r + tolX) kind[j * nx + i] = k + 1;
    }
  });
  for (let i = 0; i < nx; i++) {
    kind[i] = GROUND; // bottom plane
    kind[(ny - 1) * nx + i] = GROUND; // top plane, or the far wall of the open box
  }
  for (let j = 0; j < ny; j++) {
    const left = j * nx;
    if (half === 'odd') {
      if (kind[left] > 0) throw new InputError('trace centre', 'a trace crosses the symmetry line of an odd-mode solve');
      kind[left] = GROUND;
    } else if (dom.open && half === undefined) {
      kind[left] = GROUND;
    }
    if (dom.open) kind[left + nx - 1] = GROUND;
  }
  return { nx, ny, xs, ys, cellEr, kind, conductors: conductors.length };
}
