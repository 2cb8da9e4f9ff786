/**
 * One trace or one edge-coupled pair in a given cross-section: picks the published model for the
 * structure, validates the inputs (naming the field), and returns Z0, eps_eff and per-length L, C, delay.
 * All lengths in metres, results SI.
 */
import { InputError } from '../errors.js';
import { cohnCoupledStripline, cohnStriplineZ0 } from './cohn-stripline.js';
import { hammerstadJensenMicrostrip } from './hammerstad-jensen.js';
import {
  ipc2141aEmbeddedEpsEff, ipc2141aMicrostripZ0, ipc2141aOffsetStriplineZ0, ipc2141aStriplineZ0,
} from './ipc-2141a.js';
import { kirschningJansenCoupledMicrostrip } from './kirschning-jansen.js';
import { lineParameters, type LineParameters } from './line-parameters.js';
import { parallelCombinationOffsetStriplineZ0 } from './offset-stripline.js';
import { wheelerStriplineZ0 } from './wheeler-stripline.js';

export const STRUCTURES = ['microstrip', 'embedded-microstrip', 'stripline', 'offset-stripline'] as const;
export type Structure = (typeof STRUCTURES)[number];

/**
 * Which formula set to use. 'standard' is the default per structure (Hammerstad & Jensen 1980;
 * H&J with the IPC-2141A cover correction; Wheeler 1978; parallel combination of Wheeler 1978).
 * 'ipc-2141a' selects the simple IPC-2141A forms (labelled alternative). 'cohn-zero-thickness' selects
 * Cohn's exact zero-thickness result (symmetric stripline only; the strip thickness is ignored).
 */
export const IMPEDANCE_MODELS = ['standard', 'ipc-2141a', 'cohn-zero-thickness'] as const;
export type ImpedanceModel = (typeof IMPEDANCE_MODELS)[number];

export interface TraceGeometry {
  structure: Structure;
  /** Trace width W, m. */
  width: number;
  /** Copper thickness T, m (0 allowed). */
  thickness: number;
  /**
   * H1: dielectric between the trace and its reference plane (microstrip) or the plane below it
   * (striplines), m.
   */
  below: number;
  /** H2: dielectric between the trace and the plane above it, m (striplines; symmetric stripline defaults to H1). */
  above?: number;
  /** H3: dielectric over an embedded microstrip, m. */
  cover?: number;
  /** Relative permittivity (Dk) of the dielectric, >= 1. */
  er: number;
  model?: ImpedanceModel;
}

export interface PairGeometry extends TraceGeometry {
  /** Edge-to-edge gap S between the two traces, m. */
  spacing: number;
}

export interface TraceProperties extends LineParameters {
  structure: Structure;
  /** The formula used, in words, e.g. "Hammerstad & Jensen 1980". */
  model: string;
}

export interface PairProperties extends TraceProperties {
  /** Ω */
  zodd: number;
  zeven: number;
  /** 2·Zodd, Ω */
  zdiff: number;
  /** Zeven/2, Ω */
  zcommon: number;
  epsEffEven: number;
  epsEffOdd: number;
  /** The coupled-line formula used. */
  pairModel: string;
}

/** Maps a geometry field name to the name the user knows (the CLI maps "width" to its flag "--width"). */
export type FieldLabel = (field: keyof PairGeometry) => string;
const defaultLabel: FieldLabel = (field) => `trace ${field}`;

function positive(value: number | undefined, field: keyof PairGeometry, label: FieldLabel): void {
  if (value === undefined) throw new InputError(label(field), 'is required for this structure');
  if (!Number.isFinite(value) || value <= 0) throw new InputError(label(field), `must be a positive length, got ${value}`);
}

/** Validates a single-trace geometry; every error names the field through `label`. */
export function validateTraceGeometry(g: TraceGeometry, label: FieldLabel = defaultLabel): void {
  if (!(STRUCTURES as readonly string[]).includes(g.structure)) {
    throw new InputError(label('structure'), `unknown structure "${String(g.structure)}" (known: ${STRUCTURES.join(', ')})`);
  }
  if (g.model !== undefined && !(IMPEDANCE_MODELS as readonly string[]).includes(g.model)) {
    throw new InputError(label('model'), `unknown model "${String(g.model)}" (known: ${IMPEDANCE_MODELS.join(', ')})`);
  }
  positive(g.width, 'width', label);
  if (!Number.isFinite(g.thickness) || g.thickness < 0) {
    throw new InputError(label('thickness'), `must be zero or a positive length, got ${g.thickness}`);
  }
  positive(g.below, 'below', label);
  if (!Number.isFinite(g.er) || g.er < 1) throw new InputError(label('er'), `relative permittivity must be at least 1, got ${g.er}`);
  const striplines = g.structure === 'stripline' || g.structure === 'offset-stripline';
  if (striplines) {
    if (g.structure === 'offset-stripline' || g.above !== undefined) positive(g.above, 'above', label);
    if (g.cover !== undefined) throw new InputError(label('cover'), `applies only to embedded-microstrip, not ${g.structure}`);
  } else if (g.above !== undefined) {
    throw new InputError(label('above'), `applies only to stripline and offset-stripline, not ${g.structure}`);
  }
  if (g.structure === 'embedded-microstrip') positive(g.cover, 'cover', label);
  else if (g.cover !== undefined && !striplines) throw new InputError(label('cover'), `applies only to embedded-microstrip, not ${g.structure}`);
  if (g.structure === 'stripline' && g.above !== undefined && Math.abs(g.above - g.below) > 1e-3 * (g.above + g.below)) {
    throw new InputError(label('above'), `differs from ${label('below')} (H1): a trace not centred between its planes is an offset-stripline`);
  }
  if (g.model === 'cohn-zero-thickness' && g.structure !== 'stripline') {
    throw new InputError(label('model'), `cohn-zero-thickness applies only to symmetric stripline, not ${g.structure}`);
  }
}

/** Z0, eps_eff and the model name without validation (callers validate once). */
function impedance(g: TraceGeometry): { z0: number; epsEff: number; model: string } {
  const { width: w, thickness: t, below: h1, er } = g;
  const model = g.model ?? 'standard';
  switch (g.structure) {
    case 'microstrip': {
      if (model === 'ipc-2141a') {
        // IPC-2141A propagation delay for microstrip: eps_eff = 0.475·εr + 0.67 (value from memory).
        return { z0: ipc2141aMicrostripZ0(w, t, h1, er), epsEff: 0.475 * er + 0.67, model: 'IPC-2141A microstrip' };
      }
      const r = hammerstadJensenMicrostrip(w, t, h1, er);
      return { z0: r.z0, epsEff: r.epsEff, model: 'Hammerstad & Jensen 1980' };
    }
    case 'embedded-microstrip': {
      const epsEff = ipc2141aEmbeddedEpsEff(t, h1, g.cover ?? 0, er);
      if (model === 'ipc-2141a') {
        // IPC-2141A embedded microstrip: Z0 = 60/sqrt(εr')·ln(5.98h/(0.8W+T)).
        return { z0: (60 / Math.sqrt(epsEff)) * Math.log((5.98 * h1) / (0.8 * w + t)), epsEff, model: 'IPC-2141A embedded microstrip' };
      }
      // Air-line Z0 of the thickness-corrected strip (H&J 1980) over the IPC-2141A embedded εr'.
      const r = hammerstadJensenMicrostrip(w, t, h1, er);
      return { z0: r.z0Air / Math.sqrt(epsEff), epsEff, model: 'Hammerstad & Jensen 1980 in air, IPC-2141A cover correction' };
    }
    case 'stripline': {
      const b = h1 + (g.above ?? h1) + t;
      if (model === 'ipc-2141a') return { z0: ipc2141aStriplineZ0(w, t, b, er), epsEff: er, model: 'IPC-2141A stripline' };
      if (model === 'cohn-zero-thickness') return { z0: cohnStriplineZ0(w, b, er), epsEff: er, model: 'Cohn 1954 exact, zero thickness' };
      return { z0: wheelerStriplineZ0(w, t, b, er), epsEff: er, model: 'Wheeler 1978' };
    }
    case 'offset-stripline': {
      const h2 = g.above ?? h1;
      if (model === 'ipc-2141a') {
        return { z0: ipc2141aOffsetStriplineZ0(w, t, h1, h2, er), epsEff: er, model: 'IPC-2141A asymmetric stripline' };
      }
      return { z0: parallelCombinationOffsetStriplineZ0(w, t, h1, h2, er), epsEff: er, model: 'parallel combination of Wheeler 1978 striplines' };
    }
    default: {
      const never: never = g.structure;
      throw new InputError('structure', `unknown structure "${String(never)}"`);
    }
  }
}

/** Single-ended properties without validation: for callers that validated (classification). */
export function singleEndedUnchecked(g: TraceGeometry): TraceProperties {
  const { z0, epsEff, model } = impedance(g);
  const p = lineParameters(z0, epsEff);
  return { structure: g.structure, model, ...p };
}

/**
 * Z0, eps_eff, vp, delay, L and C per metre of one trace. Throws InputError naming the field.
 * Results are never NaN: a combination outside every model's reach (e.g. a trace so wide that the
 * IPC-2141A logarithm turns negative) is reported as an InputError.
 */
export function singleEnded(g: TraceGeometry, label: FieldLabel = defaultLabel): TraceProperties {
  validateTraceGeometry(g, label);
  const result = singleEndedUnchecked(g);
  if (!(result.z0 > 0) || !Number.isFinite(result.z0)) {
    throw new InputError(label('width'), `the ${result.model} form gives no positive Z0 for this geometry (outside its range)`);
  }
  return result;
}

/** Even/odd impedances and eps_eff of an edge-coupled pair, without validation. */
function pairModes(g: PairGeometry, label: FieldLabel): { zeven: number; zodd: number; epsEffEven: number; epsEffOdd: number; pairModel: string } {
  switch (g.structure) {
    case 'microstrip': {
      const r = kirschningJansenCoupledMicrostrip(g.width, g.spacing, g.below, g.er);
      return { ...r, pairModel: 'Kirschning & Jansen 1984 static, zero thickness' };
    }
    case 'stripline': {
      const b = g.below + (g.above ?? g.below) + g.thickness;
      const r = cohnCoupledStripline(g.width, g.spacing, b, g.er);
      return { ...r, epsEffEven: g.er, epsEffOdd: g.er, pairModel: 'Cohn 1955 exact, zero thickness' };
    }
    default:
      throw new InputError(label('spacing'), `edge-coupled pairs are modelled for microstrip and stripline only, not ${g.structure}`);
  }
}

/**
 * An edge-coupled pair: the single-trace properties of one line alone plus Zodd, Zeven,
 * Zdiff = 2·Zodd and Zcommon = Zeven/2 (Ω). Pair modes ignore strip thickness (both published models
 * are zero-thickness); the single-line values include it.
 */
export function edgeCoupled(g: PairGeometry, label: FieldLabel = defaultLabel): PairProperties {
  const single = singleEnded(g, label);
  positive(g.spacing, 'spacing', label);
  if (g.model !== undefined && g.model !== 'standard') {
    throw new InputError(label('model'), `pairs use the published coupled-line models only; model "${g.model}" is for single traces`);
  }
  const m = pairModes(g, label);
  if (!(m.zodd > 0 && m.zeven > 0) || !Number.isFinite(m.zodd) || !Number.isFinite(m.zeven)) {
    throw new InputError(label('spacing'), `the ${m.pairModel} model gives no valid result for this geometry`);
  }
  return { ...single, ...m, zdiff: 2 * m.zodd, zcommon: m.zeven / 2 };
}

/** Differential impedance 2·Zodd of a pair without validation (for the inverse search). */
export function zdiffUnchecked(g: PairGeometry): number {
  return 2 * pairModes(g, defaultLabel).zodd;
}

/**
 * Where the inputs leave the stated validity range of the formula that `singleEnded`/`edgeCoupled`
 * would use, in words (empty when inside). The result is still computed; hosts show these notes beside it.
 * Ranges as stated by each source: H&J 1980 (0.01 <= W/h <= 100, εr <= 128); IPC-2141A microstrip
 * (0.1 < W/h < 2, εr < 15), stripline (W/(b-t) < 0.35, T/b < 0.25) and asymmetric stripline
 * (0.1 <= W/h <= 2, T/h < 0.25, h the nearer plane); IPC embedded cover >= 25 µm; Wheeler 1978
 * (W'/(b-t) < 10, for offset stripline each half); the parallel-combination offset stripline is rough past
 * h2/h1 of 3 (measured, offset-stripline.ts); K&J 1984 (0.1 <= W/h, S/h <= 10, εr <= 18).
 */
export function validityNotes(g: TraceGeometry & { spacing?: number }): string[] {
  const notes: string[] = [];
  const model = g.model ?? 'standard';
  const u = g.width / g.below;
  const range = (value: number, lo: number, hi: number, what: string, source: string): void => {
    if (value < lo || value > hi) notes.push(`${what} = ${Number(value.toPrecision(3))} is outside ${lo}-${hi} (${source})`);
  };
  if (g.structure === 'microstrip' || g.structure === 'embedded-microstrip') {
    if (model === 'ipc-2141a') {
      range(u, 0.1, 2, 'W/h', 'IPC-2141A');
      range(g.er, 1, 15, 'εr', 'IPC-2141A');
    } else {
      range(u, 0.01, 100, 'W/h', 'Hammerstad & Jensen 1980');
      range(g.er, 1, 128, 'εr', 'Hammerstad & Jensen 1980');
    }
    if (g.structure === 'embedded-microstrip' && (g.cover ?? 0) < 25e-6) {
      notes.push('cover thinner than 25 µm: eps_eff lies between the open and the embedded values (IPC-2141A)');
    }
    if (g.spacing !== undefined && g.structure === 'microstrip') {
      range(u, 0.1, 10, 'W/h', 'Kirschning & Jansen 1984');
      range(g.spacing / g.below, 0.1, 10, 'S/h', 'Kirschning & Jansen 1984');
      range(g.er, 1, 18, 'εr', 'Kirschning & Jansen 1984');
    }
  } else if (g.structure === 'offset-stripline') {
    // The ranges stated in offset-stripline.ts and ipc-2141a.ts, in terms of the nearer plane h.
    const near = Math.min(g.below, g.above ?? g.below);
    const far = Math.max(g.below, g.above ?? g.below);
    if (model === 'ipc-2141a') {
      range(g.width / near, 0.1, 2, 'W/h (nearer plane)', 'IPC-2141A asymmetric stripline');
      range(g.thickness / near, 0, 0.25, 'T/h (nearer plane)', 'IPC-2141A asymmetric stripline');
    } else {
      // Each half is a Wheeler 1978 stripline of plane spacing 2h + T, so W/(b-t) = W/(2h).
      range(g.width / (2 * near), 0, 10, 'W/(2h) of the nearer half', 'Wheeler 1978');
      // 1e-9 relative: a ratio of exactly 3 in entered units (12 mil / 4 mil) is not exact in binary.
      if (far / near > 3 * (1 + 1e-9)) {
        notes.push(`h2/h1 = ${Number((far / near).toPrecision(3))} is past 3: the parallel-combination estimate reads high (about +3 % at 3, +7 % at 5 against a moment-method solution); treat Z0 as rough`);
      }
    }
  } else {
    const b = g.below + (g.above ?? g.below) + g.thickness;
    const ratio = g.width / (b - g.thickness);
    if (model === 'ipc-2141a') {
      range(ratio, 0, 0.35, 'W/(b-t)', 'IPC-2141A');
      range(g.thickness / b, 0, 0.25, 'T/b', 'IPC-2141A');
    } else if (model === 'standard') {
      range(ratio, 0, 10, 'W/(b-t)', 'Wheeler 1978');
    }
  }
  return notes;
}

/**
 * Inputs no printed circuit board has, whichever solver runs: the numbers still follow the
 * physics, but the geometry is almost certainly a unit slip (docs/reliability.md §6). Bounds are
 * generous against PCB practice (common practice, no source): copper up to 10 oz (about 350 µm,
 * 1 oz ≈ 35 µm per docs/design.md §3), dielectric layers up to 10 mm, traces up to 25 mm wide, εr up
 * to 20 (PCB laminates about 2-11, filled ceramics to about 15).
 */
export function plausibilityNotes(g: TraceGeometry & { spacing?: number }): string[] {
  const notes: string[] = [];
  const um = (m: number): string => `${Number((m * 1e6).toPrecision(3))} µm`;
  const mm = (m: number): string => `${Number((m * 1e3).toPrecision(3))} mm`;
  if (g.thickness > 350e-6) notes.push(`copper thickness ${um(g.thickness)} is beyond PCB copper (10 oz is about 350 µm): check the unit`);
  for (const [name, h] of [['dielectric below', g.below], ['dielectric above', g.above], ['cover', g.cover]] as const) {
    if (h !== undefined && h > 10e-3) notes.push(`${name} ${mm(h)} is thicker than a PCB dielectric layer (up to about 10 mm): check the unit`);
  }
  if (g.width > 25e-3) notes.push(`width ${mm(g.width)} is wider than a PCB trace (up to about 25 mm): check the unit`);
  if (g.spacing !== undefined && g.spacing > 25e-3) notes.push(`spacing ${mm(g.spacing)} leaves the pair uncoupled (over 25 mm): check the unit`);
  if (g.er > 20) notes.push(`εr ${g.er.toPrecision(3)} is beyond PCB dielectrics (about 2-15): velocity and delay follow it literally`);
  return notes;
}
