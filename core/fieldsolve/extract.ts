/**
 * Line parameters from the capacitance matrices (docs/field-solver.md §6). Quasi-TEM relations for
 * N lossless coupled lines (C. R. Paul, Analysis of Multiconductor Transmission Lines, 2nd ed. 2008,
 * §3.2 and §5.3): L = μ0·ε0·C0⁻¹ (the inductance does not depend on the dielectric); a single line has
 * Z0 = 1/(c·sqrt(C·C0)) and eps_eff = C/C0. A symmetric pair splits into the even and odd modes
 * (Cohn 1955; Paul §5.3): C_even = C11 + C12, C_odd = C11 − C12 with the Maxwell matrix (C12 < 0),
 * Z_mode = 1/(c·sqrt(C_mode·C0_mode)), eps_eff,mode = C_mode/C0_mode; Zdiff = 2·Zodd, Zcommon = Zeven/2.
 */
import { InputError } from '../errors.js';
import { C0 as LIGHT, EPS0, MU0 } from './constants.js';

/** Inverse of an N×N row-major matrix by Gauss-Jordan elimination with partial pivoting. */
export function invert(m: Float64Array, n: number): Float64Array {
  const a = Float64Array.from(m);
  const inv = new Float64Array(n * n);
  for (let i = 0; i < n; i++) inv[i * n + i] = 1;
  for (let col = 0; col < n; col++) {
    let best = col;
    for (let r = col + 1; r < n; r++) if (Math.abs(a[r * n + col]) > Math.abs(a[best * n + col])) best = r;
    const pivot = a[best * n + col];
    if (!(Math.abs(pivot) > 0)) throw new InputError('capacitance matrix', 'is singular: a conductor has no capacitance to ground');
    if (best !== col) {
      for (let k = 0; k < n; k++) {
        [a[col * n + k], a[best * n + k]] = [a[best * n + k], a[col * n + k]];
        [inv[col * n + k], inv[best * n + k]] = [inv[best * n + k], inv[col * n + k]];
      }
    }
    for (let k = 0; k < n; k++) {
      a[col * n + k] /= pivot;
      inv[col * n + k] /= pivot;
    }
    for (let r = 0; r < n; r++) {
      if (r === col) continue;
      const f = a[r * n + col];
      if (f === 0) continue;
      for (let k = 0; k < n; k++) {
        a[r * n + k] -= f * a[col * n + k];
        inv[r * n + k] -= f * inv[col * n + k];
      }
    }
  }
  return inv;
}

/** L = μ0·ε0·C0⁻¹, H/m (Paul 2008, §3.2). */
export function inductanceMatrix(c0: Float64Array, n: number): Float64Array {
  const inv = invert(c0, n);
  for (let k = 0; k < inv.length; k++) inv[k] *= MU0 * EPS0;
  return inv;
}

export interface ModeValues {
  /** Ω */
  z: number;
  epsEff: number;
  /** m/s */
  velocity: number;
  /** s/m */
  delayPerMetre: number;
  /** Per-length capacitance with dielectrics and in vacuum of this mode, F/m. */
  capacitance: number;
  capacitanceVacuum: number;
}

/** Z = 1/(c·sqrt(C·C0)), eps_eff = C/C0, v = c/sqrt(eps_eff) for one mode or one line. */
export function mode(c: number, c0: number): ModeValues {
  if (!(c > 0 && c0 > 0) || !Number.isFinite(c) || !Number.isFinite(c0)) {
    throw new InputError('field solver result', `non-positive mode capacitance (C = ${c} F/m, C0 = ${c0} F/m): the mesh does not resolve the geometry`);
  }
  const epsEff = c / c0;
  const velocity = LIGHT / Math.sqrt(epsEff);
  return { z: 1 / (LIGHT * Math.sqrt(c * c0)), epsEff, velocity, delayPerMetre: 1 / velocity, capacitance: c, capacitanceVacuum: c0 };
}

export interface PairModeValues {
  even: ModeValues;
  odd: ModeValues;
  /** 2·Zodd, Ω */
  zdiff: number;
  /** Zeven/2, Ω */
  zcommon: number;
}

/** Even and odd modes of a symmetric pair from 2×2 Maxwell matrices (Cohn 1955; Paul 2008 §5.3). */
export function pairModes(c: Float64Array, c0: Float64Array): PairModeValues {
  const c11 = 0.5 * (c[0] + c[3]);
  const c011 = 0.5 * (c0[0] + c0[3]);
  const even = mode(c11 + c[1], c011 + c0[1]);
  const odd = mode(c11 - c[1], c011 - c0[1]);
  return { even, odd, zdiff: 2 * odd.z, zcommon: even.z / 2 };
}
