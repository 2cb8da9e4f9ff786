/**
 * Inverse problems on a routing layer of a real stackup: the edge gap of a pair for a target Zdiff
 * and the trace width for a target Z0, each solved with the same model the forward results use
 * (layer-on-stackup.ts: the field solver for pairs, masked or thick-copper layers). Zdiff rises and
 * Z0 falls monotonically with gap and width, so a bracketed root is unique; the root is refined by
 * the Illinois variant of regula falsi (Dowell & Jarratt, BIT 11, 1971) on the logarithm of the
 * size, which needs a handful of forward solves where bisection would need dozens.
 */
import { InputError } from '../errors.js';
import type { Stackup } from '../project/model.js';
import { pairOnLayer, traceOnLayer, type LayerSolveOptions } from './layer-on-stackup.js';

/** Relative impedance tolerance of the inverses: 0.05 %, ten times finer than the 0.5 % asked of them. */
const TOLERANCE = 5e-4;

/** Root of increasing-or-decreasing f on [lo, hi] (log scale) to |f| <= tol·target, Illinois steps. */
function illinoisLog(f: (x: number) => number, lo: number, hi: number, tol: number): number {
  let a = Math.log(lo);
  let b = Math.log(hi);
  let fa = f(lo);
  let fb = f(hi);
  let side = 0;
  for (let i = 0; i < 60; i++) {
    const c = (a * fb - b * fa) / (fb - fa);
    const fc = f(Math.exp(c));
    if (Math.abs(fc) <= tol || Math.abs(b - a) < 1e-12) return Math.exp(c);
    if (fc > 0 === fb > 0) {
      b = c; fb = fc;
      if (side === -1) fa /= 2;
      side = -1;
    } else {
      a = c; fa = fc;
      if (side === 1) fb /= 2;
      side = 1;
    }
  }
  return Math.exp(0.5 * (a + b));
}

/**
 * Edge gap (m) of a pair of traces `width` (m) wide on `layer` that gives `targetZdiff` (Ω).
 * Searched between 0.1 and 10 trace widths; throws InputError naming the target when out of reach.
 */
export function gapForZdiffOnLayer(stackup: Stackup, layer: string, width: number, targetZdiff: number, options?: LayerSolveOptions): number {
  if (!(Number.isFinite(targetZdiff) && targetZdiff > 0)) throw new InputError('target Zdiff', `must be a positive impedance, got ${targetZdiff}`);
  const f = (gap: number) => pairOnLayer(stackup, layer, width, gap, undefined, options).zdiff - targetZdiff;
  const lo = 0.1 * width;
  const hi = 10 * width;
  const [flo, fhi] = [f(lo), f(hi)];
  if (flo > 0 || fhi < 0) {
    throw new InputError('target Zdiff', `${targetZdiff} Ω is out of reach on layer "${layer}" at width ${width} m: ` +
      `gaps of 0.1 to 10 widths give ${(flo + targetZdiff).toFixed(1)} to ${(fhi + targetZdiff).toFixed(1)} Ω`);
  }
  return illinoisLog(f, lo, hi, TOLERANCE * targetZdiff);
}

/** Trace width (m) on `layer` that gives `targetZ0` (Ω); searched between 0.02 and 5 mm. */
export function widthForZ0OnLayer(stackup: Stackup, layer: string, targetZ0: number, options?: LayerSolveOptions): number {
  if (!(Number.isFinite(targetZ0) && targetZ0 > 0)) throw new InputError('target Z0', `must be a positive impedance, got ${targetZ0}`);
  // Z0 falls with width: the root of target - Z0 rises.
  const f = (w: number) => targetZ0 - traceOnLayer(stackup, layer, w, undefined, options).z0;
  const lo = 20e-6;
  const hi = 5e-3;
  const [flo, fhi] = [f(lo), f(hi)];
  if (flo > 0 || fhi < 0) {
    throw new InputError('target Z0', `${targetZ0} Ω is out of reach on layer "${layer}": widths of 0.02 to 5 mm give ` +
      `${(targetZ0 - flo).toFixed(1)} to ${(targetZ0 - fhi).toFixed(1)} Ω`);
  }
  return illinoisLog(f, lo, hi, TOLERANCE * targetZ0);
}
