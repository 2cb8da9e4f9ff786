/**
 * The 2-D cross-section the field solver works on (docs/field-solver.md §2): a reference plane at
 * y = 0, horizontal dielectric layers stacked upward from it, optionally a second plane on top of the
 * last layer (stripline) or open air above (microstrip), traces of real thickness with a trapezoidal
 * etch profile, and an optional solder mask that conforms over the traces on the top surface.
 * Lengths in metres, x across the board (0 is arbitrary; builders centre the traces on it), y up.
 * `validateCrossSection` checks everything and names the field; the solver assumes a valid section.
 */
import { InputError } from '../errors.js';

export interface DielectricSlab {
  /** Slab thickness, m (> 0). */
  thickness: number;
  /** Relative permittivity, >= 1. */
  er: number;
}

export interface TraceShape {
  /** x of the trace's centre line, m. */
  centre: number;
  /** Width at the foot (the side on `base`, the wider side of an etched trace), m (> 0). */
  width: number;
  /** Copper thickness, m (>= 0; 0 is an infinitely thin strip). */
  thickness: number;
  /** Height of the foot above the bottom plane, m (inside the dielectric stack). */
  base: number;
  /**
   * Etch factor E = T / undercut per side (docs/field-solver.md §2): the top is narrower than the foot
   * by 2T/E. Infinity (or undefined) is a rectangle.
   */
  etchFactor?: number;
}

export interface ConformalMask {
  /** Coating thickness over the laminate surface, the trace tops and the trace sides, m (> 0). */
  thickness: number;
  /** Relative permittivity of the coating, >= 1. */
  er: number;
}

export interface CrossSection {
  /** Dielectric slabs from the bottom plane (y = 0) upward. */
  layers: DielectricSlab[];
  /** A second reference plane on top of the last slab (stripline); otherwise air above. */
  topPlane: boolean;
  /** One or more traces (a pair: two; N coupled lines: N), ordered left to right. */
  traces: TraceShape[];
  /** Solder mask over traces that sit on the top surface of an open (no top plane) stack. */
  mask?: ConformalMask;
}

/** Top width of an etched trace: foot width minus twice the undercut T/E. */
export function topWidth(trace: TraceShape): number {
  const e = trace.etchFactor;
  if (e === undefined || e === Infinity || trace.thickness === 0) return trace.width;
  return trace.width - (2 * trace.thickness) / e;
}

/** Total dielectric height, m. */
export function stackHeight(section: CrossSection): number {
  let h = 0;
  for (const l of section.layers) h += l.thickness;
  return h;
}

function positiveField(value: number, where: string): void {
  if (!(Number.isFinite(value) && value > 0)) throw new InputError(where, `must be a positive length, got ${value}`);
}

function permittivity(value: number, where: string): void {
  if (!(Number.isFinite(value) && value >= 1)) throw new InputError(where, `relative permittivity must be at least 1, got ${value}`);
}

/** Relative slack for "touching" comparisons (the foot on a surface, two traces side by side). */
const TOUCH = 1e-9;

/**
 * Validates a cross-section; every error names the field ("trace 2 width", "layer 1 er", ...).
 * Rejects zero or negative sizes, traces outside the dielectric or through a plane, overlapping
 * traces, an etch factor that leaves no top, and a mask that would not sit on the top surface.
 */
export function validateCrossSection(section: CrossSection): void {
  if (!Array.isArray(section.layers) || section.layers.length === 0) throw new InputError('cross-section layers', 'needs at least one dielectric layer');
  section.layers.forEach((l, i) => {
    positiveField(l.thickness, `layer ${i + 1} thickness`);
    permittivity(l.er, `layer ${i + 1} er`);
  });
  if (!Array.isArray(section.traces) || section.traces.length === 0) throw new InputError('cross-section traces', 'needs at least one trace');
  const height = stackHeight(section);
  section.traces.forEach((t, i) => {
    const name = `trace ${i + 1}`;
    if (!Number.isFinite(t.centre)) throw new InputError(`${name} centre`, `must be a finite position, got ${t.centre}`);
    positiveField(t.width, `${name} width`);
    if (!(Number.isFinite(t.thickness) && t.thickness >= 0)) throw new InputError(`${name} thickness`, `must be zero or a positive length, got ${t.thickness}`);
    if (!(Number.isFinite(t.base) && t.base > 0)) {
      throw new InputError(`${name} base`, `must lie above the bottom plane (height > 0), got ${t.base}`);
    }
    if (t.etchFactor !== undefined && !(t.etchFactor > 0)) throw new InputError(`${name} etch factor`, `must be positive (Infinity for a rectangle), got ${t.etchFactor}`);
    if (!(topWidth(t) > 0)) {
      throw new InputError(`${name} etch factor`, `${t.etchFactor} undercuts a ${t.width} m wide, ${t.thickness} m thick trace to nothing (top width ${topWidth(t)} m)`);
    }
    const top = t.base + t.thickness;
    if (section.topPlane) {
      if (!(top < height * (1 - TOUCH))) {
        throw new InputError(`${name} base`, `the trace (top at ${top} m) reaches the top plane at ${height} m: it must lie inside the dielectric`);
      }
    } else if (t.base > height * (1 + TOUCH)) {
      throw new InputError(`${name} base`, `the trace foot at ${t.base} m is above the dielectric surface at ${height} m (floating in air)`);
    }
  });
  for (let i = 1; i < section.traces.length; i++) {
    const a = section.traces[i - 1];
    const b = section.traces[i];
    const verticalOverlap = a.base < b.base + b.thickness + TOUCH * height && b.base < a.base + a.thickness + TOUCH * height;
    const gap = b.centre - b.width / 2 - (a.centre + a.width / 2);
    if (!(b.centre > a.centre)) throw new InputError(`trace ${i + 1} centre`, 'traces must be listed left to right');
    if (verticalOverlap && !(gap > TOUCH * (a.width + b.width))) {
      throw new InputError(`trace ${i + 1} centre`, `overlaps or touches trace ${i} (edge gap ${gap} m): conductors must be separate`);
    }
  }
  if (section.mask) {
    positiveField(section.mask.thickness, 'mask thickness');
    permittivity(section.mask.er, 'mask er');
    if (section.topPlane) throw new InputError('mask', 'a solder mask coats an outer layer; this section has a top plane');
    section.traces.forEach((t, i) => {
      if (Math.abs(t.base - height) > TOUCH * height) {
        throw new InputError(`trace ${i + 1} base`, 'with a mask every trace must sit on the top surface of the dielectric');
      }
    });
  }
}
