/**
 * The field solver's cross-section of a routing layer, built from the stackup's own layers rather
 * than from the averaged Dk of the closed forms (docs/field-solver.md §10):
 * - the reference plane is y = 0 (for a bottom-side layer the stack is mirrored, as in classify.ts);
 *   for striplines the plane below the layer;
 * - every dielectric or mask layer between the plane and the trace is a slab with its own Dk; a
 *   signal copper layer in that span counts as a slab of the dielectric next to it (its copper is not a
 *   reference, and the resin fills it);
 * - on the far side, a plane makes a stripline (the copper layer is filled with the first dielectric
 *   above it), dielectric makes an embedded microstrip, and mask alone over an outer layer is a
 *   conformal coating of the mask's thickness and Dk (several mask layers: total thickness,
 *   thickness-weighted Dk).
 */
import { InputError } from '../errors.js';
import {
  cropPotentialMap, potentialMap, stackHeight, type ConformalMask, type CrossSection, type DielectricSlab, type PotentialMap,
} from '../fieldsolve/index.js';
import type { Stackup, StackupLayer } from '../project/model.js';
import { classifyIndexUnchecked, findSignalLayer, validateStackup } from './classify.js';

interface Span {
  /** Layers from the trace outward up to (not including) the plane. */
  layers: StackupLayer[];
  plane: boolean;
}

function span(layers: StackupLayer[], from: number, step: 1 | -1): Span {
  const out: StackupLayer[] = [];
  for (let j = from + step; j >= 0 && j < layers.length; j += step) {
    const l = layers[j];
    if (l.kind === 'copper' && l.role === 'plane') return { layers: out, plane: true };
    out.push(l);
  }
  return { layers: out, plane: false };
}

/** Slabs of a span, ordered outward from the trace; copper signal layers take a neighbour's Dk. */
function slabs(list: StackupLayer[], dkFactor: number, where: string): DielectricSlab[] {
  const out: DielectricSlab[] = [];
  for (let k = 0; k < list.length; k++) {
    const l = list[k];
    let dk = l.dk;
    if (l.kind === 'copper') {
      const near = list.slice(k + 1).find((m) => m.kind !== 'copper') ?? list.slice(0, k).reverse().find((m) => m.kind !== 'copper');
      dk = near?.dk;
    }
    if (dk === undefined) throw new InputError(where, 'no dielectric between the trace and its plane');
    out.push({ thickness: l.thickness, er: Math.max(1, dk * dkFactor) });
  }
  return out;
}

/** Mask layers over an open side as one conformal coat (total thickness, thickness-weighted Dk). */
function maskOf(list: StackupLayer[], dkFactor: number): ConformalMask | undefined {
  let thickness = 0;
  let dkSum = 0;
  for (const l of list) {
    if (l.kind !== 'mask' || l.dk === undefined) continue;
    thickness += l.thickness;
    dkSum += l.dk * l.thickness;
  }
  return thickness > 0 ? { thickness, er: Math.max(1, (dkSum / thickness) * dkFactor) } : undefined;
}

/**
 * The solder mask coating a microstrip layer (mask layers on its open side, no dielectric there),
 * or undefined. Cheap: no cross-section is built.
 */
export function layerMask(stackup: Stackup, index: number): ConformalMask | undefined {
  const down = span(stackup.layers, index, 1);
  const up = span(stackup.layers, index, -1);
  if (down.plane === up.plane) return undefined;
  const far = down.plane ? up : down;
  return far.layers.some((l) => l.kind === 'dielectric') ? undefined : maskOf(far.layers, 1);
}

/**
 * Cross-section of `count` traces (1 or 2) of foot `width` at edge gap `spacing` on signal layer
 * `index` (the stackup validated and classified already), with every Dk times `dkFactor`
 * (a result below 1 is taken as 1, vacuum).
 */
export function layerFieldSection(stackup: Stackup, index: number, width: number, spacing: number | undefined, dkFactor = 1): CrossSection {
  const all = stackup.layers;
  const copper = all[index];
  const where = `stackup layer ${index + 1} "${copper.name}"`;
  const down = span(all, index, 1);
  const up = span(all, index, -1);
  const ref = down.plane ? down : up;
  const far = down.plane ? up : down;
  if (!ref.plane) throw new InputError(where, 'signal layer has no reference plane above or below it');
  const below = slabs(ref.layers, dkFactor, where);
  if (below.length === 0) throw new InputError(where, 'touches a plane with no dielectric between');
  const layers: DielectricSlab[] = below.slice().reverse();
  let base = 0;
  for (const s of below) base += s.thickness;
  const t = copper.thickness;

  let topPlane = false;
  const farBulk = far.layers.some((l) => l.kind === 'dielectric');
  if (far.plane || farBulk) {
    const above = slabs(far.layers, dkFactor, where);
    if (above.length === 0) throw new InputError(where, 'touches a plane with no dielectric between');
    // The copper layer is filled with the first dielectric beyond it.
    above[0] = { thickness: above[0].thickness + t, er: above[0].er };
    layers.push(...above);
    topPlane = far.plane;
  }
  const mask = farBulk || far.plane ? undefined : maskOf(far.layers, dkFactor);
  const traces = spacing === undefined
    ? [{ centre: 0, width, thickness: t, base }]
    : [-1, 1].map((side) => ({ centre: (side * (width + spacing)) / 2, width, thickness: t, base }));
  return { layers, topPlane, traces, ...(mask ? { mask } : {}) };
}

/**
 * The potential over the cross-section of a trace (or a pair driven +1/−1 V) on a named signal
 * layer, cropped to three structure heights around the traces, for the stackup view's picture of
 * the field (docs/field-solver.md §8). x is centred on the trace(s); y = 0 is the reference plane (for
 * a bottom-side layer, the stack mirrored).
 */
export function layerPotentialMap(stackup: Stackup, layer: string, width: number, spacing?: number): PotentialMap {
  if (!(Number.isFinite(width) && width > 0)) throw new InputError(`layer "${layer}" width`, `must be a positive length, got ${width}`);
  if (spacing !== undefined && !(Number.isFinite(spacing) && spacing > 0)) throw new InputError(`layer "${layer}" spacing`, `must be a positive length, got ${spacing}`);
  validateStackup(stackup);
  const index = findSignalLayer(stackup, layer);
  classifyIndexUnchecked(stackup, index); // the same errors as the impedance path (no reference, touching a plane)
  const section = layerFieldSection(stackup, index, width, spacing);
  const map = potentialMap(section);
  const height = stackHeight(section);
  const top = Math.max(height, ...section.traces.map((t) => t.base + t.thickness)) + (section.mask?.thickness ?? 0);
  const half = (spacing === undefined ? width / 2 : width + spacing / 2) + 3 * top;
  return section.topPlane ? cropPotentialMap(map, -half, half, height) : cropPotentialMap(map, -half, half, 4 * top);
}
