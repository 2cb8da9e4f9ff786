/**
 * Z0 and delay of a trace or an edge-coupled pair on a routing layer of a stackup, with corner
 * adjustments, and every routing layer's properties (docs/design.md §3).
 */
import { InputError } from '../errors.js';
import type { Stackup } from '../project/model.js';
import {
  classifyIndexUnchecked, classifyStackup, findSignalLayer, validateStackup, type LayerCrossSection,
} from './classify.js';
import {
  edgeCoupled, singleEndedUnchecked, type Structure, type TraceGeometry, type TraceProperties,
} from './geometry.js';
import { C0 } from './constants.js';
import { cachedFieldPair, cachedFieldSingleLine } from '../fieldsolve/index.js';
import { chooseSolver, type MethodTags, type Solver } from './field-choice.js';
import { layerFieldSection, layerMask } from './layer-section.js';
import { lineParameters } from './line-parameters.js';

/**
 * Which solver gives the numbers: 'field' or 'closed-form'; left out, the rule of field-choice.ts
 * (pairs, solder mask, thick copper, offset stripline and geometry outside the closed forms' validity
 * go to the field solver; docs/field-solver.md §10).
 */
export interface LayerSolveOptions {
  solver?: Solver;
}

/** A routing layer's computed properties (SI). */
export interface LayerProperties {
  layer: string;
  /** 'microstrip' | 'embedded-microstrip' | 'stripline' | 'offset-stripline' */
  structure: string;
  width: number;
  z0: number;
  epsEff: number;
  velocity: number;
  delayPerMetre: number;
  /** Which method gave the numbers, the model in words, and a field result's convergence estimate. */
  method?: Solver;
  model?: string;
  convergence?: number;
}


/**
 * Corner adjustments: Dk multiplied by dkFactor (> 0; a result below 1 is taken as 1, vacuum), width plus
 * widthDelta (m; negative = narrower; the adjusted width must stay positive).
 */
export interface TraceAdjust {
  dkFactor?: number;
  widthDelta?: number;
}

function checkAdjust(adjust: TraceAdjust | undefined): void {
  if (!adjust) return;
  if (adjust.dkFactor !== undefined && !(Number.isFinite(adjust.dkFactor) && adjust.dkFactor > 0)) {
    throw new InputError('corner dk factor', `must be a positive number, got ${adjust.dkFactor}`);
  }
  if (adjust.widthDelta !== undefined && !Number.isFinite(adjust.widthDelta)) {
    throw new InputError('corner width delta', `must be a finite length, got ${adjust.widthDelta}`);
  }
}

function geometryOf(section: LayerCrossSection, width: number, adjust: TraceAdjust | undefined): TraceGeometry {
  const w = width + (adjust?.widthDelta ?? 0);
  if (!(Number.isFinite(w) && w > 0)) {
    throw new InputError(`layer "${section.layer}" width`, `trace width ${width} m with etch adjustment gives ${w} m; must be positive`);
  }
  // A Dk below 1 after a corner factor is unphysical; clamp at vacuum so a slow/fast sweep never yields NaN.
  const er = Math.max(1, section.er * (adjust?.dkFactor ?? 1));
  return {
    structure: section.structure,
    width: w,
    thickness: section.thickness,
    below: section.below,
    above: section.above,
    cover: section.cover,
    er,
  };
}

/**
 * Properties of a trace of `width` (m) on the named signal layer, using the default model of the
 * layer's structure. Throws InputError naming the layer when it is unknown, a plane, or has no reference.
 * Cheap enough for thousands of calls: one stackup scan, no caching.
 */
export function traceOnLayer(stackup: Stackup, layer: string, width: number, adjust?: TraceAdjust, options?: LayerSolveOptions): TraceProperties & MethodTags {
  checkAdjust(adjust);
  if (!(Number.isFinite(width) && width > 0)) throw new InputError(`layer "${layer}" width`, `must be a positive length, got ${width}`);
  validateStackup(stackup);
  const index = findSignalLayer(stackup, layer);
  return traceOnSection(stackup, index, classifyIndexUnchecked(stackup, index), width, adjust, options);
}

/**
 * One trace on a classified layer by the chosen method (docs/field-solver.md §10). The field path
 * solves the layer's own slabs and mask (layer-section.ts), memoised per geometry.
 */
function traceOnSection(
  stackup: Stackup, index: number, section: LayerCrossSection, width: number, adjust: TraceAdjust | undefined, options: LayerSolveOptions | undefined,
): TraceProperties & MethodTags {
  const g = geometryOf(section, width, adjust);
  if (chooseSolver(g, { mask: layerMask(stackup, index) }, options?.solver) === 'closed-form') return { ...singleEndedUnchecked(g), method: 'closed-form' };
  const r = cachedFieldSingleLine(layerFieldSection(stackup, index, g.width, undefined, adjust?.dkFactor ?? 1));
  return { structure: section.structure, model: r.method, ...lineParameters(r.z0, r.epsEff), method: 'field', convergence: r.convergence.estimate };
}

/** One leg of an edge-coupled pair driven differentially (odd mode), as seen by the solver. */
export interface PairOnLayer {
  structure: Structure;
  /** Odd- and even-mode impedances of one leg, Ω. */
  zodd: number;
  zeven: number;
  /** 2·Zodd, Ω. */
  zdiff: number;
  epsEffOdd: number;
  epsEffEven: number;
  /** Odd-mode phase velocity c/sqrt(eps_eff,odd), m/s, and its inverse, s/m. */
  velocityOdd: number;
  delayPerMetreOdd: number;
  /** The coupled-line formula used, in words. */
  pairModel: string;
  /** Which method gave the numbers; a field result's convergence estimate. */
  method?: Solver;
  convergence?: number;
}

/**
 * One leg of an edge-coupled pair of `width` (m) and edge gap `spacing` (m) on the named signal layer,
 * driven with complementary signals so that only the odd mode is excited (Cohn 1955, even/odd mode
 * decomposition of symmetric coupled lines): the leg sees Zodd and travels at c/sqrt(eps_eff,odd).
 * Model: the field solution of the layer's own cross-section (copper thickness, slabs, mask) by the
 * rule of field-choice.ts; asked for closed forms, Kirschning & Jansen 1984 (microstrip) or Cohn 1955
 * (symmetric stripline), both zero-thickness, and other structures throw an InputError naming the
 * layer. Etch (adjust.widthDelta) widens
 * both traces at a fixed centre pitch, so the gap shrinks by the same amount (common practice, no source).
 */
export function pairOnLayer(stackup: Stackup, layer: string, width: number, spacing: number, adjust?: TraceAdjust, options?: LayerSolveOptions): PairOnLayer {
  checkAdjust(adjust);
  if (!(Number.isFinite(width) && width > 0)) throw new InputError(`layer "${layer}" width`, `must be a positive length, got ${width}`);
  if (!(Number.isFinite(spacing) && spacing > 0)) throw new InputError(`layer "${layer}" spacing`, `must be a positive length, got ${spacing}`);
  validateStackup(stackup);
  const section = classifyIndexUnchecked(stackup, findSignalLayer(stackup, layer));
  const gap = spacing - (adjust?.widthDelta ?? 0);
  if (!(gap > 0)) {
    throw new InputError(`layer "${layer}" spacing`, `pair gap ${spacing} m with etch adjustment gives ${gap} m; must be positive`);
  }
  const g = geometryOf(section, width, adjust);
  const index = findSignalLayer(stackup, layer);
  const solver = chooseSolver({ ...g, spacing: gap }, {}, options?.solver);
  if (solver === 'field') {
    // The pair on the layer's own slabs and mask (layer-section.ts), memoised per geometry.
    const f = cachedFieldPair(layerFieldSection(stackup, index, g.width, gap, adjust?.dkFactor ?? 1));
    return {
      structure: section.structure,
      zodd: f.zodd,
      zeven: f.zeven,
      zdiff: f.zdiff,
      epsEffOdd: f.epsEffOdd,
      epsEffEven: f.epsEffEven,
      velocityOdd: f.velocityOdd,
      delayPerMetreOdd: f.delayPerMetreOdd,
      pairModel: f.method,
      method: 'field',
      convergence: f.convergence.estimate,
    };
  }
  const p = edgeCoupled({ ...g, spacing: gap }, (field) => `layer "${layer}" ${field}`);
  // Phase velocity of the odd mode: vp = c/sqrt(eps_eff,odd) (docs/design.md §2 applied to the odd mode).
  const velocityOdd = C0 / Math.sqrt(p.epsEffOdd);
  return {
    structure: p.structure,
    zodd: p.zodd,
    zeven: p.zeven,
    zdiff: p.zdiff,
    epsEffOdd: p.epsEffOdd,
    epsEffEven: p.epsEffEven,
    velocityOdd,
    delayPerMetreOdd: 1 / velocityOdd,
    pairModel: p.pairModel,
    method: 'closed-form',
  };
}

/** Every signal layer at its defaultWidth (error naming the layer if it has none), top to bottom. */
export function layerProperties(stackup: Stackup, adjust?: TraceAdjust, options?: LayerSolveOptions): LayerProperties[] {
  checkAdjust(adjust);
  return classifyStackup(stackup).map((section) => {
    if (section.defaultWidth === undefined) {
      throw new InputError(`layer "${section.layer}" defaultWidth`, 'signal layer has no default trace width');
    }
    const p = traceOnSection(stackup, section.index, section, section.defaultWidth, adjust, options);
    return {
      layer: section.layer,
      structure: p.structure,
      width: section.defaultWidth,
      z0: p.z0,
      epsEff: p.epsEff,
      velocity: p.velocity,
      delayPerMetre: p.delayPerMetre,
      method: p.method,
      model: p.model,
      ...(p.convergence === undefined ? {} : { convergence: p.convergence }),
    };
  });
}
