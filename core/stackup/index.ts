/**
 * Stackup impedance engine: classify routing layers from a layer stack and compute Z0, eps_eff,
 * velocity, delay, L and C per metre with published closed forms (DESIGN.md §3). SI units throughout.
 */
import { InputError } from '../errors.js';
import type { LayerProperties } from '../contract/api.js';
import type { Stackup } from '../project/model.js';
import {
  classifyIndexUnchecked, classifyStackup, findSignalLayer, validateStackup, type LayerCrossSection,
} from './classify.js';
import { singleEndedUnchecked, type TraceGeometry, type TraceProperties } from './geometry.js';

export * from './elliptic.js';
export * from './constants.js';
export * from './hammerstad-jensen.js';
export * from './ipc-2141a.js';
export * from './cohn-stripline.js';
export * from './wheeler-stripline.js';
export * from './offset-stripline.js';
export * from './kirschning-jansen.js';
export * from './line-parameters.js';
export * from './geometry.js';
export * from './inverse.js';
export * from './classify.js';
export * from './parse.js';

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
export function traceOnLayer(stackup: Stackup, layer: string, width: number, adjust?: TraceAdjust): TraceProperties {
  checkAdjust(adjust);
  if (!(Number.isFinite(width) && width > 0)) throw new InputError(`layer "${layer}" width`, `must be a positive length, got ${width}`);
  validateStackup(stackup);
  const index = findSignalLayer(stackup, layer);
  return singleEndedUnchecked(geometryOf(classifyIndexUnchecked(stackup, index), width, adjust));
}

/** Every signal layer at its defaultWidth (error naming the layer if it has none), top to bottom. */
export function layerProperties(stackup: Stackup, adjust?: TraceAdjust): LayerProperties[] {
  checkAdjust(adjust);
  return classifyStackup(stackup).map((section) => {
    if (section.defaultWidth === undefined) {
      throw new InputError(`layer "${section.layer}" defaultWidth`, 'signal layer has no default trace width');
    }
    const p = singleEndedUnchecked(geometryOf(section, section.defaultWidth, adjust));
    return {
      layer: section.layer,
      structure: p.structure,
      width: section.defaultWidth,
      z0: p.z0,
      epsEff: p.epsEff,
      velocity: p.velocity,
      delayPerMetre: p.delayPerMetre,
    };
  });
}
