/**
 * Which method gives a number — the published closed forms or the 2-D field solver
 * (docs/field-solver.md §10) — and the field-solver path for the stackup's own geometry types.
 * Rule: the field solver for edge-coupled pairs (the coupled-line forms ignore copper thickness),
 * solder mask over the trace, a trapezoidal etch, thick copper (T/h > 0.2), offset stripline, and any
 * geometry outside the closed form's stated validity; the closed forms otherwise (single traces
 * inside their validity), and whenever a closed-form model is asked for by name.
 */
import { InputError } from '../errors.js';
import {
  cachedFieldPair, cachedFieldSingleLine, pcbCrossSection, type ConformalMask, type PcbTraceGeometry,
} from '../fieldsolve/index.js';
import {
  validateTraceGeometry, validityNotes, type FieldLabel, type PairGeometry, type PairProperties, type TraceGeometry,
  type TraceProperties,
} from './geometry.js';
import { lineParameters } from './line-parameters.js';

export const SOLVERS = ['field', 'closed-form'] as const;
/** 'field': core/fieldsolve; 'closed-form': the published formulas of core/stackup. */
export type Solver = (typeof SOLVERS)[number];

/** Copper thickness over the nearer dielectric height above which the closed forms are weak. */
export const THICK_COPPER_RATIO = 0.2;

/** What the closed forms cannot see: a coating, an etch profile, a second dielectric over a stripline. */
export interface CrossSectionExtras {
  /** Conformal solder mask over a microstrip trace. */
  mask?: ConformalMask;
  /** Etch factor T/undercut (docs/field-solver.md §2); undefined or Infinity is a rectangle. */
  etchFactor?: number;
  /** Dk of the dielectric above the trace when it differs from `er` (striplines, embedded microstrip). */
  erAbove?: number;
}

/** Tags every result carries: the method and, for field results, the convergence estimate. */
export interface MethodTags {
  method: Solver;
  /** Relative convergence estimate of a field result (docs/field-solver.md §5). */
  convergence?: number;
}

/** Reasons to use the field solver for this geometry; empty when the closed form is the default. */
export function fieldSolverReasons(g: TraceGeometry & { spacing?: number }, extras: CrossSectionExtras = {}): string[] {
  const reasons: string[] = [];
  if (g.spacing !== undefined) reasons.push('edge-coupled pair (the coupled-line closed forms ignore copper thickness)');
  if (extras.mask) reasons.push('solder mask over the trace (the closed forms neglect it)');
  if (extras.etchFactor !== undefined && extras.etchFactor !== Infinity) reasons.push('trapezoidal etch profile');
  const striplines = g.structure === 'stripline' || g.structure === 'offset-stripline';
  const h = striplines ? Math.min(g.below, g.above ?? g.below) : g.below;
  if (g.thickness / h > THICK_COPPER_RATIO) reasons.push(`thick copper (T/h = ${(g.thickness / h).toFixed(2)} > ${THICK_COPPER_RATIO})`);
  if (g.structure === 'offset-stripline') reasons.push('offset stripline (the parallel-combination estimate reads high)');
  if (validityNotes(g).length > 0) reasons.push('outside the closed form\'s stated validity');
  return reasons;
}

/**
 * The solver to use: the requested one, else closed form when a closed-form model was named, else
 * the rule of this file.
 */
export function chooseSolver(g: TraceGeometry & { spacing?: number }, extras: CrossSectionExtras = {}, requested?: Solver): Solver {
  if (requested !== undefined) {
    if (!(SOLVERS as readonly string[]).includes(requested)) throw new InputError('solver', `unknown solver "${String(requested)}" (known: ${SOLVERS.join(', ')})`);
    return requested;
  }
  if (g.model !== undefined && g.model !== 'standard') return 'closed-form';
  return fieldSolverReasons(g, extras).length > 0 ? 'field' : 'closed-form';
}

/** The field solver's geometry for a stackup trace geometry (traces centred, the pair at ±(W+S)/2). */
export function pcbGeometryOf(g: TraceGeometry & { spacing?: number }, extras: CrossSectionExtras = {}): PcbTraceGeometry {
  const base: PcbTraceGeometry = {
    width: g.width,
    thickness: g.thickness,
    below: g.below,
    er: g.er,
    ...(g.spacing === undefined ? {} : { spacing: g.spacing }),
    ...(extras.etchFactor === undefined ? {} : { etchFactor: extras.etchFactor }),
  };
  switch (g.structure) {
    case 'microstrip':
      return { ...base, ...(extras.mask ? { mask: extras.mask } : {}) };
    case 'embedded-microstrip':
      if (extras.mask) throw new InputError('mask', 'applies to an outer (microstrip) trace; an embedded microstrip has its cover');
      return { ...base, above: g.cover, erAbove: extras.erAbove ?? g.er };
    case 'stripline':
    case 'offset-stripline':
      if (extras.mask) throw new InputError('mask', `applies to an outer (microstrip) trace, not ${g.structure}`);
      return { ...base, above: g.above ?? g.below, erAbove: extras.erAbove ?? g.er, topPlane: true };
    default: {
      const never: never = g.structure;
      throw new InputError('structure', `unknown structure "${String(never)}"`);
    }
  }
}

/** One trace by the field solver, as TraceProperties with its method tags. Validates first. */
export function fieldSingleEnded(g: TraceGeometry, extras: CrossSectionExtras = {}, label?: FieldLabel): TraceProperties & MethodTags {
  validateTraceGeometry(g, label);
  const { spacing: _pairGap, ...lone } = g as TraceGeometry & { spacing?: number };
  const r = cachedFieldSingleLine(pcbCrossSection(pcbGeometryOf(lone, extras)));
  return { structure: g.structure, model: r.method, ...lineParameters(r.z0, r.epsEff), method: 'field', convergence: r.convergence.estimate };
}

/**
 * An edge-coupled pair by the field solver: the lone line and the pair modes, both field-solved, as
 * PairProperties with its method tags (convergence: the larger of the two estimates).
 */
export function fieldEdgeCoupled(g: PairGeometry, extras: CrossSectionExtras = {}, label?: FieldLabel): PairProperties & MethodTags {
  const single = fieldSingleEnded(g, extras, label);
  if (!(Number.isFinite(g.spacing) && g.spacing > 0)) throw new InputError(label ? label('spacing') : 'trace spacing', `must be a positive length, got ${g.spacing}`);
  const p = cachedFieldPair(pcbCrossSection(pcbGeometryOf(g, extras)));
  return {
    ...single,
    zodd: p.zodd,
    zeven: p.zeven,
    zdiff: p.zdiff,
    zcommon: p.zcommon,
    epsEffEven: p.epsEffEven,
    epsEffOdd: p.epsEffOdd,
    pairModel: p.method,
    convergence: Math.max(single.convergence ?? 0, p.convergence.estimate),
  };
}
