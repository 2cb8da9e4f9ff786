/**
 * Results people use, from a field solution (docs/field-solver.md §6): one line's Z0, eps_eff,
 * velocity, delay, L and C per metre; a symmetric pair's Zodd, Zeven, Zdiff, Zcommon and the odd and
 * even eps_eff, velocities and delays; N coupled lines' C and L matrices (FieldSolution itself).
 */
import { InputError } from '../errors.js';
import { validateCrossSection, type CrossSection } from './cross-section.js';
import { mode, pairModes } from './extract.js';
import { solveCrossSection, type Convergence, type FieldSolveOptions } from './solve.js';

export interface FieldLine {
  /** Ω */
  z0: number;
  epsEff: number;
  /** m/s */
  velocity: number;
  /** s/m */
  delayPerMetre: number;
  /** H/m */
  inductancePerMetre: number;
  /** F/m */
  capacitancePerMetre: number;
  method: string;
  convergence: Convergence;
}

export interface FieldPair {
  /** Ω */
  zodd: number;
  zeven: number;
  /** 2·Zodd, Ω */
  zdiff: number;
  /** Zeven/2, Ω */
  zcommon: number;
  epsEffOdd: number;
  epsEffEven: number;
  /** m/s */
  velocityOdd: number;
  velocityEven: number;
  /** s/m */
  delayPerMetreOdd: number;
  delayPerMetreEven: number;
  /** Maxwell C (F/m) and L (H/m), 2×2. */
  capacitance: number[][];
  inductance: number[][];
  method: string;
  convergence: Convergence;
}

/** One trace: Z0 = 1/(c·sqrt(C·C0)), eps_eff = C/C0, L = μ0ε0/C0 (docs/field-solver.md §6). */
export function fieldSingleLine(section: CrossSection, options?: FieldSolveOptions): FieldLine {
  if (section.traces?.length !== 1) throw new InputError('cross-section traces', `a single line needs exactly one trace, got ${section.traces?.length}`);
  const s = solveCrossSection(section, options);
  const m = mode(s.capacitance[0][0], s.capacitanceVacuum[0][0]);
  return {
    z0: m.z,
    epsEff: m.epsEff,
    velocity: m.velocity,
    delayPerMetre: m.delayPerMetre,
    inductancePerMetre: s.inductance[0][0],
    capacitancePerMetre: m.capacitance,
    method: s.method,
    convergence: s.convergence,
  };
}

/** Relative mismatch allowed between the two traces of a "symmetric" pair (rounding of the inputs). */
const SYMMETRY = 1e-9;

/** An edge-coupled symmetric pair: even/odd modes (Cohn 1955; docs/field-solver.md §6). */
export function fieldPair(section: CrossSection, options?: FieldSolveOptions): FieldPair {
  if (section.traces?.length !== 2) throw new InputError('cross-section traces', `a pair needs exactly two traces, got ${section.traces?.length}`);
  validateCrossSection(section);
  const [a, b] = section.traces;
  for (const key of ['width', 'thickness', 'base'] as const) {
    if (Math.abs(a[key] - b[key]) > SYMMETRY * Math.max(Math.abs(a[key]), Math.abs(b[key]), 1e-12)) {
      throw new InputError(`trace 2 ${key}`, 'differs from trace 1: even/odd modes need a symmetric pair (use solveCrossSection for the C and L matrices)');
    }
  }
  if ((a.etchFactor ?? Infinity) !== (b.etchFactor ?? Infinity)) throw new InputError('trace 2 etch factor', 'differs from trace 1: even/odd modes need a symmetric pair');
  const s = solveCrossSection(section, options);
  const flat = (m: number[][]): Float64Array => Float64Array.from(m.flat());
  const modes = pairModes(flat(s.capacitance), flat(s.capacitanceVacuum));
  return {
    zodd: modes.odd.z,
    zeven: modes.even.z,
    zdiff: modes.zdiff,
    zcommon: modes.zcommon,
    epsEffOdd: modes.odd.epsEff,
    epsEffEven: modes.even.epsEff,
    velocityOdd: modes.odd.velocity,
    velocityEven: modes.even.velocity,
    delayPerMetreOdd: modes.odd.delayPerMetre,
    delayPerMetreEven: modes.even.delayPerMetre,
    capacitance: s.capacitance,
    inductance: s.inductance,
    method: s.method,
    convergence: s.convergence,
  };
}
