/**
 * Inverse problems by bracketed bisection on a logarithmic scale: the trace width for a target Z0
 * and the edge gap for a target Zdiff. Z0 falls monotonically with width and Zdiff rises monotonically
 * with spacing in every model used here, so a sign change inside the bracket is a unique root.
 * Bisection to a relative width change of 1e-13 puts the result's Z0 within about 1e-9 Ω of the target.
 * Where field-choice.ts picks the field solver (pairs always), the search is core/fieldsolve/inverse.ts
 * (docs/field-solver.md §7) and lands within 0.05 % of the target.
 */
import { InputError } from '../errors.js';
import { fieldSpacingForZdiff, fieldWidthForZ0 } from '../fieldsolve/index.js';
import { chooseSolver, pcbGeometryOf, type CrossSectionExtras, type Solver } from './field-choice.js';
import {
  singleEndedUnchecked, validateTraceGeometry, zdiffUnchecked, type FieldLabel, type PairGeometry, type TraceGeometry,
} from './geometry.js';

const label: FieldLabel = (field) => `trace ${field}`;

/**
 * Solver choice for the inverses: the field solver (core/fieldsolve/inverse.ts) by the rule of
 * field-choice.ts — always for pairs — unless `solver` says otherwise; extras as in field-choice.ts.
 */
export interface InverseSolveOptions extends CrossSectionExtras {
  solver?: Solver;
}

function bisectLog(f: (x: number) => number, lo: number, hi: number): number {
  // f(lo) and f(hi) have opposite signs; invariant kept on log(x).
  let a = Math.log(lo);
  let b = Math.log(hi);
  const fa = f(lo);
  for (let i = 0; i < 200 && b - a > 1e-13; i++) {
    const mid = 0.5 * (a + b);
    const fm = f(Math.exp(mid));
    if (fm === 0) return Math.exp(mid);
    if (fm > 0 === fa > 0) a = mid;
    else b = mid;
  }
  return Math.exp(0.5 * (a + b));
}

/**
 * Width W (m) that gives the target Z0 (Ω) in the given cross-section (width ignored).
 * Searches W between 1e-3 and 100 times the reference height H1. Throws InputError when the target
 * lies outside that range.
 */
export function widthForZ0(targetZ0: number, geometry: Omit<TraceGeometry, 'width'>, options: InverseSolveOptions = {}): number {
  if (!Number.isFinite(targetZ0) || targetZ0 <= 0) throw new InputError('target Z0', `must be a positive impedance, got ${targetZ0}`);
  const g: TraceGeometry = { ...geometry, width: geometry.below };
  validateTraceGeometry(g, label);
  if (chooseSolver(g, options, options.solver) === 'field') return fieldWidthForZ0(targetZ0, pcbGeometryOf(g, options)).width;
  const z = (w: number): number => {
    g.width = w;
    return singleEndedUnchecked(g).z0 - targetZ0;
  };
  const lo = 1e-3 * geometry.below;
  const hi = 100 * geometry.below;
  const zLo = z(lo);
  const zHi = z(hi);
  if (!(zLo > 0 && zHi < 0)) {
    throw new InputError('target Z0', `${targetZ0} Ω is out of reach for widths between ${lo} m and ${hi} m`
      + ` (Z0 from ${(zHi + targetZ0).toFixed(2)} to ${(zLo + targetZ0).toFixed(2)} Ω)`);
  }
  return bisectLog(z, lo, hi);
}

/**
 * Edge gap S (m) that gives the target differential impedance Zdiff = 2·Zodd (Ω) for the given pair
 * (spacing ignored). Searches S between 0.05 and 20 times H1 (inside the coupled-microstrip model's
 * stated range of 0.1-10 with margin). Zdiff approaches 2·Z0 as the gap widens, so a target above
 * that is out of reach.
 */
export function spacingForZdiff(targetZdiff: number, geometry: Omit<PairGeometry, 'spacing'>, options: InverseSolveOptions = {}): number {
  if (!Number.isFinite(targetZdiff) || targetZdiff <= 0) {
    throw new InputError('target Zdiff', `must be a positive impedance, got ${targetZdiff}`);
  }
  const g: PairGeometry = { ...geometry, spacing: geometry.below };
  validateTraceGeometry(g, label);
  if (chooseSolver(g, options, options.solver) === 'field') return fieldSpacingForZdiff(targetZdiff, pcbGeometryOf(g, options)).spacing;
  if (g.structure !== 'microstrip' && g.structure !== 'stripline') {
    throw new InputError('trace structure', `edge-coupled pairs are modelled for microstrip and stripline only, not ${g.structure}`);
  }
  const f = (s: number): number => {
    g.spacing = s;
    return zdiffUnchecked(g) - targetZdiff;
  };
  const lo = 0.05 * geometry.below;
  const hi = 20 * geometry.below;
  const fLo = f(lo);
  const fHi = f(hi);
  if (!(fLo < 0 && fHi > 0)) {
    throw new InputError('target Zdiff', `${targetZdiff} Ω is out of reach for gaps between ${lo} m and ${hi} m`
      + ` (Zdiff from ${(fLo + targetZdiff).toFixed(2)} to ${(fHi + targetZdiff).toFixed(2)} Ω)`);
  }
  return bisectLog(f, lo, hi);
}
