/**
 * Classifies each signal layer of a stackup (layers top to bottom) from its neighbouring planes:
 * - microstrip: one plane on one side, nothing or only solder mask on the other (outer layer);
 * - embedded-microstrip: one plane on one side, dielectric (no plane) on the other;
 * - stripline: planes on both sides at equal distance; offset-stripline: at unequal distance.
 * H1 ("below") is the dielectric between the trace and its reference plane (for a bottom-side
 * microstrip the plane is physically above: the same structure mirrored); for striplines H1 is to the
 * plane below and H2 ("above") to the plane above. Other signal layers between the trace and a plane
 * count towards the height (their copper is not a reference).
 * Dk used: the thickness-weighted average of the dielectric and mask layers in the spans used (trace to
 * plane(s), plus the cover of an embedded microstrip). This is an approximation for mixed laminates:
 * the field does not weight the layers by thickness alone.
 */
import { InputError } from '../errors.js';
import type { Stackup, StackupLayer } from '../project/model.js';
import type { Structure } from './geometry.js';

export interface LayerCrossSection {
  layer: string;
  /** Index in Stackup.layers. */
  index: number;
  structure: Structure;
  /** Copper thickness, m. */
  thickness: number;
  /** H1, m. */
  below: number;
  /** H2, m (striplines). */
  above?: number;
  /** Dielectric over an embedded microstrip, m. */
  cover?: number;
  /** Dk used (thickness-weighted average), before any corner factor. */
  er: number;
  /** Default single-ended width, m, when the stackup gives one. */
  defaultWidth?: number;
}

/** Relative tolerance under which H1 and H2 count as equal (symmetric stripline). */
const SYMMETRY_TOLERANCE = 1e-6;

function where(layer: StackupLayer, index: number): string {
  return `stackup layer ${index + 1} "${layer.name}"`;
}

/** Checks every layer (thickness, Dk, role, names) and that there is at least one plane. */
export function validateStackup(stackup: Stackup): void {
  const layers = stackup?.layers;
  if (!Array.isArray(layers) || layers.length === 0) throw new InputError('stackup', 'has no layers');
  let planes = 0;
  for (let i = 0; i < layers.length; i++) {
    const l = layers[i];
    if (typeof l?.name !== 'string' || l.name.trim() === '') throw new InputError(`stackup layer ${i + 1}`, 'has no name');
    for (let j = 0; j < i; j++) {
      if (layers[j].name === l.name) throw new InputError(where(l, i), `name repeats layer ${j + 1}`);
    }
    if (!(Number.isFinite(l.thickness) && l.thickness > 0)) {
      throw new InputError(`${where(l, i)} thickness`, `must be a positive length, got ${l.thickness}`);
    }
    if (l.kind === 'dielectric' || l.kind === 'mask') {
      if (!(typeof l.dk === 'number' && Number.isFinite(l.dk) && l.dk >= 1)) {
        throw new InputError(`${where(l, i)} dk`, `relative permittivity must be a number of at least 1, got ${l.dk}`);
      }
      if (l.df !== undefined && !(Number.isFinite(l.df) && l.df >= 0 && l.df < 1)) {
        throw new InputError(`${where(l, i)} df`, `loss tangent must be between 0 and 1, got ${l.df}`);
      }
    } else if (l.kind === 'copper') {
      if (l.role !== 'signal' && l.role !== 'plane') {
        throw new InputError(`${where(l, i)} role`, `copper layers need role "signal" or "plane", got ${String(l.role)}`);
      }
      if (l.role === 'plane') planes++;
      if (l.defaultWidth !== undefined && !(Number.isFinite(l.defaultWidth) && l.defaultWidth > 0)) {
        throw new InputError(`${where(l, i)} defaultWidth`, `must be a positive length, got ${l.defaultWidth}`);
      }
    } else {
      throw new InputError(`${where(l, i)} kind`, `must be "copper", "dielectric" or "mask", got ${String(l.kind)}`);
    }
  }
  if (planes === 0) throw new InputError('stackup', 'has no plane layer: every signal layer needs a reference plane');
}

/**
 * One side of a trace: distance to the nearest plane (or, without a plane, to the surface) and the
 * sums for the Dk average. Filled in place by `scan` so classification allocates only its result.
 */
class Side {
  plane = false;
  /** Height to the plane (or total thickness to the surface), m. */
  height = 0;
  /** Σ dk·thickness and Σ thickness over dielectric and mask layers in the span. */
  dkSum = 0;
  dielectric = 0;
  /** Thickness of 'dielectric' layers only (mask excluded), m. */
  bulk = 0;

  scan(layers: StackupLayer[], from: number, step: 1 | -1): this {
    this.plane = false;
    this.height = this.dkSum = this.dielectric = this.bulk = 0;
    for (let j = from + step; j >= 0 && j < layers.length; j += step) {
      const l = layers[j];
      if (l.kind === 'copper') {
        if (l.role === 'plane') {
          this.plane = true;
          return this;
        }
      } else {
        this.dkSum += (l.dk as number) * l.thickness;
        this.dielectric += l.thickness;
        if (l.kind === 'dielectric') this.bulk += l.thickness;
      }
      this.height += l.thickness;
    }
    return this;
  }
}

function section(
  l: StackupLayer, index: number, structure: Structure, below: number, above: number | undefined,
  cover: number | undefined, er: number,
): LayerCrossSection {
  return { layer: l.name, index, structure, thickness: l.thickness, below, above, cover, er, defaultWidth: l.defaultWidth };
}

/** Classifies one copper signal layer by index; the stackup must already be valid (validateStackup). */
export function classifyIndexUnchecked(stackup: Stackup, index: number): LayerCrossSection {
  const layers = stackup.layers;
  const l = layers[index];
  const up = new Side().scan(layers, index, -1);
  const down = new Side().scan(layers, index, 1);
  if (up.plane && down.plane) {
    if (!(up.height > 0 && down.height > 0)) throw new InputError(where(l, index), 'touches a plane with no dielectric between');
    const er = (up.dkSum + down.dkSum) / (up.dielectric + down.dielectric);
    const symmetric = Math.abs(up.height - down.height) <= SYMMETRY_TOLERANCE * (up.height + down.height);
    return section(l, index, symmetric ? 'stripline' : 'offset-stripline', down.height, up.height, undefined, er);
  }
  if (!up.plane && !down.plane) {
    // Unreachable after validateStackup (scans pass through other signal layers); kept as a guard.
    throw new InputError(where(l, index), 'signal layer has no reference plane above or below it');
  }
  const ref = down.plane ? down : up;
  const other = down.plane ? up : down;
  if (!(ref.height > 0 && ref.dielectric > 0)) {
    throw new InputError(where(l, index), ref.height > 0 ? 'has no dielectric between it and its reference plane' : 'touches a plane with no dielectric between');
  }
  if (other.bulk > 0) {
    const er = (ref.dkSum + other.dkSum) / (ref.dielectric + other.dielectric);
    return section(l, index, 'embedded-microstrip', ref.height, undefined, other.dielectric, er);
  }
  return section(l, index, 'microstrip', ref.height, undefined, undefined, ref.dkSum / ref.dielectric);
}

/** Finds a copper signal layer by name; InputError naming the layer when missing or a plane. */
export function findSignalLayer(stackup: Stackup, layer: string): number {
  const layers = stackup.layers;
  for (let i = 0; i < layers.length; i++) {
    if (layers[i].name !== layer) continue;
    if (layers[i].kind !== 'copper') throw new InputError(`layer "${layer}"`, `is a ${layers[i].kind} layer, not a routing layer`);
    if (layers[i].role !== 'signal') throw new InputError(`layer "${layer}"`, 'is a plane, not a routing (signal) layer');
    return i;
  }
  throw new InputError(`layer "${layer}"`, `is not in stackup "${stackup.name}"`);
}

/** Classifies one named signal layer (validates the stackup first). */
export function classifyLayer(stackup: Stackup, layer: string): LayerCrossSection {
  validateStackup(stackup);
  return classifyIndexUnchecked(stackup, findSignalLayer(stackup, layer));
}

/** Classifies every signal layer, top to bottom (validates the stackup first). */
export function classifyStackup(stackup: Stackup): LayerCrossSection[] {
  validateStackup(stackup);
  const out: LayerCrossSection[] = [];
  stackup.layers.forEach((l, i) => {
    if (l.kind === 'copper' && l.role === 'signal') out.push(classifyIndexUnchecked(stackup, i));
  });
  return out;
}
