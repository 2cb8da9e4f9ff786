/**
 * Inverse problems on the field solver (docs/field-solver.md §7): the trace width for a target Z0 and
 * the edge gap for a target Zdiff. Z0 falls and Zdiff rises monotonically with the unknown, and both
 * are close to linear in its logarithm, so the root is bracketed by doubling steps and then found by
 * the Illinois variant of regula falsi on ln(x) (M. Dowell and P. Jarratt, BIT 11, 1971), a few field
 * solves in all. Each field solve carries its own convergence estimate; the search stops when the
 * solved impedance is within `tolerance` of the target (default 0.05 %).
 */
import { InputError } from '../errors.js';
import { pcbCrossSection, type PcbTraceGeometry } from './build.js';
import { fieldPair, fieldSingleLine, type FieldLine, type FieldPair } from './lines.js';
import type { FieldSolveOptions } from './solve.js';

export interface InverseOptions extends FieldSolveOptions {
  /** Relative tolerance on the impedance (default 5e-4). */
  tolerance?: number;
}

interface Root<T> {
  x: number;
  result: T;
}

/**
 * Finds x in [lo, hi] with f(x) = 0 where f changes sign once, starting from `start`; f is evaluated
 * through `solve`, which also returns the full result kept for the answer.
 */
function findRoot<T>(
  solve: (x: number) => { value: number; result: T }, start: number, lo: number, hi: number, increasing: boolean,
  tolerance: number, target: number, what: string, unit: string,
): Root<T> {
  const f = (x: number): { fx: number; result: T } => {
    const r = solve(x);
    return { fx: (r.value - target) / target, result: r.result };
  };
  let a = start;
  let fa = f(a);
  if (Math.abs(fa.fx) <= tolerance) return { x: a, result: fa.result };
  // Walk by factors of two towards the sign change.
  const up = increasing ? fa.fx < 0 : fa.fx > 0;
  let b = a;
  let fb = fa;
  for (;;) {
    const next = up ? b * 2 : b / 2;
    if (next > hi * (1 + 1e-12) || next < lo * (1 - 1e-12)) {
      throw new InputError(what, `${target} ${unit} is out of reach of the field solver between ${(lo * 1e6).toPrecision(3)} µm and ${(hi * 1e6).toPrecision(3)} µm (nearest ${(fb.fx * target + target).toFixed(2)} ${unit})`);
    }
    a = b;
    fa = fb;
    b = next;
    fb = f(b);
    if (Math.abs(fb.fx) <= tolerance) return { x: b, result: fb.result };
    if (fa.fx > 0 !== fb.fx > 0) break;
  }
  // Illinois regula falsi on u = ln(x).
  let ua = Math.log(a);
  let ub = Math.log(b);
  let ga = fa.fx;
  let gb = fb.fx;
  let side = 0;
  let best = Math.abs(fa.fx) < Math.abs(fb.fx) ? { x: a, fx: fa.fx, result: fa.result } : { x: b, fx: fb.fx, result: fb.result };
  for (let i = 0; i < 60; i++) {
    const u = (ua * gb - ub * ga) / (gb - ga);
    const x = Math.exp(u);
    const r = f(x);
    if (Math.abs(r.fx) < Math.abs(best.fx)) best = { x, fx: r.fx, result: r.result };
    if (Math.abs(r.fx) <= tolerance || Math.abs(ub - ua) < 1e-9) break;
    if (r.fx > 0 === gb > 0) {
      ub = u;
      gb = r.fx;
      if (side === -1) ga /= 2;
      side = -1;
    } else {
      ua = u;
      ga = r.fx;
      if (side === 1) gb /= 2;
      side = 1;
    }
  }
  if (!(Math.abs(best.fx) <= 10 * tolerance)) {
    throw new InputError(what, `the field solver found no ${what.replace('target ', '')} within ${(10 * tolerance * 100).toFixed(2)} % of ${target} ${unit} (best ${(best.fx * 100).toFixed(2)} % off)`);
  }
  return { x: best.x, result: best.result };
}

/** Trace width (m) whose field-solved Z0 is `targetZ0` Ω, with the line solved at that width. */
export function fieldWidthForZ0(targetZ0: number, geometry: Omit<PcbTraceGeometry, 'width' | 'spacing' | 'count'>, options: InverseOptions = {}): { width: number; line: FieldLine } {
  if (!(Number.isFinite(targetZ0) && targetZ0 > 0)) throw new InputError('target Z0', `must be a positive impedance, got ${targetZ0}`);
  if (!(geometry.below > 0)) throw new InputError('trace below', `must be a positive length, got ${geometry.below}`);
  const tol = options.tolerance ?? 5e-4;
  const h = geometry.below;
  const root = findRoot(
    (w) => {
      const line = fieldSingleLine(pcbCrossSection({ ...geometry, width: w }), options);
      return { value: line.z0, result: line };
    },
    h, 0.02 * h, 50 * h, false, tol, targetZ0, 'target Z0', 'Ω',
  );
  return { width: root.x, line: root.result };
}

/** Edge gap (m) whose field-solved Zdiff = 2·Zodd is `targetZdiff` Ω, with the pair solved at that gap. */
export function fieldSpacingForZdiff(targetZdiff: number, geometry: Omit<PcbTraceGeometry, 'spacing' | 'count'>, options: InverseOptions = {}): { spacing: number; pair: FieldPair } {
  if (!(Number.isFinite(targetZdiff) && targetZdiff > 0)) throw new InputError('target Zdiff', `must be a positive impedance, got ${targetZdiff}`);
  if (!(geometry.below > 0)) throw new InputError('trace below', `must be a positive length, got ${geometry.below}`);
  const tol = options.tolerance ?? 5e-4;
  const h = geometry.below;
  const root = findRoot(
    (s) => {
      const pair = fieldPair(pcbCrossSection({ ...geometry, spacing: s }), options);
      return { value: pair.zdiff, result: pair };
    },
    h, 0.02 * h, 40 * h, true, tol, targetZdiff, 'target Zdiff', 'Ω',
  );
  return { spacing: root.x, pair: root.result };
}
